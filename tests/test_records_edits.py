"""Copying and deleting on a real store file: a circuit copied with the next reference and no
readings; circuits, boards and saved curves deleted with an audit entry each and put back by undo;
a saved curve changed (its draft circuits reassessed) but never under a job in review or approved."""

from __future__ import annotations

import json
from collections.abc import Iterator
from pathlib import Path

import pytest

from mobile_app.store import InUseError, ReadOnlyError, Store
from mobile_app.store.circuits import next_reference

B32 = {
    "role": "final", "device_kind": "mcb", "device_curve": "B", "device_rating": "32",
    "line_csa": "2.5", "line_material": "copper", "line_insulation": "thermoplastic-70",
    "cpc_csa": "1.5", "cpc_material": "copper", "cpc_arrangement": "in-cable",
}
# A maker's curve as the demo's: points read off a chart (invented, demo only).
POINTS = [[200.0, 10.0], [500.0, 1.0], [2000.0, 0.02]]


@pytest.fixture
def store(tmp_path: Path) -> Iterator[Store]:
    opened = Store.open(tmp_path)
    yield opened
    opened.close()


def _job(store: Store) -> tuple[int, int, list[int]]:
    job_id = store.jobs.create({"client_ref": "E-1", "system": "TN-C-S", "ze": "0.35"})
    board_id = store.boards.add(job_id, "DB1")
    circuits = []
    for number, zs in (("1", "0.62"), ("2", "1.9")):
        circuit_id = store.circuits.add(board_id, number, f"way {number}")
        for name, raw in {**B32, "zs": zs, "r1r2": "0.3"}.items():
            store.circuits.set_field(circuit_id, name, raw)
        circuits.append(circuit_id)
    return job_id, board_id, circuits


def _audit(store: Store, job_id: int | None = None) -> list[dict]:
    if job_id is not None:
        return store.jobs.audit(job_id)
    return store.core.query("SELECT * FROM audit WHERE job_id IS NULL ORDER BY id")


@pytest.mark.parametrize(("reference", "taken", "expected"), [
    ("3", ["1", "2", "3"], "4"),
    ("3", ["3", "4", "5"], "6"),
    ("L2-4", ["L2-4"], "L2-5"),
    ("Cooker", ["Cooker"], "Cooker-2"),
    ("", ["", "1"], "2"),
])
def test_next_reference_counts_on_past_the_references_taken(reference, taken, expected):
    assert next_reference(reference, taken) == expected


def test_a_copy_takes_the_next_reference_and_no_readings(store):
    job_id, board_id, (first, second) = _job(store)
    copy_id = store.circuits.copy(first)
    copy = store.circuits.get(copy_id)
    fields = {name: f["raw"] for name, f in copy["fields"].items()}
    assert fields["number"] == "3" and fields["description"] == "way 1"
    assert fields["device_rating"] == "32" and fields["cpc_csa"] == "1.5"
    assert fields["zs"] == fields["r1r2"] == ""
    assert copy["verdict"] == "not-shown"  # no Zs yet: nothing decided
    assert [c["id"] for c in store.circuits.of_board(board_id)] == [first, second, copy_id]
    entry = _audit(store, job_id)[-1]
    assert (entry["entity"], entry["entity_id"], entry["old"], entry["new"]) == (
        "circuit", copy_id, f"copy of circuit {first}", "3")


def test_a_circuit_deleted_is_in_the_audit_trail_and_comes_back_on_undo(store):
    job_id, board_id, (first, second) = _job(store)
    before = store.circuits.get(second)
    removed = store.removals.circuit(second)
    assert removed.label == "circuit 2 · way 2"
    assert [c["id"] for c in store.circuits.of_board(board_id)] == [first]
    entry = _audit(store, job_id)[-1]
    assert (entry["entity"], entry["entity_id"], entry["field"]) == ("circuit", second, "removed")
    assert json.loads(entry["old"])["zs"] == "1.9"  # what was typed stays in the trail
    assert store.removals.restore(removed) == second
    after = store.circuits.get(second)
    assert after["fields"] == before["fields"] and after["verdict"] == before["verdict"]
    assert _audit(store, job_id)[-1]["field"] == "restored"
    assert store.integrity.check().message is None  # the chain still holds


