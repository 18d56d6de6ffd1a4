"""Jobs and boards: per-field saves with the raw text kept, row versions, and reassessment of the
circuits when a supply field changes."""

from __future__ import annotations

import sqlite3
from typing import Any

from mobile_app.store.assessment import Outcome, assess, build_calc_input, invalid_fields
from mobile_app.store.core import StoreCore, now_iso
from mobile_app.store.errors import ConflictError, NotFoundError, ReadOnlyError, UnknownFieldError
from mobile_app.store.fields import (
    BOARD_FIELDS,
    CIRCUIT_FIELDS,
    JOB_FIELDS,
    SUPPLY_FIELDS,
    Parsed,
    parse_field,
)

_NAMES = {"job": JOB_FIELDS, "board": BOARD_FIELDS, "circuit": CIRCUIT_FIELDS}
_TABLES = {"job": "jobs", "board": "boards", "circuit": "circuits"}
_ASSESSED = {
    "job": SUPPLY_FIELDS,
    "board": ("system", "ze"),
    "circuit": tuple(f for f in CIRCUIT_FIELDS if f not in ("number", "description")),
}


def fields_of(row: dict[str, Any], names: tuple[str, ...]) -> dict[str, dict[str, Any]]:
    """The {"raw", "value", "error"} triple of each named field of a row."""
    return {
        n: {"raw": row[f"{n}_raw"], "value": row[f"{n}_value"], "error": row[f"{n}_error"]} for n in names
    }


def set_clause(names: tuple[str, ...]) -> str:
    """`a_raw = ?, a_value = ?, a_error = ?, …` for the named fields."""
    return ", ".join(f"{n}_raw = ?, {n}_value = ?, {n}_error = ?" for n in names)


def _as_text(raw: object) -> str:
    """What was typed, as text (None becomes blank)."""
    return "" if raw is None else str(raw)


