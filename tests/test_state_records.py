"""The record's other screens without Flet: a board's details, the job's details with instruments,
the observations, and the walk's new steps (the tests with the supply off, the RCBO's IΔn)."""

from __future__ import annotations

from pathlib import Path

import pytest

from mobile_app.state import JobScreen, JobsList, Walk
from mobile_app.state.records import BoardScreen, JobDetails, ObservationsScreen
from mobile_app.store import Store


@pytest.fixture
def store(tmp_path: Path):
    with Store.open(tmp_path) as opened:
        yield opened


def new_job(store) -> JobScreen:
    return JobScreen(store, JobsList(store).new_job("Record test", "2 Test Row"))


def names(form) -> list[str]:
    return [f.spec.name for f in form.fields()]


def test_board_details_show_what_applies(store) -> None:
    job = new_job(store)
    board = BoardScreen(store, job.boards()[0].id)
    assert board.title == "Board DB1"
    assert "ra" not in names(board.form) and "earthing_csa" not in names(board.form)
    board.form.set_field("system", "TT")
    assert "ra" in names(board.form)
    board.form.set_field("origin", "yes")
    assert {"earthing_csa", "bonding_csa"} <= set(names(board.form))
    view = board.form.set_field("ze", "0,3x")
    assert view.raw == "0,3x" and view.message is not None and view.message.startswith("Ze or Zdb here: ")
    assert board.form.set_field("pfc", "1.2 kA").parsed_text == "= 1 200 A"
    assert board.form.set_field("main_device", "switch-disconnector").message is None
    job.set_field("system", "TT")
    board.form.set_field("system", "")
    assert "ra" in names(board.form)  # the job's supply is TT


def test_a_locked_job_keeps_what_was_typed(store) -> None:
    job = new_job(store)
    board = BoardScreen(store, job.boards()[0].id)
    store.review.submit(job.job_id, store.people.add("Ann", "qualified"))
    assert board.read_only
    view = board.form.set_field("location", "Loft")
    assert view.raw == "Loft" and view.message is not None and view.message.startswith("Not saved")


def test_job_details_and_instruments(store) -> None:
    job = new_job(store)
    details = JobDetails(store, job.job_id)
    assert "next_inspection" not in names(details.form)
    details.form.set_field("purpose", "periodic")
    assert "next_inspection" in names(details.form)
    assert details.form.set_field("next_inspection", "next year").message == (
        "Next inspection by: must be a date such as 2026-03-14")
    first = details.add_instrument()
    details.add_instrument()
    (_id, number, form), _second = details.instruments()
    assert (_id, number) == (first, 1)
    assert form.set_field("calibration_date", "2026-02-30").message.startswith("Calibrated on: ")
    details.remove_instrument(first)
    assert [n for _i, n, _f in details.instruments()] == [1]
    assert details.overall().mark.word == "NOT SHOWN YET"


def test_observations_with_circuits_and_the_overall_outcome(store) -> None:
    job = new_job(store)
    circuit = job.add_circuit(job.boards()[0].id)
    screen = ObservationsScreen(store, job.job_id)
    item = screen.add()
    assert screen.missing() == ["Observation 1: Severity is needed",
                                "Observation 1: What was found is needed"]
    (view,) = screen.items()
    view.form.set_field("finding", "No bonding to the gas pipe")
    view.form.set_field("severity", "serious")
    assert screen.toggle_circuit(item, circuit) == [circuit]
    (view,) = screen.items()
    assert [(c.label, c.picked) for c in view.circuits] == [("DB1 / 1", True)]
    assert screen.toggle_circuit(item, circuit) == []
    overall = screen.overall()
    assert (overall.outcome, overall.mark.word) == ("unsatisfactory", "UNSATISFACTORY")
    assert overall.reasons == ("observation 1 is serious: No bonding to the gas pipe",)
    screen.remove(item)
    assert screen.items() == []


def test_the_walk_records_every_test(store) -> None:
    job = new_job(store)
    walk = Walk(store, job.add_circuit(job.boards()[0].id))
    assert walk.progress_text == "Step 1 of 5 · Circuit and protection"
    walk.set_field("device_kind", "rcbo")
    walk.set_field("device_curve", "B")
    walk.set_field("device_rating", "32")
    assert walk.missing() == ["RCD IΔn is needed"]
    walk.set_field("rcd_idn", "30 mA")
    assert walk.can_next() and walk.next() == "conductors"
    for name, raw in (("line_csa", "2.5"), ("cpc_csa", "1.5"), ("ring", "yes"), ("points_served", "9")):
        walk.set_field(name, raw)
    assert walk.next() == "tests"
    assert {"ring_r1", "ring_rn", "ring_r2", "polarity"} <= {v.spec.name for v in walk.fields()}
    assert walk.set_field("insulation_line_earth", ">999").parsed_text == "= >999 MΩ"
    assert walk.set_field("insulation_line_line", "low").message.startswith("Insulation L–L: ")
    assert walk.can_next()  # an optional reading never blocks
    walk.set_field("polarity", "yes")
    assert walk.set_field("polarity", "").raw == ""  # an optional answer can be cleared
    assert walk.next() == "readings"
    assert walk.set_field("rcd_time_1x", "24 ms").parsed_text == "= 0.024 s"
    assert walk.next() == "results"
