"""The outbox: export bundles waiting on the device to be sent to the office folder.

One row per bundle in the table `outbox` of the store's database (created here if missing):
where the bundle lies, its files with their sizes and SHA-256, the deterministic remote folder name
(bundle name + the first 16 hex digits of the bundle hash, so the same bundle never lands under two
names), its state (`waiting` or `sent`), attempts, next try time, the last error in plain words
and its kind, when it was queued, last tried and sent, where it was sent (`sent_to`: the office folder's
address and the bundle's folder there), and the temporary folder on the server its upload went to
while it was not yet moved into place (`staging`). A newer export of the same job and revision queued
with `queue_export` replaces one still waiting (state `replaced`, `replaced_by` the newer row), so the
office never receives two copies of one revision. All times are ISO-8601 UTC text of one fixed
format, so they sort as text. Nothing here touches the network or deletes a file.

Every use of the database takes the lock the store takes (`core.db_lock`), and every write is one of
the store's write transactions, so threads sharing one Store never interleave their transactions.
"""

from __future__ import annotations

import hashlib
import json
import re
from dataclasses import dataclass
from datetime import UTC, datetime
from pathlib import Path
from typing import Any

from sqlite_utils import Database

from mobile_app.export.names import NAME_BUDGET
from mobile_app.store.core import db_lock, write_transaction

TABLE = "outbox"
MANIFEST = "manifest.json"
_UNSAFE = re.compile(r"[^A-Za-z0-9._-]+")
MAX_NAME_CHARS = NAME_BUDGET + len(".json")  # a bundle's file name, see export.names
MAX_MANIFEST_BYTES = 1 << 20
_COLUMNS: dict[str, type] = {
    "id": int,
    "bundle_dir": str,
    "bundle_name": str,
    "job_id": int,
    "revision": int,
    "bundle_sha256": str,
    "files": str,
    "remote_path": str,
    "status": str,
    "attempts": int,
    "next_try_at": str,
    "last_error": str,
    "last_error_kind": str,
    "queued_at": str,
    "last_try_at": str,
    "sent_at": str,
    "staging": str,
    "sent_to": str,
    "replaced_by": int,
}
_ADDED_SINCE = ("staging", "sent_to", "replaced_by")  # columns added after the table's first release


class OutboxError(Exception):
    """A problem with the outbox or with a bundle on the device."""


class BundleError(OutboxError, ValueError):
    """The bundle on the device is missing, empty, changed since it was queued, or badly named."""


class UnknownBundleError(OutboxError, KeyError):
    """No outbox entry has this id."""


def iso(moment: datetime) -> str:
    """ISO-8601 text in UTC with milliseconds, one fixed format (sorts as text)."""
    return moment.astimezone(UTC).isoformat(timespec="milliseconds")


def utc_now() -> datetime:
    """The current time, timezone-aware in UTC."""
    return datetime.now(UTC)


def safe_name(name: str, max_chars: int = MAX_NAME_CHARS) -> str:
    """A file or folder name safe on any WebDAV server: letters, digits, `.`, `_`, `-` only.

    Other runs become `_`; leading dots and `_` are dropped (no hidden files, no `..`); an empty
    result becomes `bundle`. A longer name than `max_chars` keeps its extension and is told apart
    from others with the same beginning by 8 hex digits of the SHA-256 of the whole name
    (`<start>-<8 hex>.pdf`), so shortening never makes two names one.
    """
    safe = _UNSAFE.sub("_", name).lstrip("._").rstrip("_") or "bundle"
    if len(safe) <= max_chars:
        return safe
    stem, dot, extension = safe.rpartition(".")
    extension = f".{extension}" if dot and stem and len(extension) <= 8 else ""
    stem = safe[: len(safe) - len(extension)]
    tag = "-" + hashlib.sha256(name.encode("utf-8", "surrogatepass")).hexdigest()[:8]
    return stem[: max_chars - len(tag) - len(extension)].rstrip("._-") + tag + extension


def file_sha256(path: Path) -> str:
    """Hex SHA-256 of a file, read in 1 MiB blocks."""
    digest = hashlib.sha256()
    with open(path, "rb") as fh:
        for block in iter(lambda: fh.read(1 << 20), b""):
            digest.update(block)
    return digest.hexdigest()


@dataclass(frozen=True)
class Queued:
    """What queuing an export did: its outbox id and the ids of the waiting rows it replaced."""

    id: int
    replaced: tuple[int, ...] = ()


@dataclass(frozen=True)
class BundleFile:
    """One file of a bundle: its local name, its sanitised remote name, size and SHA-256."""

    name: str
    remote_name: str
    size_bytes: int
    sha256: str


