"""The audit trail as a hash chain: each entry commits to the one before it.

An entry's hash is SHA-256 of the previous entry's hash (64 hex digits; GENESIS for the first)
followed by the canonical JSON (mobile_app.signing.canonical) of the entry's columns
`[id, job_id, at, person_id, entity, entity_id, field, old, new]`. Changing, inserting or deleting
any entry but the newest breaks every hash after it; an approved revision records the head of the
chain when it was approved, so deleting entries up to then is found too.
"""

from __future__ import annotations

import sqlite3
from collections.abc import Iterable
from typing import Any

from mobile_app.signing.canonical import canonical_bytes, sha256_hex

GENESIS = "0" * 64
COLUMNS = ("id", "job_id", "at", "person_id", "entity", "entity_id", "field", "old", "new")


def entry_hash(previous: str, entry: dict[str, Any]) -> str:
    """The hash of one audit entry after `previous` (module docstring)."""
    return sha256_hex(previous.encode("ascii") + canonical_bytes([entry[c] for c in COLUMNS]))


def head(conn: sqlite3.Connection) -> str:
    """The newest entry's hash, or GENESIS for an empty trail."""
    row = conn.execute("SELECT hash FROM audit ORDER BY id DESC LIMIT 1").fetchone()
    return GENESIS if row is None or row[0] is None else str(row[0])


def append(conn: sqlite3.Connection, entry: dict[str, Any]) -> str:
    """Insert an audit entry (columns of COLUMNS but `id`) with its hash; return the hash.

    Inside the caller's write transaction, which keeps appends in order.
    """
    previous = head(conn)
    names = [c for c in COLUMNS if c != "id"]
    cursor = conn.execute(
        f"INSERT INTO audit ({', '.join(names)}) VALUES ({', '.join('?' for _ in names)})",
        tuple(entry.get(c) for c in names),
    )
    row = dict(entry, id=int(cursor.lastrowid or 0))
    digest = entry_hash(previous, row)
    conn.execute("UPDATE audit SET hash = ? WHERE id = ?", (digest, row["id"]))
    return digest


def first_break(entries: Iterable[dict[str, Any]]) -> int | None:
    """The id of the first entry whose hash does not follow from the ones before (None if all do).

    `entries` are every audit row, oldest first, with COLUMNS and `hash`.
    """
    previous = GENESIS
    for entry in entries:
        if entry.get("hash") != entry_hash(previous, entry):
            return int(entry["id"])
        previous = str(entry["hash"])
    return None


def rehash_all(conn: sqlite3.Connection) -> None:
    """Give every entry its hash, oldest first (the migration that starts the chain)."""
    previous = GENESIS
    cursor = conn.execute(f"SELECT {', '.join(COLUMNS)} FROM audit ORDER BY id")
    rows = [dict(zip(COLUMNS, row, strict=True)) for row in cursor.fetchall()]
    for row in rows:
        previous = entry_hash(previous, row)
        conn.execute("UPDATE audit SET hash = ? WHERE id = ?", (previous, row["id"]))
