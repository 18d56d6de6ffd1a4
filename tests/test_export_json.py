"""JSON export: the documented format, reading it back, and the round trip through a second store."""

from __future__ import annotations

import gzip
import importlib
import json
import pkgutil
import re
from collections.abc import Iterator
from pathlib import Path
from typing import Any

import pytest
from approving import reasons_for

import mobile_app.export as export_package
import mobile_app.export.json_doc as export_json
import mobile_app.store as store_package
from mobile_app.export import CAUTIONS, import_job_json, job_json_bytes, load_job_json
from mobile_app.store import Store
from mobile_app.store.demo import DEMO_PIN, create_demo_job
from mobile_app.store.errors import DocumentError

FORMAT_MD = Path(export_json.__file__).with_name("EXPORT-FORMAT.md")
FIXTURES = Path(__file__).with_name("fixtures")
# The assessment keys the calculation core's contract promises (the core may add more: the format
# says those are kept as they are, so only these must be documented).
CONTRACT_ASSESSMENT_KEYS = {
    "earth_fault_current_a", "short_circuit_current_a", "max_disconnection_time_s", "device_time_s",
    "device_time_at_short_circuit_s", "zs_max_ohm", "disconnection_ok", "k_line", "k_cpc",
    "line_withstand_time_s", "line_withstand_ok", "cpc_min_csa_mm2", "cpc_by_proportional_rule",
    "cpc_ok", "verdict", "calc_version", "inputs", "steps",
}


@pytest.fixture(scope="module")
def store_job(tmp_path_factory: pytest.TempPathFactory) -> Iterator[tuple[Store, int]]:
    """The demo job plus a board holding unusable readings and unusual text."""
    store = Store.open(Path(tmp_path_factory.mktemp("json-store")))
    job_id = create_demo_job(store)
    board_id = store.boards.add(job_id, "DB-9 Ω", "loft, ², √, Δ", "=feed")
    odd = store.circuits.add(board_id, "1", "=1+2 sockets “quoted” \\ back\\slash")
    store.circuits.set_field(odd, "zs", "abc")
    store.circuits.set_field(odd, "device_rating", "32 A")
    store.circuits.set_field(odd, "test_temp_c", "-5 °C")
    store.jobs.set_field(job_id, "date", "31 Feb")
    store.instruments.add(job_id, {"name": "Tester “Ω”", "serial": "=SN-1", "calibration_date": "soon"})
    observation = store.observations.add(job_id, {"finding": "Cracked socket", "severity": "attention",
                                                  "location": "loft"})
    store.observations.set_circuits(observation, [odd])
    yield store, job_id
    store.close()


def test_module_docstring_is_the_format_file() -> None:
    assert export_json.__doc__ == FORMAT_MD.read_text(encoding="utf-8")


def _documented_names() -> set[str]:
    """Every `name` written in backquotes in EXPORT-FORMAT.md."""
    return set(re.findall(r"`([A-Za-z_][A-Za-z0-9_]*)`", FORMAT_MD.read_text(encoding="utf-8")))


def _keys(doc: dict[str, Any]) -> set[str]:
    """The keys of every level the format describes, from a real document."""
    circuits = [c for board in doc["boards"] for c in board["circuits"]]
    assessed = [c["assessment"] for c in circuits if c["assessment"]]
    keys = set(doc) | set(doc["job"]) | set(doc["job"]["fields"]) | set(doc["job"]["overall"])
    for item in doc["instruments"] + doc["observations"]:
        keys |= set(item) | set(item["fields"])
    for board in doc["boards"]:
        keys |= set(board) | set(board["fields"])
    for circuit in circuits:
        keys |= set(circuit) | set(circuit["fields"])
        for field in circuit["fields"].values():
            keys |= set(field)
    for assessment in assessed:
        keys |= set(assessment) & CONTRACT_ASSESSMENT_KEYS
        for step in assessment["steps"]:
            keys |= set(step)
    for item in doc["library_devices"] + doc["people"] + doc["audit"]:
        keys |= set(item)
    return keys


def test_every_key_of_a_real_document_is_documented(store_job: tuple[Store, int]) -> None:
    store, job_id = store_job
    doc = json.loads(job_json_bytes(store.documents.export(job_id)))
    undocumented = _keys(doc) - _documented_names()
    assert not undocumented, f"document EXPORT-FORMAT.md keys: {sorted(undocumented)}"
    assert CONTRACT_ASSESSMENT_KEYS <= _documented_names()


def test_file_is_utf8_json_with_schema_and_cautions(store_job: tuple[Store, int]) -> None:
    store, job_id = store_job
    data = job_json_bytes(store.documents.export(job_id))
    assert "Ω".encode() in data and b"\\u03a9" not in data
    doc = json.loads(data.decode("utf-8"))
    assert doc["schema"] == "boardside-job" and doc["schema_version"] == 2
    assert doc["cautions"] == list(CAUTIONS)
    assert list(doc)[:5] == ["schema", "schema_version", "calc_version", "exported_at", "cautions"]