def scan_bundle(bundle_dir: Path) -> list[BundleFile]:
    """The regular files at the top of a bundle folder, manifest last; symlinks and folders ignored.

    Raises BundleError if the folder is missing or empty, or two names sanitise to the same one.
    """
    if not bundle_dir.is_dir():
        raise BundleError(f"bundle folder not found: {bundle_dir.name}")
    paths = sorted(
        (p for p in bundle_dir.iterdir() if p.is_file() and not p.is_symlink()),
        key=lambda p: (p.name == MANIFEST, p.name),
    )
    if not paths:
        raise BundleError(f"bundle folder is empty: {bundle_dir.name}")
    files = [BundleFile(p.name, safe_name(p.name), p.stat().st_size, file_sha256(p)) for p in paths]
    remote = [f.remote_name for f in files]
    if len(set(remote)) != len(remote):
        raise BundleError(f"two files in {bundle_dir.name} have the same safe name")
    check_manifest(bundle_dir, files)
    return files


def check_manifest(bundle_dir: Path, files: list[BundleFile]) -> None:
    """Raise BundleError unless manifest.json lists exactly the other files with their SHA-256 and size.

    The export writes the manifest last, so a folder without one is an unfinished export.
    """
    path = bundle_dir / MANIFEST
    if not path.is_file():
        raise BundleError(f"{bundle_dir.name} has no {MANIFEST}: the export is unfinished")
    if path.stat().st_size > MAX_MANIFEST_BYTES:
        raise BundleError(f"{bundle_dir.name}/{MANIFEST} is too large")
    try:
        listed = json.loads(path.read_text(encoding="utf-8"))["files"]
        expected = {name: (int(v["bytes"]), str(v["sha256"]).lower()) for name, v in listed.items()}
    except (ValueError, KeyError, TypeError, AttributeError) as exc:
        raise BundleError(f"{bundle_dir.name}/{MANIFEST} is not a bundle manifest") from exc
    actual = {f.name: (f.size_bytes, f.sha256) for f in files if f.name != MANIFEST}
    if expected != actual:
        differ = sorted(set(expected.items()) ^ set(actual.items()))
        raise BundleError(f"{bundle_dir.name}: files differ from {MANIFEST} ({differ[0][0]})")


def bundle_sha256(files: list[BundleFile]) -> str:
    """Hex SHA-256 over each file's sanitised name and content hash, in order."""
    digest = hashlib.sha256()
    for f in files:
        digest.update(f"{f.remote_name}\0{f.sha256}\n".encode())
    return digest.hexdigest()


def remote_folder(bundle_name: str, bundle_hash: str) -> str:
    """The bundle's folder name on the server: sanitised bundle name (at most `NAME_BUDGET`
    characters, see `mobile_app.export.names`) + 16 hex digits of its hash."""
    return f"{safe_name(bundle_name, NAME_BUDGET)}-{bundle_hash[:16]}"


def files_from_row(row: dict[str, Any]) -> list[BundleFile]:
    """The BundleFile list kept in an outbox row."""
    return [BundleFile(**f) for f in json.loads(row["files"])]


