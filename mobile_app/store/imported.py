"""Reading an imported job document into rows: people matched by name and role, review columns,
outcomes, audit entries, and the checks on each value (DocumentError naming the field)."""

from __future__ import annotations

import json
from typing import Any

from mobile_app.signing import normalise_name
from mobile_app.store.assessment import Outcome
from mobile_app.store.core import now_iso
from mobile_app.store.errors import DocumentError, InvalidValueError
from mobile_app.store.people import ROLES, People

VERDICTS = ("pass", "fail", "not-shown")
OLD_VERDICTS = {"incomplete": "not-shown"}
"""Verdict words of older exports and what they read as now."""


class PeopleMatcher:
    """The people a document names, matched to people in the store by name and role, or added
    (without a PIN) on first use. A document without a `people` list (older exports) gives no
    roles: a name then matches anyone of that name, and a newcomer is added as an apprentice,
    except an approver, who is a supervisor."""

    def __init__(self, people: People, doc: dict[str, Any]) -> None:
        self.people = people
        self.listed: dict[int, tuple[str, str | None]] = {}
        for person in doc.get("people") or []:
            role = doc_choice(person["role"], "people.role", ROLES)
            self.listed[int(person["id"])] = (doc_name(person["name"]), role)
        for entry in doc.get("audit") or []:
            if entry.get("person_id") is not None and entry.get("who") is not None:
                self.listed.setdefault(int(entry["person_id"]), (doc_name(entry["who"]), None))
        self.here: dict[tuple[str, str | None], int] = {}

    def by_name(self, name: Any, role: str | None = None) -> int | None:
        """This store's id for a person named in the document (None for no name)."""
        if name is None:
            return None
        clean = doc_name(name)
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
        """The first person here with this name (and role, if known), else one of the same name in
        another role, else a new one (a name that looks like another's is refused: DocumentError)."""
        everyone = self.people.all()
        for person in everyone:
            if person["name"] == name and role in (None, person["role"]):
                return int(person["id"])
        for person in everyone:
            if person["name"] == normalise_name(name):
                return int(person["id"])
        try:
            return self.people.add(name, role or "apprentice")
        except InvalidValueError as error:
            raise DocumentError(f"person {name!r}: {error.problem}") from error


def review_columns(job: dict[str, Any], people: PeopleMatcher) -> dict[str, Any]:
    """The job row's review, revision and authorship columns from a document's job."""
    revision = job.get("revision", 1)
    if not isinstance(revision, int) or isinstance(revision, bool) or revision < 1:
        raise DocumentError(f"job.revision {revision!r} is not a whole number from 1")
    if job.get("status") == "approved" and not (job.get("approved_by") and job.get("approved_at")):
        raise DocumentError("an approved job needs approved_by and approved_at")
    stamp = now_iso()
    return {
        "revision": revision,
        "revision_reason": doc_text(job.get("revision_reason"), "job.revision_reason"),
        "recorded_by": people.by_name(job.get("recorded_by")),
        "created_at": doc_text(job.get("recorded_at"), "job.recorded_at") or stamp,
        "updated_at": stamp,
        "submitted_by": people.by_name(job.get("submitted_by")),
        "submitted_at": doc_text(job.get("submitted_at"), "job.submitted_at"),
        "approved_by": people.by_name(job.get("approved_by"), "supervisor"),
        "approved_at": doc_text(job.get("approved_at"), "job.approved_at"),
        "review_comment": doc_text(job.get("review_comment"), "job.review_comment"),
        "approval_reasons": approval_reasons(job.get("approval_reasons")),
    }


def approval_reasons(items: Any) -> str | None:
    """The reasons an approval was given with, as the job row keeps them (JSON), or None."""
    if not items:
        return None
    kept = [{k: doc_text(item.get(k), f"job.approval_reasons.{k}") or "" for k in ("item", "what", "reason")}
            for item in items if isinstance(item, dict)]
    return json.dumps(kept, ensure_ascii=False) if kept else None


def exported_outcome(circuit: dict[str, Any]) -> Outcome:
    """A circuit's assessment as the document holds it."""
    assessment = circuit.get("assessment")
    if assessment is not None and not isinstance(assessment, dict):
        raise DocumentError("a circuit's assessment must be an object or null")
    return Outcome(
        doc_choice(verdict_word(circuit.get("verdict")), "circuit.verdict", VERDICTS),
        None if assessment is None else json.dumps(assessment, ensure_ascii=False, separators=(",", ":")),
        doc_text(circuit.get("calc_version"), "circuit.calc_version"),
        doc_text(circuit.get("assessment_error"), "circuit.assessment_error"),
    )


def verdict_word(verdict: Any) -> Any:
    """A circuit's verdict word from a document, older words read as now ("incomplete" → "not-shown")."""
    if verdict is None:
        return "not-shown"
    return OLD_VERDICTS.get(verdict, verdict) if isinstance(verdict, str) else verdict


def outcome_columns(outcome: Outcome) -> dict[str, Any]:
    """The circuit columns that hold an assessment."""
    return {
        "verdict": outcome.verdict,
        "assessment": outcome.assessment_json,
        "calc_version": outcome.calc_version,
        "assessment_error": outcome.error,
    }


def audit_row(
    entry: dict[str, Any], job_id: int, ids: dict[str, dict[int, int]], people: PeopleMatcher
) -> dict[str, Any]:
    """An exported audit entry as a row of this store: same time, person, change; ids mapped
    (a board or circuit the document does not hold gets no id)."""
    entity = doc_name(entry["entity"])
    source = entry.get("entity_id")
    if entity in ("job", "review"):
        entity_id: int | None = job_id
    else:
        entity_id = None if source is None else ids.get(entity, {}).get(int(source))
    return {
        "job_id": job_id,
        "at": doc_name(entry["when"]),
        "person_id": people.by_id(entry.get("person_id")),
        "entity": entity,
        "entity_id": entity_id,
        "field": doc_text(entry.get("field"), "audit.field"),
        "old": doc_text(entry.get("old"), "audit.old"),
        "new": doc_text(entry.get("new"), "audit.new"),
    }


def source_id(item: dict[str, Any]) -> int:
    """A board's or circuit's id in the store it was exported from (-1 when the document has none)."""
    return -1 if item.get("id") is None else int(item["id"])


def doc_choice(value: Any, what: str, allowed: tuple[str, ...]) -> str:
    """`value` if it is one of `allowed`, else DocumentError."""
    if value not in allowed:
        raise DocumentError(f"{what} {value!r} is not one of {', '.join(allowed)}")
    return str(value)


def doc_name(value: Any) -> str:
    """A required piece of text (a name, a time) from a document, stripped; DocumentError if blank."""
    if not isinstance(value, str) or not value.strip():
        raise DocumentError(f"{value!r} is not a non-blank text")
    return value.strip()


def doc_text(value: Any, what: str) -> str | None:
    """Optional text from a document: a string or None, else DocumentError."""
    if value is not None and not isinstance(value, str):
        raise DocumentError(f"{what} must be text or null, not {type(value).__name__}")
    return value


def doc_raw(fields: dict[str, Any], name: str) -> str:
    """The raw text of a field in a document's fields, blank when absent."""
    entry = fields.get(name) or {}
    return "" if entry.get("raw") is None else str(entry["raw"])