def test_readings_are_kept_as_typed_beside_their_values(store_job: tuple[Store, int]) -> None:
    store, job_id = store_job
    doc = load_job_json(job_json_bytes(store.documents.export(job_id)))
    odd = doc["boards"][-1]["circuits"][0]
    assert odd["fields"]["zs"]["raw"] == "abc"
    assert odd["fields"]["zs"]["value"] is None and odd["fields"]["zs"]["error"]
    assert odd["fields"]["test_temp_c"] == {"raw": "-5 °C", "value": -5.0, "error": None}
    assert odd["verdict"] == "not-shown"
    first = doc["boards"][0]["circuits"][1]
    assert first["fields"]["zs"] == {"raw": "710 mΩ", "value": 0.71, "error": None}
    steps = first["assessment"]["steps"]
    assert any(step["formula"] == "If = U0 · Cmin / Zs" for step in steps)
    assert doc["job"]["fields"]["date"]["raw"] == "31 Feb" and doc["job"]["fields"]["date"]["error"]


def _comparable(doc: dict[str, Any]) -> list[Any]:
    """What an import must keep (ids aside): the job's fields, review state, revision, who recorded,
    submitted and approved it and when; board and circuit fields, verdicts and assessments with
    their calc version; library curves, people and the audit trail as exported."""
    review = ("status", "revision", "revision_reason", "recorded_by", "recorded_at", "submitted_by",
              "submitted_at", "approved_by", "approved_at", "review_comment")
    return [
        doc["job"]["fields"],
        {key: doc["job"][key] for key in review},
        doc["job"]["overall"],
        [(i["number"], i["fields"]) for i in doc["instruments"]],
        [(o["number"], o["fields"], o["circuits"]) for o in doc["observations"]],
        [
            (board["fields"], [(c["number"], c["description"], c["fields"], c["verdict"],
                                c["assessment"], c["calc_version"]) for c in board["circuits"]])
            for board in doc["boards"]
        ],
        [(d["name"], d["rating_a"], d["points"]) for d in doc["library_devices"]],
        sorted((p["name"], p["role"]) for p in doc["people"]),
        [{k: v for k, v in entry.items() if k not in ("id", "entity_id", "person_id")}
         for entry in doc["audit"] if entry["field"] != "imported"],
    ]


def test_round_trip_through_a_second_store(store_job: tuple[Store, int], tmp_path: Path) -> None:
    store, job_id = store_job
    original = store.documents.export(job_id)
    data = job_json_bytes(original)
    other = Store.open(tmp_path / "office")
    try:
        new_id = import_job_json(other, data)
        again = other.documents.export(new_id)
    finally:
        other.close()
    assert _comparable(again) == _comparable(original)
    assert again["job"]["status"] == "draft" and again["audit"][-1]["field"] == "imported"
    assert json.loads(job_json_bytes(again))["boards"][-1]["circuits"][0]["fields"]["zs"]["raw"] == "abc"


def test_an_approval_by_a_supervisor_the_office_never_enrolled_comes_back_submitted(tmp_path: Path) -> None:
    # Issue 11: an import keeps "approved" only when its approval verifies; the reason is in the history.
    with Store.open(tmp_path / "site") as site:
        job_id = create_demo_job(site)
        people = {p["name"]: p["id"] for p in site.people.all()}
        site.review.submit(job_id, people["Rosa Quennell"])
        site.review.approve(job_id, people["Ines Okafor"], DEMO_PIN, reasons_for(site, job_id))
        original = site.documents.export(job_id)
    assert original["approval"]["supervisor"] == "Ines Okafor" and original["roster_entry"] is None
    with Store.open(tmp_path / "office") as office:
        new_id = import_job_json(office, job_json_bytes(original))
        again = office.documents.export(new_id)
    assert (again["job"]["status"], again["job"]["approved_by"]) == ("submitted", None)
    assert again["approval"] is None
    kept = [a for a in again["audit"] if a["field"] == "approval not kept"]
    assert kept and kept[0]["new"] == "Ines Okafor is not enrolled by the firm"


@pytest.mark.parametrize(
    ("data", "problem"),
    [
        (b"{not json", "not valid JSON"),
        (b"[1, 2]", "must be a JSON object"),
        (b'{"schema": "other", "schema_version": 1, "job": {}, "boards": []}', "schema is 'other'"),
        (b'{"schema": "boardside-job", "schema_version": 3, "job": {}, "boards": []}',
         "schema_version 3"),
        (b'{"schema": "boardside-job", "schema_version": "1", "job": {}, "boards": []}',
         "schema_version '1'"),
        (b'{"schema": "boardside-job", "schema_version": 1, "boards": []}', "'job' object"),
        (b"\xff\xfe", "not valid JSON"),
        (b'{"schema": "boardside-job", "schema_version": 1, "job": {"x": NaN}, "boards": []}',
         "NaN is not a JSON number"),
    ],
)
def test_load_refuses_what_it_cannot_read(data: bytes, problem: str) -> None:
    with pytest.raises(DocumentError) as caught:
        load_job_json(data)
    assert problem in str(caught.value)
    assert str(caught.value).startswith("not a readable job document: ")


