"""Deleting circuits, boards, draft jobs and saved curves, each with an audit entry, and putting
them back (`store.removals`). A deleted job is only marked (`deleted_at`) and left out of the lists:
its audit entries refer to it and stay in the hash chain.

Only a draft job's circuits and boards are deleted; a saved curve only when no circuit uses it. A
removal returns a `Removed` holding the rows it took away, which `restore` puts back (undo, for as
long as the screen that deleted it keeps it); its audit entry keeps what was typed in them as
JSON, so nothing typed is lost with the rows. A restored circuit is reassessed against its job as it
is now.
"""

from __future__ import annotations

import json
import sqlite3
from dataclasses import dataclass
from typing import Any

from mobile_app.store.circuits import Circuits
from mobile_app.store.core import Core, now_iso
from mobile_app.store.curves import user_names
from mobile_app.store.errors import InUseError, NotFoundError
from mobile_app.store.fields import BOARD_FIELDS, CIRCUIT_FIELDS
from mobile_app.store.library import Library

_TABLES = {"circuit": "circuits", "board": "boards", "curve": "library_devices"}


@dataclass(frozen=True)
class Removed:
    """What one removal took away: enough to put it back and to say what it was."""

    kind: str  # circuit, board, job, curve
    item_id: int
    job_id: int | None
    label: str  # `circuit 3 · Kiln`, `board DB2 and its 4 circuits`, `curve Maker 250 A`
    rows: tuple[tuple[str, dict[str, Any]], ...]  # (table, row) in the order they go back
    links: tuple[tuple[int, list[int]], ...] = ()  # (observation id, its circuit ids before)


def _typed(row: dict[str, Any], names: tuple[str, ...]) -> dict[str, str]:
    """The fields of a row that hold text as typed."""
    return {n: row[f"{n}_raw"] for n in names if row.get(f"{n}_raw")}


def _circuit_label(row: dict[str, Any]) -> str:
    description = row.get("description_raw") or ""
    return f"circuit {row['number_raw'] or row['id']}" + (f" · {description}" if description else "")


