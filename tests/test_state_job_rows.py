"""The job screen's rows and actions without Flet: each circuit's device, cable pair, Zs and verdict
with its cause, a tap that opens the results once there are readings, the failing / not shown
filter, a board named before it is added, copy, delete and undo until the screen is left."""

from __future__ import annotations

from pathlib import Path

import pytest

from mobile_app.state import JobScreen, JobsList, Walk
from mobile_app.state.devices import cable_text, device_text, rating_mismatch
from mobile_app.state.jobs import ensure_demo
from mobile_app.state.undo import UndoTrail
from mobile_app.store import Store


@pytest.fixture
def store(tmp_path: Path):
    with Store.open(tmp_path) as opened:
        yield opened


def _typed_circuit(store: Store, job: JobScreen, zs: str | None) -> int:
    circuit_id = job.add_circuit(job.boards()[0].id)
    walk = Walk(store, circuit_id)
    for name, raw in (("device_curve", "B"), ("device_rating", "32"), ("line_csa", "2.5"),
                      ("cpc_csa", "1.5")):
        walk.set_field(name, raw)
    if zs is not None:
        walk.set_field("zs", zs)
    return circuit_id


@pytest.mark.parametrize(("args", "text"), [
    (("mcb", "B", 32.0, None), "B32"),
    (("rcbo", "C", 16.0, None), "RCBO C16"),
    (("fuse-gg", None, 63.0, None), "gG 63 A"),
    (("curve", None, 100.0, "Maker 100 A"), "Maker 100 A"),
    ((None, None, None, None), "device not set"),
])
def test_device_in_the_trades_shorthand(args, text):
    assert device_text(*args) == text


def test_cable_pair_and_rating_mismatch_words():
    assert cable_text(2.5, 1.5) == "2.5/1.5 mm²" and cable_text(None, None) == "cable not set"
    assert rating_mismatch("curve", 16.0, 100.0) == "Saved curve rated 100 A; this circuit's In is 16 A"
    assert rating_mismatch("curve", 100.0, 100.0) is None
    assert rating_mismatch("mcb", 16.0, 100.0) is None  # a saved curve left over from before: not used


def test_rows_say_device_cables_zs_and_where_a_tap_goes(store):
    job = JobScreen(store, JobsList(store).new_job("Rows"))
    walked = _typed_circuit(store, job, "2.0")
    fresh = _typed_circuit(store, job, None)
    rows = {c.id: c for c in job.boards()[0].circuits}
    assert rows[walked].detail.replace("\u00a0", " ") == "B32 · 2.5/1.5 mm² · Zs 2.00 Ω"
    # IEC 60364-4-41 Table 41.1 / IEC 60898-1: a B32 needs Zs ≤ 230 × 0.95 / 160 A = 1.37 Ω for 0.4 s
    assert rows[walked].verdict == "fail" and rows[walked].cause.startswith("Disconnection: ")
    assert rows[walked].step == "results"
    assert rows[fresh].detail.replace("\u00a0", " ") == "B32 · 2.5/1.5 mm² · no Zs"
    assert rows[fresh].step == "device"


def test_a_zs_worked_out_from_ze_and_r1r2_is_shown_with_where_it_came_from(store):
    job = JobScreen(store, JobsList(store).new_job("Summed"))
    summed = _typed_circuit(store, job, None)
    walk = Walk(store, summed)
    walk.set_field("ze", "0.35")
    walk.set_field("r1r2", "0.40")
    row = next(c for c in job.boards()[0].circuits if c.id == summed)
    # Zs = Ze + (R1+R2) = 0.35 + 0.40 = 0.75 Ω (arithmetic; the walk's loop step)
    assert row.detail.replace("\u00a0", " ") == "B32 · 2.5/1.5 mm² · Zs 0.75 Ω from Ze + (R1+R2)"


def test_a_long_curve_name_wraps_between_words_short_parts_stay_whole():
    from mobile_app.state.jobs import CircuitRow
    from mobile_app.state.text import verdict_mark

    row = CircuitRow(1, "1", "Sub-main", "not-shown", verdict_mark("not-shown"),
                     device="Workshop incomer 100 A moulded-case breaker", cables="16/6 mm²", zs="no Zs")
    assert row.detail == "Workshop incomer 100 A moulded-case breaker · 16/6\u00a0mm² · no\u00a0Zs"


def test_the_filter_keeps_failing_or_not_shown_circuits(store):
    job = JobScreen(store, ensure_demo(store))
    choices = {c.value: c.label for c in job.filter_choices()}
    every = [c for b in job.boards() for c in b.circuits]
    failing = sum(1 for c in every if c.verdict == "fail")
    assert choices["fail"] == f"Failing ({failing})" and failing >= 2
    job.circuit_filter = "fail"
    shown = [c for b in job.boards() for c in b.circuits]
    assert len(shown) == failing and {c.verdict for c in shown} == {"fail"}
    job.circuit_filter = "not-shown"
    assert {c.verdict for b in job.boards() for c in b.circuits} == {"not-shown"}


def test_a_board_is_named_before_it_is_added(store):
    job = JobScreen(store, JobsList(store).new_job("Boards"))
    assert job.add_board("  ") == (None, "Name the board first (e.g. DB2, Garage board)")
    assert job.add_board("db1") == (None, "This job already has a board called db1")
    board_id, message = job.add_board("Garage board")
    assert board_id is not None and message == "Added: Garage board"
    assert [b.designation for b in job.boards()] == ["DB1", "Garage board"]


def test_copy_then_delete_and_undo_until_the_screen_is_left(store):
    job = JobScreen(store, JobsList(store).new_job("Edits"))
    first = _typed_circuit(store, job, "0.62")
    copy_id, message = job.copy_circuit(first)
    assert message == "Copied as circuit 2: enter its readings"
    assert [c.number for c in job.boards()[0].circuits] == ["1", "2"]
    undo = UndoTrail(store)
    undo.enter(f"/job/{job.job_id}")
    assert undo.delete("circuit", copy_id).message == "Deleted circuit 2"
    assert undo.offer == "Deleted circuit 2"
    undo.enter(f"/job/{job.job_id}")  # the same screen drawn again: undo still offered
    assert undo.undo().message == "Put back circuit 2" and undo.offer is None
    assert [c.number for c in job.boards()[0].circuits] == ["1", "2"]
    undo.delete("board", job.boards()[0].id)
    assert job.boards() == []
    undo.enter(f"/job/{job.job_id}/review")  # the screen is left: the deletion stays
    assert undo.offer is None and undo.undo().message == "Nothing to undo"
    entries = [(e["entity"], e["field"]) for e in store.jobs.audit(job.job_id)]
    assert entries[-3:] == [("circuit", "removed"), ("circuit", "restored"), ("board", "removed")]
