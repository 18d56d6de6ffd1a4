"""Circuits: added with what a board's circuits share copied from the previous one, saved field by
field with the raw text kept, reassessed by the calculation core in the same transaction."""

from __future__ import annotations

import json
import re
import sqlite3
from typing import Any

import calc
from mobile_app.store.assessment import Outcome, assess, build_calc_input, invalid_fields
from mobile_app.store.core import Core, now_iso
from mobile_app.store.fields import (
    BOARD_SUPPLY_FIELDS,
    CIRCUIT_FIELDS,
    READING_FIELDS,
    RECORD_ONLY_CIRCUIT_FIELDS,
    SHARED_CIRCUIT_FIELDS,
    SUPPLY_FIELDS,
)
from mobile_app.store.library import Library
from mobile_app.store.rows import check_version, fields_of, parse, saved, set_clause
from mobile_app.store.settings import Settings

COPIED_TO_NEXT_CIRCUIT = SHARED_CIRCUIT_FIELDS
# what a copy leaves blank: the readings (the insulation test's voltage is how the test is done)
CLEARED_ON_COPY = tuple(f for f in READING_FIELDS if f != "insulation_test_voltage")
# readings that are measured (a test temperature alone is not a reading of the circuit)
MEASURED_FIELDS = tuple(f for f in READING_FIELDS if f not in ("test_temp_c", "insulation_test_voltage"))
# the fields of each row whose parse error leaves a circuit's assessment not shown
_ASSESSED = {
    "job": SUPPLY_FIELDS,
    "board": BOARD_SUPPLY_FIELDS,
    "circuit": tuple(f for f in CIRCUIT_FIELDS if f not in RECORD_ONLY_CIRCUIT_FIELDS),
}


