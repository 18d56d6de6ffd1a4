"""Send the outbox to the office's WebDAV folder (RFC 4918), verify what arrived, then mark it sent.

`sync_once(store_or_db, transport)` takes the store's sync lease (one run at a time, see `lease`),
probes the folder (PROPFIND Depth 0; a missing folder is made with MKCOL, and one another device made
meanwhile is fine), deletes what stopped runs left, then sends each due bundle into a temporary folder,
reads every file back (size and SHA-256) and moves the folder into place (see `send`); only then is
the bundle marked sent. ETags are not used: common servers (wsgidav, Nextcloud) make them from
metadata, not content, so they cannot prove the bytes. Any error other than one bundle's own stops the
run, and every due bundle backs off exponentially with jitter; state lives in the database, so a
restart resumes. Nothing local is ever deleted.

Time limits (`SyncLimits`, settings `sync_run_limit_s` and `sync_bundle_limit_s`) are measured from
the start of the run and of each bundle, not per read: the transport ends any request at the nearer
of the two. A bundle that reaches its own limit backs off alone and the run goes on; a run that reaches
its limit stops, and the bundles it did not try stay due for the next run, with no attempt counted.

The network is behind `mobile_app.sync.transport`: this module imports no network library. The run
is written once, as coroutines: `sync_once_async` awaits an `AsyncTransport` (the browser's fetch, or
the server's transport in a worker thread), and `sync_once` runs the same coroutines to their end at
once over a blocking `Transport` (`Immediate`, `finish`). Given a `SyncTarget` instead of a transport,
either opens the platform's own (`mobile_app.sync.connect`) and closes it at the end.
"""

from __future__ import annotations

import logging
import random
import time
from collections.abc import Callable
from dataclasses import dataclass, field
from datetime import datetime, timedelta
from typing import Any

from mobile_app.sync import lease
from mobile_app.sync.connect import open_async_transport, open_transport
from mobile_app.sync.outbox import BundleError, Outbox, utc_now
from mobile_app.sync.roster_pull import RosterPull, pull_roster
from mobile_app.sync.saved import load_target
from mobile_app.sync.send import clean_leftovers, probe, send_bundle
from mobile_app.sync.target import (
    SyncError,
    SyncTarget,
    TimeLimitError,
    VerifyError,
    check_url,
    scrub,
)
from mobile_app.sync.transport import AsyncTransport, Immediate, Transport, finish

log = logging.getLogger("boardside.sync")
log.addHandler(logging.NullHandler())
# kind of error -> (first delay, longest delay) in seconds; each further failure doubles the delay
BACKOFF_S: dict[str, tuple[float, float]] = {
    "offline": (30, 1800),
    "dropped": (30, 1800),
    "timeout": (60, 3600),
    "server": (60, 3600),
    "verify": (60, 3600),
    "storage": (900, 6 * 3600),
    "protocol": (900, 6 * 3600),
    "certificate": (1800, 12 * 3600),
    "auth": (1800, 12 * 3600),
    "local": (3600, 24 * 3600),
}
BUSY = "another sync of this store is running; it goes on until it ends"


@dataclass(frozen=True)
class SyncLimits:
    """How long one run and one bundle may take, from their start (seconds).

    Defaults (common practice): a bundle of a few MB needs under a minute on a slow mobile link, so
    3 minutes per bundle and 10 per run end a stalled server's hold well before anyone waits on it.
    """

    run_s: float = 600.0
    bundle_s: float = 180.0

    @classmethod
    def of(cls, store_or_db: Any) -> SyncLimits:
        """The limits saved in a Store's settings (`sync_run_limit_s`, `sync_bundle_limit_s`), else
        the defaults; a value that is not a positive number is ignored."""
        settings = getattr(store_or_db, "settings", None)
        if settings is None:
            return cls()
        return cls(_seconds(settings.get("sync_run_limit_s"), cls.run_s),
                   _seconds(settings.get("sync_bundle_limit_s"), cls.bundle_s))


def _seconds(text: Any, default: float) -> float:
    """A positive number of seconds from a setting's text, else `default`."""
    try:
        value = float(text)
    except (TypeError, ValueError):
        return default
    return value if 0 < value < 86400 else default


