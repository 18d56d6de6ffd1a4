"""The outbox shares the store's connection lock: threads using one Store do not interleave writes."""

from __future__ import annotations

import threading
from datetime import UTC, datetime, timedelta
from pathlib import Path

import pytest
from sync_server import make_bundle

from mobile_app.store import Store
from mobile_app.store.core import db_lock
from mobile_app.sync.outbox import Outbox

T0 = datetime(2026, 12, 2, 8, 0, tzinfo=UTC)
ROUNDS = 30


def _run(workers: list[threading.Thread]) -> None:
    """Start the threads together and wait for them (bounded)."""
    for worker in workers:
        worker.start()
    for worker in workers:
        worker.join(60)
    assert not any(worker.is_alive() for worker in workers)


def test_outbox_and_store_take_one_lock(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        assert Outbox(store.db)._lock is store.core.lock is db_lock(store.db)


def test_two_threads_enqueueing_and_marking_while_a_third_saves(tmp_path: Path) -> None:
    made = [make_bundle(tmp_path / "exports", f"job{n}-rev1", {f"job{n}.json": b'{"n": %d}' % n})
            for n in range(2 * ROUNDS)]
    errors: list[BaseException] = []
    with Store.open(tmp_path / "data") as store:
        job_id = store.jobs.create({"client_ref": "LOCK-1"})
        circuit_id = store.circuits.add(store.boards.add(job_id, "DB1"), "1")
        outbox = Outbox(store.db)
        start = threading.Barrier(3)

        def queue_and_mark(bundles: list[Path]) -> None:
            try:
                start.wait()
                for n, bundle in enumerate(bundles):
                    entry_id = outbox.enqueue(bundle, job_id=job_id, revision=1, now=T0)
                    outbox.enqueue(bundle, job_id=job_id, revision=1, now=T0)  # same bundle: same entry
                    if n % 2:
                        outbox.mark_sent(entry_id, T0)
                    else:
                        outbox.mark_failed(entry_id, "server down", "offline", T0 + timedelta(minutes=1), T0)
            except BaseException as error:  # noqa: BLE001 - collected and asserted below
                errors.append(error)

        def save_then_give_up() -> None:
            try:
                start.wait()
                for n in range(ROUNDS):
                    with pytest.raises(RuntimeError), store.batch():
                        store.circuits.set_field(circuit_id, "zs", f"{n}.5 Ω")
                        store.circuits.set_field(circuit_id, "description", f"abandoned {n}")
                        raise RuntimeError("the person cancelled")
                    store.circuits.set_field(circuit_id, "r1r2", f"0.{n + 1}")
            except BaseException as error:  # noqa: BLE001 - collected and asserted below
                errors.append(error)

        _run([
            threading.Thread(target=queue_and_mark, args=(made[:ROUNDS],)),
            threading.Thread(target=queue_and_mark, args=(made[ROUNDS:],)),
            threading.Thread(target=save_then_give_up),
        ])
        assert errors == []
        assert len(outbox.sent()) == ROUNDS and len(outbox.waiting()) == ROUNDS
        assert all(row["attempts"] == 1 and row["last_error"] == "server down" for row in outbox.waiting())
        fields = store.circuits.get(circuit_id)["fields"]
        assert (fields["zs"]["raw"], fields["description"]["raw"]) == ("", "")  # no cancelled save leaked
        assert fields["r1r2"]["raw"] == f"0.{ROUNDS}"
        assert store.db.execute("PRAGMA integrity_check").fetchone() == ("ok",)
        assert not store.db.conn.in_transaction
