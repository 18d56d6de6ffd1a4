"""Sync at the edges, against a real wsgidav server that trickles, stops mid-upload and races:
time limits from the start, one run per store, the office folder made by another device meanwhile,
nothing partial under a bundle's final name, leftovers cleaned on the next run."""

from __future__ import annotations

import hashlib
import threading
import time
from datetime import UTC, datetime, timedelta
from pathlib import Path

import pytest
from sync_server import DavServer, make_bundle, tree_hashes

from mobile_app.store import Store
from mobile_app.sync import SyncLimits, SyncTarget, WebDavTransport, save_target, sync_once
from mobile_app.sync.cli import cli_sync
from mobile_app.sync.lease import give_back, holder_until, take
from mobile_app.sync.outbox import Outbox
from mobile_app.sync.runner import BUSY

T0 = datetime(2026, 12, 2, 8, 0, tzinfo=UTC)


@pytest.fixture
def dav(tmp_path):
    server = DavServer(tmp_path / "server", tmp_path / "requests.log")
    yield server
    server.stop()


def target_for(server: DavServer, timeout_s: float = 10.0) -> SyncTarget:
    return SyncTarget(server.url, server.user, server.password, timeout_s)


def queue(store: Store, parent: Path, count: int, pdf_bytes: int = 3000) -> list[Path]:
    made = []
    for n in range(count):
        name = f"job{n}-rev1-2026-12-02"
        pdf = (hashlib.sha256(str(n).encode()).digest() * (pdf_bytes // 32 + 1))[:pdf_bytes]
        made.append(make_bundle(parent, name, {f"{name}.json": b'{"job": %d}' % n, f"{name}.pdf": pdf}))
        Outbox(store.db).enqueue(made[-1], job_id=n, revision=1, now=T0)
    return made


def office(server: DavServer) -> dict[str, dict[str, str]]:
    """Every folder in the office folder (hidden ones too) with its files' hashes."""
    folder = server.root / "office"
    return {d.name: tree_hashes(d) for d in sorted(folder.iterdir())} if folder.exists() else {}


def local(bundle_dir: Path) -> dict[str, str]:
    return {p.name: hashlib.sha256(p.read_bytes()).hexdigest() for p in bundle_dir.iterdir()}


def delivered(server: DavServer, made: list[Path]) -> bool:
    """Exactly one final folder per bundle, byte-identical, and no temporary folder left."""
    folders = office(server)
    on_server = sorted(sorted(files.items()) for files in folders.values())
    return on_server == sorted(sorted(local(b).items()) for b in made) and not any(
        name.startswith(".") for name in folders)


def test_a_trickling_server_holds_a_run_no_longer_than_its_limit(tmp_path, dav, store):
    made = queue(store, tmp_path / "exports", count=3)
    dav.start("--trickle", "0.5:100:GET")  # each read-back: one byte every half second
    limits = SyncLimits(run_s=3.0, bundle_s=2.0)
    started = time.monotonic()
    report = sync_once(store, target_for(dav, timeout_s=2.0), now=T0, limits=limits)
    elapsed_s = time.monotonic() - started
    # The first GET alone is 11 bytes at 2 a second; the whole run would take minutes without limits.
    assert elapsed_s < limits.run_s + 2.0
    assert report.sent == [] and report.stopped_at_limit
    assert report.error_kind == "timeout" and "time limit" in report.error
    rows = Outbox(store.db).waiting()
    assert [r["attempts"] for r in rows] == [1, 1, 0]  # the third was never tried: no attempt counted
    assert [r["last_error_kind"] for r in rows] == ["timeout", "timeout", None]
    assert not any(name.startswith("job") for name in office(dav))  # nothing under a final name
    assert len([name for name in office(dav) if name.startswith(".")]) == 2

    dav.stop()
    dav.start()
    report = sync_once(store, target_for(dav), now=T0 + timedelta(hours=1), limits=limits)
    assert len(report.sent) == 3 and report.cleaned == 2
    assert delivered(dav, made)


def test_a_second_run_on_the_same_store_says_a_sync_is_running(tmp_path, dav, store, capsys):
    made = queue(store, tmp_path / "exports", count=3)
    save_target(store, dav.url, dav.user, dav.password)  # for the command line
    dav.start("--slow", "1.5:1")  # the first run's probe takes 1.5 s
    first: list = []
    runner = threading.Thread(target=lambda: first.append(
        sync_once(Store.open(tmp_path / "data"), target_for(dav), now=T0)))
    runner.start()
    while holder_until(store.db) is None:  # the first run holds the lease
        time.sleep(0.01)
    second = sync_once(store, target_for(dav), now=T0)  # another window of the app, same store
    exit_code = cli_sync(tmp_path / "data")  # `python -m mobile_app sync` meanwhile: its own Store
    runner.join()
    assert second.busy and second.error == BUSY and second.sent == [] and not second.probed
    assert exit_code == 1 and "another sync of this store is running" in capsys.readouterr().err
    assert len(first[0].sent) == 3 and first[0].error is None
    rows = Outbox(store.db).sent()
    assert all(r["attempts"] == 0 and r["last_error"] is None for r in rows)  # no false error
    puts = [line for line in dav.requests() if line.startswith("PUT")]
    assert len(puts) == 9 and len(set(puts)) == 9  # each file sent once
    assert delivered(dav, made) and holder_until(store.db) is None


def test_the_office_folder_made_by_another_device_meanwhile_is_fine(tmp_path, dav, store):
    made = queue(store, tmp_path / "exports", count=1)
    dav.start("--made-meanwhile")
    report = sync_once(store, target_for(dav), now=T0)
    assert report.error is None and len(report.sent) == 1
    assert dav.requests()[:3] == ["PROPFIND /office/ 404", "MKCOL /office/ 405", "PROPFIND /office/ 207"]
    assert delivered(dav, made)


def test_a_partial_upload_never_sits_under_the_final_name_and_is_cleaned_next_run(tmp_path, dav, store):
    made = queue(store, tmp_path / "exports", count=2, pdf_bytes=3_000_000)
    dav.start("--exit-after-bytes", "1000000")  # the server dies 1 MB into the first PDF
    report = sync_once(store, target_for(dav), now=T0)
    assert report.sent == [] and report.error_kind == "dropped"
    partial = list((dav.root / "office").rglob("*.pdf"))
    assert len(partial) == 1 and 0 < partial[0].stat().st_size < 3_000_000
    assert partial[0].parent.name.startswith(".job0-") and partial[0].parent.name.endswith(".partial")
    assert [r["staging"] is not None for r in Outbox(store.db).waiting()] == [True, False]

    dav.stop()
    dav.start()
    report = sync_once(store, target_for(dav), now=T0 + timedelta(hours=1))
    assert len(report.sent) == 2 and report.cleaned == 1
    assert delivered(dav, made)
    assert all(r["staging"] is None for r in Outbox(store.db).sent())


def test_a_move_the_server_did_but_never_answered_is_not_delivered_twice(tmp_path, dav, store):
    made = queue(store, tmp_path / "exports", count=1)
    dav.start("--exit-after", "MOVE")  # the folder is moved into place, then the server dies
    report = sync_once(store, target_for(dav), now=T0)
    assert report.sent == [] and report.error_kind == "dropped"
    dav.stop()
    dav.start()
    report = sync_once(store, target_for(dav), now=T0 + timedelta(hours=1))
    assert len(report.sent) == 1 and report.error is None
    assert delivered(dav, made)  # read back in place: counted as delivered, no second copy
    sending = [line.split()[:2] for line in dav.requests() if "/office/roster/" not in line]
    assert sending[-2:] == [  # (after them, the office's roster is read)
        ["GET", f"/office/{Outbox(store.db).sent()[0]['remote_path']}/manifest.json"],
        ["DELETE", f"/office/.{Outbox(store.db).sent()[0]['remote_path']}.partial/"]]


def test_a_time_limit_set_in_the_settings_is_used(tmp_path, store):
    assert SyncLimits.of(store) == SyncLimits(run_s=600.0, bundle_s=180.0)
    store.settings.set("sync_run_limit_s", "90")
    store.settings.set("sync_bundle_limit_s", "not a number")
    assert SyncLimits.of(store) == SyncLimits(run_s=90.0, bundle_s=180.0)


def test_the_transport_answers_each_request_with_plain_results(tmp_path, dav):
    dav.start()
    transport = WebDavTransport(target_for(dav))
    try:
        assert transport.kind("") is None and transport.make_folder("") is True
        assert transport.make_folder("") is False and transport.kind("") == "folder"
        transport.put("a.txt", b"hello")
        assert transport.kind("a.txt") == "file" and transport.get("a.txt", 3) == b"hell"
        assert transport.make_folder("b/") and transport.move("a.txt", "b/a.txt")
        transport.put("a.txt", b"again")
        assert transport.move("a.txt", "b/a.txt") is False  # no overwrite unless asked
        assert transport.move("a.txt", "b/a.txt", overwrite=True)
        assert transport.get("b/a.txt", 100) == b"again" and transport.get("a.txt", 100) is None
        assert transport.delete("b/") is True and transport.delete("b/") is False
    finally:
        transport.close()


def test_a_lease_left_by_a_killed_run_runs_out(tmp_path, store):
    left = take(store.db, hold_s=10, clock=lambda: 1000.0)  # a run that was killed: never given back
    assert left is not None and take(store.db, hold_s=10, clock=lambda: 1069.0) is None
    later = take(store.db, hold_s=10, clock=lambda: 1071.0)  # 10 s + the 60 s margin have passed
    assert later is not None
    give_back(store.db, left)  # the old holder cannot end the new lease
    assert holder_until(store.db, clock=lambda: 1072.0) == later.expires_at_s
