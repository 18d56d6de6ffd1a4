"""PDF export: the text a reader (pypdf) finds in it, the embedded font, and the layout helpers."""

from __future__ import annotations

import io
import re
from collections.abc import Iterator
from pathlib import Path

import pytest
from approving import reasons_for
from pypdf import PdfReader

from mobile_app.export import CAUTIONS, job_pdf_bytes
from mobile_app.export.pdf_layout import FONT, JobPdf, wrap_text
from mobile_app.store import Store
from mobile_app.store.demo import DEMO_PIN, create_demo_job


@pytest.fixture(scope="module")
def approved_pdf(tmp_path_factory: pytest.TempPathFactory) -> Iterator[tuple[dict, PdfReader, str]]:
    """The demo job, approved by its supervisor, as a PDF read back with pypdf."""
    store = Store.open(Path(tmp_path_factory.mktemp("pdf-store")))
    job_id = create_demo_job(store)
    people = {person["name"]: person["id"] for person in store.people.all()}
    store.review.submit(job_id, people["Rosa Quennell"])
    store.review.approve(job_id, people["Ines Okafor"], DEMO_PIN, reasons_for(store, job_id))
    doc = store.documents.export(job_id)
    store.close()
    reader = PdfReader(io.BytesIO(job_pdf_bytes(doc)))
    text = "\n".join(page.extract_text() for page in reader.pages)
    yield doc, reader, text


def _squash(text: str) -> str:
    """Text with runs of white space made one space (lines may wrap anywhere in a PDF)."""
    return " ".join(text.split())


def _body(page_text: str) -> str:
    """A page's text without its watermark and footer (so a paragraph broken across pages reads on)."""
    text = page_text.removeprefix("DRAFT · NOT APPROVED").removeprefix("IN REVIEW · NOT APPROVED")
    footer = text.rfind(CAUTIONS[0][:40])
    return text[:footer] if footer >= 0 else text


def test_job_and_supply_are_in_the_header(approved_pdf: tuple[dict, PdfReader, str]) -> None:
    doc, reader, _text = approved_pdf
    first = _squash(reader.pages[0].extract_text())
    assert "Test record: TY-2026-118" in first
    assert "Unit 7, Tannery Yard, Harlow Mill Road, Wexcombe" in first
    assert "TN-C-S" in first and "230 V" in first and "0.28 Ω" in first
    assert "Prospective fault current at the origin 1.9 kA" in first
    assert "Overall outcome UNSATISFACTORY" in first and "Purpose Periodic inspection" in first
    verdicts = [c["verdict"] for board in doc["boards"] for c in board["circuits"]]
    assert (f"{len(verdicts)} circuits: {verdicts.count('pass')} pass, {verdicts.count('fail')} fail, "
            f"{len(verdicts) - verdicts.count('pass') - verdicts.count('fail')} not shown") in first


def test_every_circuit_and_verdict_is_listed(approved_pdf: tuple[dict, PdfReader, str]) -> None:
    doc, _reader, text = approved_pdf
    flat = _squash(text)
    for board in doc["boards"]:
        assert f"Board {board['designation']}" in flat
        for circuit in board["circuits"]:
            assert f"Board {board['designation']} · circuit {circuit['number']}" in flat
    verdicts = [c["verdict"] for board in doc["boards"] for c in board["circuits"]]
    assert {"fail", "not-shown"} <= set(verdicts)
    for verdict, word in (("pass", "PASS"), ("fail", "FAIL"), ("not-shown", "NOT SHOWN")):
        assert flat.count(f"Verdict: {word}") == verdicts.count(verdict)
    assert "Pug mill motor" in flat and "Glaze store sockets" in flat