def test_a_board_deleted_takes_its_circuits_and_undo_brings_them_back(store):
    job_id, board_id, circuits = _job(store)
    store.boards.add(job_id, "DB2")
    removed = store.removals.board(board_id)
    assert removed.label == "board DB1 and its 2 circuits"
    assert [b["designation"] for b in store.boards.of_job(job_id)] == ["DB2"]
    typed = json.loads(_audit(store, job_id)[-1]["old"])
    assert typed["designation"] == "DB1" and [c["zs"] for c in typed["circuits"]] == ["0.62", "1.9"]
    store.removals.restore(removed)
    assert [b["designation"] for b in store.boards.of_job(job_id)] == ["DB1", "DB2"]
    assert [c["id"] for c in store.circuits.of_board(board_id)] == circuits


def test_undo_after_the_id_was_taken_again_restores_under_a_new_id(store):
    job_id, board_id, (first, second) = _job(store)
    removed = store.removals.circuit(second)
    newer = store.circuits.add(board_id, "9")  # SQLite reuses the highest id
    assert newer == second
    restored = store.removals.restore(removed)
    assert restored not in (first, second)
    numbers = [c["number"] for c in store.circuits.of_board(board_id)]
    assert sorted(numbers) == ["1", "2", "9"]


def test_nothing_is_deleted_or_copied_in_a_job_under_review(store):
    job_id, board_id, (first, _second) = _job(store)
    person = store.people.add("Sam Hale", "qualified")
    store.review.submit(job_id, person)
    for attempt in (lambda: store.removals.circuit(first), lambda: store.removals.board(board_id),
                    lambda: store.circuits.copy(first)):
        with pytest.raises(ReadOnlyError):
            attempt()
    assert len(store.circuits.of_board(board_id)) == 2


def test_a_saved_curve_in_use_is_not_deleted_and_one_unused_is(store):
    job_id, board_id, (first, _second) = _job(store)
    used = store.library.add("Maker 100 A", POINTS, rating_a=100)
    unused = store.library.add("Maker 63 A", POINTS, rating_a=63)
    store.circuits.set_field(first, "device_kind", "curve")
    store.circuits.set_field(first, "library_device_id", str(used))
    with pytest.raises(InUseError, match=f"curve {used} cannot be deleted: used by job E-1 circuit 1"):
        store.removals.curve(used)
    removed = store.removals.curve(unused)
    assert [d["name"] for d in store.library.all()] == ["Maker 100 A"]
    assert _audit(store)[-1]["field"] == "removed"
    store.removals.restore(removed)
    assert [d["name"] for d in store.library.all()] == ["Maker 100 A", "Maker 63 A"]


def test_changing_a_saved_curve_reassesses_draft_circuits_and_spares_approved_jobs(store):
    job_id, _board_id, (first, _second) = _job(store)
    device = store.library.add("Maker 100 A", POINTS, rating_a=100)
    store.circuits.set_field(first, "device_kind", "curve")
    store.circuits.set_field(first, "library_device_id", str(device))
    before = store.circuits.get(first)["assessment"]["device_time_s"]
    slower = [[200.0, 20.0], [500.0, 5.0], [2000.0, 0.5]]
    assert store.curves.update(device, "Maker 100 A (rev B)", slower, rating_a=100) == 1
    after = store.circuits.get(first)["assessment"]["device_time_s"]
    assert after > before  # the slower curve's time at the same fault current
    assert store.library.find(device)["name"] == "Maker 100 A (rev B)"
    assert _audit(store, job_id)[-1]["new"] == f"reassessed: saved curve {device} changed"
    person = store.people.add("Sam Hale", "qualified")
    store.review.submit(job_id, person)
    with pytest.raises(InUseError, match="cannot be changed: used by job E-1 circuit 1"):
        store.curves.update(device, "Maker 100 A", POINTS, rating_a=100)
    assert store.library.find(device)["points"] == slower


def test_a_curve_an_approved_job_still_names_is_kept_even_under_another_device_kind(store):
    job_id, _board_id, (first, _second) = _job(store)
    device = store.library.add("Maker 100 A", POINTS, rating_a=100)
    store.circuits.set_field(first, "device_kind", "curve")
    store.circuits.set_field(first, "library_device_id", str(device))
    store.circuits.set_field(first, "device_kind", "mcb")  # switched back: the curve is still named
    assert store.library.users(device) == [] and len(store.library.users(device, every_reference=True)) == 1
    person = store.people.add("Ann Marsh", "supervisor", "135790")
    store.review.submit(job_id, person)
    store.review.approve(job_id, person, "135790", {c.key: "test" for c in store.review.concerns(job_id)})
    with pytest.raises(InUseError, match="cannot be deleted"):
        store.removals.curve(device)
    with pytest.raises(InUseError, match="cannot be changed"):
        store.curves.update(device, "Maker 100 A", POINTS)
    assert store.integrity.check().broken == {}  # the approved document still holds its curve
