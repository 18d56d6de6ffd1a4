"""A job as one JSON-able document (the body of the JSON export) and importing one back as it was."""

from __future__ import annotations

import datetime
import json
import sqlite3
from collections.abc import Callable
from typing import Any

import calc
from mobile_app.store import chain, imported
from mobile_app.store.approvals import VERIFIED, ApprovalCheck, check_document
from mobile_app.store.assessment import Outcome
from mobile_app.store.boards import Boards
from mobile_app.store.circuits import Circuits
from mobile_app.store.core import Core, now_iso
from mobile_app.store.doc_versions import CURRENT_VERSION, VERSIONS, upgrade_document
from mobile_app.store.document_check import check_job_document
from mobile_app.store.errors import DocumentError
from mobile_app.store.fields import BOARD_FIELDS, CIRCUIT_FIELDS, JOB_FIELDS
from mobile_app.store.items import Items, export_items, import_items
from mobile_app.store.jobs import Jobs
from mobile_app.store.library import Library
from mobile_app.store.people import People
from mobile_app.store.roster import Roster
from mobile_app.store.rows import parse, triples

DOCUMENT_SCHEMA = "boardside-job"
DOCUMENT_SCHEMA_VERSION = CURRENT_VERSION
STATUSES = ("draft", "submitted", "approved")