def test_working_shows_every_step_with_formula_and_numbers(
    approved_pdf: tuple[dict, PdfReader, str]
) -> None:
    doc, reader, _text = approved_pdf
    flat = _squash(" ".join(_body(page.extract_text()) for page in reader.pages))
    for circuit in doc["boards"][0]["circuits"][:3]:
        for step in circuit["assessment"]["steps"]:
            working = " → ".join(_squash(step[key]) for key in ("formula", "working") if step[key])
            assert working in flat, (circuit["number"], step["id"])
            assert _squash(step["title"]) in flat


def test_symbols_render_as_themselves() -> None:
    step = {"id": "s", "title": "Symbols", "formula": "S = √(I²t) / k; RA · IΔn ≤ 50 V",
            "working": "Zs = 0.62 Ω; 1.5 mm² ≥ 0.97 mm²", "value": 0.97, "unit": "mm²",
            "verdict": "pass", "note": "k in A·s½/mm² at 70 → 160 °C"}
    circuit = {"number": "1", "description": "Ω ² √ Δ", "verdict": "pass", "fields": {},
               "assessment": {"steps": [step]}}
    doc = {"schema": "boardside-job", "schema_version": 1, "job": {"id": 7, "fields": {}},
           "boards": [{"designation": "DB-Ω", "circuits": [circuit]}]}
    flat = _squash("\n".join(p.extract_text() for p in PdfReader(io.BytesIO(job_pdf_bytes(doc))).pages))
    assert "S = √(I²t) / k; RA · IΔn ≤ 50 V → Zs = 0.62 Ω; 1.5 mm² ≥ 0.97 mm²" in flat
    assert "Symbols: 0.97 mm² — PASS" in flat
    assert "k in A·s½/mm² at 70 → 160 °C" in flat
    assert "Board DB-Ω · circuit 1 · Ω ² √ Δ" in flat
    assert "\ufffd" not in flat


def test_review_block_and_cautions(approved_pdf: tuple[dict, PdfReader, str]) -> None:
    _doc, reader, text = approved_pdf
    flat = _squash(text)
    assert "People and signatures" in flat
    assert "Reviewed and approved by Ines Okafor supervisor" in flat
    assert "Recorded by Rosa Quennell qualified" in flat
    for caution in CAUTIONS:
        assert _squash(caution) in flat
    for page in reader.pages:  # the footer carries the cautions on every page
        assert "Testing live circuits is dangerous" in _squash(page.extract_text())


def test_pages_are_numbered(approved_pdf: tuple[dict, PdfReader, str]) -> None:
    _doc, reader, _text = approved_pdf
    total = len(reader.pages)
    assert total > 2
    for number, page in enumerate(reader.pages, start=1):
        assert re.search(rf"page {number} of {total}\b", page.extract_text())


def test_dejavu_is_embedded(approved_pdf: tuple[dict, PdfReader, str]) -> None:
    _doc, reader, _text = approved_pdf
    fonts = reader.pages[0]["/Resources"]["/Font"]
    names = {str(fonts[key].get_object()["/BaseFont"]) for key in fonts}
    assert any("DejaVuSans" in name for name in names)
    for key in fonts:
        descendant = fonts[key].get_object()["/DescendantFonts"][0].get_object()
        assert "/FontFile2" in descendant["/FontDescriptor"]  # the TrueType program is in the file


def test_the_font_files_ship_with_their_licence() -> None:
    fonts = Path(__file__).resolve().parents[1] / "mobile_app" / "fonts"
    assert (fonts / "DejaVuSans.ttf").stat().st_size > 100_000
    assert (fonts / "DejaVuSans-Bold.ttf").stat().st_size > 100_000
    licence = (fonts / "LICENSE-DejaVu.txt").read_text(encoding="utf-8")
    assert "Bitstream" in licence and "Permission is hereby granted" in licence


