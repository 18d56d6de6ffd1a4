"""The walk's screen logic without Flet: step order, defaults, messages, next/back rules, saving."""

from __future__ import annotations

from pathlib import Path

import pytest

from mobile_app.state import STEPS, JobScreen, JobsList, Walk
from mobile_app.store import Store


@pytest.fixture
def store(tmp_path: Path):
    with Store.open(tmp_path) as opened:
        yield opened


def new_circuit(store) -> tuple[JobScreen, int]:
    job = JobScreen(store, JobsList(store).new_job("Walk test", "1 Test Street"))
    return job, job.add_circuit(job.boards()[0].id)


def fill_to_readings(walk: Walk) -> None:
    for name, raw in (("device_curve", "B"), ("device_rating", "32"), ("line_csa", "2.5"),
                      ("cpc_csa", "1.5")):
        walk.set_field(name, raw)


def test_steps_in_walk_order() -> None:
    assert STEPS == ("device", "conductors", "tests", "readings", "results")


def test_new_circuit_gets_usual_choices(store) -> None:
    _job, circuit_id = new_circuit(store)
    walk = Walk(store, circuit_id)
    assert walk.raw("device_kind") == "mcb"
    assert walk.raw("line_material") == "copper"
    assert walk.raw("cpc_arrangement") == "in-cable"
    assert walk.raw("zs") == ""


def test_next_is_blocked_until_required_device_fields(store) -> None:
    _job, circuit_id = new_circuit(store)
    walk = Walk(store, circuit_id)
    assert not walk.can_back()
    assert "Curve is needed" in walk.missing()
    assert "Rating In is needed" in walk.missing()
    assert walk.next() == "device"
    walk.set_field("device_curve", "C")
    walk.set_field("device_rating", "32 A")
    assert walk.can_next()
    assert walk.next() == "conductors"
    assert walk.back() == "device"


def test_curve_field_only_for_circuit_breakers(store) -> None:
    _job, circuit_id = new_circuit(store)
    walk = Walk(store, circuit_id)
    assert "device_curve" in [v.spec.name for v in walk.fields()]
    walk.set_field("device_kind", "fuse-gg")
    names = [v.spec.name for v in walk.fields()]
    assert "device_curve" not in names and "library_device_id" not in names
    walk.set_field("device_kind", "curve")
    assert "library_device_id" in [v.spec.name for v in walk.fields()]


def test_invalid_reading_names_the_field_and_keeps_the_text(store) -> None:
    _job, circuit_id = new_circuit(store)
    walk = Walk(store, circuit_id, step="readings")
    fill_to_readings(walk)
    view = walk.set_field("zs", "0.6x2")
    assert view.raw == "0.6x2"
    assert view.message is not None and view.message.startswith("Zs: ")
    assert view.parsed_text == ""
    assert not walk.can_next()
    view = walk.set_field("zs", "620 mΩ")
    assert view.message is None
    assert view.parsed_text == "= 0.62 Ω"
    assert walk.can_next()


def test_optional_reading_does_not_block(store) -> None:
    _job, circuit_id = new_circuit(store)
    walk = Walk(store, circuit_id, step="readings")
    fill_to_readings(walk)
    walk.set_field("zs", "0.62")
    view = walk.set_field("zsc", "oops")
    assert view.message is not None and view.message.startswith("Zsc: ")
    assert walk.can_next()


def test_units_as_typed(store) -> None:
    _job, circuit_id = new_circuit(store)
    walk = Walk(store, circuit_id, step="conductors")
    assert walk.set_field("line_csa", "2.5mm2").parsed_text == "= 2.50 mm²"
    walk.step = "device"
    assert walk.set_field("rcd_idn", "30 mA").parsed_text == "= 0.03 A"


def test_everything_typed_survives_a_new_walk_object(store) -> None:
    _job, circuit_id = new_circuit(store)
    walk = Walk(store, circuit_id, step="readings")
    fill_to_readings(walk)
    walk.set_field("zs", "620 mΩ")
    again = Walk(store, circuit_id, step="readings")
    assert again.raw("zs") == "620 mΩ"
    assert again.raw("device_rating") == "32"


def test_save_error_keeps_typed_text(store) -> None:
    job, circuit_id = new_circuit(store)
    walk = Walk(store, circuit_id, step="readings")
    fill_to_readings(walk)
    person = store.people.add("Sam", "qualified")
    store.review.submit(job.job_id, person)
    view = walk.set_field("zs", "0.7")
    assert view.raw == "0.7"
    assert view.save_error is not None and view.save_error.startswith("Not saved")


def test_second_circuit_copies_the_first_ones_device_kind_and_curve_not_rating_or_sizes(store) -> None:
    job, first = new_circuit(store)
    fill_to_readings(Walk(store, first))
    second = job.add_circuit(job.boards()[0].id)
    walk = Walk(store, second)
    assert (walk.raw("device_kind"), walk.raw("device_curve")) == ("mcb", "B")
    assert walk.raw("line_insulation") == "thermoplastic-70"
    assert (walk.raw("device_rating"), walk.raw("line_csa"), walk.raw("cpc_csa")) == ("", "", "")
    assert walk.raw("zs") == ""
    assert walk.title.startswith("Circuit 2 ")


def test_progress_and_neighbours(store) -> None:
    _job, circuit_id = new_circuit(store)
    walk = Walk(store, circuit_id, step="conductors")
    assert walk.progress_text == "Step 2 of 5 · Conductors"
    assert walk.progress == 0.4
    assert (walk.previous_step, walk.next_step) == ("device", "tests")
    walk.step = "results"
    assert walk.next_step is None and not walk.can_next()


def test_device_from_the_library(store) -> None:
    curve_id = store.library.add("MCCB 100", [(130.0, 3000.0), (600.0, 0.04), (2000.0, 0.02)],
                                        rating_a=100.0)
    _job, circuit_id = new_circuit(store)
    walk = Walk(store, circuit_id)
    walk.set_field("device_kind", "curve")
    library = walk.field("library_device_id")
    assert [(c.value, c.label) for c in library.choices] == [(str(curve_id), "MCCB 100")]
    assert "Library device is needed" in walk.missing()
    walk.set_field("library_device_id", str(curve_id))
    walk.set_field("device_rating", "100")
    assert walk.can_next()
    walk.step = "conductors"
    walk.set_field("line_csa", "25")
    walk.set_field("cpc_csa", "16")
    walk.step = "readings"
    walk.set_field("zs", "0.2")
    panel = walk.results()
    assert panel.verdict in {"pass", "fail", "not-shown"}
    assert next(c for c in panel.checks if c.id == "disconnection").outcome in {"pass", "fail"}
    assert panel.chart is not None
    assert any(s.role == "device" for s in panel.chart.series)
