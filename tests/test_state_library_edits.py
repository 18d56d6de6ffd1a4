"""The device library screen's state without Flet: a saved curve opened, changed and saved (or saved
as a new one when a job in review uses it), deleted only when unused, and a circuit whose saved
curve is rated otherwise than the circuit flagged in its results."""

from __future__ import annotations

from pathlib import Path

import pytest

from mobile_app.state import CurveDraft, JobScreen, JobsList, Walk
from mobile_app.state.library import library_rows
from mobile_app.state.undo import UndoTrail
from mobile_app.store import Store

# Points read off a maker's chart for the demo (invented).
POINTS = [[200.0, 10.0], [500.0, 1.0], [2000.0, 0.02]]


@pytest.fixture
def store(tmp_path: Path):
    with Store.open(tmp_path) as opened:
        yield opened


def _circuit_on(store: Store, device_id: int, rating: str) -> tuple[JobScreen, int]:
    job = JobScreen(store, JobsList(store).new_job("Curves"))
    circuit_id = job.add_circuit(job.boards()[0].id)
    walk = Walk(store, circuit_id)
    for name, raw in (("device_kind", "curve"), ("library_device_id", str(device_id)),
                      ("device_rating", rating), ("line_csa", "2.5"), ("cpc_csa", "1.5"), ("zs", "0.4")):
        walk.set_field(name, raw)
    return job, circuit_id


def test_a_saved_curve_opens_with_its_points_and_saves_its_changes(store):
    device_id = store.library.add("Maker 100 A", POINTS, rating_a=100)
    draft = CurveDraft.from_saved(store.library.find(device_id))
    assert (draft.name, draft.rating, draft.editing) == ("Maker 100 A", "100", device_id)
    assert [(r.current, r.time) for r in draft.rows] == [("200", "10"), ("500", "1"), ("2000", "0.02")]
    draft.set_cell(1, "time", "2 s")
    draft.name = "Maker 100 A rev B"
    assert draft.save(store) == device_id
    assert draft.message == "Saved the changes to Maker 100 A rev B"
    assert store.library.find(device_id)["points"][1] == [500.0, 2.0]
    assert len(store.library.all()) == 1


def test_a_curve_under_a_job_in_review_is_saved_as_a_new_one(store):
    device_id = store.library.add("Maker 100 A", POINTS, rating_a=100)
    job, _circuit = _circuit_on(store, device_id, "100")
    store.review.submit(job.job_id, store.people.add("Sam Hale", "qualified"))
    draft = CurveDraft.from_saved(store.library.find(device_id))
    draft.set_cell(0, "time", "20 s")
    assert draft.save(store) is None
    assert draft.message.startswith(f"Not saved: curve {device_id} cannot be changed: used by job Curves")
    assert draft.message.endswith("Save it as a new curve instead.")
    new_id = draft.save(store, as_new=True)
    assert new_id not in (None, device_id) and store.library.find(device_id)["points"] == POINTS


def test_a_curve_in_use_is_not_deleted_and_the_list_says_why(store):
    used = store.library.add("Maker 100 A", POINTS, rating_a=100)
    spare = store.library.add("Maker 63 A", POINTS, rating_a=63)
    _circuit_on(store, used, "100")
    details = {row.name: row.detail for row in library_rows(store)}
    assert details["Maker 100 A"] == "3 points · In 100 A · used by 1 circuit"
    undo = UndoTrail(store)
    undo.enter("/library")
    refused = undo.delete("curve", used)
    assert not refused.ok and "used by job Curves circuit 1" in refused.message
    assert undo.delete("curve", spare).message == "Deleted curve Maker 63 A"
    assert undo.undo().message == "Put back curve Maker 63 A"


def test_a_rating_that_differs_from_the_saved_curve_is_flagged(store):
    device_id = store.library.add("Maker 100 A", POINTS, rating_a=100)
    job, circuit_id = _circuit_on(store, device_id, "16")
    note = "Saved curve rated 100 A; this circuit's In is 16 A"
    assert Walk(store, circuit_id).results().notes[0] == note
    row = job.boards()[0].circuits[0]
    assert row.rating_note == note and row.device == "Maker 100 A"
    Walk(store, circuit_id).set_field("device_rating", "100")
    assert note not in Walk(store, circuit_id).results().notes


def test_what_a_new_curve_still_needs_is_a_hint_until_a_point_is_typed():
    draft = CurveDraft()
    assert draft.problem() == "Enter at least two points (current and time)" and not draft.started
    draft.set_cell(0, "current", "200")
    assert draft.started and draft.problem() == "Enter at least two points (current and time)"