@dataclass
class SyncReport:
    """What one sync run did: ids sent, how many still wait, the run's error in plain words.

    `busy`: another run held the store's sync lease, so this one did nothing. `stopped_at_limit`: the
    run reached its time limit and left the bundles it did not try for the next run.
    """

    sent: list[int] = field(default_factory=list)
    waiting: int = 0
    error: str | None = None
    error_kind: str | None = None
    probed: bool = False
    next_try_at: str | None = None
    busy: bool = False
    stopped_at_limit: bool = False
    cleaned: int = 0
    roster: RosterPull | None = None
    """The office's roster as read after sending (None when not read: nothing sent, or no store)."""


def backoff_s(kind: str, failures: int, rng: random.Random) -> float:
    """Delay before the next try after `failures` failures in a row (1 = first), with equal jitter:
    half the exponential delay fixed, half random, so devices do not retry in step."""
    first_s, longest_s = BACKOFF_S.get(kind, BACKOFF_S["protocol"])
    delay_s = min(longest_s, first_s * 2 ** max(failures - 1, 0))
    return delay_s / 2 + rng.uniform(0, delay_s / 2)


def _db_of(store_or_db: Any) -> Any:
    """The sqlite-utils Database of a Store, or the Database itself."""
    return getattr(store_or_db, "db", store_or_db)


@dataclass
class _Run:
    """One run's fixed context: where it records, what it talks to, its clock and limits."""

    outbox: Outbox
    transport: AsyncTransport
    now: datetime
    rng: random.Random
    limits: SyncLimits
    report: SyncReport
    ends_at_s: float = 0.0

    def fail(self, rows: list[dict[str, Any]], exc: Exception) -> None:
        """Record one error on rows, each backing off by its own count of failures."""
        kind = getattr(exc, "kind", "local")
        message = scrub(str(exc), self.transport.target)
        log.warning("sync: %s", message)
        self.report.error, self.report.error_kind = message, kind
        for row in rows:
            delay_s = backoff_s(kind, int(row["attempts"] or 0) + 1, self.rng)
            self.outbox.mark_failed(row["id"], message, kind, self.now + timedelta(seconds=delay_s),
                                    self.now)


def sync_once(store_or_db: Any, transport: Transport | SyncTarget, now: datetime | None = None,
              force: bool = False, progress: Callable[[int, int], None] | None = None,
              rng: random.Random | None = None, limits: SyncLimits | None = None) -> SyncReport:
    """Send every due bundle of the outbox (every waiting one when `force`, i.e. "send now").

    `transport` is a Transport, or a SyncTarget for the platform's own blocking transport (opened and
    closed here; InsecureTargetError before any traffic for a refused address). Errors while sending
    are recorded on the bundles (attempts, last error, next try) and summed up in the report. While
    another run holds the store's lease the report says `busy` and nothing is touched.
    `progress(done, total)` is called after each bundle. Returns when the run has ended.
    """
    given = transport if isinstance(transport, SyncTarget) else Immediate(transport)
    return finish(sync_once_async(store_or_db, given, now, force, progress, rng, limits,
                                  opener=lambda target: Immediate(open_transport(target))))


async def sync_once_async(store_or_db: Any, transport: AsyncTransport | SyncTarget,
                          now: datetime | None = None, force: bool = False,
                          progress: Callable[[int, int], None] | None = None,
                          rng: random.Random | None = None, limits: SyncLimits | None = None,
                          opener: Callable[[SyncTarget], AsyncTransport] | None = None) -> SyncReport:
    """`sync_once` as a coroutine over an AsyncTransport; a SyncTarget opens the platform's own
    (`open_async_transport`, or `opener`). No threads of its own: the browser awaits it on the page's
    event loop, and the store's lease keeps it to one run at a time."""
    db = _db_of(store_or_db)
    outbox = Outbox(db)
    if isinstance(transport, SyncTarget):
        check_url(transport.url)
    now = now or utc_now()
    report = SyncReport()
    limits = limits or SyncLimits.of(store_or_db)
    if outbox.due(now, force=force):
        taken = lease.take(db, limits.run_s)
        if taken is None:
            report.busy, report.error, report.error_kind = True, BUSY, "busy"
        else:
            try:
                await _with_transport(outbox, transport, opener or open_async_transport, now, force,
                                      rng, limits, report, progress,
                                      store_or_db if hasattr(store_or_db, "roster") else None)
            finally:
                lease.give_back(db, taken)
    report.waiting = len(outbox.waiting())
    report.next_try_at = outbox.next_try_at()
    return report


