"""Reading what is still readable from a store file that was moved aside as damaged.

The file is never changed: it is copied (with its -wal) to a temporary folder, the copy is brought
up to the current schema where possible, and every job is read part by part; parts SQLite cannot
read are left out and listed as problems. The documents have the shape of `store.documents.export`, so
the exports can write them like any other job.
"""

from __future__ import annotations

import shutil
import sqlite3
import tempfile
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import sqlite_utils

from mobile_app.store.errors import StoreError
from mobile_app.store.schema import SQLITE_HEADER, migrate
from mobile_app.store.store import Store


@dataclass(frozen=True)
class Salvage:
    """Job documents read from a damaged file, and what could not be read."""

    documents: list[dict[str, Any]] = field(default_factory=list)
    problems: list[str] = field(default_factory=list)


def salvage_jobs(path: Path) -> Salvage:
    """Every job document that can still be read from the store file at `path` (left unchanged)."""
    with path.open("rb") as handle:
        if handle.read(16) != SQLITE_HEADER:
            return Salvage([], ["not an SQLite file: nothing can be read"])
    with tempfile.TemporaryDirectory() as folder:
        copy = Path(folder) / "salvage.sqlite"
        shutil.copyfile(path, copy)
        wal = path.with_name(path.name + "-wal")
        if wal.exists():
            shutil.copyfile(wal, copy.with_name(copy.name + "-wal"))
        conn = sqlite3.connect(str(copy), isolation_level=None)
        try:
            return _read(Store(copy, sqlite_utils.Database(conn)))
        finally:
            conn.close()


def _read(store: Store) -> Salvage:
    """Read every job of an opened copy, part by part."""
    problems: list[str] = []
    try:
        migrate(store.db, store.path)
    except (StoreError, sqlite3.DatabaseError) as error:
        problems.append(f"schema not brought up to date: {error}")
    try:
        job_ids = [row[0] for row in store.db.conn.execute("SELECT id FROM jobs ORDER BY id")]
    except sqlite3.DatabaseError as error:
        return Salvage([], [*problems, f"the list of jobs cannot be read: {error}"])
    documents = []
    for job_id in job_ids:
        try:
            documents.append(store.documents.salvage(job_id, problems))
        except sqlite3.DatabaseError as error:
            problems.append(f"job {job_id}: {error}")
    return Salvage(documents, problems)
