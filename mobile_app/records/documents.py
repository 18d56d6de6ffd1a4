"""A job as one JSON-able document (the body of the JSON export) and importing one back."""

from __future__ import annotations

import datetime
import sqlite3
from collections.abc import Callable
from typing import Any

import calc
from mobile_app.records.errors import DocumentError, InvalidValueError
from mobile_app.records.fields import BOARD_FIELDS, CIRCUIT_FIELDS, JOB_FIELDS
from mobile_app.records.review import ReviewStore

DOCUMENT_SCHEMA = "boardside-job"
DOCUMENT_SCHEMA_VERSION = 1


class DocumentStore(ReviewStore):
    """Job documents out of and into the store."""

    def job_document(self, job_id: int) -> dict[str, Any]:
        """The whole job (boards, circuits with fields as typed and assessments, library devices
        used, audit trail) as a JSON-able dict with "schema": "boardside-job"."""
        return self._document(job_id, None)

    def _document(self, job_id: int, problems: list[str] | None) -> dict[str, Any]:
        """The job document; with a `problems` list, parts SQLite cannot read are left out and
        noted there instead of raising (salvaging a damaged file)."""

        def part(what: str, read: Callable[[], Any], instead: Any) -> Any:
            if problems is None:
                return read()
            try:
                return read()
            except sqlite3.DatabaseError as error:
                problems.append(f"job {job_id}, {what}: {error}")
                return instead

        job = self.get_job(job_id)
        fields = job["fields"]
        boards = []
        used_library: set[int] = set()
        for board in part("boards", lambda: self.boards(job_id), []):
            circuits = []
            rows = part(f"board {board['designation']} circuits", lambda b=board: self.circuits(b["id"]), [])
            for row in rows:
                circuit = part(f"circuit {row['number']}", lambda r=row: self.get_circuit(r["id"]), None)
                if circuit is None:
                    continue
                library_id = circuit["fields"]["library_device_id"]["value"]
                if library_id is not None:
                    used_library.add(int(library_id))
                circuits.append(
                    {
                        "id": circuit["id"],
                        "number": row["number"],
                        "description": row["description"],
                        "fields": circuit["fields"],
                        "verdict": circuit["verdict"],
                        "assessment": circuit["assessment"],
                        "calc_version": circuit["calc_version"],
                        "assessment_error": circuit["assessment_error"],
                        "updated_at": circuit["updated_at"],
                        "updated_by": circuit["updated_by"],
                    }
                )
            boards.append(
                {
                    "id": board["id"],
                    "designation": board["designation"],
                    "location": board["location"],
                    "supplied_from": board["supplied_from"],
                    "fields": board["fields"],
                    "circuits": circuits,
                }
            )
        names = part("people", lambda: {p["id"]: p["name"] for p in self.people()}, {})
        library = part("device library", self.library_devices, [])
        return {
            "schema": DOCUMENT_SCHEMA,
            "schema_version": DOCUMENT_SCHEMA_VERSION,
            "calc_version": calc.__version__,
            "exported_at": datetime.datetime.now(datetime.UTC).isoformat(timespec="seconds"),
            "job": {
                "id": job["id"],
                "revision": job["revision"],
                "status": job["status"],
                "parent_job_id": job["parent_job_id"],
                "revision_reason": job["revision_reason"],
                **{
                    name: fields[name]["raw"]
                    for name in ("client_ref", "site_address", "description", "date", "system")
                },
                "fields": fields,
                "recorded_by": names.get(job["recorded_by"]),
                "submitted_by": names.get(job["submitted_by"]),
                "approved_by": names.get(job["approved_by"]),
                "approved_at": job["approved_at"],
                "review_comment": job["review_comment"],
            },
            "boards": boards,
            "library_devices": [d for d in library if d["id"] in used_library],
            "audit": part("audit trail", lambda: self.audit(job_id), []),
        }

    def import_job_document(self, doc: dict[str, Any]) -> int:
        """Create a new draft job from a job document, in one transaction.

        Fields are re-parsed from their raw text, circuits reassessed, library curves added when
        not already in the library; the job starts as a draft (an approval is not imported).
        """
        if not isinstance(doc, dict) or doc.get("schema") != DOCUMENT_SCHEMA:
            raise DocumentError(f'"schema" is not "{DOCUMENT_SCHEMA}"')
        if doc.get("schema_version") != DOCUMENT_SCHEMA_VERSION:
            raise DocumentError(f"schema_version {doc.get('schema_version')!r} is not supported")
        with self._write() as conn:
            try:
                library_ids = self._import_library(doc.get("library_devices") or [])
                job = doc["job"]
                job_id = self.create_job({n: _raw(job["fields"], n) for n in JOB_FIELDS})
                for board in doc.get("boards") or []:
                    board_fields = board.get("fields") or {}
                    board_id = self.add_board(job_id, _raw(board_fields, "designation"))
                    for name in BOARD_FIELDS[1:]:
                        self.set_board_field(board_id, name, _raw(board_fields, name))
                    for circuit in board.get("circuits") or []:
                        self._import_circuit(board_id, circuit["fields"], library_ids)
            except (KeyError, TypeError, AttributeError, InvalidValueError) as error:
                raise DocumentError(f"{type(error).__name__}: {error}") from error
            note = f"{_raw(job['fields'], 'client_ref')} revision {job.get('revision')}"
            self._audit(conn, job_id, None, "job", job_id, "imported", None, note)
        return job_id

    def _import_circuit(self, board_id: int, fields: dict[str, Any], library_ids: dict[int, int]) -> None:
        """Add one imported circuit, field by field, mapping library ids to this store's."""
        circuit_id = self.add_circuit(board_id, _raw(fields, "number"), _raw(fields, "description"))
        for name in CIRCUIT_FIELDS[2:]:
            raw = _raw(fields, name)
            if name == "library_device_id" and raw.strip().isascii() and raw.strip().isdigit():
                raw = str(library_ids.get(int(raw), raw))
            self.set_circuit_field(circuit_id, name, raw)

    def _import_library(self, devices: list[dict[str, Any]]) -> dict[int, int]:
        """Add document library devices not already here; map their ids to this store's ids."""
        here = {(d["name"], tuple(map(tuple, d["points"]))): d["id"] for d in self.library_devices()}
        mapping: dict[int, int] = {}
        for device in devices:
            key = (device["name"], tuple(tuple(float(v) for v in p) for p in device["points"]))
            mapping[int(device["id"])] = here.get(key) or self.add_library_device(
                device["name"], device["points"], device.get("rating_a")
            )
        return mapping


def _raw(fields: dict[str, Any], name: str) -> str:
    """The raw text of a field in a document's fields, blank when absent."""
    entry = fields.get(name) or {}
    return "" if entry.get("raw") is None else str(entry["raw"])
