"""The schedule of test results the office files: figures rounded as the instrument shows them, times
in local time, each recorded value in its circuit's row of the PDF (read back with pypdf), the board's
details, observations, limitations, instruments, overall outcome and signatures, and the watermark on
a record not yet approved."""

from __future__ import annotations

import datetime
import io
from collections.abc import Iterator
from pathlib import Path

import pytest
from approving import reasons_for
from pdf_rows import body, rows, squash
from pypdf import PdfReader

from mobile_app.export import job_pdf_bytes
from mobile_app.export.figures import local_date, local_time, rating, reading, significant
from mobile_app.export.schedule import COLUMNS, circuit_values
from mobile_app.store import Store
from mobile_app.store.demo import DEMO_PIN, create_demo_job


@pytest.mark.parametrize(
    ("number", "kwargs", "text"),
    [
        (0.6666, {}, "0.67"),
        (0.345, {}, "0.35"),
        (0.125, {"max_decimals": 2}, "0.13"),
        (1.13, {}, "1.13"),
        (48, {}, "48.0"),
        (6039.59, {}, "6040"),
        (0.005, {}, "0.01"),
        (199.6, {}, "200"),
        (6.0, {"keep_zeros": False}, "6"),
        (0.0241, {"max_decimals": 0}, "0"),
        (-0.25, {}, "-0.25"),
        (0, {}, "0"),
    ],
)
def test_three_significant_figures_never_an_exponent(number: float, kwargs: dict, text: str) -> None:
    """Common practice: installation test instruments show three significant figures (0.01 Ω
    resolution below 10 Ω)."""
    assert significant(number, **kwargs) == text


def test_readings_ratings_and_bounds() -> None:
    assert reading(">999") == ">999" and reading(">0.3", 1e3, 0) == ">300"
    assert reading(0.024, 1e3, 0) == "24" and reading(None) == "" and reading(True) == ""
    assert rating(6000.0, 1e-3) == "6" and rating(2.5) == "2.5" and rating(0.03, 1e3) == "30"


def test_times_are_local_and_written_out() -> None:
    stamp = "2026-11-24T13:05:09.123+00:00"
    local = datetime.datetime.fromisoformat(stamp).astimezone()
    assert local_time(stamp) == f"{local.day} {local:%b %Y, %H:%M} {local.tzname()}"
    assert local_date("2031-11-24") == "24 Nov 2031" and local_date("soon") == "soon"
    assert local_time(None) == "" and local_time("not a time") == "not a time"


def _pdf(store: Store, job_id: int) -> tuple[dict, bytes]:
    doc = store.documents.export(job_id)
    return doc, job_pdf_bytes(doc)


@pytest.fixture(scope="module")
def demo(tmp_path_factory: pytest.TempPathFactory) -> Iterator[tuple[dict, bytes, dict, bytes]]:
    """The demo job as a draft and, approved, as a second job: (draft doc, its PDF, approved doc, PDF)."""
    with Store.open(Path(tmp_path_factory.mktemp("schedule"))) as store:
        draft = _pdf(store, create_demo_job(store))
        job_id = create_demo_job(store)
        people = {p["name"]: p["id"] for p in store.people.all()}
        store.review.submit(job_id, people["Rosa Quennell"])
        store.review.approve(job_id, people["Ines Okafor"], DEMO_PIN, reasons_for(store, job_id))
        yield (*draft, *_pdf(store, job_id))


def test_each_recorded_value_is_in_its_row(demo: tuple[dict, bytes, dict, bytes]) -> None:
    _draft, _draft_pdf, doc, data = demo
    library = {d["id"]: d["name"] for d in doc["library_devices"]}
    for board in doc["boards"]:
        refs = [(c["number"], c["description"]) for c in board["circuits"]]
        found = rows(data, refs)
        for circuit in board["circuits"]:
            row = found[circuit["number"]]
            values = circuit_values(circuit, library)
            for column in COLUMNS:
                if column.key in ("device_curve", "zs_from", "zs_limit_by", "reason"):
                    continue  # the curve's name is under the table; the others are words in a cell
                assert squash(values[column.key]) in row, (board["designation"], circuit["number"],
                                                            column.key, values[column.key], row)
            if values["reason"]:
                assert squash(values["reason"])[:60] in row


