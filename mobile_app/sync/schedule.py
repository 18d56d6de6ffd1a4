"""The awaited sync that runs whenever something is due, with no thread of its own.

`SyncLoop(store)` runs `sync_store_async` on the event loop it is started on: once at its start, then
at the next try time of the outbox (at most `idle_s` later), and at once on `wake()`: an export was
queued, the connection came back (the browser's `online` event), or a person asked to send now
(`wake(force=True)`). The browser build starts one from its entry; its runs and those of "send now"
on the outbox screen are kept to one at a time by the store's sync lease (`lease`), like the server
form's `SyncTask` thread.
"""

from __future__ import annotations

import asyncio
import logging
from collections.abc import Callable
from datetime import datetime
from typing import Any

from mobile_app.sync.outbox import Outbox, utc_now
from mobile_app.sync.runner import SyncReport, sync_store_async
from mobile_app.sync.target import InsecureTargetError, NotConfiguredError

BUSY_WAIT_S = 5.0
log = logging.getLogger("boardside.sync")


def wait_s(report: SyncReport, idle_s: float) -> float:
    """Seconds until the next bundle is due, at most `idle_s`, at least 0.1 (a few seconds while
    another run holds the store's sync lease; `idle_s` with no office folder set)."""
    if report.busy:
        return min(idle_s, BUSY_WAIT_S)
    if not report.next_try_at or report.error_kind == "config":
        return idle_s
    due_in_s = (datetime.fromisoformat(report.next_try_at) - utc_now()).total_seconds()
    return min(idle_s, max(0.1, due_in_s))


async def run_once(store: Any, force: bool = False) -> SyncReport:
    """One awaited run; a missing or refused office folder is reported with `error_kind` "config"."""
    try:
        return await sync_store_async(store, force=force)
    except (NotConfiguredError, InsecureTargetError) as exc:
        return SyncReport(waiting=len(Outbox(store.db).waiting()), error=str(exc), error_kind="config")


class SyncLoop:
    """Sync on the event loop whenever something is due (see the module's docstring).

    `on_report(report)` hears every run that tried something (sent, failed or found another run
    busy); runs with nothing due stay quiet.
    """

    def __init__(self, store: Any, on_report: Callable[[SyncReport], None] | None = None,
                 idle_s: float = 60.0) -> None:
        self.store, self.on_report, self.idle_s = store, on_report, idle_s
        self._event = asyncio.Event()
        self._force = False
        self._stopped = False
        self.runs = 0

    def wake(self, force: bool = False) -> None:
        """Run now; with `force`, send every waiting bundle whatever its next try time."""
        self._force = self._force or force
        self._event.set()

    def stop(self) -> None:
        """End the loop after the run in progress."""
        self._stopped = True
        self._event.set()

    async def run(self) -> None:
        """Run until `stop()`."""
        while not self._stopped:
            self._event.clear()
            force, self._force = self._force, False
            report = await self._one(force)
            self.runs += 1
            if self.on_report is not None and (report.probed or report.busy or report.sent):
                self.on_report(report)
            try:
                await asyncio.wait_for(self._event.wait(), wait_s(report, self.idle_s))
            except TimeoutError:
                pass

    async def _one(self, force: bool) -> SyncReport:
        """One run; an unexpected failure is logged and reported, and the loop goes on."""
        try:
            return await run_once(self.store, force)
        except Exception as exc:  # noqa: BLE001 - a background loop must outlive any one run
            log.exception("sync run failed")
            return SyncReport(error=f"the sync failed ({type(exc).__name__})", error_kind="local")
