"""CSV export: one row per circuit, unit-carrying headers, formula injection neutralised."""

from __future__ import annotations

import csv
import io
from collections.abc import Iterator
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from mobile_app.export import job_csv_bytes, neutralise_cell
from mobile_app.export.csv_doc import csv_cell, csv_headers
from mobile_app.store import Store
from mobile_app.store.demo import create_demo_job

# Cells a spreadsheet would run as a formula (OWASP "CSV injection", common practice) and plain
# numbers that must stay numbers: (text, expected cell).
INJECTION_CASES = [
    ("=1+2", "'=1+2"),
    ("=HYPERLINK(\"http://x.invalid\",\"click\")", "'=HYPERLINK(\"http://x.invalid\",\"click\")"),
    ("+44 20 7946 0000", "'+44 20 7946 0000"),
    ("-2+3", "'-2+3"),
    ("@SUM(A1:A9)", "'@SUM(A1:A9)"),
    ("\t=1+2", "'\t=1+2"),
    ("\r=1+2", "'\r=1+2"),
    ("-", "'-"),
    ("+", "'+"),
    ("-0.5", "-0.5"),
    ("+3", "+3"),
    ("-1.5e-3", "-1.5e-3"),
    ("0.62", "0.62"),
    ("Kiln 1", "Kiln 1"),
    ("", ""),
    (" =1+2", " =1+2"),
]


@pytest.mark.parametrize(("text", "expected"), INJECTION_CASES)
def test_neutralise_cell(text: str, expected: str) -> None:
    assert neutralise_cell(text) == expected


@settings(max_examples=150, deadline=None)
@given(st.text(max_size=30))
def test_neutralised_text_never_starts_a_formula(text: str) -> None:
    cell = neutralise_cell(text)
    assert cell in (text, "'" + text)
    if cell[:1] in ("=", "+", "-", "@", "\t", "\r"):
        float(cell)


@settings(max_examples=60, deadline=None)
@given(st.lists(st.text(max_size=20), min_size=1, max_size=5))
def test_any_description_reads_back_from_the_file(descriptions: list[str]) -> None:
    circuits = [{"number": str(n), "description": text, "fields": {}}
                for n, text in enumerate(descriptions)]
    doc = {"schema": "boardside-job", "schema_version": 1, "job": {"id": 1},
           "boards": [{"designation": "DB", "circuits": circuits}]}
    read = [row["Description"] for row in _rows(job_csv_bytes(doc))]
    assert read == [neutralise_cell(text) for text in descriptions]


@pytest.mark.parametrize(
    ("value", "expected"),
    [(None, ""), (True, "yes"), (False, "no"), (3, "3"), (0.62, "0.62"), (1.2e-05, "1.2e-05"),
     (float("inf"), ""), ("=cmd", "'=cmd"), ("-0.25", "-0.25")],
)
def test_csv_cell(value: object, expected: str) -> None:
    assert csv_cell(value) == expected


@pytest.fixture(scope="module")
def store_job(tmp_path_factory: pytest.TempPathFactory) -> Iterator[tuple[Store, int]]:
    """The demo job plus a board of hostile descriptions and readings."""
    store = Store.open(Path(tmp_path_factory.mktemp("csv-store")))
    job_id = create_demo_job(store)
    board_id = store.boards.add(job_id, "=BOARD()", "@loft", "-feed")
    for number, (text, _cell) in enumerate(INJECTION_CASES[:9], start=1):
        circuit_id = store.circuits.add(board_id, str(number), text)
        store.circuits.set_field(circuit_id, "zs", text)
    yield store, job_id
    store.close()


def _rows(data: bytes) -> list[dict[str, str]]:
    """The CSV read back with the csv module, as a spreadsheet import would."""
    assert data.startswith(b"\xef\xbb\xbf"), "UTF-8 byte-order mark for spreadsheets"
    return list(csv.DictReader(io.StringIO(data.decode("utf-8-sig"), newline="")))