def test_values_json_cannot_hold_are_refused() -> None:
    doc = {"schema": "boardside-job", "schema_version": 1, "job": {"id": 1, "x": float("nan")},
           "boards": []}
    with pytest.raises(DocumentError, match="cannot be written as JSON"):
        job_json_bytes(doc)


def test_the_store_and_the_export_raise_the_stores_one_document_error() -> None:
    names = [
        m.name
        for package in (store_package, export_package)
        for m in pkgutil.iter_modules(package.__path__, package.__name__ + ".")
    ]
    found = {name: getattr(importlib.import_module(name), "DocumentError", None) for name in names}
    assert {cls for cls in found.values() if cls is not None} == {store_package.DocumentError}


def _old_export(name: str) -> bytes:
    """A JSON export written by the release before version 2 (see tests/fixtures/README.md)."""
    return gzip.decompress((FIXTURES / f"export-v1-{name}.json.gz").read_bytes())


@pytest.mark.parametrize("name", ["draft", "approved"])
def test_a_version_1_export_imports_as_it_was(tmp_path: Path, name: str) -> None:
    data = _old_export(name)
    old = json.loads(data)
    assert old["schema_version"] == 1
    with Store.open(tmp_path) as store:
        new_id = import_job_json(store, data)
        again = store.documents.export(new_id)
    assert again["schema_version"] == 2
    # written before approvals were signed: an approved one comes back for review, not approved
    assert again["job"]["status"] == {"draft": "draft", "approved": "submitted"}[name]
    assert again["instruments"] == [] and again["observations"] == []
    for board, old_board in zip(again["boards"], old["boards"], strict=True):
        for circuit, old_circuit in zip(board["circuits"], old_board["circuits"], strict=True):
            for field_name, field in old_circuit["fields"].items():
                assert circuit["fields"][field_name]["raw"] == field["raw"], field_name
            assert circuit["fields"]["insulation_line_earth"] == {"raw": "", "value": None, "error": None}
            assert circuit["verdict"] == old_circuit["verdict"]
    assert again["job"]["overall"]["outcome"] == "unsatisfactory"
    if name == "draft":
        typed = again["boards"][0]["circuits"][-1]["fields"]["device_kind"]
        assert (typed["raw"], typed["value"]) == ("rcbo", "rcbo")


def test_a_signed_export_of_the_previous_release_still_verifies(tmp_path: Path) -> None:
    """A job approved (and signed) before the test record came in: brought to version 2, its
    approval still holds over every part; only the enrolment is missing (a device-only key)."""
    from mobile_app.store.approvals import UNVERIFIED, check_document
    from mobile_app.store.doc_versions import upgrade_document

    old = json.loads(gzip.decompress((FIXTURES / "export-schema6-approved.json.gz").read_bytes()))
    assert old["schema_version"] == 1 and old["approval"]
    result = check_document(upgrade_document(old), None, lambda _key, _at: None)
    assert (result.state, result.reason) == (UNVERIFIED, "Ines Okafor is not enrolled by the firm")
    with Store.open(tmp_path) as store:
        again = store.documents.export(import_job_json(store, json.dumps(old)))
    assert again["boards"][0]["circuits"][0]["fields"]["zs"]["raw"] == old["boards"][0]["circuits"][0][
        "fields"]["zs"]["raw"]


def test_an_approval_covers_instruments_and_observations(tmp_path: Path) -> None:
    from mobile_app.store.approvals import BROKEN, check_document

    with Store.open(tmp_path) as store:
        job_id = create_demo_job(store)
        people = {p["name"]: p["id"] for p in store.people.all()}
        store.review.submit(job_id, people["Rosa Quennell"])
        store.review.approve(job_id, people["Ines Okafor"], DEMO_PIN, reasons_for(store, job_id))
        doc = store.documents.export(job_id)
    assert check_document(doc, None, lambda _key, _at: None).state != BROKEN
    doc["observations"][0]["fields"]["severity"]["raw"] = "note"
    doc["instruments"][1]["fields"]["serial"]["raw"] = "IR-0000"
    result = check_document(doc, None, lambda _key, _at: None)
    assert (result.state, result.reason) == (BROKEN, "changed since approval: instrument 2, observation 1")


def test_the_fields_the_signature_treats_as_new_are_the_store_migrations() -> None:
    from mobile_app.signing.content import ADDED_IN_VERSION_2
    from mobile_app.store.schema import _M007_COLUMNS

    assert {level: set(names) for level, names in ADDED_IN_VERSION_2.items()} == {
        "job": set(_M007_COLUMNS["jobs"]), "board": set(_M007_COLUMNS["boards"]),
        "circuit": set(_M007_COLUMNS["circuits"])}


def test_upgrading_leaves_the_document_given_alone() -> None:
    from mobile_app.store.doc_versions import upgrade_document

    old = json.loads(_old_export("approved"))
    upgraded = upgrade_document(old)
    assert old["schema_version"] == 1 and "instruments" not in old
    assert (upgraded["schema_version"], upgraded["instruments"], upgraded["observations"]) == (2, [], [])
    assert upgraded["boards"] == old["boards"]
    with pytest.raises(DocumentError, match="schema_version 0 is not supported"):
        upgrade_document({"schema_version": 0})
