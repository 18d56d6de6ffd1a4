"""Review flow, supervisor PINs and lock-out, read-only approved jobs, revisions and the audit trail."""

from __future__ import annotations

from collections.abc import Iterator
from pathlib import Path

import pytest
from approving import reasons_for

from mobile_app.store import (
    LockedOutError,
    PinError,
    ReadOnlyError,
    ReviewError,
    Store,
)
from mobile_app.store.pins import MAX_WRONG_PINS, PIN_ITERATIONS, hash_pin, pin_matches

PIN = "482913"


class People:
    """Ids of the people in the review fixture."""

    def __init__(self, store: Store) -> None:
        self.apprentice = store.people.add("Abe Apprentice", "apprentice")
        self.qualified = store.people.add("Quin Qualified", "qualified")
        self.supervisor = store.people.add("Sue Supervisor", "supervisor", PIN)
        self.other_supervisor = store.people.add("Sam Supervisor", "supervisor", "9999")


@pytest.fixture
def store(tmp_path: Path) -> Iterator[Store]:
    """A fresh store with a clock the tests can move."""
    opened = Store.open(tmp_path)
    opened.core.clock = FakeClock()
    yield opened
    opened.close()


class FakeClock:
    """A clock in seconds that moves only when told to (for the lock-out)."""

    def __init__(self) -> None:
        self.now = 1_000_000.0

    def __call__(self) -> float:
        return self.now


def draft_job(store: Store, by: int) -> tuple[int, int]:
    """A draft job with one board and a circuit with Zs; returns (job id, circuit id)."""
    job_id = store.jobs.create({"client_ref": "R-1", "system": "TN-S", "ze": "0.8"}, by=by)
    board_id = store.boards.add(job_id, "DB1", by=by)
    circuit_id = store.circuits.add(board_id, "1", "lights", by=by)
    for name, raw in {
        "role": "final",
        "device_kind": "mcb",
        "device_curve": "B",
        "device_rating": "6",
        "line_csa": "1.5",
        "cpc_csa": "1.0",
        "zs": "1.2",
    }.items():
        store.circuits.set_field(circuit_id, name, raw, by=by)
    return job_id, circuit_id


def test_pin_hash_is_salted_pbkdf2_and_checked() -> None:
    first, second = hash_pin(PIN), hash_pin(PIN)
    assert first != second and first.startswith(f"pbkdf2-sha256${PIN_ITERATIONS}$")
    assert pin_matches(PIN, first) and not pin_matches("482914", first)
    for bad in ("12a4", "123", "١٢٣٤", "12²4"):
        with pytest.raises(PinError, match="a PIN must be at least 4 digits"):
            hash_pin(bad)


def test_draft_submitted_approved(store: Store) -> None:
    people = People(store)
    job_id, circuit_id = draft_job(store, people.apprentice)
    store.review.submit(job_id, people.apprentice)
    assert store.jobs.get(job_id)["status"] == "submitted"
    store.review.approve(job_id, people.supervisor, PIN, reasons_for(store, job_id))
    job = store.jobs.get(job_id)
    assert (job["status"], job["approved_by"], job["submitted_by"]) == (
        "approved",
        people.supervisor,
        people.apprentice,
    )
    with pytest.raises(ReadOnlyError, match="open a new revision"):
        store.circuits.set_field(circuit_id, "zs", "0.9")
    with pytest.raises(ReadOnlyError):
        store.jobs.set_field(job_id, "ze", "0.5")
    with pytest.raises(ReadOnlyError):
        store.boards.add(job_id, "DB2")
    with pytest.raises(ReadOnlyError):
        store.jobs.reassess(job_id)


def test_a_submitted_job_is_frozen_until_returned_with_a_comment(store: Store) -> None:
    people = People(store)
    job_id, circuit_id = draft_job(store, people.qualified)
    store.review.submit(job_id, people.qualified)
    with pytest.raises(ReadOnlyError, match="return it to draft"):
        store.circuits.set_field(circuit_id, "zs", "0.9")
    with pytest.raises(ReviewError, match="a comment is needed"):
        store.review.return_to_draft(job_id, people.supervisor, "  ", PIN)
    with pytest.raises(ReviewError, match="only a supervisor"):
        store.review.return_to_draft(job_id, people.qualified, "fine by me", PIN)
    with pytest.raises(PinError, match="PIN is needed"):
        store.review.return_to_draft(job_id, people.supervisor, "Zs on circuit 1 looks high: retest")
    with pytest.raises(PinError, match="wrong PIN"):
        store.review.return_to_draft(job_id, people.supervisor, "Zs on circuit 1 looks high: retest", "0000")
    store.review.return_to_draft(job_id, people.supervisor, "Zs on circuit 1 looks high: retest", PIN)
    job = store.jobs.get(job_id)
    assert (job["status"], job["review_comment"]) == ("draft", "Zs on circuit 1 looks high: retest")
    store.circuits.set_field(circuit_id, "zs", "0.9", by=people.qualified)


def test_review_steps_out_of_order_are_refused(store: Store) -> None:
    people = People(store)
    job_id, _ = draft_job(store, people.qualified)
    with pytest.raises(ReviewError, match="is draft, not submitted"):
        store.review.approve(job_id, people.supervisor, PIN, reasons_for(store, job_id))
    store.review.submit(job_id, people.qualified)
    with pytest.raises(ReviewError, match="is submitted, not draft"):
        store.review.submit(job_id, people.qualified)
    with pytest.raises(ReviewError, match="is not a supervisor"):
        store.review.approve(job_id, people.qualified, PIN, reasons_for(store, job_id))


