"""A job as one JSON-able document (the body of the JSON export) and importing one back as it was."""

from __future__ import annotations

import datetime
import json
import sqlite3
from collections.abc import Callable
from typing import Any

import calc
from mobile_app.store import chain
from mobile_app.store.assessment import Outcome
from mobile_app.store.boards import Boards
from mobile_app.store.circuits import Circuits
from mobile_app.store.core import Core, now_iso
from mobile_app.store.errors import DocumentError
from mobile_app.store.fields import BOARD_FIELDS, CIRCUIT_FIELDS, JOB_FIELDS
from mobile_app.store.jobs import Jobs
from mobile_app.store.library import Library
from mobile_app.store.people import ROLES, People
from mobile_app.store.rows import parse, triples

DOCUMENT_SCHEMA = "boardside-job"
DOCUMENT_SCHEMA_VERSION = 1
STATUSES = ("draft", "submitted", "approved")
VERDICTS = ("pass", "fail", "not-shown")
OLD_VERDICTS = {"incomplete": "not-shown"}
"""Verdict words of older exports and what they read as now."""


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
    ) -> None:
        self.core = core
        self.people = people
        self.library = library
        self.jobs = jobs
        self.boards = boards
        self.circuits = circuits

    def export(self, job_id: int) -> dict[str, Any]:
        """The whole job (boards, circuits with fields as typed and assessments, library devices
        used, audit trail) as a JSON-able dict with "schema": "boardside-job"."""
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
            },
            "boards": boards,
            "library_devices": [d for d in library if d["id"] in used_library],
            "people": [
                {"id": p["id"], "name": p["name"], "role": p["role"]}
                for person_id, p in sorted(everyone.items())
                if person_id in mentioned
            ],
            "audit": trail,
        }

    def import_(self, doc: dict[str, Any]) -> int:
        """Load a job document as a new job, in one transaction (a broken document imports nothing).

        The job comes back as it was exported: status, revision and its reason, who recorded,
        submitted and approved it and when, the review comment, each field as typed, each circuit's
        assessment with its calc version, and the audit trail (followed by one "imported" entry).
        People are matched by name and role, or added without a PIN. An approved job stays approved
        and read-only. A draft circuit assessed by another calc version is reassessed, with an audit
        entry when that changes it. Ids are this store's; the parent revision is linked only when
        this store holds it (see EXPORT-FORMAT.md).
        """
        if not isinstance(doc, dict) or doc.get("schema") != DOCUMENT_SCHEMA:
            raise DocumentError(f'"schema" is not "{DOCUMENT_SCHEMA}"')
        if doc.get("schema_version") != DOCUMENT_SCHEMA_VERSION:
            raise DocumentError(f"schema_version {doc.get('schema_version')!r} is not supported")
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
        people = _PeopleMatcher(self.people, doc)
        library_ids = self._import_library(doc.get("library_devices") or [])
        status = _choice(job.get("status", "draft"), "job.status", STATUSES)
        typed = [parse("job", n, _raw(job["fields"], n), self.library) for n in JOB_FIELDS]
        row = dict(triples(JOB_FIELDS, typed), **_review_columns(job, people), status=status)
        row["parent_job_id"] = self._imported_parent(row, job.get("parent_job_id"))
        job_id = self.core.insert(conn, "jobs", row)
        job_row = dict(row, id=job_id)
        ids: dict[str, dict[int, int]] = {"board": {}, "circuit": {}}
        reassessed: list[tuple[int, Outcome, Outcome]] = []
        for position, board in enumerate(doc.get("boards") or [], start=1):
            board_typed = [parse("board", n, _raw(board["fields"], n), self.library) for n in BOARD_FIELDS]
            board_row = dict(triples(BOARD_FIELDS, board_typed), job_id=job_id, position=position)
            board_id = self.core.insert(conn, "boards", board_row)
            ids["board"][_source_id(board)] = board_id
            for number, circuit in enumerate(board.get("circuits") or [], start=1):
                circuit_row = self._imported_circuit(circuit, library_ids, people)
                circuit_row.update(board_id=board_id, position=number)
                kept = _exported_outcome(circuit)
                outcome = kept
                if status == "draft" and kept.calc_version not in (None, calc.__version__):
                    outcome = self.circuits.assess(job_row, board_row, circuit_row)
                circuit_row.update(_outcome_columns(outcome))
                circuit_id = self.core.insert(conn, "circuits", circuit_row)
                ids["circuit"][_source_id(circuit)] = circuit_id
                if _outcome_columns(outcome) != _outcome_columns(kept):
                    reassessed.append((circuit_id, kept, outcome))
        for entry in doc.get("audit") or []:
            chain.append(conn, _audit_row(entry, job_id, ids, people))
        note = f"{row['client_ref_raw']} revision {row['revision']}"
        self.core.audit(conn, job_id, None, "job", job_id, "imported", None, note)
        for circuit_id, kept, outcome in reassessed:
            old = f"{kept.verdict} (calc {kept.calc_version})"
            new = f"{outcome.verdict} (calc {outcome.calc_version})"
            self.core.audit(conn, job_id, None, "circuit", circuit_id, "assessment", old, new)
        return job_id

    def _imported_circuit(
        self, circuit: dict[str, Any], library_ids: dict[int, int], people: _PeopleMatcher
    ) -> dict[str, Any]:
        """An imported circuit's row (fields as typed, library ids mapped), without its ids."""
        fields = circuit["fields"]
        parsed = []
        for name in CIRCUIT_FIELDS:
            raw = _raw(fields, name)
            if name == "library_device_id" and raw.strip().isascii() and raw.strip().isdigit():
                raw = str(library_ids.get(int(raw), raw))
            parsed.append(parse("circuit", name, raw, self.library))
        return dict(
            triples(CIRCUIT_FIELDS, parsed),
            updated_at=_text(circuit.get("updated_at"), "circuit.updated_at") or now_iso(),
            updated_by=people.by_id(circuit.get("updated_by")),
        )

    def _imported_parent(self, row: dict[str, Any], exported_parent: Any) -> int | None:
        """The job here that an imported revision continues: the approved previous revision with
        the same client reference and no revision yet; None for a first revision or when absent."""
        if exported_parent is None or row["revision"] <= 1:
            return None
        parent = self.core.one(
            "SELECT id FROM jobs j WHERE client_ref_raw = ? AND revision = ? AND status = 'approved'"
            " AND NOT EXISTS (SELECT 1 FROM jobs k WHERE k.parent_job_id = j.id) ORDER BY id DESC",
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


class _PeopleMatcher:
    """The people a document names, matched to people in the store by name and role, or added
    (without a PIN) on first use. A document without a `people` list (older exports) gives no
    roles: a name then matches anyone of that name, and a newcomer is added as an apprentice,
    except an approver, who is a supervisor."""

    def __init__(self, people: People, doc: dict[str, Any]) -> None:
        self.people = people
        self.listed: dict[int, tuple[str, str | None]] = {}
        for person in doc.get("people") or []:
            role = _choice(person["role"], "people.role", ROLES)
            self.listed[int(person["id"])] = (_name(person["name"]), role)
        for entry in doc.get("audit") or []:
            if entry.get("person_id") is not None and entry.get("who") is not None:
                self.listed.setdefault(int(entry["person_id"]), (_name(entry["who"]), None))
        self.here: dict[tuple[str, str | None], int] = {}

    def by_name(self, name: Any, role: str | None = None) -> int | None:
        """This store's id for a person named in the document (None for no name)."""
        if name is None:
            return None
        clean = _name(name)
        roles = {r for n, r in self.listed.values() if n == clean and r is not None}
        if role is None and len(roles) == 1:
            role = roles.pop()
        if (clean, role) not in self.here:
            self.here[(clean, role)] = self._match(clean, role)
        return self.here[(clean, role)]

    def by_id(self, person_id: Any) -> int | None:
        """This store's id for a person id of the document (None when the document does not say)."""
        if person_id is None or int(person_id) not in self.listed:
            return None
        name, role = self.listed[int(person_id)]
        return self.by_name(name, role)

    def _match(self, name: str, role: str | None) -> int:
        """The first person here with this name (and role, if known), else a new one."""
        for person in self.people.all():
            if person["name"] == name and role in (None, person["role"]):
                return int(person["id"])
        return self.people.add(name, role or "apprentice")


def _review_columns(job: dict[str, Any], people: _PeopleMatcher) -> dict[str, Any]:
    """The job row's review, revision and authorship columns from a document's job."""
    revision = job.get("revision", 1)
    if not isinstance(revision, int) or isinstance(revision, bool) or revision < 1:
        raise DocumentError(f"job.revision {revision!r} is not a whole number from 1")
    if job.get("status") == "approved" and not (job.get("approved_by") and job.get("approved_at")):
        raise DocumentError("an approved job needs approved_by and approved_at")
    stamp = now_iso()
    return {
        "revision": revision,
        "revision_reason": _text(job.get("revision_reason"), "job.revision_reason"),
        "recorded_by": people.by_name(job.get("recorded_by")),
        "created_at": _text(job.get("recorded_at"), "job.recorded_at") or stamp,
        "updated_at": stamp,
        "submitted_by": people.by_name(job.get("submitted_by")),
        "submitted_at": _text(job.get("submitted_at"), "job.submitted_at"),
        "approved_by": people.by_name(job.get("approved_by"), "supervisor"),
        "approved_at": _text(job.get("approved_at"), "job.approved_at"),
        "review_comment": _text(job.get("review_comment"), "job.review_comment"),
    }


def _exported_outcome(circuit: dict[str, Any]) -> Outcome:
    """A circuit's assessment as the document holds it."""
    assessment = circuit.get("assessment")
    if assessment is not None and not isinstance(assessment, dict):
        raise DocumentError("a circuit's assessment must be an object or null")
    return Outcome(
        _choice(_verdict_word(circuit.get("verdict")), "circuit.verdict", VERDICTS),
        None if assessment is None else json.dumps(assessment, ensure_ascii=False, separators=(",", ":")),
        _text(circuit.get("calc_version"), "circuit.calc_version"),
        _text(circuit.get("assessment_error"), "circuit.assessment_error"),
    )


def _verdict_word(verdict: Any) -> Any:
    """A circuit's verdict word from a document, older words read as now ("incomplete" → "not-shown")."""
    if verdict is None:
        return "not-shown"
    return OLD_VERDICTS.get(verdict, verdict) if isinstance(verdict, str) else verdict


def _outcome_columns(outcome: Outcome) -> dict[str, Any]:
    """The circuit columns that hold an assessment."""
    return {
        "verdict": outcome.verdict,
        "assessment": outcome.assessment_json,
        "calc_version": outcome.calc_version,
        "assessment_error": outcome.error,
    }


def _audit_row(
    entry: dict[str, Any], job_id: int, ids: dict[str, dict[int, int]], people: _PeopleMatcher
) -> dict[str, Any]:
    """An exported audit entry as a row of this store: same time, person, change; ids mapped
    (a board or circuit the document does not hold gets no id)."""
    entity = _name(entry["entity"])
    source = entry.get("entity_id")
    if entity in ("job", "review"):
        entity_id: int | None = job_id
    else:
        entity_id = None if source is None else ids.get(entity, {}).get(int(source))
    return {
        "job_id": job_id,
        "at": _name(entry["when"]),
        "person_id": people.by_id(entry.get("person_id")),
        "entity": entity,
        "entity_id": entity_id,
        "field": _text(entry.get("field"), "audit.field"),
        "old": _text(entry.get("old"), "audit.old"),
        "new": _text(entry.get("new"), "audit.new"),
    }


def _source_id(item: dict[str, Any]) -> int:
    """A board's or circuit's id in the store it was exported from (-1 when the document has none)."""
    return -1 if item.get("id") is None else int(item["id"])


def _choice(value: Any, what: str, allowed: tuple[str, ...]) -> str:
    """`value` if it is one of `allowed`, else DocumentError."""
    if value not in allowed:
        raise DocumentError(f"{what} {value!r} is not one of {', '.join(allowed)}")
    return str(value)


def _name(value: Any) -> str:
    """A required piece of text (a name, a time) from a document, stripped; DocumentError if blank."""
    if not isinstance(value, str) or not value.strip():
        raise DocumentError(f"{value!r} is not a non-blank text")
    return value.strip()


def _text(value: Any, what: str) -> str | None:
    """Optional text from a document: a string or None, else DocumentError."""
    if value is not None and not isinstance(value, str):
        raise DocumentError(f"{what} must be text or null, not {type(value).__name__}")
    return value


def _raw(fields: dict[str, Any], name: str) -> str:
    """The raw text of a field in a document's fields, blank when absent."""
    entry = fields.get(name) or {}
    return "" if entry.get("raw") is None else str(entry["raw"])
