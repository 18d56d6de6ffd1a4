"""Opening the store file: checks, schema versions and migrations, and moving a bad file aside.

The schema is built by a list of sqlite-utils migrations, applied in order; the number applied is
also written to `PRAGMA user_version`. Before any migration runs on a file holding data, a copy is
taken with SQLite's backup API, and all pending migrations run in one transaction, so a migration
that fails leaves the previous file as it was. A file that is not SQLite or fails
`PRAGMA integrity_check` is renamed with a timestamp (never overwritten or deleted) and a fresh
store is made in its place.
"""

from __future__ import annotations

import datetime
import json
import sqlite3
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Literal

import sqlite_utils
from sqlite_utils import Migrations

from mobile_app.store import chain
from mobile_app.store.errors import MigrationError, StoreTooNewError

SQLITE_HEADER = b"SQLite format 3\x00"
DAMAGE_ERRORS = ("SQLITE_CORRUPT", "SQLITE_NOTADB")


@dataclass(frozen=True)
class MovedAside:
    """A store file that could not be used and was renamed; a fresh store took its place."""

    original: Path
    moved_to: Path
    reason: str

    @property
    def message(self) -> str:
        """A sentence for the person using the app."""
        return (
            f"The job store could not be read ({self.reason}). It was kept as {self.moved_to.name} "
            "and a new, empty store was started. Nothing was deleted."
        )


def _triple(name: str) -> str:
    """Columns for one typed field: text as typed, parsed value, parse error."""
    return f"{name}_raw TEXT NOT NULL DEFAULT '', {name}_value, {name}_error TEXT"


def _m001(db: sqlite_utils.Database) -> None:
    """Version 1: people, jobs, boards, circuits with readings as typed, and the audit trail."""
    job = ", ".join(
        _triple(f)
        for f in (
            "client_ref",
            "site_address",
            "description",
            "date",
            "system",
            "u0",
            "cmin",
            "ze",
            "pfc",
        )
    )
    board = ", ".join(_triple(f) for f in ("designation", "location", "supplied_from"))
    circuit = ", ".join(
        _triple(f)
        for f in (
            "number",
            "description",
            "role",
            "device_kind",
            "device_curve",
            "device_rating",
            "let_through_i2t",
            "rcd_idn",
            "rcd_type",
            "line_csa",
            "line_material",
            "line_insulation",
            "cpc_csa",
            "cpc_material",
            "cpc_arrangement",
            "zs",
            "zsc",
            "r1r2",
            "ze",
            "test_temp_c",
        )
    )
    for sql in (
        "CREATE TABLE people (id INTEGER PRIMARY KEY, name TEXT NOT NULL, role TEXT NOT NULL"
        " CHECK (role IN ('apprentice', 'qualified', 'supervisor')), created_at TEXT NOT NULL)",
        "CREATE TABLE jobs (id INTEGER PRIMARY KEY, status TEXT NOT NULL DEFAULT 'draft'"
        " CHECK (status IN ('draft', 'submitted', 'approved')), created_at TEXT NOT NULL,"
        " updated_at TEXT NOT NULL, recorded_by INTEGER REFERENCES people(id), " + job + ")",
        "CREATE TABLE boards (id INTEGER PRIMARY KEY, job_id INTEGER NOT NULL REFERENCES jobs(id),"
        " position INTEGER NOT NULL, " + board + ")",
        "CREATE TABLE circuits (id INTEGER PRIMARY KEY,"
        " board_id INTEGER NOT NULL REFERENCES boards(id), position INTEGER NOT NULL, "
        + circuit
        + ", verdict TEXT NOT NULL DEFAULT 'incomplete', assessment TEXT, calc_version TEXT,"
        " assessment_error TEXT, updated_at TEXT NOT NULL,"
        " updated_by INTEGER REFERENCES people(id))",
        "CREATE TABLE audit (id INTEGER PRIMARY KEY, job_id INTEGER REFERENCES jobs(id),"
        " at TEXT NOT NULL, person_id INTEGER REFERENCES people(id), entity TEXT NOT NULL,"
        " entity_id INTEGER, field TEXT, old TEXT, new TEXT)",
        "CREATE INDEX boards_job ON boards(job_id, position)",
        "CREATE INDEX circuits_board ON circuits(board_id, position)",
        "CREATE INDEX audit_job ON audit(job_id, id)",
    ):
        db.execute(sql)


