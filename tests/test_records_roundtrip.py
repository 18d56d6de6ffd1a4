"""Round trip: what goes in comes out, raw text included, for unicode and odd input; job documents."""

from __future__ import annotations

import json
from collections.abc import Iterator
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from mobile_app.records import BOARD_FIELDS, CIRCUIT_FIELDS, JOB_FIELDS, Store
from mobile_app.records.demo import create_demo_job
from mobile_app.records.errors import DocumentError

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
    job_id = store.create_job({"client_ref": "RT"})
    store.add_circuit(store.add_board(job_id, "DB1"), "1")
    yield store
    store.close()


@settings(max_examples=60, deadline=None)
@given(name=fields, raw=texts)
def test_any_text_in_any_circuit_field_comes_back_exactly(shared: Store, name: str, raw: str) -> None:
    saved = shared.set_circuit_field(1, name, raw)
    stored = shared.get_circuit(1)["fields"][name]
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
    job_id = shared.create_job(job)
    fields_back = shared.get_job(job_id)["fields"]
    for name, typed in job.items():
        if typed.strip() or name not in ("system", "u0", "cmin"):
            assert fields_back[name]["raw"] == typed
    board_id = shared.add_board(job_id, "B")
    shared.set_board_field(board_id, board, raw)
    assert shared.boards(job_id)[0]["fields"][board]["raw"] == raw


def test_job_document_is_json_and_imports_to_an_equal_job(tmp_path: Path) -> None:
    with Store.open(tmp_path / "a") as first:
        job_id = create_demo_job(first)
        first.set_circuit_field(1, "zs", "¿0.7?")
        doc = first.job_document(job_id)
    text = json.dumps(doc, ensure_ascii=False)
    assert doc["schema"] == "boardside-job" and doc["schema_version"] == 1
    assert doc["job"]["client_ref"] == "TY-2026-118"
    assert len(doc["library_devices"]) == 1 and doc["audit"]
    with Store.open(tmp_path / "b") as second:
        second.add_library_device("already here", [(10, 10), (100, 0.1)])
        new_id = second.import_job_document(json.loads(text))
        again = second.job_document(new_id)
    assert again["job"]["fields"] == doc["job"]["fields"]
    assert again["job"]["status"] == "draft"

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


@pytest.mark.parametrize(
    "doc, problem",
    [
        ({"schema": "other"}, '"schema" is not "boardside-job"'),
        ({"schema": "boardside-job", "schema_version": 9}, "schema_version 9 is not supported"),
        ({"schema": "boardside-job", "schema_version": 1}, "KeyError: 'job'"),
    ],
)
def test_a_foreign_document_is_refused(tmp_path: Path, doc: dict, problem: str) -> None:
    with Store.open(tmp_path) as store, pytest.raises(DocumentError) as caught:
        store.import_job_document(doc)
    assert str(caught.value) == f"not a readable job document: {problem}"


def test_a_document_broken_half_way_imports_nothing(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        doc = store.job_document(create_demo_job(store))
        del doc["boards"][1]["circuits"][2]["fields"]
        before = (store.list_jobs(), store.library_devices())
        with pytest.raises(DocumentError, match="KeyError: 'fields'"):
            store.import_job_document(doc)
        assert (store.list_jobs(), store.library_devices()) == before


@pytest.mark.parametrize("raw", ["²", "١", "3²", "0x1", "-1", "1.0"])
def test_a_library_reference_that_is_not_plain_digits_is_an_error(shared: Store, raw: str) -> None:
    saved = shared.set_circuit_field(1, "library_device_id", raw)
    assert (saved["raw"], saved["value"], saved["error"]) == (
        raw,
        None,
        "must be the id of a device in the library",
    )
