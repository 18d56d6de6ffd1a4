"""Exports of a job: JSON, CSV and PDF in a bundle folder with a manifest of SHA-256 hashes.

Public surface (formats in EXPORT-FORMAT.md, which is also `mobile_app.export.json_doc.__doc__`):

    from mobile_app.export import export_bundle, read_bundle
    bundle = export_bundle(store, job_id, out_dir)          # or board_id=... for one board
    bundle.path, bundle.files (json, csv, pdf), bundle.manifest, bundle.sha256 {file name: hex}
    write_bundle(doc, out_dir, board_id=None) -> Bundle     # a job document already read
    read_bundle(path) -> Bundle                              # re-checks every hash (BundleCheckError)
    job_json_bytes(doc), job_csv_bytes(doc), job_pdf_bytes(doc)   # one format of a job document
    load_job_json(data) -> doc ; import_job_json(store, data) -> new job id   # within a size limit
                                            # (32 MB) and about 3x the document's size in memory
    neutralise_cell(text) ; CAUTIONS
    await ready()                           # before an export: the PDF's libraries importable (the
                                            # browser loads them then; use_loader installs how)

Errors: ExportError (a StoreError) with BundleExistsError, BundleCheckError and LibrariesError; the store's
NotFoundError for an unknown job or board; the store's DocumentError for an unreadable JSON export.
`python -m mobile_app export` is `mobile_app.export.cli.cli_export`.

Modules: `bundle` (the folder and its manifest), `names` (the length budget of bundle names),
`json_load` (reading a JSON document within its limits), `json_doc`, `csv_doc`, `pdf_doc` with
`pdf_schedule`, `pdf_annex`, `pdf_blocks` and `pdf_layout` (the three formats), `schedule` (the schedule
of test results' values, shared by the PDF and the CSV), `figures` (readings rounded as the instrument
shows them, local times), `common` (cautions, errors, number formatting), `loading` (the seam that
loads the PDF's libraries where they are not installed), `cli`. Imports point to the store
and calc only. A name is imported from its module when first used, so importing this package loads
neither fpdf2 nor the writers until an export runs.
"""

from __future__ import annotations

import importlib
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from mobile_app.export.bundle import Bundle, export_bundle, read_bundle, write_bundle
    from mobile_app.export.common import (
        CAUTIONS,
        BundleCheckError,
        BundleExistsError,
        ExportError,
        LibrariesError,
    )
    from mobile_app.export.csv_doc import job_csv_bytes, neutralise_cell
    from mobile_app.export.json_doc import import_job_json, job_json_bytes, load_job_json
    from mobile_app.export.loading import ready, use_loader
    from mobile_app.export.pdf_doc import job_pdf_bytes

_MODULE_OF = {
    "Bundle": "bundle",
    "export_bundle": "bundle",
    "read_bundle": "bundle",
    "write_bundle": "bundle",
    "CAUTIONS": "common",
    "BundleCheckError": "common",
    "BundleExistsError": "common",
    "ExportError": "common",
    "LibrariesError": "common",
    "job_csv_bytes": "csv_doc",
    "neutralise_cell": "csv_doc",
    "import_job_json": "json_doc",
    "job_json_bytes": "json_doc",
    "load_job_json": "json_doc",
    "job_pdf_bytes": "pdf_doc",
    "ready": "loading",
    "use_loader": "loading",
}

__all__ = [
    "CAUTIONS",
    "Bundle",
    "BundleCheckError",
    "BundleExistsError",
    "ExportError",
    "LibrariesError",
    "export_bundle",
    "import_job_json",
    "job_csv_bytes",
    "job_json_bytes",
    "job_pdf_bytes",
    "load_job_json",
    "neutralise_cell",
    "read_bundle",
    "ready",
    "use_loader",
    "write_bundle",
]


def __getattr__(name: str) -> Any:
    """A public name, imported from its module on first use."""
    if name not in _MODULE_OF:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    return getattr(importlib.import_module(f"{__name__}.{_MODULE_OF[name]}"), name)


def __dir__() -> list[str]:
    return sorted(__all__)