@pytest.mark.parametrize(
    ("board", "ref", "expected"),
    [
        ("DB-1", "1", ["RCBO B32", "6 kA", "A 30 mA", "2.5 / 1.5", "r1 0.56", "rn 0.57", "r2 0.93",
                       "L–L >999", "L–E >999", "at 500 V", "correct", "0.66", "limit 6040 RCD", "×1 23",
                       "×5 12", "button trips", "PASS", "10 points · flat twin and earth · method C · 76 m"]),
        ("DB-1", "2", ["RCBO B20", "R1+R2 0.41", "0.71", "×1 340", "×5 31", "FAIL",
                       "RCD operating time: 340 ms at IΔn exceeds 300 ms"]),
        ("DB-1", "3", ["MCB B6", "1.5 / 1", "R1+R2 0.85", "L–L 260", "1.13 (Ze + (R1+R2))", "limit 6.09",
                       "PASS"]),
        ("DB-1", "4", ["R2 0.28", "wrong", "FAIL", "Polarity"]),
        ("DB-1", "5", ["RCBO C16", "L–L 85.0", "L–E 0.62", "FAIL", "Insulation resistance"]),
        ("DB-1", "6", ["MCB D16", "0.93", "limit 0.68", "FAIL", "Disconnection: Zs 0.93 Ω is above"]),
        ("DB-1", "11", ["MCB C40", "10 kA", "A, type S (delayed) 100 mA", "×1 210", "×5 78", "PASS"]),
        ("DB-1", "13", ["r1 0.48", "rn 0.79", "r2 0.81", "FAIL", "Ring final circuit continuity"]),
        ("DB-2", "1", ["gG 32 A", "80 kA", "6 / 2.5", "R1+R2 0.15", "PASS"]),
        ("DB-2", "7", ["L–L 120", "L–E 95.0", "at 250 V", "PASS"]),
        ("DB-3", "3", ["×1 35", "×5 52", "FAIL", "RCD operating time: 52 ms at 5 IΔn exceeds 40 ms"]),
    ],
)
def test_rows_read_as_recorded(demo: tuple[dict, bytes, dict, bytes], board: str, ref: str,
                               expected: list[str]) -> None:
    """Readings as typed in the demo (tests/…/demo_data), rounded to three significant figures; limits
    from the calculation core: B6 at 18 °C 6.09 Ω, D16 0.68 Ω (IEC 60898-1 10 In, Cmin 0.95)."""
    _draft, _draft_pdf, doc, data = demo
    circuits = next(b for b in doc["boards"] if b["designation"] == board)["circuits"]
    row = rows(data, [(c["number"], c["description"]) for c in circuits])[ref]
    for text in expected:
        assert text in row, (board, ref, text, row)


def test_schedule_pages_are_landscape_and_the_rest_portrait(demo: tuple[dict, bytes, dict, bytes]) -> None:
    _draft, _draft_pdf, _doc, data = demo
    reader = PdfReader(io.BytesIO(data))
    kinds = ["L" if p.mediabox.width > p.mediabox.height else "P" for p in reader.pages]
    assert kinds[0] == "P" and kinds[1] == "L" and kinds[-1] == "P"
    for page, kind in zip(reader.pages, kinds, strict=True):
        text = page.extract_text()
        assert ("Ref Circuit" in squash(text)) == (kind == "L"), text[:200]


def test_the_record_after_the_schedules(demo: tuple[dict, bytes, dict, bytes]) -> None:
    _draft, _draft_pdf, doc, data = demo
    flat = squash(" ".join(body(p.extract_text()) for p in PdfReader(io.BytesIO(data)).pages))
    assert "Details of board DB-1 Location Workshop entrance, north wall" in flat
    assert "Main switch or device switch-disconnector, 100 A" in flat
    assert "Earthing conductor 16 mm² Main protective bonding conductors 10 mm²" in flat
    assert "Earth electrode resistance RA 46.0 Ω" in flat
    assert "1 Serious: unsafe now or likely to become so Meter cupboard — No main protective bonding" in flat
    assert "2 Needs attention: to be put right Kiln room, east wall DB-2 / 2 Kiln 2 cannot" in flat
    assert "Limitations of the inspection Kiln 1 was firing" in flat
    assert "Multifunction installation tester MFT-20931 14 Mar 2026" in flat
    assert "Overall outcome UNSATISFACTORY • 12 circuits fail: DB-1 / 2" in flat
    approved = datetime.datetime.fromisoformat(doc["job"]["approved_at"])
    assert f"Reviewed and approved by Ines Okafor supervisor {local_time(approved.isoformat())}" in flat
    assert flat.index("People and signatures") < flat.index("Calculation annex")
    assert "Next inspection recommended by 24 Nov 2031" in flat


def test_a_record_not_yet_approved_carries_a_watermark(demo: tuple[dict, bytes, dict, bytes]) -> None:
    _doc, draft_pdf, _approved, approved_pdf = demo
    for page in PdfReader(io.BytesIO(draft_pdf)).pages:
        assert page.extract_text().startswith("DRAFT · NOT APPROVED")
    assert not any("NOT APPROVED" in p.extract_text() for p in PdfReader(io.BytesIO(approved_pdf)).pages)
    submitted = {"schema": "boardside-job", "schema_version": 2,
                 "job": {"id": 2, "status": "submitted", "fields": {}}, "boards": []}
    assert all(p.extract_text().startswith("IN REVIEW · NOT APPROVED")
               for p in PdfReader(io.BytesIO(job_pdf_bytes(submitted))).pages)