def test_a_draft_says_it_is_not_approved() -> None:
    doc = {"schema": "boardside-job", "schema_version": 1, "exported_at": "2026-12-02T07:00:00+00:00",
           "job": {"id": 3, "revision": 1, "status": "draft", "client_ref": "X-1", "fields": {}},
           "boards": [{"designation": "DB-A", "circuits": []}]}
    flat = _squash("\n".join(p.extract_text() for p in PdfReader(io.BytesIO(job_pdf_bytes(doc))).pages))
    assert "Not approved: this record has not been approved by a supervisor." in flat
    assert "No circuits recorded on this board." in flat
    assert "page 1 of" in flat


def test_why_a_circuit_was_not_assessed_is_printed() -> None:
    circuits = [{"number": "1", "description": "A", "verdict": "incomplete", "fields": {},
                 "assessment": None, "assessment_error": "invalid entries: job.pfc"},
                {"number": "2", "description": "B", "verdict": None, "fields": {}, "assessment": None}]
    doc = {"schema": "boardside-job", "schema_version": 1, "job": {"id": 8, "fields": {}},
           "boards": [{"designation": "DB-E", "circuits": circuits}]}
    flat = _squash("\n".join(p.extract_text() for p in PdfReader(io.BytesIO(job_pdf_bytes(doc))).pages))
    assert "Not assessed: invalid entries: job.pfc." in flat
    assert "Not assessed: readings or circuit details are missing." in flat
    assert "Verdict: NOT ASSESSED" in flat


def test_long_unbroken_text_is_wrapped_not_lost() -> None:
    long_word = "A" * 300
    circuit = {"number": "1", "description": long_word, "verdict": None, "fields": {}}
    doc = {"schema": "boardside-job", "schema_version": 1, "job": {"id": 4, "fields": {}},
           "boards": [{"designation": "DB-B", "circuits": [circuit]}]}
    pages = PdfReader(io.BytesIO(job_pdf_bytes(doc))).pages
    assert long_word in "".join(pages[1].extract_text().split())  # the schedule
    assert long_word in "".join(pages[-1].extract_text().split())  # the annex


def test_a_zs_worked_out_from_ze_and_r1r2_is_marked() -> None:
    circuit = {"number": "4", "description": "Hall lights", "verdict": "pass",
               "fields": {"zs": {"raw": "", "value": None, "error": None}},
               "assessment": {"zs_ohm": 0.8, "zs_source": "Ze + (R1+R2)", "steps": []}}
    doc = {"schema": "boardside-job", "schema_version": 1, "job": {"id": 6, "fields": {}},
           "boards": [{"designation": "DB-D", "circuits": [circuit]}]}
    flat = _squash(PdfReader(io.BytesIO(job_pdf_bytes(doc))).pages[1].extract_text())
    assert "4 Hall lights" in flat and "0.80 (Ze + (R1+R2))" in flat


def test_characters_the_font_lacks_show_as_replacement_marks() -> None:
    circuit = {"number": "1", "description": "Heater \U0001f525 \u6f22 \x07 end", "fields": {}}
    doc = {"schema": "boardside-job", "schema_version": 1, "job": {"id": 5, "fields": {}},
           "boards": [{"designation": "DB-C", "circuits": [circuit]}]}
    flat = _squash(PdfReader(io.BytesIO(job_pdf_bytes(doc))).pages[1].extract_text())
    assert "Heater \ufffd \ufffd \ufffd end" in flat


@pytest.mark.parametrize("width_mm", [20.0, 50.0, 180.0])
def test_wrap_text_keeps_every_word_and_fits(width_mm: float) -> None:
    pdf = JobPdf("title", "note")
    pdf.set_font(FONT, "", 9)
    text = "Zs = 0.71 Ω; If = 230 × 0.95 / 0.71 = 307.7 A; S = √(If² · t) / k " * 4 + "x" * 120
    lines = wrap_text(pdf, text, width_mm)
    assert "".join("".join(lines).split()) == "".join(text.split())
    assert all(pdf.get_string_width(line) <= width_mm + 1e-6 for line in lines)
    assert wrap_text(pdf, "one\n\ntwo", width_mm) == ["one", "", "two"]
