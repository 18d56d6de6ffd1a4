"""Round trip: what goes in comes out, raw text included, for unicode and odd input; job documents."""

from __future__ import annotations

import json
import re
from collections.abc import Iterator
from pathlib import Path

import pytest
from approving import reasons_for
from hypothesis import given, settings
from hypothesis import strategies as st

import calc
from mobile_app.store import BOARD_FIELDS, CIRCUIT_FIELDS, JOB_FIELDS, Store
from mobile_app.store.demo import DEMO_PIN, create_demo_job
from mobile_app.store.errors import DocumentError

ODD = [
    "",
    " ",
    "0.62",
    " 0.62 ",
    "0,62",
    "620 mΩ",
    "620mΩ",
    "0.62 ohm",
    "∞",
    "NaN",
    "-0",
    "1e309",
    "½",
    "٠٫٦٢",
    "0.62\n",
    "\t",
    "0.62; DROP TABLE circuits;--",
    "'",
    '"',
    "\\",
    "%_",
    "\x00",
    "a\x00b",
    "🙂 Zs",
    "Ω" * 500,
    "x" * 10_000,
    "ｆｕｌｌｗｉｄｔｈ",
    "\u202e0.62",
    "²",
    "١٢",
    "12²",
]
fields = st.sampled_from(CIRCUIT_FIELDS)
texts = st.one_of(st.sampled_from(ODD), st.text(max_size=60))


@pytest.fixture(scope="module")
def shared(tmp_path_factory: pytest.TempPathFactory) -> Iterator[Store]:
    """One store with a job, a board and a circuit, shared by the property tests."""
    store = Store.open(tmp_path_factory.mktemp("roundtrip"))
    job_id = store.jobs.create({"client_ref": "RT"})
    store.circuits.add(store.boards.add(job_id, "DB1"), "1")
    yield store
    store.close()


@settings(max_examples=60, deadline=None)
@given(name=fields, raw=texts)
def test_any_text_in_any_circuit_field_comes_back_exactly(shared: Store, name: str, raw: str) -> None:
    saved = shared.circuits.set_field(1, name, raw)
    stored = shared.circuits.get(1)["fields"][name]
    assert stored["raw"] == raw == saved["raw"]
    assert (stored["value"], stored["error"]) == (saved["value"], saved["error"])
    assert stored["value"] is None or stored["error"] is None
    if raw.strip() and stored["value"] is None:
        assert stored["error"]


@settings(max_examples=25, deadline=None)
@given(
    job=st.fixed_dictionaries({n: texts for n in JOB_FIELDS}), board=st.sampled_from(BOARD_FIELDS), raw=texts
)
def test_job_and_board_text_comes_back_exactly(
    shared: Store, job: dict[str, str], board: str, raw: str
) -> None:
    job_id = shared.jobs.create(job)
    fields_back = shared.jobs.get(job_id)["fields"]
    for name, typed in job.items():
        if typed.strip() or name not in ("system", "u0", "cmin"):
            assert fields_back[name]["raw"] == typed
    board_id = shared.boards.add(job_id, "B")
    shared.boards.set_field(board_id, board, raw)
    assert shared.boards.of_job(job_id)[0]["fields"][board]["raw"] == raw


def test_job_document_is_json_and_imports_to_an_equal_job(tmp_path: Path) -> None:
    with Store.open(tmp_path / "a") as first:
        job_id = create_demo_job(first)
        first.circuits.set_field(1, "zs", "¿0.7?")
        doc = first.documents.export(job_id)
    text = json.dumps(doc, ensure_ascii=False)
    assert doc["schema"] == "boardside-job" and doc["schema_version"] == 2
    assert doc["job"]["client_ref"] == "TY-2026-118"
    assert len(doc["library_devices"]) == 1 and doc["audit"]
    with Store.open(tmp_path / "b") as second:
        second.library.add("already here", [(10, 10), (100, 0.1)])
        new_id = second.documents.import_(json.loads(text))
        again = second.documents.export(new_id)
    assert again["job"]["fields"] == doc["job"]["fields"]
    assert again["job"]["status"] == "draft"
    assert restored(again) == restored(doc)

    def shape(document: dict) -> list:
        return [
            (b["designation"], b["fields"], [(c["number"], c["fields"], c["verdict"]) for c in b["circuits"]])
            for b in document["boards"]
        ]

    library_id = again["library_devices"][0]["id"]
    assert library_id == 2
    for board in doc["boards"]:
        for circuit in board["circuits"]:
            entry = circuit["fields"]["library_device_id"]
            if entry["raw"]:
                entry.update(raw=str(library_id), value=library_id)
    assert shape(again) == shape(doc)


