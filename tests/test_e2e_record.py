"""End to end in a real Chromium at 390×844: the whole test record of a ring final circuit (every
test), a board with its supply details, the job's details with an instrument, an observation; then
approval and export. The exported PDF is rendered to PNG (pdftoppm, Debian's poppler-utils) under
test-artifacts/ to be looked at, and read back with pypdf: each value recorded is in its circuit's
row of the schedule.

Limits: IEC 60364-6 Table 6.1 (insulation ≥ 1 MΩ at 500 V), IEC 61008-1 / 61009-1 Table 1 (300 ms at
IΔn, 40 ms at 5 IΔn), ring r1 and rn within 0.05 Ω (common practice); the readings are invented.
"""

from __future__ import annotations

import io
import shutil
import subprocess
from pathlib import Path

import pytest
from pdf_rows import rows, squash
from pypdf import PdfReader
from test_e2e_walk import (
    ARTIFACTS,
    CHROMIUM,
    PIN,
    SUPERVISOR,
    fill,
    give_reasons,
    new_job,
    open_app,
    page_fixture,  # noqa: F401 - the phone-sized page fixture
    see,
    server,  # noqa: F401 - a running app with one supervisor
    shot,
    tap,
    type_into,
)

pytestmark = [
    pytest.mark.browser,
    pytest.mark.skipif(not CHROMIUM.exists(), reason="needs Debian chromium at /usr/bin/chromium"),
]


def press(page, name: str, nth: int = 0) -> None:
    """Tap the nth button of that exact name (several choice rows share words such as Yes)."""
    button = page.get_by_role("button", name=name, exact=True).nth(nth)
    button.scroll_into_view_if_needed()
    page.wait_for_timeout(350)  # the canvas scrolls a frame after its accessibility tree
    button.click()
    page.wait_for_timeout(250)


def test_a_ring_final_circuit_recorded_whole_and_exported(server: str, page, tmp_path: Path) -> None:  # noqa: F811
    open_app(page, server + "/")
    see(page, "No jobs yet")
    new_job(page)
    type_into(page, "Client reference", "E2E-REC 12 Ash Grove")
    type_into(page, "Site address", "12 Ash Grove")
    tap(page, "Create job")
    see(page, "Status: Draft")

    # The job's details and an instrument
    press(page, "Job details and instruments")
    see(page, "Test instruments used")
    fill(page, "Client", "Ash Grove Housing Trust")
    press(page, "Periodic inspection")
    fill(page, "Next inspection by (optional)", "2031-06-30")
    fill(page, "Limitations of the inspection", "Loft not entered: no boards laid.")
    press(page, "Add instrument")
    fill(page, "Instrument", "Multifunction tester")
    fill(page, "Serial number", "MF-5521")
    fill(page, "Calibrated on", "2026-04-01")
    shot(page, "30-record-job-details")
    press(page, "Back to job")

    # The board's supply details
    see(page, "Boards and circuits")
    press(page, "Board DB1 details")
    see(page, "Left blank, the board's supply is the job's")
    fill(page, "Location", "Hall cupboard")
    fill(page, "Fed from", "Origin (meter tails)")
    fill(page, "Ze or Zdb here (optional)", "0.35")
    fill(page, "Prospective fault current here (optional)", "1.6 kA")
    press(page, "switch-disconnector")
    fill(page, "Its rating (optional)", "100 A")
    press(page, "Yes")  # at the origin
    fill(page, "Earthing conductor size", "16")
    fill(page, "Main bonding conductor size", "10")
    see(page, "= 10.0 mm²")
    shot(page, "31-record-board")
    press(page, "Back to job")

    # The circuit, step by step
    see(page, "Boards and circuits")
    tap(page, "Add circuit")
    see(page, "Step 1 of 5")
    fill(page, "Circuit reference", "L2-4")
    fill(page, "Description", "Kitchen ring")
    press(page, "RCBO")
    press(page, "B")
    fill(page, "Rating In", "32")
    see(page, "RCD IΔn is needed")
    fill(page, "Breaking capacity (optional)", "6 kA")
    fill(page, "RCD IΔn (optional)", "30 mA")
    press(page, "Type A")
    press(page, "Yes")  # for additional protection
    fill(page, "Let-through I²t (optional)", "45000")
    fill(page, "Let-through stated at (optional)", "6 kA")
    see(page, "= 6 000 A")
    shot(page, "32-record-walk-protection")
    tap(page, "Next")

    see(page, "Step 2 of 5")
    fill(page, "Line size", "2.5")
    fill(page, "CPC size", "1.5")
    press(page, "flat twin and earth")
    press(page, "C")
    fill(page, "Length (optional)", "48 m")
    fill(page, "Points served (optional)", "9")
    press(page, "Yes")  # a ring final circuit
    shot(page, "33-record-walk-conductors")
    tap(page, "Next")

    see(page, "Step 3 of 5 · Supply-off tests")
    fill(page, "Ring r1 end to end", "0.52")
    fill(page, "Ring rn end to end", "0.53")
    fill(page, "Ring r2 end to end", "0.86")
    press(page, "500 V")
    fill(page, "Insulation L–L (optional)", ">999")
    fill(page, "Insulation L–E (optional)", "0,2x")
    see(page, "Insulation L–E: ")  # the field is named in its error, the text kept
    fill(page, "Insulation L–E (optional)", "200")
    see(page, "= 200 MΩ")
    press(page, "Correct")
    shot(page, "34-record-walk-supply-off")
    tap(page, "Next")

    see(page, "Step 4 of 5 · Live tests")
    fill(page, "Zs", "0.62")
    fill(page, "Zsc (optional)", "0.41")
    fill(page, "Test temperature (optional)", "20")
    fill(page, "RCD time at IΔn (optional)", "24 ms")
    fill(page, "RCD time at 5 IΔn (optional)", "11 ms")
    press(page, "Trips")
    shot(page, "35-record-walk-live")
    tap(page, "Next")
    see(page, "Step 5 of 5")
    see(page, "Every check passes")
    shot(page, "36-record-results")
    press(page, "Back to job")

    # An observation about the circuit
    see(page, "Boards and circuits")
    press(page, "Observations (0)")
    press(page, "Add observation")
    press(page, "Needs attention")
    fill(page, "Where", "Kitchen, behind the fridge")
    fill(page, "What was found", "Socket-outlet faceplate cracked")
    press(page, "DB1 / L2-4")
    see(page, "SATISFACTORY")
    shot(page, "37-record-observation")
    press(page, "Back to job")

    # Review, approval and export
    see(page, "Boards and circuits")
    tap(page, "Review")
    type_into(page, "Recorded by (your name)", "Sam Apprentice")
    tap(page, "Submit for review")
    see(page, "Status: In review")
    type_into(page, "Supervisor name", SUPERVISOR)
    assert give_reasons(page, "Faceplate replaced by the client this week") == 1  # the open observation
    type_into(page, "PIN or passphrase", PIN)
    tap(page, "Approve")
    see(page, "Status: Approved")
    tap(page, "Export to outbox")
    pdfs: list[Path] = []
    for _ in range(60):  # the export runs in the background
        pdfs = sorted((tmp_path / "exports").glob("job*/*.pdf"))  # the server's data folder is tmp_path
        if pdfs:
            break
        page.wait_for_timeout(500)
    assert len(pdfs) == 1
    check_pdf(pdfs[0].read_bytes())
    render(pdfs[0])