async def _with_transport(outbox: Outbox, transport: AsyncTransport | SyncTarget,
                          opener: Callable[[SyncTarget], AsyncTransport], now: datetime, force: bool,
                          rng: random.Random | None, limits: SyncLimits, report: SyncReport,
                          progress: Callable[[int, int], None] | None, store: Any = None) -> None:
    """Run with the given transport, or with the platform's own opened for `transport`'s target; once
    something was sent, read the office's roster too (`roster_pull`, a Store only)."""
    opened = opener(transport) if isinstance(transport, SyncTarget) else None
    run = _Run(outbox, opened or transport, now, rng or random.Random(), limits, report)  # type: ignore[arg-type]
    try:
        due = outbox.due(now, force=force)  # again: a run that held the lease may have sent them
        if due:
            report.probed = True
            await _send_due(run, due, progress)
        if report.sent and store is not None:
            run.transport.set_deadline(min(run.ends_at_s, time.monotonic() + run.limits.bundle_s))
            try:
                report.roster = await pull_roster(store, run.transport)
            except SyncError as exc:  # the bundles went; the roster waits for the next run
                report.roster = RosterPull(problem=f"the office folder could not be read ({exc})")
    finally:
        run.transport.set_deadline(None)
        if opened is not None:
            opened.close()


async def _send_due(run: _Run, due: list[dict[str, Any]],
                    progress: Callable[[int, int], None] | None) -> None:
    """Probe, clean leftovers, then send the due rows one by one within the time limits."""
    run.ends_at_s = time.monotonic() + run.limits.run_s
    run.transport.set_deadline(run.ends_at_s)
    try:
        await probe(run.transport)
        run.report.cleaned = await clean_leftovers(run.outbox, run.transport)
    except SyncError as exc:
        run.fail(due, exc)
        return
    for done, row in enumerate(due, start=1):
        if time.monotonic() >= run.ends_at_s:
            _stopped(run)
            return
        run.transport.set_deadline(min(run.ends_at_s, time.monotonic() + run.limits.bundle_s))
        if not await _send_one(run, row, due[done - 1:]):
            return
        if progress is not None:
            progress(done, len(due))


async def _send_one(run: _Run, row: dict[str, Any], rest: list[dict[str, Any]]) -> bool:
    """Send one row and record how it went; False when the run must stop here."""
    try:
        await send_bundle(run.transport, run.outbox, row)
    except (BundleError, VerifyError) as exc:
        run.fail([row], exc)
    except TimeLimitError as exc:
        run.fail([row], exc)
        if time.monotonic() >= run.ends_at_s:
            _stopped(run)
            return False
    except SyncError as exc:
        run.fail(rest, exc)
        return False
    else:
        run.outbox.mark_sent(row["id"], utc_now(), sent_to=sent_to(run.transport.target.url, row))
        run.report.sent.append(row["id"])
    return True


def sent_to(url: str, row: dict[str, Any]) -> str:
    """Where a bundle went: the office folder's address and the bundle's folder in it."""
    return f"{url.rstrip('/')}/{row['remote_path']}/"


def _stopped(run: _Run) -> None:
    """Say that the run reached its time limit (the bundles not tried stay due, no attempt counted)."""
    run.report.stopped_at_limit = True
    if run.report.error is None:
        run.report.error = (f"the sync reached its time limit ({run.limits.run_s:g} s); "
                            "the other exports wait for the next run")
        run.report.error_kind = "limit"


def sync_store(store: Any, force: bool = False,
               progress: Callable[[int, int], None] | None = None) -> SyncReport:
    """Sync a Store to its saved office folder ("send now" is `force=True`).

    With nothing due it reads no settings and makes no traffic. Otherwise raises NotConfiguredError
    or InsecureTargetError (before any traffic) for a missing or refused folder. Call it from the
    thread that opened the store (SQLite connections stay in their thread).
    """
    outbox = Outbox(_db_of(store))
    if not outbox.due(force=force):
        return SyncReport(waiting=len(outbox.waiting()), next_try_at=outbox.next_try_at())
    return sync_once(store, load_target(store), force=force, progress=progress)


async def sync_store_async(store: Any, force: bool = False,
                           progress: Callable[[int, int], None] | None = None) -> SyncReport:
    """`sync_store` as a coroutine over the platform's own AsyncTransport (the browser's fetch)."""
    outbox = Outbox(_db_of(store))
    if not outbox.due(force=force):
        return SyncReport(waiting=len(outbox.waiting()), next_try_at=outbox.next_try_at())
    return await sync_once_async(store, load_target(store), force=force, progress=progress)
