"""Boards of a job: added in order, saved field by field with the raw text kept; a board's own
supply (system, Ze or Zdb, PFC, RA: an outbuilding on its own earth electrode, a board at the end of
a sub-main) reassesses its circuits."""

from __future__ import annotations

from typing import Any

from mobile_app.store.circuits import Circuits
from mobile_app.store.core import Core
from mobile_app.store.fields import BOARD_FIELDS, BOARD_SUPPLY_FIELDS
from mobile_app.store.library import Library
from mobile_app.store.rows import check_version, fields_of, parse, saved, set_clause


class Boards:
    """The boards of a store's jobs (`store.boards`)."""

    def __init__(self, core: Core, library: Library, circuits: Circuits) -> None:
        self.core = core
        self.library = library
        self.circuits = circuits

    def add(
        self,
        job_id: int,
        designation: str,
        location: str = "",
        supplied_from: str = "",
        by: int | None = None,
    ) -> int:
        """Add a board to a draft job; returns its id."""
        typed = {"designation": designation, "location": location, "supplied_from": supplied_from}
        parsed = [parse("board", n, typed.get(n, ""), self.library) for n in BOARD_FIELDS]
        with self.core.write() as conn:
            self.core.draft_job(job_id)
            position = conn.execute(
                "SELECT COALESCE(MAX(position), 0) + 1 FROM boards WHERE job_id = ?", (job_id,)
            ).fetchone()[0]
            cursor = conn.execute("INSERT INTO boards (job_id, position) VALUES (?, ?)", (job_id, position))
            board_id = int(cursor.lastrowid or 0)
            conn.execute(
                f"UPDATE boards SET {set_clause(BOARD_FIELDS)} WHERE id = ?",
                (*[v for p in parsed for v in (p.raw, p.value, p.error)], board_id),
            )
            self.core.audit(conn, job_id, by, "board", board_id, None, None, designation)
            self.core.touch_job(conn, job_id)
        return board_id

    def of_job(self, job_id: int) -> list[dict[str, Any]]:
        """A job's boards in order: id, designation, location, supplied_from, version, fields."""
        self.core.row("job", job_id)
        return [
            _board(row)
            for row in self.core.query("SELECT * FROM boards WHERE job_id = ? ORDER BY position", (job_id,))
        ]

    def get(self, board_id: int) -> dict[str, Any]:
        """One board as `of_job` lists it."""
        return _board(self.core.row("board", board_id))

    def set_field(
        self,
        board_id: int,
        name: str,
        raw: str,
        by: int | None = None,
        expected_version: int | None = None,
    ) -> dict[str, Any]:
        """Save one board field as typed; the board's supply fields reassess its circuits."""
        parsed = parse("board", name, raw, self.library)
        with self.core.write() as conn:
            board = self.core.row("board", board_id)
            job = self.core.draft_job(board["job_id"])
            check_version("board", board, expected_version)
            version = board["version"]
            if board[f"{name}_raw"] != parsed.raw:
                version += 1
                conn.execute(
                    f"UPDATE boards SET {set_clause((name,))}, version = ? WHERE id = ?",
                    (parsed.raw, parsed.value, parsed.error, version, board_id),
                )
                old = board[f"{name}_raw"]
                self.core.audit(conn, job["id"], by, "board", board_id, name, old, parsed.raw)
                self.core.touch_job(conn, job["id"])
                if name in BOARD_SUPPLY_FIELDS:
                    self.circuits.reassess_board(conn, job, self.core.row("board", board_id))
        return saved(parsed, name, version)


def _board(row: dict[str, Any]) -> dict[str, Any]:
    """A board row as the store hands it out."""
    return {
        "id": row["id"],
        "job_id": row["job_id"],
        "position": row["position"],
        "version": row["version"],
        "designation": row["designation_raw"],
        "location": row["location_raw"],
        "supplied_from": row["supplied_from_raw"],
        "fields": fields_of(row, BOARD_FIELDS),
    }
