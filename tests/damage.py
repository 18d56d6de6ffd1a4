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


def pages_of(path: Path, table: str) -> dict[str, list[int]]:
    """The pages of a table in the SQLite file at `path` by kind ("internal", "leaf", "overflow"),
    as SQLite's dbstat table lists them (the store closed)."""
    conn = sqlite3.connect(path)
    found: dict[str, list[int]] = {}
    for pageno, kind in conn.execute("SELECT pageno, pagetype FROM dbstat WHERE name = ?", (table,)):
        found.setdefault(kind, []).append(pageno)
    conn.close()
    return found


def overwrite_page(path: Path, number: int, fill: bytes = b"\x5a") -> None:
    """Overwrite the whole of page `number` (from 1) of the SQLite file at `path` with `fill`."""
    conn = sqlite3.connect(path)
    page_size = conn.execute("PRAGMA page_size").fetchone()[0]
    conn.close()
    data = bytearray(path.read_bytes())
    data[(number - 1) * page_size : number * page_size] = (fill * page_size)[:page_size]
    path.write_bytes(bytes(data))
