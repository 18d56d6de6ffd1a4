"""Approving with what fails or is open, on a real store file: the items listed first (failing
circuits, circuits not shown to pass, empty boards, open observations), a written reason needed for
each before any PIN is tried, the reasons kept in the record, its audit trail, the signed document
and the PDF; and draft jobs deleted as a mark and put back."""

from __future__ import annotations

import io
from collections.abc import Iterator
from pathlib import Path

import pytest
from pypdf import PdfReader

from mobile_app.export import job_pdf_bytes
from mobile_app.signing import approved_parts
from mobile_app.store import ReadOnlyError, ReviewError, Store
from mobile_app.store.demo import DEMO_PIN, create_demo_job


@pytest.fixture
def store(tmp_path: Path) -> Iterator[Store]:
    opened = Store.open(tmp_path)
    yield opened
    opened.close()


def _people(store: Store) -> dict[str, int]:
    return {p["name"]: p["id"] for p in store.people.all()}


def test_the_items_come_failing_first_then_open_then_empty_boards_and_observations(store):
    job_id = create_demo_job(store)
    empty = store.boards.add(job_id, "DB-9")
    found = store.review.concerns(job_id)
    kinds = [c.kind for c in found]
    assert kinds == sorted(kinds, key=["fail", "not-shown", "empty-board", "observation"].index)
    verdicts = [c["verdict"] for b in store.boards.of_job(job_id) for c in store.circuits.of_board(b["id"])]
    assert kinds.count("fail") == verdicts.count("fail") and kinds.count("not-shown") == verdicts.count(
        "not-shown")
    assert f"board:{empty}" in [c.key for c in found]
    severities = [o["fields"]["severity"]["value"] for o in store.observations.of_job(job_id)]
    assert kinds.count("observation") == sum(1 for s in severities if s in ("serious", "attention"))
    failing = next(c for c in found if c.kind == "fail")
    assert " fails (" in failing.what  # with its primary cause


def test_no_reason_no_approval_and_no_pin_attempt_spent(store):
    job_id = create_demo_job(store)
    people = _people(store)
    store.review.submit(job_id, people["Tomasz Brill"])
    found = store.review.concerns(job_id)
    partial = {found[0].key: "Client accepts: kiln replaced next week"}
    with pytest.raises(ReviewError, match="a written reason is needed to approve with: ") as info:
        store.review.approve(job_id, people["Ines Okafor"], "0000", partial)
    assert found[1].what in str(info.value) and found[0].what not in str(info.value)
    assert store.people.get(people["Ines Okafor"])["failed_pins"] == 0  # refused before the PIN
    assert store.jobs.get(job_id)["status"] == "submitted"


def test_the_reasons_go_into_the_record_the_trail_the_signature_and_the_pdf(store):
    job_id = create_demo_job(store)
    people = _people(store)
    store.review.submit(job_id, people["Tomasz Brill"])
    found = store.review.concerns(job_id)
    reasons = {c.key: f"Reason {n}: agreed with the client on site" for n, c in enumerate(found, start=1)}
    store.review.approve(job_id, people["Ines Okafor"], DEMO_PIN, reasons)
    doc = store.documents.export(job_id)
    kept = doc["job"]["approval_reasons"]
    expected = [(c.key, c.what, reasons[c.key]) for c in found]
    assert [(r["item"], r["what"], r["reason"]) for r in kept] == expected
    trail = [e for e in store.jobs.audit(job_id) if e["entity"] == "review" and e["field"] == "reason"]
    assert [(e["old"], e["new"]) for e in trail] == [(c.what, reasons[c.key]) for c in found]
    signed = doc["approval"]["parts"]
    assert approved_parts(doc) == signed
    changed = dict(doc, job=dict(doc["job"], approval_reasons=[dict(kept[0], reason="something else")]))
    assert approved_parts(changed)["job"] != signed["job"]  # a changed reason breaks the approval
    assert store.integrity.check().broken == {}
    text = " ".join(" ".join(page.extract_text() for page in PdfReader(io.BytesIO(job_pdf_bytes(doc))).pages)
                    .split())
    assert "Approved with these items open, for the reasons the supervisor gave:" in text
    assert reasons[found[0].key] in text


def test_an_approval_with_nothing_open_signs_as_before(store):
    job_id = store.jobs.create({"client_ref": "Nothing open"})
    person = store.people.add("Ann Marsh", "supervisor", "135790")
    store.review.submit(job_id, person)
    assert store.review.concerns(job_id) == []
    store.review.approve(job_id, person, "135790")
    doc = store.documents.export(job_id)
    assert doc["job"]["approval_reasons"] == []
    assert "approval_reasons" not in approved_parts(doc) and approved_parts(doc) == doc["approval"]["parts"]


def test_a_draft_job_deleted_leaves_the_list_keeps_its_trail_and_comes_back(store):
    job_id = create_demo_job(store)
    removed = store.removals.job(job_id)
    assert removed.label == "job TY-2026-118"
    assert job_id not in [j["id"] for j in store.jobs.all()]
    assert store.jobs.audit(job_id)[-1]["field"] == "removed"
    store.removals.restore(removed)
    assert job_id in [j["id"] for j in store.jobs.all()]
    assert store.integrity.check().ok


def test_an_approved_job_is_not_deleted_and_a_deleted_revision_frees_its_parent(store):
    job_id = store.jobs.create({"client_ref": "Revised"})
    person = store.people.add("Ann Marsh", "supervisor", "135790")
    store.review.submit(job_id, person)
    store.review.approve(job_id, person, "135790")
    with pytest.raises(ReadOnlyError):
        store.removals.job(job_id)
    revision = store.review.open_revision(job_id, "new circuit added", person)
    store.removals.job(revision)
    assert not next(j for j in store.jobs.all() if j["id"] == job_id)["superseded"]
    assert store.review.open_revision(job_id, "second try", person) != revision


def test_a_deleted_circuit_leaves_its_observations_and_returns_to_them(store):
    job_id = store.jobs.create({"client_ref": "Links"})
    board = store.boards.add(job_id, "DB1")
    first, second = store.circuits.add(board, "1"), store.circuits.add(board, "2")
    observation = store.observations.add(job_id, {"finding": "Scorched terminal", "severity": "serious"})
    store.observations.set_circuits(observation, [first, second])
    removed = store.removals.circuit(first)
    assert store.observations.get(observation)["circuit_ids"] == [second]
    store.removals.restore(removed)
    assert store.observations.get(observation)["circuit_ids"] == [first, second]