class Circuits:
    """The circuits of the boards of a store's jobs, and their assessments (`store.circuits`)."""

    def __init__(self, core: Core, library: Library, settings: Settings) -> None:
        self.core = core
        self.library = library
        self.settings = settings

    def add(self, board_id: int, number: str, description: str = "", by: int | None = None) -> int:
        """Add a circuit; what a board's circuits share (`COPIED_TO_NEXT_CIRCUIT`: the kind and curve
        of device, breaking capacity, RCD, the cables' materials and insulation, the wiring) is copied
        from the board's previous circuit, not its rating, sizes or readings."""
        with self.core.write() as conn:
            board = self.core.row("board", board_id)
            job = self.core.draft_job(board["job_id"])
            previous = self.core.one(
                "SELECT * FROM circuits WHERE board_id = ? ORDER BY position DESC LIMIT 1",
                (board_id,),
            )
            position = 1 if previous is None else previous["position"] + 1
            cursor = conn.execute(
                "INSERT INTO circuits (board_id, position, updated_at, updated_by) VALUES (?, ?, ?, ?)",
                (board_id, position, now_iso(), by),
            )
            circuit_id = int(cursor.lastrowid or 0)
            own = [
                parse("circuit", "number", number, self.library),
                parse("circuit", "description", description, self.library),
            ]
            values = [v for p in own for v in (p.raw, p.value, p.error)]
            if previous is not None:
                values += [
                    previous[f"{n}_{part}"]
                    for n in COPIED_TO_NEXT_CIRCUIT
                    for part in ("raw", "value", "error")
                ]
                names = ("number", "description", *COPIED_TO_NEXT_CIRCUIT)
            else:
                names = ("number", "description")
            conn.execute(f"UPDATE circuits SET {set_clause(names)} WHERE id = ?", (*values, circuit_id))
            circuit = self.core.row("circuit", circuit_id)
            self.save_assessment(conn, circuit_id, self.assess(job, board, circuit))
            self.core.audit(conn, job["id"], by, "circuit", circuit_id, None, None, number)
            self.core.touch_job(conn, job["id"])
        return circuit_id

    def copy(self, circuit_id: int, by: int | None = None) -> int:
        """Copy a circuit of a draft job to the end of its board with the board's next reference
        (`next_reference`): every field as typed but the readings, which are left blank. Returns the
        copy's id."""
        with self.core.write() as conn:
            source = self.core.row("circuit", circuit_id)
            board = self.core.row("board", source["board_id"])
            job = self.core.draft_job(board["job_id"])
            siblings = self.core.query("SELECT number_raw, position FROM circuits WHERE board_id = ?",
                                       (board["id"],))
            number = next_reference(source["number_raw"], [s["number_raw"] for s in siblings])
            row = {k: v for k, v in source.items() if k != "id"}
            for name in CLEARED_ON_COPY:
                row.update({f"{name}_raw": "", f"{name}_value": None, f"{name}_error": None})
            parsed = parse("circuit", "number", number, self.library)
            row.update(number_raw=parsed.raw, number_value=parsed.value, number_error=parsed.error,
                       position=max(s["position"] for s in siblings) + 1, version=1,
                       updated_at=now_iso(), updated_by=by)
            copy_id = self.core.insert(conn, "circuits", row)
            self.save_assessment(conn, copy_id, self.assess(job, board, self.core.row("circuit", copy_id)))
            self.core.audit(conn, job["id"], by, "circuit", copy_id, None, f"copy of circuit {circuit_id}",
                            number)
            self.core.touch_job(conn, job["id"])
        return copy_id

    def of_board(self, board_id: int) -> list[dict[str, Any]]:
        """A board's circuits in order: id, number, description, verdict, version."""
        self.core.row("board", board_id)
        return self.core.query(
            "SELECT id, board_id, position, number_raw AS number,"
            " description_raw AS description,"
            " verdict, version FROM circuits WHERE board_id = ? ORDER BY position",
            (board_id,),
        )

    def summaries(self, board_id: int) -> list[dict[str, Any]]:
        """A board's circuits in order as a list shows them: id, number, description, verdict,
        version, the device (`device_kind`, `device_curve`, `device_rating_a`, `library_name`,
        `library_rating_a`), `line_csa_mm2`, `cpc_csa_mm2`, `zs_ohm` (as measured), `zs_used_ohm` and
        `zs_source` (the Zs the assessment used and where it came from, e.g. "Ze + (R1+R2)"),
        `has_readings` (any reading typed) and `cause` (the primary cause's words)."""
        self.core.row("board", board_id)
        typed = " OR ".join(f"c.{name}_raw != ''" for name in MEASURED_FIELDS)
        return self.core.query(
            "SELECT c.id, c.number_raw AS number, c.description_raw AS description, c.verdict, c.version,"
            " c.device_kind_value AS device_kind, c.device_curve_value AS device_curve,"
            " c.device_rating_value AS device_rating_a, l.name AS library_name,"
            " l.rating_a AS library_rating_a, c.line_csa_value AS line_csa_mm2,"
            " c.cpc_csa_value AS cpc_csa_mm2, c.zs_value AS zs_ohm,"
            " json_extract(c.assessment, '$.zs_ohm') AS zs_used_ohm,"
            " json_extract(c.assessment, '$.zs_source') AS zs_source,"
            f" ({typed}) AS has_readings,"
            " json_extract(c.assessment, '$.primary_cause.text') AS cause"
            " FROM circuits c LEFT JOIN library_devices l ON l.id = c.library_device_id_value"
            " WHERE c.board_id = ? ORDER BY c.position",
            (board_id,),
        )

    def get(self, circuit_id: int) -> dict[str, Any]:
        """One circuit: ids, version, verdict, calc version, fields as typed, latest assessment, and
        the saved curve its library field names (`library_device`: id, name, rating_a, or None)."""
        row = self.core.row("circuit", circuit_id)
        job_id = self.core.row("board", row["board_id"])["job_id"]
        return {
            "id": row["id"],
            "board_id": row["board_id"],
            "job_id": job_id,
            "position": row["position"],
            "version": row["version"],
            "verdict": row["verdict"],
            "calc_version": row["calc_version"],
            "assessment_error": row["assessment_error"],
            "updated_at": row["updated_at"],
            "updated_by": row["updated_by"],
            "fields": fields_of(row, CIRCUIT_FIELDS),
            "assessment": json.loads(row["assessment"]) if row["assessment"] else None,
            "library_device": self._library_device(row.get("library_device_id_value")),
        }

    def _library_device(self, device_id: Any) -> dict[str, Any] | None:
        """The saved curve a circuit names (id, name, rating_a), or None."""
        device = self.library.find(int(device_id)) if isinstance(device_id, int | float) else None
        return None if device is None else {k: device[k] for k in ("id", "name", "rating_a")}

    def set_field(
        self,
        circuit_id: int,
        name: str,
        raw: str,
        by: int | None = None,
        expected_version: int | None = None,
    ) -> dict[str, Any]:
        """Save one circuit field as typed and reassess, all in one transaction.

        ConflictError when `expected_version` is given and stale; ReadOnlyError unless the job is
        a draft; SaveError when the storage refuses the write (nothing is half-written).
        """
        parsed = parse("circuit", name, raw, self.library)
        with self.core.write() as conn:
            circuit = self.core.row("circuit", circuit_id)
            board = self.core.row("board", circuit["board_id"])
            job = self.core.draft_job(board["job_id"])
            check_version("circuit", circuit, expected_version)
            version = circuit["version"]
            verdict = circuit["verdict"]
            if circuit[f"{name}_raw"] != parsed.raw:
                version += 1
                old = circuit[f"{name}_raw"]
                circuit.update(
                    {
                        f"{name}_raw": parsed.raw,
                        f"{name}_value": parsed.value,
                        f"{name}_error": parsed.error,
                    }
                )
                outcome = self.assess(job, board, circuit)
                verdict = outcome.verdict
                conn.execute(
                    f"UPDATE circuits SET {set_clause((name,))}, version = ?, updated_at = ?,"
                    " updated_by = ?, verdict = ?, assessment = ?, calc_version = ?,"
                    " assessment_error = ? WHERE id = ?",
                    (
                        parsed.raw,
                        parsed.value,
                        parsed.error,
                        version,
                        now_iso(),
                        by,
                        outcome.verdict,
                        outcome.assessment_json,
                        outcome.calc_version,
                        outcome.error,
                        circuit_id,
                    ),
                )
                self.core.audit(conn, job["id"], by, "circuit", circuit_id, name, old, parsed.raw)
                self.core.touch_job(conn, job["id"])
        return dict(saved(parsed, name, version), verdict=verdict)

    def preview(self, circuit_id: int, typed: dict[str, str]) -> dict[str, Any]:
        """What the circuit would be with the fields in `typed` saved as typed, written nowhere: each
        typed field parsed (`fields`: {name: {"raw", "value", "error"}}), and the `verdict` and
        `assessment` the calculation core gives it (the live verdict while a person types)."""
        circuit = self.core.row("circuit", circuit_id)
        board = self.core.row("board", circuit["board_id"])
        job = self.core.row("job", board["job_id"])
        fields: dict[str, dict[str, Any]] = {}
        for name, raw in typed.items():
            parsed = parse("circuit", name, raw, self.library)
            circuit.update({f"{name}_raw": parsed.raw, f"{name}_value": parsed.value,
                            f"{name}_error": parsed.error})
            fields[name] = {"raw": parsed.raw, "value": parsed.value, "error": parsed.error}
        outcome = self.assess(job, board, circuit)
        assessment = json.loads(outcome.assessment_json) if outcome.assessment_json else None
        return {"fields": fields, "verdict": outcome.verdict, "assessment": assessment,
                "assessment_error": outcome.error}

    def calc_input(self, circuit_id: int) -> dict[str, Any]:
        """The dict given to `calc.assess` for this circuit (the job's supply and the circuit)."""
        circuit = self.core.row("circuit", circuit_id)
        board = self.core.row("board", circuit["board_id"])
        job = self.core.row("job", board["job_id"])
        return self._calc_input(job, board, circuit)

    def _calc_input(
        self, job: dict[str, Any], board: dict[str, Any], circuit: dict[str, Any]
    ) -> dict[str, Any]:
        """The calc input of a circuit from its rows, with its library curve and the settings."""
        library_id = circuit.get("library_device_id_value")
        library = self.library.find(int(library_id)) if library_id is not None else None
        return build_calc_input(job, board, circuit, library, self.settings.get("final_circuit_max_a"))

    def assess(self, job: dict[str, Any], board: dict[str, Any], circuit: dict[str, Any]) -> Outcome:
        """Assess one circuit from its job, board and circuit rows (nothing is written)."""
        rows = {"job": job, "board": board, "circuit": circuit}
        return assess(self._calc_input(job, board, circuit), invalid_fields(rows, _ASSESSED))

    @staticmethod
    def save_assessment(conn: sqlite3.Connection, circuit_id: int, outcome: Outcome) -> None:
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

    def reassess_one(self, conn: sqlite3.Connection, circuit_id: int) -> None:
        """Reassess one circuit (inside the caller's transaction)."""
        circuit = self.core.row("circuit", circuit_id)
        board = self.core.row("board", circuit["board_id"])
        job = self.core.row("job", board["job_id"])
        self.save_assessment(conn, circuit_id, self.assess(job, board, circuit))

    def reassess_board(self, conn: sqlite3.Connection, job: dict[str, Any], board: dict[str, Any]) -> None:
        """Reassess every circuit of a board (inside the caller's transaction)."""
        for circuit in self.core.query("SELECT * FROM circuits WHERE board_id = ?", (board["id"],)):
            self.save_assessment(conn, circuit["id"], self.assess(job, board, circuit))

    def reassess_job(self, conn: sqlite3.Connection, job_id: int) -> None:
        """Reassess every circuit of a job (inside the caller's transaction)."""
        job = self.core.row("job", job_id)
        for board in self.core.query("SELECT * FROM boards WHERE job_id = ?", (job_id,)):
            self.reassess_board(conn, job, board)

    def reassess_stale_drafts(self) -> int:
        """Reassess the circuits of draft jobs last assessed by another calc version (after an update
        of the app), one job per transaction with an audit entry; returns how many jobs. Submitted and
        approved jobs keep the assessment they were reviewed with."""
        rows = self.core.query(
            "SELECT DISTINCT j.id FROM jobs j JOIN boards b ON b.job_id = j.id"
            " JOIN circuits c ON c.board_id = b.id WHERE j.status = 'draft'"
            " AND c.calc_version IS NOT NULL AND c.calc_version != ?",
            (calc.__version__,),
        )
        for row in rows:
            with self.core.write() as conn:
                self.reassess_job(conn, row["id"])
                self.core.audit(conn, row["id"], None, "job", row["id"], "assessment", None,
                                f"reassessed by calc {calc.__version__}")
        return len(rows)


def next_reference(reference: str, taken: list[str]) -> str:
    """The reference after `reference` on a board: its last run of digits counted on past every
    reference already taken (`3` → `4`, `L2-4` → `L2-5`, `7` → `9` when `8` is taken); a reference
    with no digits gets `-2` (`Cooker` → `Cooker-2`), a blank one the first free number."""
    used = {t.strip().casefold() for t in taken}
    match = re.search(r"(\d+)(?!.*\d)", reference)
    if match:
        head, number, tail = reference[: match.start()], int(match.group()), reference[match.end():]
    elif reference.strip():
        head, number, tail = reference.strip() + "-", 1, ""
    else:
        head, number, tail = "", 0, ""
    while True:
        number += 1
        candidate = f"{head}{number}{tail}"
        if candidate.strip().casefold() not in used:
            return candidate
