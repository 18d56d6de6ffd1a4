"""Sync against a real WebDAV server (wsgidav + cheroot on 127.0.0.1, basic auth): the normal paths."""

from __future__ import annotations

import hashlib
import shutil
import time
from datetime import UTC, datetime, timedelta

import pytest
from sync_server import DavServer, make_bundle, self_signed_cert, tree_hashes

from mobile_app.store import Store
from mobile_app.sync import SyncTarget, SyncTask, save_target, sync_once
from mobile_app.sync.outbox import Outbox

T0 = datetime(2026, 12, 2, 8, 0, tzinfo=UTC)


@pytest.fixture
def dav(tmp_path):
    server = DavServer(tmp_path / "server", tmp_path / "requests.log")
    yield server
    server.stop()


def target_for(server: DavServer, password: str | None = None, timeout_s: float = 10.0):
    return SyncTarget(server.url, server.user, password or server.password, timeout_s)


def bundles(parent, count: int, start: int = 0) -> list:
    """Small bundles with JSON, CSV and PDF-like bytes, each different."""
    made = []
    for n in range(start, start + count):
        name = f"job{n}-REF{n}-rev1-2026-12-02"
        made.append(make_bundle(parent, name, {
            f"{name}.json": f'{{"job": {n}, "zs_ohm": 0.62}}'.encode(),
            f"{name}.csv": f"circuit,zs_ohm\n{n},0.62\n".encode(),
            f"{name}.pdf": hashlib.sha256(str(n).encode()).digest() * 40,
        }))
    return made


def local_hashes(bundle_dir) -> dict[str, str]:
    return {p.name: hashlib.sha256(p.read_bytes()).hexdigest() for p in bundle_dir.iterdir()}


def server_bundles(server: DavServer) -> dict[str, dict[str, str]]:
    """Each bundle folder on the server's disk with its files' hashes."""
    office = server.root / "office"
    return {d.name: tree_hashes(d) for d in sorted(office.iterdir())} if office.exists() else {}


def test_bundles_arrive_whole_and_are_marked_sent(tmp_path, dav):
    store = Store.open(tmp_path / "data")
    made = bundles(tmp_path / "exports", 3)
    ids = [Outbox(store.db).enqueue(b, job_id=i, revision=1, now=T0) for i, b in enumerate(made)]
    dav.start()
    progress: list[tuple[int, int]] = []
    report = sync_once(store, target_for(dav), now=T0, progress=lambda d, t: progress.append((d, t)))
    assert report.sent == ids and report.waiting == 0 and report.error is None
    assert progress == [(1, 3), (2, 3), (3, 3)]
    on_server = server_bundles(dav)
    for row, bundle_dir in zip(Outbox(store.db).sent()[::-1], made, strict=True):
        assert row["sent_at"] and row["remote_path"].startswith(bundle_dir.name)
        assert on_server[row["remote_path"]] == local_hashes(bundle_dir)
    assert all(local_hashes(b) for b in made)  # nothing local deleted
    methods = [line.split()[0] for line in dav.requests()]
    assert methods[0] == "PROPFIND" and methods.count("MKCOL") == 4  # office folder + 3 bundles


def test_offline_first_bundles_queue_then_all_arrive_after_a_restart(tmp_path, dav):
    store = Store.open(tmp_path / "data")
    made = bundles(tmp_path / "exports", 5)
    for i, b in enumerate(made):
        Outbox(store.db).enqueue(b, job_id=i, revision=1, now=T0)
    report = sync_once(store, target_for(dav), now=T0)  # nothing listens on the port yet
    assert report.sent == [] and report.waiting == 5 and report.error_kind == "offline"
    assert "did not answer" in report.error
    assert all(row["attempts"] == 1 and row["last_error_kind"] == "offline"
               for row in Outbox(store.db).waiting())
    assert sync_once(store, target_for(dav), now=T0 + timedelta(seconds=1)).probed is False
    store.close()

    dav.start()
    store = Store.open(tmp_path / "data")  # the app restarted: state comes back from the database
    report = sync_once(store, target_for(dav), now=T0 + timedelta(hours=1))
    assert len(report.sent) == 5 and report.waiting == 0
    assert sorted(server_bundles(dav).values(), key=str) == sorted(
        (local_hashes(b) for b in made), key=str)


