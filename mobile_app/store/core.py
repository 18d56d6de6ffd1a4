"""The store's shared core: the store file's place, its one lock, write transactions (SQLite's
refusals as SaveError), and `Core`, which every part of the Store is given."""

from __future__ import annotations

import contextlib
import datetime
import sqlite3
import threading
import time
import weakref
from collections.abc import Callable, Iterator
from pathlib import Path
from typing import Any

import platformdirs
import sqlite_utils

from mobile_app.store import chain
from mobile_app.store.errors import NotFoundError, ReadOnlyError, SaveError

STORE_FILE = "boardside.sqlite"
_TABLES = {
    "job": "jobs",
    "board": "boards",
    "circuit": "circuits",
    "instrument": "instruments",
    "observation": "observations",
}


def default_data_dir() -> Path:
    """The user's app-data folder for Boardside (platformdirs)."""
    return Path(platformdirs.user_data_dir("Boardside", "Boardside"))


def now_iso() -> str:
    """The current UTC time, ISO 8601 with milliseconds."""
    return datetime.datetime.now(datetime.UTC).isoformat(timespec="milliseconds")


_REASONS = {
    "SQLITE_FULL": "the device storage is full; free some space and try again",
    "SQLITE_READONLY": "the store's folder is read-only",
    "SQLITE_CANTOPEN": "the store's folder cannot be written (read-only or no permission)",
    "SQLITE_BUSY": "the store is busy in another window; try again",
    "SQLITE_LOCKED": "the store is busy in another window; try again",
    "SQLITE_IOERR": "the storage could not be written (I/O error)",
}


def save_reason(error: sqlite3.Error) -> str:
    """A plain sentence for why SQLite refused to open or write (by its primary result code)."""
    name = getattr(error, "sqlite_errorname", "") or ""
    primary = "_".join(name.split("_")[:2])
    return _REASONS.get(primary, str(error))


_LOCKS: weakref.WeakKeyDictionary[sqlite_utils.Database, threading.RLock] = weakref.WeakKeyDictionary()
_LOCKS_GUARD = threading.Lock()
_AFTER_COMMIT: weakref.WeakKeyDictionary[sqlite_utils.Database, Callable[[], object]] = (
    weakref.WeakKeyDictionary()
)


def db_lock(db: sqlite_utils.Database) -> threading.RLock:
    """The one lock of a database connection: the store and the outbox take it around every use
    of the connection, so threads sharing one store never interleave their transactions."""
    with _LOCKS_GUARD:
        lock = _LOCKS.get(db)
        if lock is None:
            lock = _LOCKS[db] = threading.RLock()
        return lock


def after_commit(db: sqlite_utils.Database, hook: Callable[[], object] | None) -> None:
    """Call `hook` after each write transaction on `db` commits (None removes it).

    The seam for a platform that must copy the store file somewhere once a save is committed (the
    browser build copies it to persistent browser storage); the store itself never asks which
    platform it runs on.
    """
    if hook is None:
        _AFTER_COMMIT.pop(db, None)
    else:
        _AFTER_COMMIT[db] = hook


@contextlib.contextmanager
def write_transaction(db: sqlite_utils.Database) -> Iterator[sqlite3.Connection]:
    """One write transaction (BEGIN IMMEDIATE … COMMIT) holding the connection's lock; SQLite
    refusals become SaveError. Inside another write it is a savepoint, so a larger change (an
    import) commits as one."""
    with db_lock(db):
        conn = db.conn
        if conn.in_transaction:
            yield from _savepoint(conn)
            return
        try:
            conn.execute("BEGIN IMMEDIATE")
        except sqlite3.OperationalError as error:
            raise SaveError(save_reason(error)) from error
        try:
            yield conn
            conn.execute("COMMIT")
        except sqlite3.Error as error:
            if conn.in_transaction:
                conn.execute("ROLLBACK")
            raise SaveError(save_reason(error)) from error
        except BaseException:
            if conn.in_transaction:
                conn.execute("ROLLBACK")
            raise
        hook = _AFTER_COMMIT.get(db)
        if hook is not None:
            hook()


class Core:
    """One open store file, shared by every part of the Store: the connection and its lock, write
    transactions, reads, the rows of jobs, boards and circuits, the audit trail and the clock."""

    def __init__(self, path: Path, db: sqlite_utils.Database) -> None:
        self.path = path
        self.db = db
        self.lock = db_lock(db)
        self.clock: Callable[[], float] = time.time

    def write(self) -> contextlib.AbstractContextManager[sqlite3.Connection]:
        """One write transaction on this store's connection (see `write_transaction`)."""
        return write_transaction(self.db)

    def query(self, sql: str, params: tuple[Any, ...] | dict[str, Any] = ()) -> list[dict[str, Any]]:
        """Rows of a read query as dicts (plain sqlite3: no savepoint around each read)."""
        with self.lock:
            cursor = self.db.conn.execute(sql, params)
            names = [column[0] for column in cursor.description]
            return [dict(zip(names, row, strict=True)) for row in cursor.fetchall()]

    def one(self, sql: str, params: tuple[Any, ...] = ()) -> dict[str, Any] | None:
        """The first row of a query as a dict, or None."""
        rows = self.query(sql, params)
        return rows[0] if rows else None

    def row(self, kind: str, item_id: int) -> dict[str, Any]:
        """One job, board, circuit, instrument or observation row, or NotFoundError."""
        row = self.one(f"SELECT * FROM {_TABLES[kind]} WHERE id = ?", (item_id,))
        if row is None:
            raise NotFoundError(kind, item_id)
        return row

    def draft_job(self, job_id: int) -> dict[str, Any]:
        """The job row if it may be changed (draft), else ReadOnlyError."""
        job = self.row("job", job_id)
        if job["status"] != "draft":
            raise ReadOnlyError(job_id, job["status"])
        return job

    @staticmethod
    def touch_job(conn: sqlite3.Connection, job_id: int) -> None:
        """Mark a job as changed now (inside the caller's transaction)."""
        conn.execute("UPDATE jobs SET updated_at = ? WHERE id = ?", (now_iso(), job_id))

    @staticmethod
    def insert(conn: sqlite3.Connection, table: str, row: dict[str, Any]) -> int:
        """Insert a row given as a dict (inside the caller's transaction); return its id."""
        names = ", ".join(row)
        marks = ", ".join("?" for _ in row)
        return int(
            conn.execute(f"INSERT INTO {table} ({names}) VALUES ({marks})", tuple(row.values())).lastrowid
            or 0
        )

    @staticmethod
    def audit(
        conn: sqlite3.Connection,
        job_id: int | None,
        by: int | None,
        entity: str,
        entity_id: int | None,
        field: str | None,
        old: Any,
        new: Any,
    ) -> str:
        """Record one change in the audit trail, chained to the one before (inside the caller's
        transaction); return the entry's hash."""
        return chain.append(conn, {
            "job_id": job_id,
            "at": now_iso(),
            "person_id": by,
            "entity": entity,
            "entity_id": entity_id,
            "field": field,
            "old": None if old is None else str(old),
            "new": None if new is None else str(new),
        })


def _savepoint(conn: sqlite3.Connection) -> Iterator[sqlite3.Connection]:
    """A nested write: a savepoint released on success, rolled back to on failure."""
    conn.execute("SAVEPOINT nested_write")
    try:
        yield conn
    except BaseException:
        if conn.in_transaction:
            conn.execute("ROLLBACK TO nested_write")
            conn.execute("RELEASE nested_write")
        raise
    conn.execute("RELEASE nested_write")
