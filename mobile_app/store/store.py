"""The job store: `Store.open(data_dir)` and everything the app, exports and sync call on it.

The class is assembled from layers, each in its own module: `core` (file, transactions, audit,
people, settings, device library), `jobs` (jobs, boards, reassessment), `circuits`, `review` (review
flow, PINs, revisions, audit trail) and `documents` (job documents out and in).
"""

from __future__ import annotations

from mobile_app.store.documents import DocumentStore


class Store(DocumentStore):
    """An open job store on the device (see the package docstring for its whole surface)."""


__all__ = ["Store"]
