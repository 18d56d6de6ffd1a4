"""Benchmark of the export: prints figures, asserts nothing.

    python tests/bench_export.py [--rounds N]

A 500-circuit job (10 boards × 50 assessed circuits, in a real store in a temporary folder) is
exported to each format; each figure is the median of several rounds. Target: the three formats
≤ 5 s together. For scale, the same run times a baseline: `json.dumps` of the job document with
Python's own encoder, and each figure is also shown as a ratio to it. The whole bundle (the three
files, hashes, manifest, fsync, rename) and reading the job document out of the store are shown too.
"""

from __future__ import annotations

import argparse
import io
import json
import statistics
import sys
import tempfile
import time
from collections.abc import Callable
from pathlib import Path
from typing import Any

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from pypdf import PdfReader  # noqa: E402

from mobile_app.export import (  # noqa: E402
    export_bundle,
    job_csv_bytes,
    job_json_bytes,
    job_pdf_bytes,
)
from mobile_app.store import Store  # noqa: E402

BOARDS, CIRCUITS_PER_BOARD = 10, 50
TARGET_S = 5.0
SPEC = {"role": "final", "device_kind": "mcb", "device_curve": "B", "device_rating": "32",
        "line_csa": "2.5", "line_material": "copper", "line_insulation": "thermoplastic-70",
        "cpc_csa": "1.5", "cpc_material": "copper", "cpc_arrangement": "in-cable",
        "zsc": "0.45", "r1r2": "0.3", "test_temp_c": "20"}
NOT_SHARED = ("device_rating", "line_csa", "cpc_csa")
"""Set on every circuit: a new circuit does not take its rating and sizes from the previous one."""


def build_job(store: Store) -> int:
    """A TN-C-S job of BOARDS boards × CIRCUITS_PER_BOARD B32 circuits, every one assessed."""
    job_id = store.jobs.create({"client_ref": "BENCH-500", "system": "TN-C-S", "u0": "230",
                               "cmin": "0.95", "ze": "0.35", "pfc": "1.5 kA"})
    for b in range(BOARDS):
        board_id = store.boards.add(job_id, f"DB{b + 1}", f"Floor {b + 1}")
        first = store.circuits.add(board_id, "1", "Sockets")
        for name, raw in SPEC.items():
            store.circuits.set_field(first, name, raw)
        store.circuits.set_field(first, "zs", "0.62")
        for n in range(2, CIRCUITS_PER_BOARD + 1):
            circuit_id = store.circuits.add(board_id, str(n), f"Circuit {n} of board {b + 1}")
            for name in NOT_SHARED:  # a new circuit takes only what a board's circuits share
                store.circuits.set_field(circuit_id, name, SPEC[name])
            store.circuits.set_field(circuit_id, "zs", f"{0.4 + n / 40:.2f}")
    return job_id


def median_s(action: Callable[[], object], rounds: int) -> float:
    """Median wall time of `rounds` calls of `action`, in seconds."""
    times = []
    for _ in range(rounds):
        start = time.perf_counter()
        action()
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def main() -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rounds", type=int, default=5)
    rounds = parser.parse_args().rounds
    with tempfile.TemporaryDirectory(prefix="bench-export-") as folder:
        store = Store.open(Path(folder) / "store")
        try:
            start = time.perf_counter()
            job_id = build_job(store)
            print(f"built a {BOARDS * CIRCUITS_PER_BOARD}-circuit job in "
                  f"{time.perf_counter() - start:.1f} s (not part of the figures)")
            doc: dict[str, Any] = store.documents.export(job_id)
            baseline = median_s(lambda: json.dumps(doc), rounds)
            figures = {
                "job document from the store": median_s(lambda: store.documents.export(job_id), rounds),
                "JSON": median_s(lambda: job_json_bytes(doc), rounds),
                "CSV": median_s(lambda: job_csv_bytes(doc), rounds),
                "PDF": median_s(lambda: job_pdf_bytes(doc), rounds),
            }
            out = Path(folder) / "out"
            figures["whole bundle (store to folder)"] = median_s(
                lambda: export_bundle(store, job_id, out), rounds)
        finally:
            store.close()
    pages = len(PdfReader(io.BytesIO(job_pdf_bytes(doc))).pages)
    print(f"median of {rounds} rounds; baseline json.dumps of the document: {baseline * 1000:.0f} ms")
    for name, seconds in figures.items():
        print(f"  {name:<32} {seconds:7.3f} s   {seconds / baseline:6.1f} × baseline")
    together = figures["JSON"] + figures["CSV"] + figures["PDF"]
    verdict = "within" if together <= TARGET_S else "OVER"
    print(f"  JSON + CSV + PDF together        {together:7.3f} s   ({verdict} the {TARGET_S:.0f} s target)")
    print(f"  PDF pages: {pages}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
