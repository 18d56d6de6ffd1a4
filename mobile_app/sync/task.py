"""The app's background sync in the server form: a thread with its own Store (the browser build
schedules runs on its own, without threads; the store's sync lease keeps either to one run at a time)."""

from __future__ import annotations

import threading
from collections.abc import Callable
from pathlib import Path

from mobile_app.store import Store
from mobile_app.sync.outbox import Outbox
from mobile_app.sync.runner import SyncReport, sync_store
from mobile_app.sync.schedule import wait_s
from mobile_app.sync.target import InsecureTargetError, NotConfiguredError


class SyncTask:
    """The app's background sync: a thread with its own Store that sends bundles when they are due.

    `wake()` is "send now" (every waiting bundle, backoff ignored); `wake(force=False)` just looks
    again, e.g. after a bundle was queued. `on_report(report)` runs in the task's thread after each
    run; a missing or refused office folder is reported with `error_kind` "config", a run held off by
    another one (the command line, a second window) with `busy`, and tried again a few seconds later.
    """

    def __init__(self, data_dir: Path | None, on_report: Callable[[SyncReport], None] | None = None,
                 idle_s: float = 60.0) -> None:
        self.data_dir, self.on_report, self.idle_s = data_dir, on_report, idle_s
        self._event, self._stop = threading.Event(), threading.Event()
        self._force = False
        self._thread = threading.Thread(target=self._run, name="boardside-sync", daemon=True)

    def start(self) -> SyncTask:
        """Start the thread; it runs once at once, then whenever something is due."""
        self._thread.start()
        return self

    def wake(self, force: bool = True) -> None:
        """Run now; with `force`, send every waiting bundle whatever its next try time."""
        self._force = self._force or force
        self._event.set()

    def stop(self, timeout_s: float = 30.0) -> None:
        """Stop after the current run (a transfer in progress ends or times out first)."""
        self._stop.set()
        self._event.set()
        self._thread.join(timeout_s)

    def _run(self) -> None:
        store = Store.open(self.data_dir)
        try:
            while not self._stop.is_set():
                self._event.clear()
                force, self._force = self._force, False
                try:
                    report = sync_store(store, force=force)
                except (NotConfiguredError, InsecureTargetError) as exc:
                    report = SyncReport(waiting=len(Outbox(store.db).waiting()), error=str(exc),
                                        error_kind="config")
                if self.on_report is not None:
                    self.on_report(report)
                self._event.wait(self._wait_s(report))
        finally:
            store.close()

    def _wait_s(self, report: SyncReport) -> float:
        """Seconds until the next bundle is due (`schedule.wait_s`)."""
        return wait_s(report, self.idle_s)