def restored(doc: dict) -> dict:
    """What an import must bring back besides the fields, ids aside: the job's review state,
    revision, authorship and times, each circuit's assessment, and the audit trail as exported."""
    job = doc["job"]
    keys = ("status", "revision", "revision_reason", "recorded_by", "recorded_at", "submitted_by",
            "submitted_at", "approved_by", "approved_at", "review_comment")
    who = {person["id"]: (person["name"], person["role"]) for person in doc["people"]}
    return {
        "job": {key: job[key] for key in keys},
        "circuits": [
            (c["verdict"], c["assessment"], c["calc_version"], c["assessment_error"], c["updated_at"],
             who.get(c["updated_by"]))
            for b in doc["boards"] for c in b["circuits"]
        ],
        "people": sorted(who.values()),
        "audit": [
            {k: v for k, v in entry.items() if k not in ("id", "entity_id", "person_id")}
            for entry in doc["audit"]
            if entry["field"] != "imported"
        ],
    }


def reviewed_revisions(store: Store) -> tuple[int, int]:
    """The demo job returned once with a comment, approved, then revised and submitted again."""
    job_id = create_demo_job(store)
    people = {p["name"]: p["id"] for p in store.people.all()}
    rosa, ines = people["Rosa Quennell"], people["Ines Okafor"]
    store.review.submit(job_id, rosa)
    store.review.return_to_draft(job_id, ines, "Circuit 3: measure Zs again – «0.7?» is not a reading",
                                 DEMO_PIN)
    store.circuits.set_field(3, "zs", "0.41 Ω", by=rosa)
    store.review.submit(job_id, rosa)
    store.review.approve(job_id, ines, DEMO_PIN, reasons_for(store, job_id))
    revision_id = store.review.open_revision(job_id, "Board DB2 replaced", by=rosa)
    store.jobs.set_field(revision_id, "description", "After the DB2 swap", by=rosa)
    store.review.submit(revision_id, rosa)
    return job_id, revision_id


def test_an_import_restores_review_revision_people_and_audit(tmp_path: Path) -> None:
    with Store.open(tmp_path / "site") as site:
        first_id, second_id = reviewed_revisions(site)
        first, second = site.documents.export(first_id), site.documents.export(second_id)
    first, second = json.loads(json.dumps(first)), json.loads(json.dumps(second))
    assert first["job"]["status"] == "approved" and second["job"]["status"] == "submitted"
    with Store.open(tmp_path / "office") as office:
        office.people.add("Ines Okafor", "supervisor", "9753")
        new_first = office.documents.import_(first)
        new_second = office.documents.import_(second)
        again_first, again_second = office.documents.export(new_first), office.documents.export(new_second)
        assert restored(again_second) == restored(second)
        # Ines was not enrolled by a firm this office pinned: her approval is unverified here, so the
        # job arrives submitted (issue 11) and the revision after it is not linked to it.
        assert {**restored(first)["job"], "status": "submitted", "approved_by": None, "approved_at": None} \
            == restored(again_first)["job"]
        assert [a["field"] for a in again_first["audit"][-2:]] == ["imported", "approval not kept"]
        assert office.jobs.get(new_second)["parent_job_id"] is None
        assert office.jobs.get(new_second)["revision"] == 2
        people = {(p["name"], p["role"]): p["has_pin"] for p in office.people.all()}
    assert people == {("Ines Okafor", "supervisor"): 1, ("Rosa Quennell", "qualified"): 0}
    assert "Tomasz Brill" not in {p["name"] for p in first["people"]}  # never part of this job


def test_a_revision_whose_parent_is_not_here_keeps_its_reason_only(tmp_path: Path) -> None:
    with Store.open(tmp_path / "site") as site:
        _, second_id = reviewed_revisions(site)
        doc = site.documents.export(second_id)
    with Store.open(tmp_path / "office") as office:
        job = office.jobs.get(office.documents.import_(doc))
    assert (job["parent_job_id"], job["revision"], job["revision_reason"]) == (
        None, 2, "Board DB2 replaced")