def check_pdf(data: bytes) -> None:
    """Each recorded value in the circuit's row; the board, observation and instrument in the text."""
    row = rows(data, [("L2-4", "Kitchen ring")])["L2-4"]
    for text in ("ring · 9 points · flat twin and earth · method C · 48 m", "2.5 / 1.5", "RCBO B32",
                 "6 kA", "A 30 mA", "r1 0.52", "rn 0.53", "r2 0.86", "(r1+r2)/4 0.35", "L–L >999",
                 "L–E 200", "at 500 V", "correct", "0.62", "×1 24", "×5 11", "button trips", "PASS"):
        assert text in row, (text, row)
    flat = squash(" ".join(p.extract_text() for p in PdfReader(io.BytesIO(data)).pages))
    for text in ("Location Hall cupboard", "Fed from Origin (meter tails)", "Ze or Zdb at this board 0.35 Ω",
                 "Prospective fault current here 1.6 kA", "Main switch or device switch-disconnector, 100 A",
                 "Earthing conductor 16 mm²", "Main protective bonding conductors 10 mm²",
                 "Needs attention: to be put right Kitchen, behind the fridge DB1 / L2-4 Socket-outlet",
                 "Multifunction tester MF-5521 1 Apr 2026", "Loft not entered: no boards laid.",
                 "Overall outcome SATISFACTORY", "Client Ash Grove Housing Trust",
                 "Next inspection recommended by 30 Jun 2031", f"Reviewed and approved by {SUPERVISOR}"):
        assert text in flat, text
    assert "NOT APPROVED" not in flat


def render(pdf: Path) -> None:
    """The schedule's page and the record's last page as PNG images under test-artifacts/."""
    if shutil.which("pdftoppm") is None:
        pytest.skip("pdftoppm (poppler-utils) is not installed: .ci/run installs it as root")
    ARTIFACTS.mkdir(exist_ok=True)
    subprocess.run(["pdftoppm", "-r", "90", "-png", "-f", "1", "-l", "3", str(pdf),
                    str(ARTIFACTS / "38-record-pdf")], check=True, timeout=120)
    assert sorted(p.name for p in ARTIFACTS.glob("38-record-pdf-*.png"))[:3] == [
        "38-record-pdf-1.png", "38-record-pdf-2.png", "38-record-pdf-3.png"]
