"""Benchmark: time to sync 200 bundles to a wsgidav server on 127.0.0.1 (target <= 10 s).

Run: `.venv/bin/python tests/bench_sync.py [--runs 3] [--bundles 200]`. Prints the median of several
runs of `sync_once` (lease, probe, MKCOL a temporary folder, PUT each file, GET it back and hash
it, MOVE the folder into place, mark sent) and, as a
baseline measured in the same run, the median time of bare PUTs of the same files with httpx
(no folders, no verification, no database). Prints figures; asserts nothing about time.
"""

from __future__ import annotations

import argparse
import hashlib
import statistics
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path[:0] = [str(HERE.parent), str(HERE)]

import httpx  # noqa: E402
from sync_server import DavServer, make_bundle  # noqa: E402

from mobile_app.store import Store  # noqa: E402
from mobile_app.sync import SyncTarget, sync_once  # noqa: E402
from mobile_app.sync.outbox import Outbox  # noqa: E402


def make_bundles(parent: Path, count: int) -> list[Path]:
    """`count` bundles of a JSON, a CSV and a 20 kB PDF-like file plus the manifest."""
    made = []
    for n in range(count):
        name = f"job{n}-BENCH-rev1-2026-12-02"
        made.append(make_bundle(parent, name, {
            f"{name}.json": b'{"job": %d, "circuits": []}' % n * 20,
            f"{name}.csv": b"circuit,zs_ohm,verdict\n" + b"1,0.62,pass\n" * 50,
            f"{name}.pdf": hashlib.sha256(str(n).encode()).digest() * 640,
        }))
    return made


def time_sync(work: Path, server: DavServer, bundles: list[Path], run: int) -> float:
    """Seconds for one sync_once of all bundles into a fresh folder and a fresh store."""
    store = Store.open(work / f"data{run}")
    outbox = Outbox(store.db)
    for n, bundle in enumerate(bundles):
        outbox.enqueue(bundle, job_id=n, revision=1)
    target = SyncTarget(server.url.replace("/office/", f"/office{run}/"), server.user,
                        server.password)
    start = time.perf_counter()
    report = sync_once(store, target, force=True)
    elapsed_s = time.perf_counter() - start
    store.close()
    assert len(report.sent) == len(bundles), report
    return elapsed_s


def time_bare_puts(server: DavServer, bundles: list[Path], run: int) -> float:
    """Seconds to PUT the same files flat into one folder with httpx: the least any upload costs."""
    base = server.url.replace("/office/", f"/bare{run}/")
    with httpx.Client(auth=(server.user, server.password)) as client:
        client.request("MKCOL", base).raise_for_status()
        start = time.perf_counter()
        for bundle in bundles:
            for path in sorted(bundle.iterdir()):
                client.put(f"{base}{bundle.name}-{path.name}",
                           content=path.read_bytes()).raise_for_status()
        return time.perf_counter() - start


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--runs", type=int, default=3)
    parser.add_argument("--bundles", type=int, default=200)
    args = parser.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        work = Path(tmp)
        bundles = make_bundles(work / "exports", args.bundles)
        server = DavServer(work / "server", work / "requests.log").start()
        try:
            sync_s = [time_sync(work, server, bundles, run) for run in range(args.runs)]
            bare_s = [time_bare_puts(server, bundles, run) for run in range(args.runs)]
        finally:
            server.stop()
    sync_median_s, bare_median_s = statistics.median(sync_s), statistics.median(bare_s)
    print(f"sync {args.bundles} bundles (4 files each) to wsgidav on 127.0.0.1, "
          f"median of {args.runs}: {sync_median_s:.2f} s (target <= 10 s); "
          f"runs: {', '.join(f'{s:.2f}' for s in sync_s)}")
    print(f"baseline, bare PUTs of the same files: {bare_median_s:.2f} s; "
          f"ratio sync/baseline: {sync_median_s / bare_median_s:.2f}")


if __name__ == "__main__":
    main()
