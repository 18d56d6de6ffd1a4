"""`python -m mobile_app sync --data DIR`: send what waits in the outbox now and say how it went."""

from __future__ import annotations

import sys
from pathlib import Path

from mobile_app.store import Store
from mobile_app.sync.outbox import Outbox
from mobile_app.sync.runner import SyncReport, sync_store
from mobile_app.sync.target import InsecureTargetError, NotConfiguredError


def cli_sync(data_dir: Path | None) -> int:
    """`python -m mobile_app sync`: send now; print what was sent, what waits and the last error.

    Exit 0 when nothing waits because of an error, 1 when something does or another sync of this
    store is running, 2 for a refused or missing office folder while bundles wait.
    """
    store = Store.open(data_dir)
    try:
        outbox = Outbox(store.db)
        try:
            report = sync_store(store, force=True)
        except (NotConfiguredError, InsecureTargetError) as exc:
            print(f"sync: {exc}", file=sys.stderr)
            return 2
        if report.busy:
            print(f"sync: {report.error}", file=sys.stderr)
            return 1
        print_report(outbox, report)
        return 1 if any(row["last_error"] for row in outbox.waiting()) else 0
    finally:
        store.close()


def print_report(outbox: Outbox, report: SyncReport) -> None:
    """Print the run's result for a terminal: sent now, waiting (with errors), last error."""
    print(f"Sent now: {len(report.sent)}")
    for row in map(outbox.get, report.sent):
        print(f"  {row['bundle_name']} -> {row['remote_path']}/ at {row['sent_at']}")
    waiting = outbox.waiting()
    print(f"Waiting: {len(waiting)}")
    for row in waiting:
        note = f"; last error: {row['last_error']}" if row["last_error"] else ""
        print(f"  {row['bundle_name']} (tries {row['attempts']}, next {row['next_try_at']}{note})")
    last = outbox.last_error()
    if last:
        print(f"Last error: {last}")
    if report.roster is not None:
        print(f"Roster: {report.roster.message}")
