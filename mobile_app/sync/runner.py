"""Send the outbox to the office's WebDAV folder (RFC 4918), verify what arrived, then mark it sent.

`sync_once(store_or_db, target)` probes the folder (PROPFIND Depth 0; a missing folder is created with
MKCOL), then for each bundle that is due: MKCOL its folder, PUT each file with the webdav4 client (the
manifest last, overwriting any partial upload of its own), GET each file back and compare size and
SHA-256, and only then mark the bundle sent. ETags are not used: common servers (wsgidav, Nextcloud)
make them from metadata, not content, so they cannot prove the bytes. Any error other than one bundle's
own stops the run, and every due bundle backs off exponentially with jitter; state lives in the
database, so a restart resumes. Nothing local is ever deleted.

The office folder, its address rules, the password kept on the device and the typed errors are in
`mobile_app.sync.target`.
"""

from __future__ import annotations

import hashlib
import logging
import random
import ssl
import threading
from collections.abc import Callable
from dataclasses import dataclass, field
from datetime import datetime, timedelta
from pathlib import Path
from typing import Any

import httpx
from webdav4 import client as dav

from mobile_app.store import Store
from mobile_app.sync.outbox import (
    BundleError,
    BundleFile,
    Outbox,
    file_sha256,
    files_from_row,
    utc_now,
)
from mobile_app.sync.target import (
    InsecureTargetError,
    NotConfiguredError,
    ProtocolError,
    SyncTarget,
    VerifyError,
    check_url,
    classify,
    load_target,
    parse_is_collection,
    scrub,
    status_error,
)

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


@dataclass
class SyncReport:
    """What one sync run did: ids sent, how many still wait, the run's error in plain words."""

    sent: list[int] = field(default_factory=list)
    waiting: int = 0
    error: str | None = None
    error_kind: str | None = None
    probed: bool = False
    next_try_at: str | None = None


def backoff_s(kind: str, failures: int, rng: random.Random) -> float:
    """Delay before the next try after `failures` failures in a row (1 = first), with equal jitter:
    half the exponential delay fixed, half random, so devices do not retry in step."""
    first_s, longest_s = BACKOFF_S.get(kind, BACKOFF_S["protocol"])
    delay_s = min(longest_s, first_s * 2 ** max(failures - 1, 0))
    return delay_s / 2 + rng.uniform(0, delay_s / 2)


PROPFIND_BODY = (b'<?xml version="1.0" encoding="utf-8"?>'
                 b'<d:propfind xmlns:d="DAV:"><d:prop><d:resourcetype/></d:prop></d:propfind>')


class Connection:
    """A webdav4 client on the target folder, with the probe, upload and read-back steps."""

    def __init__(self, target: SyncTarget) -> None:
        self.target = target
        self.url = check_url(target.url)
        timeout = httpx.Timeout(target.timeout_s, connect=min(target.timeout_s, 10.0))
        auth = (target.user, target.password) if target.user else None
        verify = ssl.create_default_context(cafile=target.ca_file) if target.ca_file else True
        self.client = dav.Client(self.url, auth=auth, retry=False, verify=verify,
                                 timeout=timeout, follow_redirects=False, trust_env=False)

    def close(self) -> None:
        """Close the HTTP connections."""
        self.client.http.close()

    def probe(self) -> None:
        """PROPFIND Depth 0 on the folder; create it (MKCOL) if missing; raise if not a folder."""
        response = self.client.http.request(
            "PROPFIND", self.url, content=PROPFIND_BODY,
            headers={"Depth": "0", "Content-Type": "application/xml; charset=utf-8"})
        if response.status_code == 404:
            self.client.mkdir("")
            return
        if response.status_code != 207:
            raise status_error(response.status_code) if response.status_code >= 300 else \
                ProtocolError("the office address is not a WebDAV folder (no multistatus)")
        if not parse_is_collection(response.read()):
            raise ProtocolError("the office address is a file, not a folder")

    def make_folder(self, remote_path: str) -> None:
        """MKCOL the bundle's folder; an existing one (a resumed upload) is fine."""
        try:
            self.client.mkdir(remote_path)
        except dav.ResourceAlreadyExists:
            return

    def put(self, local: Path, remote: str, size_bytes: int) -> None:
        """PUT one file (overwriting any partial copy of its own) with the webdav4 client."""
        with open(local, "rb") as fh:
            self.client.upload_fileobj(fh, remote, overwrite=True, size=size_bytes)

    def read_back(self, remote: str, expected_bytes: int) -> tuple[int, str]:
        """GET a file back; its size in bytes and hex SHA-256 (reading stops past the size sent)."""
        digest, size = hashlib.sha256(), 0
        with self.client.http.stream("GET", self.client.join_url(remote)) as response:
            if response.status_code != 200:
                raise status_error(response.status_code) if response.status_code != 404 else \
                    VerifyError(f"{remote} is missing on the server after upload")
            for chunk in response.iter_bytes():
                digest.update(chunk)
                size += len(chunk)
                if size > expected_bytes:
                    break
        return size, digest.hexdigest()