def _m002(db: sqlite_utils.Database) -> None:
    """Version 2: the device library (manufacturer curves) and a circuit's link to it."""
    db.execute(
        "CREATE TABLE library_devices (id INTEGER PRIMARY KEY, name TEXT NOT NULL,"
        " rating_a REAL, points TEXT NOT NULL, created_at TEXT NOT NULL)"
    )
    for column in _triple("library_device_id").split(", "):
        db.execute(f"ALTER TABLE circuits ADD COLUMN {column}")


def _m003(db: sqlite_utils.Database) -> None:
    """Version 3: row versions, review and revision columns, a board's own supply (system, Ze)."""
    for table in ("jobs", "boards", "circuits"):
        db.execute(f"ALTER TABLE {table} ADD COLUMN version INTEGER NOT NULL DEFAULT 1")
    for column in (
        "revision INTEGER NOT NULL DEFAULT 1",
        "parent_job_id INTEGER REFERENCES jobs(id)",
        "revision_reason TEXT",
        "submitted_by INTEGER REFERENCES people(id)",
        "submitted_at TEXT",
        "approved_by INTEGER REFERENCES people(id)",
        "approved_at TEXT",
        "review_comment TEXT",
    ):
        db.execute(f"ALTER TABLE jobs ADD COLUMN {column}")
    for column in (_triple("system") + ", " + _triple("ze")).split(", "):
        db.execute(f"ALTER TABLE boards ADD COLUMN {column}")


def _m004(db: sqlite_utils.Database) -> None:
    """Version 4: supervisor PIN hashes with a lock-out counter, and the settings table."""
    for column in ("pin_hash TEXT", "failed_pins INTEGER NOT NULL DEFAULT 0", "locked_until REAL"):
        db.execute(f"ALTER TABLE people ADD COLUMN {column}")
    db.execute("CREATE TABLE settings (key TEXT PRIMARY KEY, value TEXT NOT NULL)")


def _m005(db: sqlite_utils.Database) -> None:
    """Version 5: a circuit whose evidence decides nothing reads "not-shown" (calc 0.2), not "incomplete".

    Draft jobs are reassessed by the new calc when the store opens; submitted and approved jobs keep
    the assessment they were reviewed with, under the new word.
    """
    db.execute("UPDATE circuits SET verdict = 'not-shown' WHERE verdict = 'incomplete'")


def _m006(db: sqlite_utils.Database) -> None:
    """Version 6: signed approvals, enrolled supervisors' keys, and the audit trail as a hash chain.

    PINs stored as scrypt hashes are dropped (the browser build cannot check them; such a supervisor
    sets a PIN again). Jobs approved before approvals were signed are listed in the setting
    `unsigned_approvals`, so the integrity check tells them from jobs whose approval was removed later.
    """
    for column in ("public_key TEXT", "sealed_key TEXT", "roster_entry TEXT"):
        db.execute(f"ALTER TABLE people ADD COLUMN {column}")
    db.execute("ALTER TABLE jobs ADD COLUMN approval TEXT")
    db.execute("ALTER TABLE audit ADD COLUMN hash TEXT")
    db.execute("UPDATE people SET pin_hash = NULL WHERE pin_hash LIKE 'scrypt$%'")
    chain.rehash_all(db.conn)
    approved = [row[0] for row in db.conn.execute("SELECT id FROM jobs WHERE status = 'approved'")]
    db.conn.execute("INSERT OR REPLACE INTO settings (key, value) VALUES ('unsigned_approvals', ?)",
                    (json.dumps(approved),))


