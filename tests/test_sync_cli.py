"""`python -m mobile_app sync --data DIR` and the sync settings, against a real wsgidav server."""

from __future__ import annotations

import stat
import subprocess
import sys
from pathlib import Path

import pytest
from sync_server import DavServer, make_bundle

from mobile_app.cli import main
from mobile_app.store import Store
from mobile_app.sync import (
    InsecureTargetError,
    NotConfiguredError,
    load_target,
    save_target,
)
from mobile_app.sync.outbox import Outbox

ROOT = Path(__file__).resolve().parents[1]


@pytest.fixture
def dav(tmp_path):
    server = DavServer(tmp_path / "server", tmp_path / "requests.log")
    yield server.start()
    server.stop()


def setup_store(data: Path, url: str, user: str, password: str, count: int = 2) -> None:
    """A store with the office folder saved and `count` bundles waiting; closed again."""
    store = Store.open(data)
    save_target(store, url, user, password)
    for n in range(count):
        bundle = make_bundle(data.parent / "exports", f"job{n}-rev1", {f"job{n}.csv": b"n\n1\n"})
        Outbox(store.db).enqueue(bundle, job_id=n, revision=1)
    store.close()


def test_sync_command_sends_and_reports(tmp_path, dav, capsys):
    data = tmp_path / "data"
    setup_store(data, dav.url, dav.user, dav.password)
    assert main(["sync", "--data", str(data)]) == 0
    out = capsys.readouterr().out
    assert out.startswith("Sent now: 2\n  job0-rev1 -> job0-rev1-")
    assert "Waiting: 0" in out and "Last error" not in out
    assert main(["sync", "--data", str(data)]) == 0
    assert capsys.readouterr().out == "Sent now: 0\nWaiting: 0\n"


def test_sync_command_with_a_wrong_password_exits_1_without_showing_it(tmp_path, dav):
    data = tmp_path / "data"
    setup_store(data, dav.url, dav.user, "Not-The-Pa55word")
    done = subprocess.run([sys.executable, "-m", "mobile_app", "sync", "--data", str(data)],
                          cwd=ROOT, capture_output=True, text=True, timeout=60)
    assert done.returncode == 1, done.stderr
    assert "Sent now: 0\nWaiting: 2\n" in done.stdout
    assert ("Last error: the office folder refused the user name or password (HTTP 401); "
            "check them in the sync settings") in done.stdout
    assert "Not-The-Pa55word" not in done.stdout + done.stderr


def test_sync_command_with_nothing_waiting_needs_no_folder(tmp_path, capsys):
    assert main(["sync", "--data", str(tmp_path / "data")]) == 0
    assert capsys.readouterr().out == "Sent now: 0\nWaiting: 0\n"


def test_sync_command_refuses_plain_http_to_another_host(tmp_path, capsys):
    data = tmp_path / "data"
    setup_store(data, "http://127.0.0.1:9/office/", "office", "pw")
    store = Store.open(data)
    store.settings.set("sync_url", "http://192.0.2.7/office/")  # RFC 5737 test address
    store.close()
    assert main(["sync", "--data", str(data)]) == 2
    assert capsys.readouterr().err == (
        "sync: plain http is refused for 192.0.2.7: use https (http is allowed only to this device)\n")


def test_the_password_is_kept_sealed_with_a_key_beside_the_store(tmp_path):
    data = tmp_path / "data"
    setup_store(data, "https://dav.example.com/office", "office", "Hunter2-pw", count=0)
    store = Store.open(data)
    try:
        target = load_target(store)
        assert (target.url, target.user, target.password) == (
            "https://dav.example.com/office/", "office", "Hunter2-pw")
        assert store.settings.get("sync_password") is None
        with pytest.raises(InsecureTargetError):
            save_target(store, "http://dav.example.com/", "office", "x")
    finally:
        store.close()
    assert stat.S_IMODE((data / "device-key").stat().st_mode) == 0o600
    assert all(b"Hunter2-pw" not in p.read_bytes() for p in data.rglob("*") if p.is_file())


def test_no_folder_set_is_a_typed_error(tmp_path):
    store = Store.open(tmp_path / "data")
    try:
        with pytest.raises(NotConfiguredError, match="no office folder is set"):
            load_target(store)
    finally:
        store.close()