class JobStore(StoreCore):
    """Jobs and boards on top of the store's foundation, with the helpers circuits share."""

    # shared helpers
    def _row(self, kind: str, item_id: int) -> dict[str, Any]:
        """One job, board or circuit row, or NotFoundError."""
        row = self._one(f"SELECT * FROM {_TABLES[kind]} WHERE id = ?", (item_id,))
        if row is None:
            raise NotFoundError(kind, item_id)
        return row

    def _draft_job(self, job_id: int) -> dict[str, Any]:
        """The job row if it may be changed (draft), else ReadOnlyError."""
        job = self._row("job", job_id)
        if job["status"] != "draft":
            raise ReadOnlyError(job_id, job["status"])
        return job

    @staticmethod
    def _check_version(kind: str, row: dict[str, Any], expected_version: int | None) -> None:
        """ConflictError when the caller's row version is stale."""
        if expected_version is not None and expected_version != row["version"]:
            raise ConflictError(kind, row["id"], expected_version, row["version"])

    def _parse(self, kind: str, name: str, raw: object) -> Parsed:
        """Parse a field of `kind`, checking its name; library references must exist."""
        if name not in _NAMES[kind]:
            raise UnknownFieldError(kind, name)
        parsed = parse_field(kind, name, _as_text(raw))
        if name == "library_device_id" and parsed.value is not None:
            if self._library_device(int(parsed.value)) is None:
                return Parsed(parsed.raw, None, f"no device with id {parsed.value} in the library")
        return parsed

    def _outcome(self, job: dict[str, Any], board: dict[str, Any], circuit: dict[str, Any]) -> Outcome:
        """Assess one circuit from its rows."""
        library_id = circuit.get("library_device_id_value")
        library = self._library_device(int(library_id)) if library_id is not None else None
        limit = self.get_setting("final_circuit_max_a")
        data = build_calc_input(job, board, circuit, library, limit)
        rows = {"job": job, "board": board, "circuit": circuit}
        return assess(data, invalid_fields(rows, _ASSESSED))

    def _store_outcome(self, conn: sqlite3.Connection, circuit_id: int, outcome: Outcome) -> None:
        """Write a circuit's assessment (inside the caller's transaction)."""
        conn.execute(
            "UPDATE circuits SET verdict = ?, assessment = ?, calc_version = ?,"
            " assessment_error = ? WHERE id = ?",
            (
                outcome.verdict,
                outcome.assessment_json,
                outcome.calc_version,
                outcome.error,
                circuit_id,
            ),
        )

    def _reassess_job(self, conn: sqlite3.Connection, job_id: int) -> None:
        """Reassess every circuit of a job (after a supply change)."""
        job = self._row("job", job_id)
        for board in self._query("SELECT * FROM boards WHERE job_id = ?", (job_id,)):
            self._reassess_board(conn, job, board)

    def _reassess_board(self, conn: sqlite3.Connection, job: dict[str, Any], board: dict[str, Any]) -> None:
        """Reassess every circuit of a board."""
        for circuit in self._query("SELECT * FROM circuits WHERE board_id = ?", (board["id"],)):
            self._store_outcome(conn, circuit["id"], self._outcome(job, board, circuit))

    # jobs
    def reassess_job(self, job_id: int) -> int:
        """Reassess every circuit of a draft job, e.g. after a settings change or a new calc
        version; returns how many circuits. Submitted and approved jobs keep their assessments."""
        with self._write() as conn:
            self._draft_job(job_id)
            self._reassess_job(conn, job_id)
        return int(
            self.db.conn.execute(
                "SELECT COUNT(*) FROM circuits c JOIN boards b ON b.id = c.board_id WHERE b.job_id = ?",
                (job_id,),
            ).fetchone()[0]
        )

    def create_job(self, fields: dict[str, str] | None = None, by: int | None = None) -> int:
        """Create a draft job from typed fields; blank system, U0, Cmin take the defaults."""
        typed = dict(fields or {})
        defaults = {
            "system": self.get_setting("default_system", ""),
            "u0": self.get_setting("default_u0", "230 V"),
            "cmin": self.get_setting("default_cmin", "0.95"),
        }
        for name, default in defaults.items():
            if not _as_text(typed.get(name)).strip():
                typed[name] = default
        parsed = [self._parse("job", name, typed.get(name, "")) for name in JOB_FIELDS]
        values = [v for p in parsed for v in (p.raw, p.value, p.error)]
        stamp = now_iso()
        with self._write() as conn:
            cursor = conn.execute(
                "INSERT INTO jobs (status, created_at, updated_at, recorded_by) VALUES ('draft', ?, ?, ?)",
                (stamp, stamp, by),
            )
            job_id = int(cursor.lastrowid or 0)
            conn.execute(f"UPDATE jobs SET {set_clause(JOB_FIELDS)} WHERE id = ?", (*values, job_id))
            self._audit(conn, job_id, by, "job", job_id, None, None, "created")
        return job_id

    def list_jobs(self, search: str = "") -> list[dict[str, Any]]:
        """Jobs, newest change first, with circuit counts.

        `search` matches the client reference, site address or description.
        """
        pattern = "%" + search.replace("\\", "\\\\").replace("%", "\\%").replace("_", "\\_") + "%"
        return self._query(
            "SELECT j.id, j.client_ref_raw AS client_ref, j.site_address_raw AS site_address,"
            " j.date_raw AS date, j.status, j.revision, j.version, j.parent_job_id,"
            " j.updated_at,"
            " EXISTS (SELECT 1 FROM jobs k WHERE k.parent_job_id = j.id) AS superseded,"
            " COUNT(c.id) AS circuits,"
            " COALESCE(SUM(c.verdict = 'fail'), 0) AS failing,"
            " COALESCE(SUM(c.verdict = 'incomplete'), 0) AS incomplete"
            " FROM jobs j LEFT JOIN boards b ON b.job_id = j.id LEFT JOIN circuits c"
            " ON c.board_id = b.id WHERE j.client_ref_raw LIKE :p ESCAPE '\\'"
            " OR j.site_address_raw LIKE :p ESCAPE '\\'"
            " OR j.description_raw LIKE :p ESCAPE '\\'"
            " GROUP BY j.id ORDER BY j.updated_at DESC, j.id DESC",
            {"p": pattern},
        )

    def get_job(self, job_id: int) -> dict[str, Any]:
        """One job: ids, status, revision, version, review details and its fields as typed."""
        row = self._row("job", job_id)
        plain = {k: v for k, v in row.items() if not k.endswith(("_raw", "_value", "_error"))}
        return dict(plain, fields=fields_of(row, JOB_FIELDS))

    def set_job_field(
        self,
        job_id: int,
        name: str,
        raw: str,
        by: int | None = None,
        expected_version: int | None = None,
    ) -> dict[str, Any]:
        """Save one job field as typed; a supply field reassesses every circuit of the job."""
        parsed = self._parse("job", name, raw)
        with self._write() as conn:
            job = self._draft_job(job_id)
            self._check_version("job", job, expected_version)
            version = job["version"]
            if job[f"{name}_raw"] != parsed.raw:
                version += 1
                conn.execute(
                    f"UPDATE jobs SET {set_clause((name,))}, version = ?, updated_at = ? WHERE id = ?",
                    (parsed.raw, parsed.value, parsed.error, version, now_iso(), job_id),
                )
                self._audit(conn, job_id, by, "job", job_id, name, job[f"{name}_raw"], parsed.raw)
                if name in SUPPLY_FIELDS:
                    self._reassess_job(conn, job_id)
        return {
            "field": name,
            "raw": parsed.raw,
            "value": parsed.value,
            "error": parsed.error,
            "version": version,
        }

    def _touch_job(self, conn: sqlite3.Connection, job_id: int) -> None:
        """Mark a job as changed now."""
        conn.execute("UPDATE jobs SET updated_at = ? WHERE id = ?", (now_iso(), job_id))

    # boards
    def add_board(
        self,
        job_id: int,
        designation: str,
        location: str = "",
        supplied_from: str = "",
        by: int | None = None,
    ) -> int:
        """Add a board to a draft job; returns its id."""
        typed = {"designation": designation, "location": location, "supplied_from": supplied_from}
        parsed = [self._parse("board", n, typed.get(n, "")) for n in BOARD_FIELDS]
        with self._write() as conn:
            self._draft_job(job_id)
            position = conn.execute(
                "SELECT COALESCE(MAX(position), 0) + 1 FROM boards WHERE job_id = ?", (job_id,)
            ).fetchone()[0]
            cursor = conn.execute("INSERT INTO boards (job_id, position) VALUES (?, ?)", (job_id, position))
            board_id = int(cursor.lastrowid or 0)
            conn.execute(
                f"UPDATE boards SET {set_clause(BOARD_FIELDS)} WHERE id = ?",
                (*[v for p in parsed for v in (p.raw, p.value, p.error)], board_id),
            )
            self._audit(conn, job_id, by, "board", board_id, None, None, designation)
            self._touch_job(conn, job_id)
        return board_id

    def boards(self, job_id: int) -> list[dict[str, Any]]:
        """A job's boards in order: id, designation, location, supplied_from, version, fields."""
        self._row("job", job_id)
        return [
            {
                "id": row["id"],
                "job_id": job_id,
                "position": row["position"],
                "version": row["version"],
                "designation": row["designation_raw"],
                "location": row["location_raw"],
                "supplied_from": row["supplied_from_raw"],
                "fields": fields_of(row, BOARD_FIELDS),
            }
            for row in self._query("SELECT * FROM boards WHERE job_id = ? ORDER BY position", (job_id,))
        ]

    def set_board_field(
        self,
        board_id: int,
        name: str,
        raw: str,
        by: int | None = None,
        expected_version: int | None = None,
    ) -> dict[str, Any]:
        """Save one board field as typed; the board's system or Ze reassesses its circuits."""
        parsed = self._parse("board", name, raw)
        with self._write() as conn:
            board = self._row("board", board_id)
            job = self._draft_job(board["job_id"])
            self._check_version("board", board, expected_version)
            version = board["version"]
            if board[f"{name}_raw"] != parsed.raw:
                version += 1
                conn.execute(
                    f"UPDATE boards SET {set_clause((name,))}, version = ? WHERE id = ?",
                    (parsed.raw, parsed.value, parsed.error, version, board_id),
                )
                self._audit(conn, job["id"], by, "board", board_id, name, board[f"{name}_raw"], parsed.raw)
                self._touch_job(conn, job["id"])
                if name in ("system", "ze"):
                    self._reassess_board(conn, job, self._row("board", board_id))
        return {
            "field": name,
            "raw": parsed.raw,
            "value": parsed.value,
            "error": parsed.error,
            "version": version,
        }
