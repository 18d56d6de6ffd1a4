"""The store's foundation: opening the file, write transactions, the audit trail, people,
settings and the device library."""

from __future__ import annotations

import contextlib
import datetime
import json
import math
import sqlite3
import threading
import time
import weakref
from collections.abc import Callable, Iterator
from pathlib import Path
from typing import Any, Self

import platformdirs
import sqlite_utils

import calc
from mobile_app.store import pins
from mobile_app.store.errors import InvalidValueError, NotFoundError, OpenError, SaveError
from mobile_app.store.schema import MovedAside, connect, migrate, move_aside, problem_with

STORE_FILE = "boardside.sqlite"
ROLES = ("apprentice", "qualified", "supervisor")


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


def db_lock(db: sqlite_utils.Database) -> threading.RLock:
    """The one lock of a database connection: the store and the outbox take it around every use
    of the connection, so threads sharing one store never interleave their transactions."""
    with _LOCKS_GUARD:
        lock = _LOCKS.get(db)
        if lock is None:
            lock = _LOCKS[db] = threading.RLock()
        return lock


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


class StoreCore:
    """An open store file: connection, transactions, audit, people, settings, device library."""

    def __init__(
        self,
        path: Path,
        db: sqlite_utils.Database,
        recovered: MovedAside | None,
        backup_path: Path | None,
    ) -> None:
        self.path = path
        self.db = db
        self.recovered = recovered
        self.backup_path = backup_path
        self.clock: Callable[[], float] = time.time
        self._lock = db_lock(db)

    @classmethod
    def open(cls, data_dir: Path | None = None) -> Self:
        """Open (or create) the store in `data_dir` (None: the user's app-data folder).

        Checks the file (a non-SQLite or damaged file is moved aside and `recovered` says so), turns
        on WAL and foreign keys, and runs pending migrations after taking a backup copy.
        """
        folder = Path(data_dir) if data_dir is not None else default_data_dir()
        try:
            folder.mkdir(parents=True, exist_ok=True)
            path = folder / STORE_FILE
            problem = problem_with(path)
            recovered = move_aside(path, problem) if problem else None
            conn = connect(path)
        except (OSError, sqlite3.Error) as error:
            reason = save_reason(error) if isinstance(error, sqlite3.Error) else str(error)
            raise OpenError(str(folder), reason) from error
        db = sqlite_utils.Database(conn)
        try:
            backup_path = migrate(db, path)
        except BaseException:
            conn.close()
            raise
        return cls(path, db, recovered, backup_path)

    def close(self) -> None:
        """Close the connection (every save is already committed)."""
        self.db.close()

    def __enter__(self) -> Self:
        return self

    def __exit__(self, *exc_info: object) -> None:
        self.close()

    def _write(self) -> contextlib.AbstractContextManager[sqlite3.Connection]:
        """One write transaction on this store's connection (see `write_transaction`)."""
        return write_transaction(self.db)

    @contextlib.contextmanager
    def batch(self) -> Iterator[None]:
        """Several changes that commit together or not at all (each call inside is a savepoint)."""
        with self._write():
            yield

    def _query(self, sql: str, params: tuple[Any, ...] | dict[str, Any] = ()) -> list[dict[str, Any]]:
        """Rows of a read query as dicts (plain sqlite3: no savepoint around each read)."""
        with self._lock:
            cursor = self.db.conn.execute(sql, params)
            names = [column[0] for column in cursor.description]
            return [dict(zip(names, row, strict=True)) for row in cursor.fetchall()]

    def _one(self, sql: str, params: tuple[Any, ...] = ()) -> dict[str, Any] | None:
        """The first row of a query as a dict, or None."""
        rows = self._query(sql, params)
        return rows[0] if rows else None

    def _audit(
        self,
        conn: sqlite3.Connection,
        job_id: int | None,
        by: int | None,
        entity: str,
        entity_id: int | None,
        field: str | None,
        old: Any,
        new: Any,
    ) -> None:
        """Record one change in the audit trail (inside the caller's transaction)."""
        conn.execute(
            "INSERT INTO audit (job_id, at, person_id, entity, entity_id, field, old, new)"
            " VALUES (?, ?, ?, ?, ?, ?, ?, ?)",
            (
                job_id,
                now_iso(),
                by,
                entity,
                entity_id,
                field,
                None if old is None else str(old),
                None if new is None else str(new),
            ),
        )

    # people
    def add_person(self, name: str, role: str, pin: str | None = None) -> int:
        """Add a person (role: apprentice, qualified or supervisor), with a PIN for supervisors."""
        if not name.strip():
            raise InvalidValueError("name", "must not be blank")
        if role not in ROLES:
            raise InvalidValueError("role", "must be one of: " + ", ".join(ROLES))
        pin_hash = pins.hash_pin(pin) if pin is not None else None
        with self._write() as conn:
            cursor = conn.execute(
                "INSERT INTO people (name, role, created_at, pin_hash) VALUES (?, ?, ?, ?)",
                (name.strip(), role, now_iso(), pin_hash),
            )
            person_id = int(cursor.lastrowid or 0)
            self._audit(conn, None, None, "person", person_id, "role", None, role)
        return person_id

    def set_pin(self, person_id: int, pin: str) -> None:
        """Set or change a person's PIN (stored only as a salted scrypt hash); clears a lock-out."""
        self._person(person_id)
        pin_hash = pins.hash_pin(pin)
        with self._write() as conn:
            conn.execute(
                "UPDATE people SET pin_hash = ?, failed_pins = 0, locked_until = NULL WHERE id = ?",
                (pin_hash, person_id),
            )
            self._audit(conn, None, person_id, "person", person_id, "pin", None, "changed")

    def people(self) -> list[dict[str, Any]]:
        """Everyone known to the store: id, name, role and whether a PIN is set (never the hash)."""
        return self._query(
            "SELECT id, name, role, pin_hash IS NOT NULL AS has_pin FROM people ORDER BY name, id"
        )

    def _person(self, person_id: int) -> dict[str, Any]:
        """One person's row, or NotFoundError."""
        row = self._one("SELECT * FROM people WHERE id = ?", (person_id,))
        if row is None:
            raise NotFoundError("person", person_id)
        return row

    # settings
    def get_setting(self, key: str, default: Any = None) -> Any:
        """A setting's value (JSON-decoded), or `default` when it was never set."""
        row = self._one("SELECT value FROM settings WHERE key = ?", (key,))
        return default if row is None else json.loads(row["value"])

    def set_setting(self, key: str, value: Any) -> None:
        """Store a JSON-able setting (passwords do not belong here)."""
        with self._write() as conn:
            conn.execute(
                "INSERT INTO settings (key, value) VALUES (?, ?) ON CONFLICT(key)"
                " DO UPDATE SET value = excluded.value",
                (key, json.dumps(value)),
            )

    # device library
    def add_library_device(
        self,
        name: str,
        points: list[tuple[float, float]] | list[list[float]],
        rating_a: float | None = None,
    ) -> int:
        """Save a manufacturer curve: (current_a, time_s) points, times falling as current rises."""
        if not name.strip():
            raise InvalidValueError("name", "must not be blank")
        clean = check_curve_points(points)
        if rating_a is not None and not (math.isfinite(rating_a) and rating_a > 0):
            raise InvalidValueError("rating_a", "must be greater than zero")
        with self._write() as conn:
            cursor = conn.execute(
                "INSERT INTO library_devices (name, rating_a, points, created_at) VALUES (?, ?, ?, ?)",
                (name.strip(), rating_a, json.dumps(clean), now_iso()),
            )
            device_id = int(cursor.lastrowid or 0)
            self._audit(conn, None, None, "library", device_id, "name", None, name.strip())
        return device_id

    def library_devices(self) -> list[dict[str, Any]]:
        """The device library: id, name, rating_a, points [[current_a, time_s], ...]."""
        return [
            dict(row, points=json.loads(row["points"]))
            for row in self._query("SELECT id, name, rating_a, points FROM library_devices ORDER BY name, id")
        ]

    def _library_device(self, device_id: int) -> dict[str, Any] | None:
        """One library device with its points decoded, or None."""
        row = self._one("SELECT id, name, rating_a, points FROM library_devices WHERE id = ?", (device_id,))
        return None if row is None else dict(row, points=json.loads(row["points"]))


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


def check_curve_points(points: Any) -> list[list[float]]:
    """Check curve points with the calculation core: two or more, times falling as current rises.

    Returns [[current_a, time_s], ...] sorted by current; InvalidValueError otherwise.
    """
    try:
        parsed = calc.read_points(list(points))
    except TypeError as error:
        raise InvalidValueError("points", "must be a list of [current, time] pairs") from error
    except calc.InputError as error:
        raise InvalidValueError("points", error.problem) from error
    return [[current_a, time_s] for current_a, time_s in parsed]
