"""Damaging a store file on purpose, for the tests of what happens to a file SQLite cannot read."""

from __future__ import annotations

import sqlite3
from pathlib import Path


def overwrite_root_page(path: Path, table: str) -> bytes:
    """Overwrite the start of `table`'s root page in the SQLite file at `path` (the store closed);
    returns the damaged file's bytes."""
    conn = sqlite3.connect(path)
    root, page_size = conn.execute(
        "SELECT rootpage, (SELECT page_size FROM pragma_page_size) FROM sqlite_master WHERE name = ?",
        (table,),
    ).fetchone()
    conn.close()
    data = bytearray(path.read_bytes())
    offset = (root - 1) * page_size
    data[offset : offset + 12] = b"\x5a" * 12
    path.write_bytes(bytes(data))
    return bytes(data)
