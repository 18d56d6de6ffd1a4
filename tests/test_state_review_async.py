"""The review's awaited paths, as the browser build's screens use them: the PIN or passphrase is
derived first (`kdf.derive_for`, WebCrypto in the browser, hashlib here), then handed to the store,
which keeps one stored form for both. PBKDF2-HMAC-SHA256 per RFC 8018 section 5.2."""

from __future__ import annotations

import asyncio
from collections.abc import Iterator
from pathlib import Path

import pytest
from approving import reasons_for
from test_records_review import draft_job

from mobile_app.signing import kdf
from mobile_app.signing.errors import KeyFormatError
from mobile_app.state.review import ReviewState
from mobile_app.store import Store
from mobile_app.store.pins import PIN_ITERATIONS, pin_matches


@pytest.fixture
def store(tmp_path: Path) -> Iterator[Store]:
    opened = Store.open(tmp_path)
    yield opened
    opened.close()


def test_a_supervisor_added_with_derived_pins_approves_and_returns_with_the_typed_pin(store: Store) -> None:
    review = ReviewState(store, 0)
    outcome = asyncio.run(review.add_supervisor_async("Ines Okafor", "2468"))
    assert outcome.ok, outcome.message
    person = store.people.get(next(p["id"] for p in store.people.all() if p["name"] == "Ines Okafor"))
    # the stored verifier is the text form both forms read, at the PIN's iteration count
    assert person["pin_hash"].startswith(f"pbkdf2-sha256${PIN_ITERATIONS}$")
    assert pin_matches("2468", person["pin_hash"]) and not pin_matches("2469", person["pin_hash"])

    recorder = store.people.add("Rosa Quennell", "qualified")
    job_id, _ = draft_job(store, recorder)
    store.review.submit(job_id, recorder)
    job = ReviewState(store, job_id)
    refused = asyncio.run(job.return_to_draft_async("Ines Okafor", "check circuit 1", "1111"))
    assert not refused.ok and "PIN not accepted" in refused.message
    returned = asyncio.run(job.return_to_draft_async("Ines Okafor", "check circuit 1", "2468"))
    assert returned.ok, returned.message
    store.review.submit(job_id, recorder)
    unanswered = asyncio.run(job.approve_async("Ines Okafor", "2468"))
    assert not unanswered.ok and "reason" in unanswered.message  # the job has an item to answer
    approved = asyncio.run(job.approve_async("Ines Okafor", "2468", reasons_for(store, job_id)))
    assert approved.ok and "unverified" in approved.message
    assert job.status == "approved"


def test_a_bad_pin_or_name_is_refused_before_any_derivation(store: Store) -> None:
    review = ReviewState(store, 0)
    assert not asyncio.run(review.add_supervisor_async("Ines Okafor", "12")).ok
    assert not asyncio.run(review.add_supervisor_async(" ", "2468")).ok
    assert store.people.all() == []


def test_the_store_takes_a_tuple_of_derivations_and_picks_each_by_its_parameters(store: Store) -> None:
    params = kdf.new_params(PIN_ITERATIONS)
    other = kdf.new_params(PIN_ITERATIONS)
    both = (asyncio.run(kdf.derive_for("2468", params)), asyncio.run(kdf.derive_for("2468", other)))
    assert kdf.resolve(both, other) == kdf.derive_now("2468", other)
    with pytest.raises(KeyFormatError):
        kdf.resolve(both[:1], other)
