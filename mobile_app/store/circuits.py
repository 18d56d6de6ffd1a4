"""Circuits: added with the previous circuit's device and cables, saved field by field with the raw
text kept, reassessed by the calculation core in the same transaction."""

from __future__ import annotations

import json
from typing import Any

from mobile_app.store.assessment import build_calc_input
from mobile_app.store.core import now_iso
from mobile_app.store.fields import CIRCUIT_FIELDS, READING_FIELDS
from mobile_app.store.jobs import JobStore, fields_of, set_clause

COPIED_TO_NEXT_CIRCUIT = tuple(
    f for f in CIRCUIT_FIELDS if f not in ("number", "description", *READING_FIELDS)
)


class CircuitStore(JobStore):
    """Circuits of the boards of a job."""

    def add_circuit(self, board_id: int, number: str, description: str = "", by: int | None = None) -> int:
        """Add a circuit; device and cables are copied from the board's previous circuit."""
        with self._write() as conn:
            board = self._row("board", board_id)
            job = self._draft_job(board["job_id"])
            previous = self._one(
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
                self._parse("circuit", "number", number),
                self._parse("circuit", "description", description),
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
            circuit = self._row("circuit", circuit_id)
            self._store_outcome(conn, circuit_id, self._outcome(job, board, circuit))
            self._audit(conn, job["id"], by, "circuit", circuit_id, None, None, number)
            self._touch_job(conn, job["id"])
        return circuit_id

    def circuits(self, board_id: int) -> list[dict[str, Any]]:
        """A board's circuits in order: id, number, description, verdict, version."""
        self._row("board", board_id)
        return self._query(
            "SELECT id, board_id, position, number_raw AS number,"
            " description_raw AS description,"
            " verdict, version FROM circuits WHERE board_id = ? ORDER BY position",
            (board_id,),
        )

    def get_circuit(self, circuit_id: int) -> dict[str, Any]:
        """One circuit: ids, version, verdict, calc version, fields as typed, latest assessment."""
        row = self._row("circuit", circuit_id)
        job_id = self._row("board", row["board_id"])["job_id"]
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
        }

    def set_circuit_field(
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
        parsed = self._parse("circuit", name, raw)
        with self._write() as conn:
            circuit = self._row("circuit", circuit_id)
            board = self._row("board", circuit["board_id"])
            job = self._draft_job(board["job_id"])
            self._check_version("circuit", circuit, expected_version)
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
                outcome = self._outcome(job, board, circuit)
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
                self._audit(conn, job["id"], by, "circuit", circuit_id, name, old, parsed.raw)
                self._touch_job(conn, job["id"])
        return {
            "field": name,
            "raw": parsed.raw,
            "value": parsed.value,
            "error": parsed.error,
            "version": version,
            "verdict": verdict,
        }

    def calc_input(self, circuit_id: int) -> dict[str, Any]:
        """The dict given to `calc.assess` for this circuit (the job's supply and the circuit)."""
        circuit = self._row("circuit", circuit_id)
        board = self._row("board", circuit["board_id"])
        job = self._row("job", board["job_id"])
        library_id = circuit["library_device_id_value"]
        library = self._library_device(int(library_id)) if library_id is not None else None
        return build_calc_input(job, board, circuit, library, self.get_setting("final_circuit_max_a"))