class Removals:
    """Deleting and restoring the circuits, boards and saved curves of a store."""

    def __init__(self, core: Core, library: Library, circuits: Circuits) -> None:
        self.core = core
        self.library = library
        self.circuits = circuits

    def circuit(self, circuit_id: int, by: int | None = None) -> Removed:
        """Delete one circuit of a draft job."""
        with self.core.write() as conn:
            row = self.core.row("circuit", circuit_id)
            job = self.core.draft_job(self.core.row("board", row["board_id"])["job_id"])
            links = self._unlink(conn, job["id"], {circuit_id})
            removed = Removed("circuit", circuit_id, job["id"], _circuit_label(row), (("circuits", row),),
                              links)
            conn.execute("DELETE FROM circuits WHERE id = ?", (circuit_id,))
            self._record(conn, removed, by, _typed(row, CIRCUIT_FIELDS))
        return removed

    def board(self, board_id: int, by: int | None = None) -> Removed:
        """Delete a board of a draft job with its circuits."""
        with self.core.write() as conn:
            board = self.core.row("board", board_id)
            job = self.core.draft_job(board["job_id"])
            circuits = self.core.query("SELECT * FROM circuits WHERE board_id = ? ORDER BY position",
                                       (board_id,))
            count = len(circuits)
            label = f"board {board['designation_raw'] or board_id}" + (
                f" and its {count} circuit{'s' if count != 1 else ''}" if count else "")
            rows = (("boards", board), *(("circuits", c) for c in circuits))
            links = self._unlink(conn, job["id"], {c["id"] for c in circuits})
            removed = Removed("board", board_id, job["id"], label, rows, links)
            conn.execute("DELETE FROM circuits WHERE board_id = ?", (board_id,))
            conn.execute("DELETE FROM boards WHERE id = ?", (board_id,))
            typed = dict(_typed(board, BOARD_FIELDS), circuits=[_typed(c, CIRCUIT_FIELDS) for c in circuits])
            self._record(conn, removed, by, typed)
        return removed

    def job(self, job_id: int, by: int | None = None) -> Removed:
        """Delete a draft job: it leaves the lists but is kept with its audit trail (`deleted_at`),
        so undo only clears the mark."""
        with self.core.write() as conn:
            job = self.core.draft_job(job_id)
            if job["deleted_at"]:
                raise NotFoundError("job", job_id)
            label = f"job {job['client_ref_raw'] or job_id}"
            conn.execute("UPDATE jobs SET deleted_at = ? WHERE id = ?", (now_iso(), job_id))
            removed = Removed("job", job_id, job_id, label, ())
            self._record(conn, removed, by, {"client_ref": job["client_ref_raw"]})
        return removed

    def curve(self, device_id: int, by: int | None = None) -> Removed:
        """Delete a saved curve that no circuit uses, and that no job in review or approved names
        (InUseError naming them otherwise)."""
        with self.core.write() as conn:
            row = self.core.one("SELECT * FROM library_devices WHERE id = ?", (device_id,))
            if row is None:
                raise NotFoundError("library device", device_id)
            users = self.library.users(device_id)
            users += [u for u in self.library.users(device_id, every_reference=True)
                      if u["status"] != "draft" and u not in users]
            if users:
                raise InUseError("curve", device_id, user_names(users), "deleted")
            removed = Removed("curve", device_id, None, f"curve {row['name']}", (("library_devices", row),))
            conn.execute("DELETE FROM library_devices WHERE id = ?", (device_id,))
            self._record(conn, removed, by, {k: row[k] for k in ("name", "rating_a", "points")})
        return removed

    def _unlink(self, conn: sqlite3.Connection, job_id: int,
                circuit_ids: set[int]) -> tuple[tuple[int, list[int]], ...]:
        """Take deleted circuits out of the job's observations; what each named before."""
        links = []
        for row in self.core.query("SELECT id, circuit_ids FROM observations WHERE job_id = ?", (job_id,)):
            named = json.loads(row["circuit_ids"] or "[]")
            if set(named) & circuit_ids:
                links.append((int(row["id"]), named))
                kept = [c for c in named if c not in circuit_ids]
                conn.execute("UPDATE observations SET circuit_ids = ?, version = version + 1 WHERE id = ?",
                             (json.dumps(kept), row["id"]))
        return tuple(links)

    def _record(self, conn: sqlite3.Connection, removed: Removed, by: int | None,
                typed: dict[str, Any]) -> None:
        self.core.audit(conn, removed.job_id, by, removed.kind, removed.item_id, "removed",
                        json.dumps(typed, ensure_ascii=False), None)
        if removed.job_id is not None:
            self.core.touch_job(conn, removed.job_id)

    def restore(self, removed: Removed, by: int | None = None) -> int:
        """Put back what a removal took away (the job must still be a draft); return the id it has
        now (its old one unless that was taken since)."""
        with self.core.write() as conn:
            if removed.job_id is not None:
                self.core.draft_job(removed.job_id)
            if removed.kind == "job":
                conn.execute("UPDATE jobs SET deleted_at = NULL WHERE id = ?", (removed.item_id,))
                self.core.audit(conn, removed.job_id, by, "job", removed.item_id, "restored", None,
                                removed.label)
                return removed.item_id
            new_ids: dict[tuple[str, int], int] = {}
            for table, row in removed.rows:
                values = dict(row)
                if table == "circuits" and ("boards", row["board_id"]) in new_ids:
                    values["board_id"] = new_ids[("boards", row["board_id"])]
                taken = conn.execute(f"SELECT 1 FROM {table} WHERE id = ?", (row["id"],)).fetchone()
                if taken:
                    values.pop("id")
                new_ids[(table, row["id"])] = self.core.insert(conn, table, values)
            for (table, _old), new_id in new_ids.items():
                if table == "circuits":
                    self.circuits.reassess_one(conn, new_id)
            for observation_id, named in removed.links:
                ids = [new_ids.get(("circuits", c), c) for c in named]
                conn.execute("UPDATE observations SET circuit_ids = ?, version = version + 1 WHERE id = ?",
                             (json.dumps(ids), observation_id))
            item_id = new_ids[(_TABLES[removed.kind], removed.item_id)]
            self.core.audit(conn, removed.job_id, by, removed.kind, item_id, "restored", None, removed.label)
            if removed.job_id is not None:
                self.core.touch_job(conn, removed.job_id)
        return item_id