_M007_COLUMNS = {
    "jobs": ("client_name", "client_address", "purpose", "next_inspection", "limitations"),
    "boards": ("pfc", "main_device", "main_rating", "origin", "earthing_csa", "bonding_csa", "ra"),
    "circuits": (
        "points_served",
        "wiring_type",
        "reference_method",
        "length_m",
        "ring",
        "selv",
        "breaking_capacity",
        "let_through_at",
        "rcd_waveform",
        "rcd_additional",
        "cpc_insulation",
        "cpc_bunched",
        "cpc_protected",
        "r2",
        "ring_r1",
        "ring_rn",
        "ring_r2",
        "insulation_test_voltage",
        "insulation_line_line",
        "insulation_line_earth",
        "polarity",
        "rcd_time_1x",
        "rcd_time_5x",
        "rcd_test_button",
    ),
}


def _m007(db: sqlite_utils.Database) -> None:
    """Version 7: the whole test record. A circuit's other tests (continuity, ring, insulation,
    polarity, RCD times and button), its wiring, length and points, breaking capacity and RCD type
    letter; a board's supply details, main device and (at the origin) earthing and bonding sizes; a
    job's client, purpose, next inspection and limitations; the job's instruments and observations.

    A device typed "rcbo" was read as a plain breaker before (no RCBO kind): it now reads as an RCBO.
    """
    for table, names in _M007_COLUMNS.items():
        for name in names:
            for column in _triple(name).split(", "):
                db.execute(f"ALTER TABLE {table} ADD COLUMN {column}")
    db.execute("UPDATE circuits SET device_kind_value = 'rcbo' WHERE lower(trim(device_kind_raw)) = 'rcbo'")
    items = "id INTEGER PRIMARY KEY, job_id INTEGER NOT NULL REFERENCES jobs(id), position INTEGER NOT NULL,"
    items += " version INTEGER NOT NULL DEFAULT 1, updated_at TEXT NOT NULL"
    instrument = ", ".join(_triple(f) for f in ("name", "serial", "calibration_date"))
    observation = ", ".join(_triple(f) for f in ("finding", "severity", "location"))
    for sql in (
        f"CREATE TABLE instruments ({items}, {instrument})",
        f"CREATE TABLE observations ({items}, {observation}, circuit_ids TEXT NOT NULL DEFAULT '[]')",
        "CREATE INDEX instruments_job ON instruments(job_id, position)",
        "CREATE INDEX observations_job ON observations(job_id, position)",
    ):
        db.execute(sql)


def _m008(db: sqlite_utils.Database) -> None:
    """Version 8: approval reasons and deleted drafts. What a supervisor wrote for each failing or
    open item they approved a job with (`approval_reasons`, JSON), and when a draft job was deleted
    (`deleted_at`: the job is kept, out of the lists, so its audit trail stays whole)."""
    db.execute("ALTER TABLE jobs ADD COLUMN approval_reasons TEXT")
    db.execute("ALTER TABLE jobs ADD COLUMN deleted_at TEXT")


STEPS: tuple[tuple[str, Callable[[sqlite_utils.Database], None]], ...] = (
    ("001_jobs_boards_circuits", _m001),
    ("002_device_library", _m002),
    ("003_row_versions_review_revisions", _m003),
    ("004_pins_settings", _m004),
    ("005_not_shown_verdict", _m005),
    ("006_signed_approvals_audit_chain", _m006),
    ("007_test_record", _m007),
    ("008_approval_reasons_deleted_jobs", _m008),
)
SCHEMA_VERSION = len(STEPS)


def build_migrations(
    steps: tuple[tuple[str, Callable[[sqlite_utils.Database], None]], ...] = STEPS,
) -> Migrations:
    """A sqlite-utils migration set holding `steps` in order."""
    migrations = Migrations("boardside")
    for name, step in steps:
        migrations(name=name)(step)
    return migrations


def utc_stamp() -> str:
    """The current UTC time as a compact stamp for file names, e.g. 20261202T070400Z."""
    return datetime.datetime.now(datetime.UTC).strftime("%Y%m%dT%H%M%SZ")