def test_outcomes_are_reassessed_on_import_and_differences_recorded(tmp_path: Path) -> None:
    # Issue 11: a stored verdict is never kept silently where the readings assess otherwise.
    with Store.open(tmp_path / "site") as site:
        approved_id, draft_id = reviewed_revisions(site)
        supervisor = [p["id"] for p in site.people.all() if p["role"] == "supervisor"][0]
        site.review.return_to_draft(draft_id, supervisor, "check the description", DEMO_PIN)
        docs = [site.documents.export(approved_id), site.documents.export(draft_id)]
    current = docs[1]["boards"][0]["circuits"][0]["verdict"]
    assert current != "fail"
    for doc in docs:
        circuit = doc["boards"][0]["circuits"][0]
        circuit["calc_version"] = circuit["assessment"]["calc_version"] = "0.0.1-older"
        circuit["verdict"] = "fail"
    with Store.open(tmp_path / "office") as office:
        redone = [office.documents.export(office.documents.import_(doc)) for doc in docs]
    for again in redone:
        circuit = again["boards"][0]["circuits"][0]
        assert (circuit["verdict"], circuit["calc_version"]) == (current, calc.__version__)
        changes = [a for a in again["audit"] if a["field"] == "assessment"]
        assert [(a["old"], a["new"]) for a in changes] == [
            ("fail (calc 0.0.1-older, as exported)", f"{current} (calc {calc.__version__})")]
    assert redone[0]["job"]["status"] == "submitted"  # the edited verdict broke the approval


@pytest.mark.parametrize(
    "doc, problem",
    [
        ({"schema": "other"}, '"schema" is not "boardside-job"'),
        ({"schema": "boardside-job", "schema_version": 9}, "schema_version 9 is not supported"),
        ({"schema": "boardside-job", "schema_version": 1}, "job: is missing"),
    ],
)
def test_a_foreign_document_is_refused(tmp_path: Path, doc: dict, problem: str) -> None:
    with Store.open(tmp_path) as store, pytest.raises(DocumentError) as caught:
        store.documents.import_(doc)
    assert str(caught.value) == f"not a readable job document: {problem}"


def test_a_document_broken_half_way_imports_nothing(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        doc = store.documents.export(create_demo_job(store))
        del doc["boards"][1]["circuits"][2]["fields"]
        before = (store.jobs.all(), store.library.all())
        with pytest.raises(DocumentError, match=re.escape("boards[1].circuits[2].fields: is missing")):
            store.documents.import_(doc)
        assert (store.jobs.all(), store.library.all()) == before


def test_an_older_document_without_people_matches_by_name(tmp_path: Path) -> None:
    with Store.open(tmp_path / "site") as site:
        doc = site.documents.export(reviewed_revisions(site)[0])
    del doc["people"]
    with Store.open(tmp_path / "office") as office:
        rosa = office.people.add("Rosa Quennell", "apprentice")
        job = office.jobs.get(office.documents.import_(doc))
        people = {(p["name"], p["role"]) for p in office.people.all()}
    assert job["recorded_by"] == job["submitted_by"] == rosa
    assert people == {("Rosa Quennell", "apprentice"), ("Ines Okafor", "supervisor")}


@pytest.mark.parametrize(
    ("change", "problem"),
    [
        (lambda d: d["job"].update(approved_by=None), "an approved job needs approved_by"),
        (lambda d: d["job"].update(status="signed"), "job.status 'signed' is not one of"),
        (lambda d: d["job"].update(revision=0), "job.revision 0"),
        (lambda d: d["people"][0].update(role="boss"), "people.role 'boss'"),
        (lambda d: d["audit"][-1].update(when=None), ".when: must be text, not null"),
        (lambda d: d["boards"][1]["circuits"][0].update(assessment=[1]), "must be an object or null"),
        (lambda d: d["boards"][1]["circuits"][0].update(verdict="ok"), "circuit.verdict 'ok'"),
    ],
)
def test_a_document_with_a_bad_review_part_imports_nothing(tmp_path: Path, change, problem: str) -> None:
    with Store.open(tmp_path / "site") as site:
        doc = site.documents.export(reviewed_revisions(site)[0])
    change(doc)
    with Store.open(tmp_path / "office") as office:
        with pytest.raises(DocumentError, match=re.escape(problem)):
            office.documents.import_(doc)
        assert (office.jobs.all(), office.people.all(), office.library.all()) == ([], [], [])


@pytest.mark.parametrize("raw", ["²", "١", "3²", "0x1", "-1", "1.0"])
def test_a_library_reference_that_is_not_plain_digits_is_an_error(shared: Store, raw: str) -> None:
    saved = shared.circuits.set_field(1, "library_device_id", raw)
    assert (saved["raw"], saved["value"], saved["error"]) == (
        raw,
        None,
        "must be the id of a device in the library",
    )
