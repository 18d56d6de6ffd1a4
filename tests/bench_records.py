"""Benchmark of the job store: prints figures, asserts nothing.

    python tests/bench_records.py

Figures (medians of several runs, on a real file in a temporary folder, synchronous=FULL):
- save one reading through the store, including the reassessment it triggers (target ≤ 5 ms);
- the same writes with plain sqlite3 on the same file in the same run, alternating save by save
  with the store so both meet the same disk (same UPDATE of the circuit row with an assessment of
  the same size, same audit INSERT, same job time UPDATE, one COMMIT): the ratio store/plain
  (target ≤ 3×), also shown without the time spent inside calc.assess;
- opening a 500-circuit job (target ≤ 200 ms): opening the store file (integrity check included),
  the job overview (job, boards, circuit lists) and the whole job with every assessment;
- a supply change, which reassesses all 500 circuits in one transaction (no target).
"""

from __future__ import annotations

import json
import sqlite3
import statistics
import sys
import tempfile
import time
from collections.abc import Callable
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

import calc  # noqa: E402
from mobile_app.store import Store  # noqa: E402

SAVES = 200
ROUNDS = 5
OPEN_RUNS = 7
BOARDS, CIRCUITS_PER_BOARD = 10, 50
SPEC = {
    "role": "final",
    "device_kind": "mcb",
    "device_curve": "B",
    "device_rating": "32",
    "line_csa": "2.5",
    "line_material": "copper",
    "line_insulation": "thermoplastic-70",
    "cpc_csa": "1.5",
    "cpc_material": "copper",
    "cpc_arrangement": "in-cable",
    "zsc": "0.45",
    "r1r2": "0.3",
    "test_temp_c": "20",
}


def timed_ms(action: Callable[..., object], *args: object) -> float:
    """Milliseconds taken by one call of `action(*args)`."""
    start = time.perf_counter()
    action(*args)
    return (time.perf_counter() - start) * 1000


def build_job(store: Store) -> int:
    """A TN-C-S job of BOARDS boards × CIRCUITS_PER_BOARD B32 circuits with readings."""
    job_id = store.jobs.create({"client_ref": "BENCH", "system": "TN-C-S", "ze": "0.35", "pfc": "1.5 kA"})
    for b in range(BOARDS):
        board_id = store.boards.add(job_id, f"DB{b + 1}")
        first = store.circuits.add(board_id, "1")
        for name, raw in SPEC.items():
            store.circuits.set_field(first, name, raw)
        store.circuits.set_field(first, "zs", "0.62")
        for n in range(2, CIRCUITS_PER_BOARD + 1):
            circuit_id = store.circuits.add(board_id, str(n))
            for name in ("device_rating", "line_csa", "cpc_csa"):  # not taken from the previous circuit
                store.circuits.set_field(circuit_id, name, SPEC[name])
            store.circuits.set_field(circuit_id, "zs", f"{0.4 + n / 100:.2f}")
    return job_id


def plain_save(conn: sqlite3.Connection, circuit_id: int, raw: str, assessment: str) -> None:
    """The writes of one save done by hand with sqlite3: circuit row, audit row, job time, COMMIT."""
    conn.execute("BEGIN IMMEDIATE")
    conn.execute(
        "UPDATE circuits SET zs_raw = ?, zs_value = ?, zs_error = NULL,"
        " version = version + 1, updated_at = ?, verdict = 'pass', assessment = ?,"
        " calc_version = ? WHERE id = ?",
        (raw, float(raw), "2026-01-01T00:00:00+00:00", assessment, calc.__version__, circuit_id),
    )
    conn.execute(
        "INSERT INTO audit (job_id, at, entity, entity_id, field, old, new)"
        " VALUES (1, '2026-01-01T00:00:00+00:00', 'circuit', ?, 'zs', '', ?)",
        (circuit_id, raw),
    )
    conn.execute("UPDATE jobs SET updated_at = '2026-01-01T00:00:00+00:00' WHERE id = 1")
    conn.execute("COMMIT")


def main() -> int:
    with tempfile.TemporaryDirectory() as folder:
        data = Path(folder)
        store = Store.open(data)
        start = time.perf_counter()
        job_id = build_job(store)
        build_s = time.perf_counter() - start
        circuit_id = store.circuits.of_board(store.boards.of_job(job_id)[0]["id"])[0]["id"]
        calc_input = store.circuits.calc_input(circuit_id)
        assessment = json.dumps(calc.assess(calc_input).to_dict(), ensure_ascii=False, separators=(",", ":"))

        plain = sqlite3.connect(store.path, isolation_level=None)
        plain.execute("PRAGMA synchronous=FULL")
        plain.execute("PRAGMA foreign_keys=ON")
        store_ms: list[float] = []
        plain_ms: list[float] = []
        calc_ms: list[float] = []
        for i in range(ROUNDS * SAVES):
            raw = f"0.{500 + i % 400}"
            store_ms.append(timed_ms(store.circuits.set_field, circuit_id, "zs", raw))
            plain_ms.append(timed_ms(plain_save, plain, circuit_id, raw, assessment))
            calc_ms.append(timed_ms(lambda: calc.assess(calc_input).to_dict()))
        plain.close()
        store.close()

        supply_ms = []
        with Store.open(data) as again:
            for i in range(3):
                supply_ms.append(timed_ms(again.jobs.set_field, job_id, "ze", f"0.3{i}"))
        open_ms, overview_ms, whole_ms = [], [], []
        for _ in range(OPEN_RUNS):
            start = time.perf_counter()
            again = Store.open(data)
            open_ms.append((time.perf_counter() - start) * 1000)
            start = time.perf_counter()
            again.jobs.get(job_id)
            rows = [again.circuits.of_board(board["id"]) for board in again.boards.of_job(job_id)]
            overview_ms.append((time.perf_counter() - start) * 1000)
            start = time.perf_counter()
            document = again.documents.export(job_id)
            whole_ms.append((time.perf_counter() - start) * 1000)
            again.close()
        circuits = sum(len(r) for r in rows)
        assert circuits == sum(len(b["circuits"]) for b in document["boards"])

    save, base, calc_only = (statistics.median(x) for x in (store_ms, plain_ms, calc_ms))
    print(f"records benchmark (medians; {ROUNDS}×{SAVES} saves, {OPEN_RUNS} opens; synchronous=FULL, WAL)")
    print(f"  built a job of {circuits} circuits in {build_s:.1f} s")
    print(f"  save one reading incl. reassessment: {save:.2f} ms   (target ≤ 5 ms)")
    print(f"  same writes, plain sqlite3:          {base:.2f} ms")
    print(f"  ratio store / plain sqlite3:         {save / base:.2f}×   (target ≤ 3×)")
    print(
        f"  of which calc.assess alone:          {calc_only:.2f} ms; ratio without it: "
        f"{(save - calc_only) / base:.2f}×"
    )
    print(f"  open the store file (integrity check, migrations check): {statistics.median(open_ms):.1f} ms")
    print(
        f"  open a {circuits}-circuit job, overview (job, boards, circuit lists): "
        f"{statistics.median(overview_ms):.1f} ms   (target ≤ 200 ms)"
    )
    print(
        f"  open a {circuits}-circuit job, whole (every circuit with its assessment): "
        f"{statistics.median(whole_ms):.1f} ms"
    )
    print(
        f"  supply change reassessing all {circuits} circuits (one transaction): "
        f"{statistics.median(supply_ms):.0f} ms"
    )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