def connect(path: Path, journal: Literal["WAL", "DELETE"] = "WAL") -> sqlite3.Connection:
    """Open a connection with explicit transactions, WAL (or the `journal` mode given), foreign keys
    and full sync."""
    conn = sqlite3.connect(str(path), isolation_level=None, timeout=10.0, check_same_thread=False)
    conn.execute(f"PRAGMA journal_mode={journal}")
    conn.execute("PRAGMA synchronous=FULL")
    conn.execute("PRAGMA foreign_keys=ON")
    conn.execute("PRAGMA busy_timeout=10000")
    return conn


def problem_with(path: Path) -> str | None:
    """Why the file at `path` is damaged (not SQLite, corrupt), or None if it checks out.

    Other failures (no rights, read-only folder) are raised as they are: they are not damage,
    and the file must not be moved for them.
    """
    if not path.exists() or path.stat().st_size == 0:
        return None
    # The file is never opened with open(): closing any other descriptor of a database file drops
    # the POSIX locks that this process's SQLite connections hold on it, and another process could
    # then write over them. SQLite itself tells a file that is not a database (SQLITE_NOTADB).
    try:
        conn = sqlite3.connect(str(path), isolation_level=None)
        try:
            rows = conn.execute("PRAGMA integrity_check").fetchall()
        finally:
            conn.close()
    except sqlite3.DatabaseError as error:
        name = getattr(error, "sqlite_errorname", "")
        if name == "SQLITE_NOTADB":
            return "not an SQLite file"
        if name in DAMAGE_ERRORS:
            return f"unreadable: {error}"
        raise
    if rows != [("ok",)]:
        return "failed its integrity check: " + "; ".join(str(r[0]) for r in rows[:3])
    return None


def move_aside(path: Path, reason: str) -> MovedAside:
    """Rename a bad store file (and its -wal/-shm companions) with a timestamp; never delete it."""
    stamp = utc_stamp()
    target = path.with_name(f"{path.stem}-unusable-{stamp}{path.suffix}")
    counter = 1
    while target.exists():
        counter += 1
        target = path.with_name(f"{path.stem}-unusable-{stamp}-{counter}{path.suffix}")
    for suffix in ("-wal", "-shm"):
        companion = path.with_name(path.name + suffix)
        if companion.exists():
            companion.rename(target.with_name(target.name + suffix))
    path.rename(target)
    return MovedAside(path, target, reason)


def backup(conn: sqlite3.Connection, path: Path, from_version: int) -> Path:
    """Copy the open store to backups/ with SQLite's backup API; return the copy's path."""
    folder = path.parent / "backups"
    folder.mkdir(parents=True, exist_ok=True)
    target = folder / f"{path.stem}-v{from_version}-{utc_stamp()}{path.suffix}"
    counter = 1
    while target.exists():
        counter += 1
        target = folder / f"{path.stem}-v{from_version}-{utc_stamp()}-{counter}{path.suffix}"
    copy = sqlite3.connect(str(target))
    try:
        conn.backup(copy)
    finally:
        copy.close()
    return target


def migrate(
    db: sqlite_utils.Database,
    path: Path,
    steps: tuple[tuple[str, Callable[[sqlite_utils.Database], None]], ...] = STEPS,
) -> Path | None:
    """Bring the schema up to date in one transaction; return the backup taken first, if any."""
    migrations = build_migrations(steps)
    applied = [m.name for m in migrations.applied(db)]
    known = [name for name, _ in steps]
    unknown = [name for name in applied if name not in known]
    if unknown:
        raise StoreTooNewError(str(path), unknown)
    if not migrations.pending(db):
        return None
    backup_path = backup(db.conn, path, len(applied)) if applied else None
    db.conn.execute("BEGIN IMMEDIATE")
    try:
        migrations.apply(db)
        db.conn.execute(f"PRAGMA user_version={len(known)}")
        db.conn.execute("COMMIT")
    except Exception as error:
        db.conn.execute("ROLLBACK")
        raise MigrationError(str(path), f"{type(error).__name__}: {error}") from error
    return backup_path