def test_one_row_per_circuit_with_unit_headers(store_job: tuple[Store, int]) -> None:
    store, job_id = store_job
    doc = store.documents.export(job_id)
    rows = _rows(job_csv_bytes(doc))
    circuits = [c for board in doc["boards"] for c in board["circuits"]]
    assert len(rows) == len(circuits) == 24 + 9
    assert list(rows[0]) == csv_headers()
    for header in ("Zs (Ω)", "Zs limit (Ω)", "R1+R2 (Ω)", "Ring r1 (Ω)", "Insulation L–E (MΩ)",
                   "Insulation test voltage (V)", "RCD IΔn (mA)", "RCD time at IΔn (ms)",
                   "Breaking capacity (kA)", "Line (mm²)", "Length (m)"):
        assert header in rows[0]
    first = rows[0]
    assert first["Board"] == "DB-1" and first["Circuit"] == "1"
    assert (first["Zs (Ω)"], first["Zs from"], first["Zs limit set by"]) == ("0.66", "measured", "RCD")
    assert (first["Ring r1 (Ω)"], first["Ring rn (Ω)"], first["Ring r2 (Ω)"]) == ("0.56", "0.57", "0.93")
    assert (first["Insulation L–E (MΩ)"], first["Insulation test voltage (V)"]) == (">999", "500")
    assert (first["RCD time at IΔn (ms)"], first["RCD time at 5 IΔn (ms)"]) == ("23", "12")
    assert (first["RCD type"], first["RCD IΔn (mA)"], first["Device"]) == ("A", "30", "RCBO B32")
    assert first["Disconnection: outcome"] == "pass"
    assert first["Disconnection: deciding figure"].endswith("Ω")
    assert (first["Outcome"], first["Reason"], first["Verdict"]) == ("PASS", "", "pass")
    assert first["Updated by"] == "Rosa Quennell"
    submain = next(row for row in rows if row["Description"].startswith("Sub-main"))
    assert submain["Maker's curve"].startswith("Workshop incomer 100 A")
    assert submain["Device"] == "curve 100 A" and submain["Breaking capacity (kA)"] == "25"
    assert "competent person" in first["Cautions"]
    slow = next(row for row in rows if row["Description"] == "Office sockets (radial)")
    assert (slow["Outcome"], slow["RCD time at IΔn (ms)"]) == ("FAIL", "340")
    assert slow["Reason"].startswith("RCD operating time: 340 ms at IΔn exceeds 300 ms")
    verdicts = {row["Verdict"] for row in rows}
    assert {"pass", "fail", "not-shown"} <= verdicts


def test_the_csv_holds_the_pdf_schedules_values(store_job: tuple[Store, int]) -> None:
    """The same columns, rounded the same way: each CSV row's values are the PDF schedule's."""
    from mobile_app.export.schedule import COLUMNS, circuit_values

    store, job_id = store_job
    doc = store.documents.export(job_id)
    library = {d["id"]: d["name"] for d in doc["library_devices"]}
    rows = _rows(job_csv_bytes(doc))
    circuits = [c for board in doc["boards"] for c in board["circuits"]]
    for row, circuit in zip(rows, circuits, strict=True):
        values = circuit_values(circuit, library)
        assert [row[c.header] for c in COLUMNS] == [neutralise_cell(values[c.key]) for c in COLUMNS]


def test_readings_are_rounded_as_the_instrument_shows_them(store_job: tuple[Store, int]) -> None:
    store, job_id = store_job
    rows = _rows(job_csv_bytes(store.documents.export(job_id)))
    office = next(row for row in rows if row["Description"] == "Office sockets (radial)")
    assert office["Zs (Ω)"] == "0.71"  # typed "710 mΩ" in the demo
    lighting = next(row for row in rows if row["Description"] == "Workshop lighting")
    assert (lighting["Zs (Ω)"], lighting["Zs from"]) == ("1.13", "Ze + (R1+R2)")  # 0.28 + 0.85
    assert lighting["Zs limit (Ω)"] == "6.09"  # 6.0874 Ω worked out at 18 °C
    wheels = next(row for row in rows if row["Description"] == "Wheel benches")
    assert (wheels["Insulation L–L (MΩ)"], wheels["Insulation L–E (MΩ)"]) == ("85.0", "0.62")


def test_hostile_text_is_neutralised_in_the_file(store_job: tuple[Store, int]) -> None:
    store, job_id = store_job
    doc = store.documents.export(job_id)
    stored = [c["description"] for c in doc["boards"][-1]["circuits"]]
    rows = [row for row in _rows(job_csv_bytes(doc)) if row["Board"] == "'=BOARD()"]
    assert [row["Description"] for row in rows] == [neutralise_cell(text) for text in stored]
    assert rows[0]["Description"] == "'=1+2"
    for row in rows:
        for cell in row.values():
            if cell[:1] in ("=", "+", "-", "@", "\t", "\r"):
                float(cell)  # raises unless the cell is a plain number
    phone = next(row for row in rows if row["Description"] == "'+44 20 7946 0000")
    assert phone["Zs (Ω)"] == ""
    assert phone["Input problems"].startswith('zs "+44 20 7946 0000": ')
    formula = next(row for row in rows if row["Description"] == "'=1+2")
    assert formula["Input problems"].startswith('zs "=1+2": ')


def test_tab_and_carriage_return_survive_the_csv_quoting() -> None:
    circuits = [{"number": "1", "description": text, "fields": {}} for text in ("\t=1+2", "\r=1+2")]
    doc = {"schema": "boardside-job", "schema_version": 1, "job": {"id": 1},
           "boards": [{"designation": "DB", "circuits": circuits}]}
    assert [row["Description"] for row in _rows(job_csv_bytes(doc))] == ["'\t=1+2", "'\r=1+2"]


def test_empty_document_gives_only_headers() -> None:
    doc = {"schema": "boardside-job", "schema_version": 1, "job": {"id": 1}, "boards": []}
    assert _rows(job_csv_bytes(doc)) == []