def test_wrong_pins_count_down_then_lock_out_even_the_right_pin_whatever_the_clock(store: Store) -> None:
    people = People(store)
    job_id, _ = draft_job(store, people.qualified)
    store.review.submit(job_id, people.qualified)
    for left in range(MAX_WRONG_PINS - 1, 0, -1):
        with pytest.raises(PinError) as caught:
            store.review.approve(job_id, people.supervisor, "0000", reasons_for(store, job_id))
        assert str(caught.value) == f"wrong PIN ({left} attempts left before a lock-out)"
        assert not isinstance(caught.value, LockedOutError)
    with pytest.raises(LockedOutError, match="Sue Supervisor is locked after 5 wrong attempts"):
        store.review.approve(job_id, people.supervisor, "0000", reasons_for(store, job_id))
    store.core.clock.now += 10 * 365 * 24 * 3600  # a clock moved forward buys nothing
    with pytest.raises(LockedOutError, match="stays locked"):
        store.review.approve(job_id, people.supervisor, PIN, reasons_for(store, job_id))
    assert store.jobs.get(job_id)["status"] == "submitted"
    wrong = [a for a in store.jobs.audit(job_id) if a["field"] == "pin"]
    assert len(wrong) == MAX_WRONG_PINS and all(a["who"] == "Sue Supervisor" for a in wrong)


def test_a_right_pin_resets_the_count_of_wrong_ones(store: Store) -> None:
    people = People(store)
    for _ in range(2):
        job_id, _ = draft_job(store, people.qualified)
        store.review.submit(job_id, people.qualified)
        for _ in range(MAX_WRONG_PINS - 1):
            with pytest.raises(PinError):
                store.review.approve(job_id, people.supervisor, "1111", reasons_for(store, job_id))
        store.review.approve(job_id, people.supervisor, PIN, reasons_for(store, job_id))


def test_a_supervisor_without_a_pin_cannot_approve(store: Store) -> None:
    people = People(store)
    no_pin = store.people.add("Nell", "supervisor")
    job_id, _ = draft_job(store, people.qualified)
    store.review.submit(job_id, people.qualified)
    with pytest.raises(PinError, match="no PIN is set for Nell"):
        store.review.approve(job_id, no_pin, "1234", reasons_for(store, job_id))
    store.people.set_pin(no_pin, "1234")
    store.review.approve(job_id, no_pin, "1234", reasons_for(store, job_id))


def test_revision_copies_the_approved_job_and_leaves_it_unchanged(store: Store) -> None:
    people = People(store)
    job_id, circuit_id = draft_job(store, people.qualified)
    store.review.submit(job_id, people.qualified)
    store.review.approve(job_id, people.supervisor, PIN, reasons_for(store, job_id))
    approved = store.documents.export(job_id)
    with pytest.raises(ReviewError, match="a reason is needed"):
        store.review.open_revision(job_id, " ", people.qualified)
    new_id = store.review.open_revision(job_id, "RCD added to circuit 1", people.qualified)
    with pytest.raises(ReviewError, match=f"revision job {new_id} is already open"):
        store.review.open_revision(job_id, "again", people.qualified)
    new = store.jobs.get(new_id)
    assert (new["status"], new["revision"], new["parent_job_id"], new["revision_reason"]) == (
        "draft",
        2,
        job_id,
        "RCD added to circuit 1",
    )
    (board,) = store.boards.of_job(new_id)
    (circuit,) = store.circuits.of_board(board["id"])
    copied = store.circuits.get(circuit["id"])
    assert copied["fields"] == store.circuits.get(circuit_id)["fields"]
    store.circuits.set_field(circuit["id"], "rcd_idn", "30 mA", by=people.qualified)
    after = store.documents.export(job_id)
    assert after["boards"] == approved["boards"] and after["job"] == approved["job"]
    listed = {j["id"]: j for j in store.jobs.all()}
    assert listed[job_id]["superseded"] == 1 and listed[new_id]["superseded"] == 0
    with pytest.raises(ReviewError, match="only an approved job is revised"):
        store.review.open_revision(new_id, "why not", people.qualified)


def test_audit_trail_records_who_what_old_and_new(store: Store) -> None:
    people = People(store)
    job_id, circuit_id = draft_job(store, people.apprentice)
    store.circuits.set_field(circuit_id, "zs", "1.35", by=people.qualified)
    store.jobs.set_field(job_id, "ze", "0.75", by=people.qualified)
    trail = store.jobs.audit(job_id)
    zs_changes = [a for a in trail if a["field"] == "zs"]
    assert [(a["who"], a["old"], a["new"], a["what"]) for a in zs_changes] == [
        ("Abe Apprentice", "", "1.2", "circuit 1 zs"),
        ("Quin Qualified", "1.2", "1.35", "circuit 1 zs"),
    ]
    ze = [a for a in trail if a["entity"] == "job" and a["field"] == "ze"]
    assert [(a["old"], a["new"]) for a in ze] == [("0.8", "0.75")]
    assert all(a["when"].endswith("+00:00") for a in trail)
    assert [a["id"] for a in trail] == sorted(a["id"] for a in trail)