class Documents:
    """Whole jobs out of and into a store, as JSON-able documents (`store.documents`)."""

    def __init__(
        self,
        core: Core,
        people: People,
        library: Library,
        jobs: Jobs,
        boards: Boards,
        circuits: Circuits,
        roster: Roster,
        instruments: Items,
        observations: Items,
    ) -> None:
        self.core = core
        self.people = people
        self.library = library
        self.jobs = jobs
        self.boards = boards
        self.circuits = circuits
        self.roster = roster
        self.instruments = instruments
        self.observations = observations

    def export(self, job_id: int) -> dict[str, Any]:
        """The whole job (boards, circuits with fields as typed and assessments, instruments,
        observations, the overall outcome, library devices used, audit trail) as a JSON-able dict
        with "schema": "boardside-job"."""
        return self._document(job_id, None)

    def salvage(self, job_id: int, problems: list[str]) -> dict[str, Any]:
        """The job document as far as it can be read from a damaged file: parts SQLite cannot read
        are left out and noted in `problems`."""
        return self._document(job_id, problems)

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

        job = self.jobs.get(job_id)
        fields = job["fields"]
        boards = []
        used_library: set[int] = set()
        for board in part("boards", lambda: self.boards.of_job(job_id), []):
            circuits = []
            rows = part(
                f"board {board['designation']} circuits", lambda b=board: self.circuits.of_board(b["id"]), []
            )
            for row in rows:
                circuit = part(f"circuit {row['number']}", lambda r=row: self.circuits.get(r["id"]), None)
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
        labels = {c["id"]: f"{b['designation']} / {c['number']}" for b in boards for c in b["circuits"]}
        instruments = part("instruments", lambda: export_items(self.instruments, job_id, labels), [])
        observations = part("observations", lambda: export_items(self.observations, job_id, labels), [])
        overall = part("overall outcome", lambda: self.jobs.overall(job_id).to_dict(), None)
        everyone = part("people", lambda: {p["id"]: p for p in self.people.all()}, {})
        names = {person_id: person["name"] for person_id, person in everyone.items()}
        library = part("device library", self.library.all, [])
        trail = part("audit trail", lambda: self.jobs.audit(job_id), [])
        mentioned = {job[k] for k in ("recorded_by", "submitted_by", "approved_by")}
        mentioned |= {c["updated_by"] for b in boards for c in b["circuits"]}
        mentioned |= {entry["person_id"] for entry in trail}
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
                "recorded_at": job["created_at"],
                "submitted_by": names.get(job["submitted_by"]),
                "submitted_at": job["submitted_at"],
                "approved_by": names.get(job["approved_by"]),
                "approved_at": job["approved_at"],
                "review_comment": job["review_comment"],
                "approval_reasons": json.loads(job.get("approval_reasons") or "[]"),
                "overall": overall,
            },
            "boards": boards,
            "instruments": instruments,
            "observations": observations,
            "library_devices": [d for d in library if d["id"] in used_library],
            "people": [
                {"id": p["id"], "name": p["name"], "role": p["role"]}
                for person_id, p in sorted(everyone.items())
                if person_id in mentioned
            ],
            "audit": trail,
            **self._approval_of(job_id, job["approved_by"]),
        }

    def _approval_of(self, job_id: int, approver: int | None) -> dict[str, Any]:
        """The job's signed approval and its approver's roster entry (None when there is none)."""
        row = self.core.one("SELECT approval FROM jobs WHERE id = ?", (job_id,))
        approval = None if row is None or row["approval"] is None else json.loads(row["approval"])
        entry = None
        if approval is not None and approver is not None:
            person = self.people.get(approver)
            entry = None if person["roster_entry"] is None else json.loads(person["roster_entry"])
        return {"approval": approval, "roster_entry": entry}

    def import_(self, doc: dict[str, Any]) -> int:
        """Load a job document as a new job, in one transaction (a broken document imports nothing).

        The job comes back as it was exported: status, revision and its reason, who recorded,
        submitted and approved it and when, the review comment, each field as typed, each circuit's
        assessment with its calc version, its instruments and observations, and the audit trail
        (followed by one "imported" entry). An older document is first brought up to date
        (`doc_versions`).
        People are matched by name and role, or added without a PIN. An approved job stays approved
        and read-only. A draft circuit assessed by another calc version is reassessed, with an audit
        entry when that changes it. Ids are this store's; the parent revision is linked only when
        this store holds it (see EXPORT-FORMAT.md).
        """
        if not isinstance(doc, dict) or doc.get("schema") != DOCUMENT_SCHEMA:
            raise DocumentError(f'"schema" is not "{DOCUMENT_SCHEMA}"')
        if doc.get("schema_version") not in VERSIONS:
            raise DocumentError(f"schema_version {doc.get('schema_version')!r} is not supported")
        check_job_document(doc)
        doc = upgrade_document(doc)
        with self.core.write() as conn:
            try:
                return self._import(conn, doc)
            except DocumentError:
                raise
            except (KeyError, TypeError, AttributeError, ValueError) as error:
                raise DocumentError(f"{type(error).__name__}: {error}") from error

    def _import(self, conn: sqlite3.Connection, doc: dict[str, Any]) -> int:
        """The body of an import, inside its transaction; returns the new job's id."""
        job = doc["job"]
        people = imported.PeopleMatcher(self.people, doc)
        library_ids = self._import_library(doc.get("library_devices") or [])
        status = imported.doc_choice(job.get("status", "draft"), "job.status", STATUSES)
        typed = [parse("job", n, imported.doc_raw(job["fields"], n), self.library) for n in JOB_FIELDS]
        row = dict(triples(JOB_FIELDS, typed), **imported.review_columns(job, people), status=status)
        approval = self._imported_approval(doc) if status == "approved" else None
        if status == "approved" and approval.state != VERIFIED:
            status = row["status"] = "submitted"
            row.update(approved_by=None, approved_at=None, approval_reasons=None)
        elif approval is not None:
            row["approval"] = json.dumps(doc["approval"])
        row["parent_job_id"] = (self._imported_parent(row, job.get("parent_job_id"))
                                if status == "approved" else None)
        job_id = self.core.insert(conn, "jobs", row)
        job_row = dict(row, id=job_id)
        ids: dict[str, dict[int, int]] = {"board": {}, "circuit": {}}
        reassessed: list[tuple[int, Outcome, Outcome]] = []
        for position, board in enumerate(doc.get("boards") or [], start=1):
            board_typed = [parse("board", n, imported.doc_raw(board["fields"], n), self.library)
                           for n in BOARD_FIELDS]
            board_row = dict(triples(BOARD_FIELDS, board_typed), job_id=job_id, position=position)
            board_id = self.core.insert(conn, "boards", board_row)
            ids["board"][imported.source_id(board)] = board_id
            for number, circuit in enumerate(board.get("circuits") or [], start=1):
                circuit_row = self._imported_circuit(circuit, library_ids, people)
                circuit_row.update(board_id=board_id, position=number)
                kept = imported.exported_outcome(circuit)
                outcome = self.circuits.assess(job_row, board_row, circuit_row)
                circuit_row.update(imported.outcome_columns(kept if status == "approved" else outcome))
                circuit_id = self.core.insert(conn, "circuits", circuit_row)
                ids["circuit"][imported.source_id(circuit)] = circuit_id
                if imported.outcome_columns(outcome) != imported.outcome_columns(kept):
                    reassessed.append((circuit_id, kept, outcome))
        ids.update(import_items(self.core, conn, self.library, job_id, doc, ids["circuit"]))
        for entry in doc.get("audit") or []:
            chain.append(conn, imported.audit_row(entry, job_id, ids, people))
        note = f"{row['client_ref_raw']} revision {row['revision']}"
        self.core.audit(conn, job_id, None, "job", job_id, "imported", None, note)
        if approval is not None and approval.state != VERIFIED:
            self.core.audit(conn, job_id, None, "review", job_id, "approval not kept", "approved",
                            approval.reason)
        for circuit_id, kept, outcome in reassessed:
            old = f"{kept.verdict} (calc {kept.calc_version}, as exported)"
            new = f"{outcome.verdict} (calc {outcome.calc_version})" + (
                ", not kept: the approved outcome stands" if status == "approved" else "")
            self.core.audit(conn, job_id, None, "circuit", circuit_id, "assessment", old, new)
        return job_id

    def _imported_approval(self, doc: dict[str, Any]) -> ApprovalCheck:
        """Whether an imported approved job's approval verifies here; a verified approver's roster
        entry is taken into this store's roster."""
        result = check_document(doc, self.roster.firm_key(), self.roster.verified_key)
        if result.state == VERIFIED and doc.get("roster_entry") is not None and result.approval:
            approved_at = datetime.datetime.fromisoformat(result.approval.approved_at)
            self.roster.load([doc["roster_entry"]], approved_at)
        return result

    def _imported_circuit(
        self, circuit: dict[str, Any], library_ids: dict[int, int], people: imported.PeopleMatcher
    ) -> dict[str, Any]:
        """An imported circuit's row (fields as typed, library ids mapped), without its ids."""
        fields = circuit["fields"]
        parsed = []
        for name in CIRCUIT_FIELDS:
            raw = imported.doc_raw(fields, name)
            if name == "library_device_id" and raw.strip().isascii() and raw.strip().isdigit():
                raw = str(library_ids.get(int(raw), raw))
            parsed.append(parse("circuit", name, raw, self.library))
        return dict(
            triples(CIRCUIT_FIELDS, parsed),
            updated_at=imported.doc_text(circuit.get("updated_at"), "circuit.updated_at") or now_iso(),
            updated_by=people.by_id(circuit.get("updated_by")),
        )

    def _imported_parent(self, row: dict[str, Any], exported_parent: Any) -> int | None:
        """The job here that an imported revision continues: the approved previous revision with
        the same client reference and no revision yet; None for a first revision or when absent."""
        if exported_parent is None or row["revision"] <= 1:
            return None
        parent = self.core.one(
            "SELECT id FROM jobs j WHERE client_ref_raw = ? AND revision = ? AND status = 'approved'"
            " AND NOT EXISTS (SELECT 1 FROM jobs k WHERE k.parent_job_id = j.id AND k.deleted_at IS NULL)"
            " ORDER BY id DESC",
            (row["client_ref_raw"], row["revision"] - 1),
        )
        return None if parent is None else int(parent["id"])

    def _import_library(self, devices: list[dict[str, Any]]) -> dict[int, int]:
        """Add document library devices not already here; map their ids to this store's ids."""
        here = {(d["name"], tuple(map(tuple, d["points"]))): d["id"] for d in self.library.all()}
        mapping: dict[int, int] = {}
        for device in devices:
            key = (device["name"], tuple(tuple(float(v) for v in p) for p in device["points"]))
            mapping[int(device["id"])] = here.get(key) or self.library.add(
                device["name"], device["points"], device.get("rating_a")
            )
        return mapping