def check_local(bundle_dir: Path, files: list[BundleFile]) -> None:
    """Raise BundleError if a queued file is missing or changed on the device."""
    for f in files:
        path = bundle_dir / f.name
        if not path.is_file() or path.stat().st_size != f.size_bytes or file_sha256(path) != f.sha256:
            raise BundleError(f"{bundle_dir.name}/{f.name} is missing or changed since it was queued")


def send_bundle(conn: Connection, row: dict[str, Any]) -> None:
    """Upload one outbox row's files (manifest last) and verify each by reading it back."""
    bundle_dir = Path(row["bundle_dir"])
    files = files_from_row(row)
    check_local(bundle_dir, files)
    conn.make_folder(row["remote_path"])
    for f in files:
        remote = f"{row['remote_path']}/{f.remote_name}"
        conn.put(bundle_dir / f.name, remote, f.size_bytes)
        size, sha = conn.read_back(remote, f.size_bytes)
        if (size, sha) != (f.size_bytes, f.sha256):
            raise VerifyError(f"{remote} arrived different from the one sent "
                              f"({size} of {f.size_bytes} bytes)")


def _db_of(store_or_db: Any) -> Any:
    """The sqlite-utils Database of a Store, or the Database itself."""
    return getattr(store_or_db, "db", store_or_db)


def sync_once(store_or_db: Any, target: SyncTarget, now: datetime | None = None,
              force: bool = False, progress: Callable[[int, int], None] | None = None,
              rng: random.Random | None = None) -> SyncReport:
    """Send every due bundle of the outbox (every waiting one when `force`, i.e. "send now").

    Raises InsecureTargetError before any traffic for a refused address. Errors while sending are
    recorded on the bundles (attempts, last error, next try) and summed up in the report.
    `progress(done, total)` is called after each bundle.
    """
    outbox = Outbox(_db_of(store_or_db))
    conn = Connection(target)
    now = now or utc_now()
    rng = rng or random.Random()
    due = outbox.due(now, force=force)
    report = SyncReport()
    try:
        if due:
            report.probed = True
            _send_due(outbox, conn, due, now, rng, report, progress)
    finally:
        conn.close()
    report.waiting = len(outbox.waiting())
    report.next_try_at = outbox.next_try_at()
    return report


def _send_due(outbox: Outbox, conn: Connection, due: list[dict[str, Any]], now: datetime,
              rng: random.Random, report: SyncReport,
              progress: Callable[[int, int], None] | None) -> None:
    """Probe, then send the due rows one by one; a run-wide error stops and backs off the rest."""
    try:
        conn.probe()
    except Exception as exc:  # noqa: BLE001 - every failure is classified and recorded
        _fail(outbox, due, classify(exc), conn.target, now, rng, report)
        return
    for done, row in enumerate(due, start=1):
        try:
            send_bundle(conn, row)
        except (BundleError, VerifyError) as exc:
            _fail(outbox, [row], exc, conn.target, now, rng, report)
        except Exception as exc:  # noqa: BLE001 - every failure is classified and recorded
            _fail(outbox, due[done - 1:], classify(exc), conn.target, now, rng, report)
            return
        else:
            outbox.mark_sent(row["id"], utc_now())
            report.sent.append(row["id"])
        if progress is not None:
            progress(done, len(due))


def _fail(outbox: Outbox, rows: list[dict[str, Any]], exc: Exception, target: SyncTarget,
          now: datetime, rng: random.Random, report: SyncReport) -> None:
    """Record one error on rows, each backing off by its own count of failures."""
    kind = getattr(exc, "kind", "local")
    message = scrub(str(exc), target)
    log.warning("sync: %s", message)
    report.error, report.error_kind = message, kind
    for row in rows:
        delay_s = backoff_s(kind, int(row["attempts"] or 0) + 1, rng)
        outbox.mark_failed(row["id"], message, kind, now + timedelta(seconds=delay_s), now)


def sync_store(store: Any, force: bool = False,
               progress: Callable[[int, int], None] | None = None) -> SyncReport:
    """Sync a Store to its saved office folder ("send now" is `force=True`).

    With nothing due it reads no settings and makes no traffic. Otherwise raises NotConfiguredError
    or InsecureTargetError (before any traffic) for a missing or refused folder. Call it from the
    thread that opened the store (SQLite connections stay in their thread); see SyncTask.
    """
    outbox = Outbox(_db_of(store))
    if not outbox.due(force=force):
        return SyncReport(waiting=len(outbox.waiting()), next_try_at=outbox.next_try_at())
    return sync_once(store, load_target(store), force=force, progress=progress)


class SyncTask:
    """The app's background sync: a thread with its own Store that sends bundles when they are due.

    `wake()` is "send now" (every waiting bundle, backoff ignored); `wake(force=False)` just looks
    again, e.g. after a bundle was queued. `on_report(report)` runs in the task's thread after each
    run; a missing or refused office folder is reported with `error_kind` "config".
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
        """Seconds until the next bundle is due, at most `idle_s`, at least 0.1."""
        if not report.next_try_at or report.error_kind == "config":
            return self.idle_s
        due_in_s = (datetime.fromisoformat(report.next_try_at) - utc_now()).total_seconds()
        return min(self.idle_s, max(0.1, due_in_s))
