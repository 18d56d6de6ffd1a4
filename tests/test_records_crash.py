"""Crash safety: a child process saving readings is killed with SIGKILL at random moments; after each
kill the store opens, passes `PRAGMA integrity_check`, and every acknowledged save is there."""

from __future__ import annotations

import random
import signal
import sqlite3
import subprocess
import sys
import time
from pathlib import Path

import pytest

from mobile_app.store import Store
from mobile_app.store.core import STORE_FILE

ROOT = Path(__file__).resolve().parents[1]
KILLS = 25

# The child saves one field at a time and prints "ack <raw>" only after circuits.set_field returned
# (that is, after COMMIT). It alternates a reading with units and a unicode description.
CHILD = """
import sys
from pathlib import Path
import calc
from mobile_app.store import Store
store = Store.open(Path(sys.argv[1]))
calc.parse_value("measured.zs", "1 mΩ")  # the unit registry is made on the first unit: before "ready"
run = int(sys.argv[2])
ids = [int(i) for i in sys.argv[3].split(",")]
print("ready", flush=True)
n = 0
while True:
    n += 1
    circuit_id = ids[n % len(ids)]
    if n % 2:
        raw = f"{run * 1_000_000 + n} mΩ"
        store.circuits.set_field(circuit_id, "zs", raw)
    else:
        raw = f"run {run} save {n} ✓ — ünïcode"
        store.circuits.set_field(circuit_id, "description", raw)
    print("ack", circuit_id, raw, flush=True)
"""


def complete_lines(output: str) -> list[str]:
    """The lines the child finished writing: a kill can cut the last one short, and a partly written
    "ack" is no acknowledgement."""
    return output.split("\n")[:-1]


def prepare(folder: Path) -> list[int]:
    """A store with one job, one board and four B32 circuits; returns the circuit ids."""
    with Store.open(folder) as store:
        job_id = store.jobs.create({"client_ref": "CRASH", "system": "TN-S", "ze": "0.3"})
        board_id = store.boards.add(job_id, "DB1")
        first = store.circuits.add(board_id, "1")
        for name, raw in {
            "role": "final",
            "device_kind": "mcb",
            "device_curve": "B",
            "device_rating": "32",
            "line_csa": "2.5",
            "cpc_csa": "1.5",
        }.items():
            store.circuits.set_field(first, name, raw)
        return [first] + [sized(store, store.circuits.add(board_id, str(n))) for n in (2, 3, 4)]


def sized(store: Store, circuit_id: int) -> int:
    """Give a new circuit the rating and sizes, which it does not take from the previous one."""
    for name, raw in (("device_rating", "32"), ("line_csa", "2.5"), ("cpc_csa", "1.5")):
        store.circuits.set_field(circuit_id, name, raw)
    return circuit_id


@pytest.mark.slow
def test_sigkill_at_random_moments_loses_no_acknowledged_save(tmp_path: Path) -> None:
    ids = prepare(tmp_path)
    chance = random.Random(20261202)
    acknowledged: list[tuple[int, str]] = []
    for run in range(1, KILLS + 1):
        child = subprocess.Popen(
            [sys.executable, "-c", CHILD, str(tmp_path), str(run), ",".join(map(str, ids))],
            cwd=ROOT,
            stdout=subprocess.PIPE,
            text=True,
            encoding="utf-8",
        )
        assert child.stdout is not None
        assert child.stdout.readline().strip() == "ready"
        time.sleep(chance.uniform(0.0, 0.25))
        child.send_signal(signal.SIGKILL)
        output, _ = child.communicate(timeout=30)
        assert child.returncode == -signal.SIGKILL
        lines = [line.split(" ", 2) for line in complete_lines(output) if line.startswith("ack ")]
        acknowledged += [(int(circuit_id), raw) for _, circuit_id, raw in lines]

        conn = sqlite3.connect(tmp_path / STORE_FILE)
        assert conn.execute("PRAGMA integrity_check").fetchall() == [("ok",)]
        conn.close()
        with Store.open(tmp_path) as store:
            assert store.recovered is None
            saved = {(row["entity_id"], row["new"]) for row in store.jobs.audit(1)}
            missing = [pair for pair in acknowledged if pair not in saved]
            assert missing == [], f"run {run}: acknowledged saves lost: {missing[:5]}"
            for circuit_id in ids:
                circuit = store.circuits.get(circuit_id)
                last = {"zs": None, "description": None}
                for entry in store.jobs.audit(1):
                    if entry["entity_id"] == circuit_id and entry["field"] in last:
                        last[entry["field"]] = entry["new"]
                for name, raw in last.items():
                    if raw is not None:
                        assert circuit["fields"][name]["raw"] == raw
    assert len(acknowledged) > KILLS, "the child hardly saved anything before the kills"
    print(f"{KILLS} kills, {len(acknowledged)} acknowledged saves, all present")


SUPPLY_KILLS = 8
SUPPLY_CHILD = """
import sys
from pathlib import Path
import calc
from mobile_app.store import Store
store = Store.open(Path(sys.argv[1]))
calc.parse_value("supply.ze", "1 Ω")  # the unit registry is made on the first unit: before "ready"
print("ready", flush=True)
n = 0
while True:
    n += 1
    raw = f"0.{100 + (int(sys.argv[2]) * 1000 + n) % 800} Ω"
    store.jobs.set_field(1, "ze", raw)
    print("ack", raw, flush=True)
"""


@pytest.mark.slow
def test_sigkill_during_supply_changes_leaves_every_circuit_assessed_with_the_saved_ze(
    tmp_path: Path,
) -> None:
    prepare(tmp_path)
    with Store.open(tmp_path) as store:
        board_id = store.boards.of_job(1)[0]["id"]
        for number in range(5, 41):
            store.circuits.set_field(sized(store, store.circuits.add(board_id, str(number))), "r1r2", "0.2")
    chance = random.Random(4181)
    total_acked = 0
    for run in range(1, SUPPLY_KILLS + 1):
        child = subprocess.Popen(
            [sys.executable, "-c", SUPPLY_CHILD, str(tmp_path), str(run)],
            cwd=ROOT,
            stdout=subprocess.PIPE,
            text=True,
            encoding="utf-8",
        )
        assert child.stdout is not None
        assert child.stdout.readline().strip() == "ready"
        time.sleep(chance.uniform(0.05, 0.4))
        child.send_signal(signal.SIGKILL)
        output, _ = child.communicate(timeout=30)
        acked = [line[4:] for line in complete_lines(output) if line.startswith("ack ")]
        total_acked += len(acked)
        with Store.open(tmp_path) as store:
            assert store.db.conn.execute("PRAGMA integrity_check").fetchone() == ("ok",)
            ze = store.jobs.get(1)["fields"]["ze"]
            if acked:
                history = [a["new"] for a in store.jobs.audit(1) if a["field"] == "ze"]
                assert acked[-1] in history[-2:]
            assessed = [store.circuits.get(c["id"])["assessment"] for c in store.circuits.of_board(board_id)]
            assert len(assessed) == 40 and all(a is not None for a in assessed)
            assert [a["inputs"]["supply"]["ze"] for a in assessed] == [pytest.approx(ze["value"])] * 40
    assert total_acked > SUPPLY_KILLS, "the child hardly saved anything before the kills"