class Outbox:
    """The outbox table on a sqlite-utils Database (the store's `store.db`)."""

    def __init__(self, db: Database) -> None:
        self.db = db
        self._lock = db_lock(db)
        self.ensure_table()

    def ensure_table(self) -> None:
        """Create the outbox table and its indexes if they are missing (and a column added since)."""
        with self._lock:
            if TABLE in self.db.table_names():
                missing = [c for c in _ADDED_SINCE if c not in self.db[TABLE].columns_dict]
                if missing:
                    with write_transaction(self.db) as conn:
                        for column in missing:
                            kind = "INTEGER" if _COLUMNS[column] is int else "TEXT"
                            conn.execute(f"ALTER TABLE {TABLE} ADD COLUMN {column} {kind}")
                return
            with write_transaction(self.db):
                if TABLE in self.db.table_names():
                    return
                self.db[TABLE].create(_COLUMNS, pk="id",
                                      not_null={"bundle_dir", "remote_path", "status"},
                                      defaults={"status": "waiting", "attempts": 0})
                self.db[TABLE].create_index(["remote_path"], unique=True)
                self.db[TABLE].create_index(["status", "next_try_at"])

    def _rows(self, where: str, params: list[Any] | None = None,
              order_by: str | None = None) -> list[dict[str, Any]]:
        """Outbox rows matching `where`, read under the connection's lock."""
        with self._lock:
            return list(self.db[TABLE].rows_where(where, params or [], order_by=order_by))

    def _scalar(self, sql: str) -> Any:
        """The first column of the first row of a query (None for no row), under the lock."""
        with self._lock:
            row = self.db.execute(sql).fetchone()
        return row[0] if row else None

    def enqueue(self, bundle_dir: Path, job_id: int, revision: int, now: datetime | None = None) -> int:
        """Queue a bundle folder to be sent; returns its outbox id.

        Queuing the same bundle (same name and content) again returns the existing id, so it is
        never sent twice. Raises BundleError if the folder is missing, empty or badly named.
        """
        bundle_dir = Path(bundle_dir).resolve()
        files = scan_bundle(bundle_dir)
        digest = bundle_sha256(files)
        remote_path = remote_folder(bundle_dir.name, digest)
        with write_transaction(self.db):
            existing = self._rows("remote_path = ?", [remote_path])
            if existing:
                return int(existing[0]["id"])
            return int(self.db[TABLE].insert({
                "bundle_dir": str(bundle_dir),
                "bundle_name": bundle_dir.name,
                "job_id": job_id,
                "revision": revision,
                "bundle_sha256": digest,
                "files": json.dumps([f.__dict__ for f in files]),
                "remote_path": remote_path,
                "status": "waiting",
                "attempts": 0,
                "next_try_at": iso(now or utc_now()),
                "queued_at": iso(now or utc_now()),
            }).last_pk)

    def queue_export(self, bundle_dir: Path, job_id: int, revision: int,
                     now: datetime | None = None) -> Queued:
        """Queue a job's new export: like `enqueue`, and any other export of the same job and
        revision still waiting is marked `replaced` by it (it is not sent; a temporary folder its
        upload left on the server is still cleaned up). An export already sent stays as it was."""
        with write_transaction(self.db) as conn:
            entry_id = self.enqueue(bundle_dir, job_id, revision, now)
            older = [int(row["id"]) for row in self._rows(
                "status = 'waiting' and job_id = ? and revision = ? and id != ?",
                [job_id, revision, entry_id], order_by="id")]
            for old_id in older:
                conn.execute(f"UPDATE {TABLE} SET status = 'replaced', replaced_by = ?, next_try_at = NULL"
                             " WHERE id = ?", (entry_id, old_id))
        return Queued(entry_id, tuple(older))

    def get(self, entry_id: int) -> dict[str, Any]:
        """One outbox row as a dict; raises UnknownBundleError."""
        rows = self._rows("id = ?", [entry_id])
        if not rows:
            raise UnknownBundleError(entry_id)
        return rows[0]

    def waiting(self) -> list[dict[str, Any]]:
        """Rows still to be sent, oldest first."""
        return self._rows("status = 'waiting'", order_by="queued_at, id")

    def sent(self) -> list[dict[str, Any]]:
        """Rows sent and verified, most recent first."""
        return self._rows("status = 'sent'", order_by="sent_at desc, id desc")

    def due(self, now: datetime | None = None, force: bool = False) -> list[dict[str, Any]]:
        """Waiting rows whose next try time has come (all waiting rows when `force`)."""
        if force:
            return self.waiting()
        return self._rows("status = 'waiting' and next_try_at <= ?", [iso(now or utc_now())],
                          order_by="queued_at, id")

    def next_try_at(self) -> str | None:
        """The earliest next try time of the waiting rows, or None when nothing waits."""
        return self._scalar(f"select min(next_try_at) from {TABLE} where status = 'waiting'")

    def mark_sent(self, entry_id: int, now: datetime | None = None, sent_to: str | None = None) -> None:
        """Record that a bundle arrived whole and was verified (at `sent_to`, its folder's address)."""
        moment = iso(now or utc_now())
        with write_transaction(self.db):
            self.db[TABLE].update(entry_id, {
                "status": "sent", "sent_at": moment, "last_try_at": moment, "staging": None,
                "last_error": None, "last_error_kind": None, "next_try_at": None, "sent_to": sent_to})

    def mark_staging(self, entry_id: int, staging: str | None) -> None:
        """Record where on the server a bundle is being uploaded before it is moved into place
        (None once that temporary folder is gone), so a run that was stopped can be cleaned up."""
        with write_transaction(self.db):
            self.db[TABLE].update(entry_id, {"staging": staging})

    def staged(self) -> list[dict[str, Any]]:
        """Rows not sent (waiting or replaced) that may have left a temporary upload folder on the
        server."""
        return self._rows("status in ('waiting', 'replaced') and staging is not null", order_by="id")

    def mark_failed(self, entry_id: int, message: str, kind: str, next_try_at: datetime,
                    now: datetime | None = None) -> None:
        """Record a failed attempt: one more attempt, the error in plain words, the next try time."""
        with write_transaction(self.db):
            row = self.get(entry_id)
            self.db[TABLE].update(entry_id, {
                "attempts": int(row["attempts"] or 0) + 1,
                "last_error": message,
                "last_error_kind": kind,
                "last_try_at": iso(now or utc_now()),
                "next_try_at": iso(next_try_at)})

    def last_error(self) -> str | None:
        """The most recent error among the waiting rows, in plain words, or None."""
        return self._scalar(
            f"select last_error from {TABLE} where status = 'waiting' and last_error is not null "
            "order by last_try_at desc limit 1")
