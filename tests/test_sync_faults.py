"""Sync against a real WebDAV server that fails: stopped mid-upload, lying, 401, 500, 507, slow."""

from __future__ import annotations

import hashlib
import logging
from datetime import UTC, datetime, timedelta

import pytest
from sync_server import DavServer, make_bundle, tree_hashes

from mobile_app.store import Store
from mobile_app.sync import SyncTarget, sync_once
from mobile_app.sync.outbox import Outbox

T0 = datetime(2026, 12, 2, 8, 0, tzinfo=UTC)
WRONG = "Wr0ng-Passw0rd%x"


@pytest.fixture
def dav(tmp_path):
    server = DavServer(tmp_path / "server", tmp_path / "requests.log")
    yield server
    server.stop()


def target_for(server: DavServer, password: str | None = None, timeout_s: float = 10.0):
    return SyncTarget(server.url, server.user, password or server.password, timeout_s)


def queue(store: Store, parent, count: int = 2, pdf_bytes: int = 3000) -> list:
    """Queue `count` bundles, each with a PDF-like file of `pdf_bytes`."""
    made = []
    for n in range(count):
        name = f"job{n}-rev1-2026-12-02"
        pdf = (hashlib.sha256(str(n).encode()).digest() * (pdf_bytes // 32 + 1))[:pdf_bytes]
        made.append(make_bundle(parent, name, {f"{name}.json": b'{"job": %d}' % n,
                                               f"{name}.pdf": pdf}))
        Outbox(store.db).enqueue(made[-1], job_id=n, revision=1, now=T0)
    return made


def arrived(server: DavServer, bundle_dir) -> bool:
    """True if the bundle's files are all on the server's disk, byte-identical, in one folder."""
    local = {p.name: hashlib.sha256(p.read_bytes()).hexdigest() for p in bundle_dir.iterdir()}
    folders = [d for d in (server.root / "office").iterdir() if d.name.startswith(bundle_dir.name)]
    return len(folders) == 1 and tree_hashes(folders[0]) == local


def delay_s(row, now: datetime) -> float:
    return (datetime.fromisoformat(row["next_try_at"]) - now).total_seconds()


def test_server_stopped_mid_upload_marks_nothing_sent_and_the_retry_completes(tmp_path, dav, store):
    made = queue(store, tmp_path / "exports", count=2, pdf_bytes=3_000_000)
    dav.start("--exit-after-bytes", "1000000")  # the server process dies 1 MB into the first PDF
    report = sync_once(store, target_for(dav), now=T0)
    assert report.sent == [] and report.waiting == 2
    assert report.error_kind == "dropped" and "broke during the transfer" in report.error
    partial = list((dav.root / "office").rglob("*.pdf"))
    assert len(partial) == 1 and 0 < partial[0].stat().st_size < 3_000_000  # a partial file
    assert all(row["status"] == "waiting" for row in Outbox(store.db).waiting())

    dav.stop()
    dav.start()
    report = sync_once(store, target_for(dav), now=T0 + timedelta(hours=1))
    assert len(report.sent) == 2 and report.waiting == 0
    assert all(arrived(dav, b) for b in made)  # the partial file was overwritten, not duplicated


def test_a_server_that_stores_less_than_it_got_is_caught_by_reading_back(tmp_path, dav, store):
    made = queue(store, tmp_path / "exports", count=1)
    dav.start("--truncate-put", "10")
    report = sync_once(store, target_for(dav), now=T0)
    assert report.sent == [] and report.error_kind == "verify"
    assert "arrived different from the one sent" in report.error
    dav.stop()
    dav.start()
    assert sync_once(store, target_for(dav), now=T0 + timedelta(hours=1)).sent
    assert arrived(dav, made[0])


def test_wrong_password_gives_a_clear_message_and_no_hammering(tmp_path, dav, store, caplog):
    queue(store, tmp_path / "exports", count=3)
    dav.start()
    caplog.set_level(logging.DEBUG)
    report = sync_once(store, target_for(dav, password=WRONG), now=T0)
    assert report.error == ("the office folder refused the user name or password (HTTP 401); "
                            "check them in the sync settings")
    assert dav.requests() == ["PROPFIND /office/ 401"]  # one probe, no upload attempted
    rows = Outbox(store.db).waiting()
    assert all(r["last_error_kind"] == "auth" and delay_s(r, T0) >= 15 * 60 for r in rows)
    later = T0 + timedelta(minutes=10)
    assert sync_once(store, target_for(dav, password=WRONG), now=later).probed is False
    assert len(dav.requests()) == 1  # still backing off: nothing sent to the server
    stored = b"".join(p.read_bytes() for p in (tmp_path / "data").iterdir()
                      if p.name != "sync-password")
    for text in [report.error, caplog.text, *(r["last_error"] for r in rows)]:
        assert WRONG not in text and "Wr0ng" not in text
    assert WRONG.encode() not in stored and dav.password.encode() not in stored

    report = sync_once(store, target_for(dav), now=T0, force=True)  # "send now" with the right one
    assert len(report.sent) == 3


@pytest.mark.parametrize(("status", "kind", "first_s"), [
    (500, "server", 60),  # common practice: retry a failed server after a minute or so
    (507, "storage", 900),  # RFC 4918 section 11.5: 507 Insufficient Storage; wait longer
])
def test_server_errors_back_off_longer_each_time_then_succeed(tmp_path, dav, store, status, kind,
                                                              first_s):
    made = queue(store, tmp_path / "exports", count=2)
    dav.start("--fail", f"{status}:2")
    now, delays = T0, []
    for _ in range(2):
        report = sync_once(store, target_for(dav), now=now)
        assert report.sent == [] and report.error_kind == kind and f"HTTP {status}" in report.error
        row = Outbox(store.db).waiting()[0]
        delays.append(delay_s(row, now))
        assert sync_once(store, target_for(dav), now=now + timedelta(seconds=1)).probed is False
        now = max(datetime.fromisoformat(r["next_try_at"]) for r in Outbox(store.db).waiting())
    assert first_s / 2 <= delays[0] <= first_s <= delays[1] <= 2 * first_s
    assert len(dav.requests()) == 2  # one probe per run, nothing in between
    report = sync_once(store, target_for(dav), now=now)
    assert len(report.sent) == 2 and all(arrived(dav, b) for b in made)
    assert all(row["attempts"] == 2 for row in Outbox(store.db).sent())


def test_a_slow_server_times_out_and_is_retried_later(tmp_path, dav, store):
    made = queue(store, tmp_path / "exports", count=1)
    dav.start("--slow", "2:1")  # the first request waits 2 s, the client waits 0.5 s
    report = sync_once(store, target_for(dav, timeout_s=0.5), now=T0)
    assert report.sent == [] and report.error_kind == "timeout" and "too slow" in report.error
    row = Outbox(store.db).waiting()[0]
    assert 30 <= delay_s(row, T0) <= 60
    report = sync_once(store, target_for(dav, timeout_s=0.5), now=T0 + timedelta(minutes=5))
    assert report.sent and arrived(dav, made[0])