def test_200_bundles_each_arrive_once_byte_identical(tmp_path, dav):
    store = Store.open(tmp_path / "data")
    made = bundles(tmp_path / "exports", 200)
    outbox = Outbox(store.db)
    for i, b in enumerate(made):
        outbox.enqueue(b, job_id=i, revision=1, now=T0)
    dav.start()
    report = sync_once(store, target_for(dav), now=T0)
    assert len(report.sent) == 200 and report.waiting == 0
    for i, b in enumerate(made):  # queuing again does not make a second copy
        outbox.enqueue(b, job_id=i, revision=1)
    assert sync_once(store, target_for(dav), now=T0, force=True).probed is False
    on_server = server_bundles(dav)
    assert len(on_server) == 200
    expected = {row["remote_path"]: local_hashes(tmp_path / "exports" / row["bundle_name"])
                for row in outbox.sent()}
    assert on_server == expected
    puts = [line for line in dav.requests() if line.startswith("PUT")]
    assert len(puts) == 200 * 4 and len(set(puts)) == 200 * 4


def test_an_exported_job_bundle_is_sent_whole(tmp_path, dav):
    from mobile_app.export import export_bundle
    from mobile_app.store.demo import create_demo_job

    store = Store.open(tmp_path / "data")
    save_target(store, dav.url, dav.user, dav.password)
    job_id = create_demo_job(store)
    bundle = export_bundle(store, job_id, tmp_path / "exports")
    assert all(dav.password.encode() not in p.read_bytes() for p in bundle.path.iterdir())
    entry_id = Outbox(store.db).enqueue(bundle.path, job_id=job_id, revision=1)
    dav.start()
    assert sync_once(store, target_for(dav)).sent == [entry_id]
    row = Outbox(store.db).get(entry_id)
    assert server_bundles(dav) == {row["remote_path"]: local_hashes(bundle.path)}
    assert set(local_hashes(bundle.path)) == {*(p.name for p in bundle.files), "manifest.json"}
    store.close()


def wait_for(reports: list, check, timeout_s: float = 20.0):
    """The first report that passes `check`, polling the list the task appends to."""
    deadline = time.monotonic() + timeout_s
    while time.monotonic() < deadline:
        found = [r for r in list(reports) if check(r)]
        if found:
            return found[0]
        time.sleep(0.05)
    raise AssertionError(f"no such report in {reports}")


def test_the_background_task_sends_when_the_server_comes_back(tmp_path, dav):
    data = tmp_path / "data"
    store = Store.open(data)
    save_target(store, dav.url, dav.user, dav.password)
    made = bundles(tmp_path / "exports", 2)
    for i, b in enumerate(made):
        Outbox(store.db).enqueue(b, job_id=i, revision=1)
    reports: list = []
    task = SyncTask(data, on_report=reports.append, idle_s=0.2).start()
    try:
        wait_for(reports, lambda r: r.error_kind == "offline")
        dav.start()
        task.wake()  # "send now": the backoff is skipped
        wait_for(reports, lambda r: len(r.sent) == 2 and r.waiting == 0)
        made.append(bundles(tmp_path / "exports", 1, start=2)[0])
        Outbox(store.db).enqueue(made[-1], job_id=2, revision=1)  # queued while the task runs
        task.wake(force=False)
        wait_for(reports, lambda r: len(r.sent) == 1 and r.waiting == 0)
    finally:
        task.stop()
        store.close()
    assert len(server_bundles(dav)) == 3


def test_the_background_task_reports_a_missing_folder(tmp_path):
    data = tmp_path / "data"
    store = Store.open(data)
    Outbox(store.db).enqueue(bundles(tmp_path / "exports", 1)[0], job_id=1, revision=1)
    store.close()
    reports: list = []
    task = SyncTask(data, on_report=reports.append, idle_s=0.2).start()
    try:
        report = wait_for(reports, lambda r: r.error_kind == "config")
    finally:
        task.stop()
    assert report.error == "no office folder is set on this device" and report.waiting == 1


@pytest.mark.skipif(shutil.which("openssl") is None, reason="needs the openssl command")
def test_https_with_an_unknown_certificate_is_refused_then_accepted_with_its_authority(tmp_path):
    cert, key = self_signed_cert(tmp_path)
    server = DavServer(tmp_path / "server", tmp_path / "requests.log", tls=(cert, key)).start()
    try:
        store = Store.open(tmp_path / "data")
        made = bundles(tmp_path / "exports", 1)
        Outbox(store.db).enqueue(made[0], job_id=1, revision=1, now=T0)
        report = sync_once(store, target_for(server), now=T0)
        assert report.sent == [] and report.error_kind == "certificate"
        assert report.error.startswith("the office server's https certificate could not be verified")
        trusted = SyncTarget(server.url, server.user, server.password, ca_file=str(cert))
        assert sync_once(store, trusted, now=T0, force=True).sent
        assert list(server_bundles(server).values()) == [local_hashes(made[0])]
        store.close()
    finally:
        server.stop()
