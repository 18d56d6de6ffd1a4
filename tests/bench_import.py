"""Benchmark of importing a JSON export: memory and time; prints figures, asserts nothing.

    python tests/bench_import.py [--rounds N]

A 500-circuit job (tests/bench_export.py's) is exported as JSON and imported into a fresh store
with `import_job_json`. Memory is the peak traced by tracemalloc during the import, as a multiple of
the document's size (target <= 4x); the baseline, measured in the same run, is the same import
after a plain `json.loads` of the bytes. Times are medians of several rounds.
"""

from __future__ import annotations

import argparse
import json
import statistics
import sys
import tempfile
import time
import tracemalloc
from collections.abc import Callable
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path[:0] = [str(ROOT), str(ROOT / "tests")]

from bench_export import build_job  # noqa: E402

from mobile_app.export import import_job_json, job_json_bytes  # noqa: E402
from mobile_app.store import Store  # noqa: E402


def measure(folder: Path, run: Callable[[Store], object], rounds: int) -> tuple[float, float]:
    """(peak traced bytes of the first round, median seconds) of `run` into fresh stores."""
    peaks, times = [], []
    for n in range(rounds):
        with Store.open(folder / f"store-{len(list(folder.iterdir()))}-{n}") as store:
            tracemalloc.start()
            start = time.perf_counter()
            run(store)
            times.append(time.perf_counter() - start)
            peaks.append(tracemalloc.get_traced_memory()[1])
            tracemalloc.stop()
    return min(peaks), statistics.median(times)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rounds", type=int, default=3)
    args = parser.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        with Store.open(folder / "site") as site:
            data = job_json_bytes(site.documents.export(build_job(site)))
        lean_peak, lean_s = measure(folder, lambda store: import_job_json(store, data), args.rounds)
        plain_peak, plain_s = measure(
            folder, lambda store: store.documents.import_(json.loads(data)), args.rounds)
    size = len(data)
    print(f"import a 500-circuit job ({size / 1e6:.1f} MB of JSON), median of {args.rounds}:")
    print(f"  import_job_json: peak memory {lean_peak / 1e6:.1f} MB = {lean_peak / size:.2f}x the "
          f"document (target <= 4x); {lean_s:.2f} s")
    print(f"  baseline, json.loads then import_: {plain_peak / 1e6:.1f} MB = {plain_peak / size:.2f}x; "
          f"{plain_s:.2f} s; ratio of peaks {lean_peak / plain_peak:.2f}")


if __name__ == "__main__":
    main()
