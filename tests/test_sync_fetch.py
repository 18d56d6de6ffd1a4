"""The browser build's sync, run here: `FetchTransport` (WebDAV over a fetch function) and the
awaited runner and `SyncLoop`, against a real wsgidav server on loopback, with the CORS setting the
README gives an office.

Here the fetch function is the standard library's HTTP client in a worker thread; in the browser it is
the page's fetch (`mobile_app.browser.network`), driven by tests/test_e2e_web.py in Chromium. The
requests, their order and the checks are the same code.
"""

from __future__ import annotations

import asyncio
import time
import urllib.error
import urllib.request
from datetime import UTC, datetime
from pathlib import Path

import pytest
from sync_server import DavServer
from test_sync_edges import T0, delivered, queue, target_for

from mobile_app.sync import (
    FetchTransport,
    OfflineError,
    SlowServerError,
    SyncLimits,
    SyncTarget,
    save_target,
    sync_once_async,
)
from mobile_app.sync.fetch import ALLOWED_HEADERS, METHODS, Reply
from mobile_app.sync.outbox import Outbox
from mobile_app.sync.schedule import SyncLoop
from mobile_app.sync.target import ProtocolError

ORIGIN = "http://127.0.0.1:8000"


class _NoRedirects(urllib.request.HTTPRedirectHandler):
    def redirect_request(self, *args, **kwargs):  # noqa: ANN002, ANN003 - urllib's signature
        return None


_opener = urllib.request.build_opener(_NoRedirects)


async def urllib_fetch(method: str, url: str, headers: dict[str, str], body: bytes | None,
                       max_bytes: int, timeout_s: float | None) -> Reply:
    """A fetcher on urllib (a real HTTP client), as `Fetcher` asks: typed errors only."""

    def ask() -> Reply:
        request = urllib.request.Request(url, data=body, method=method, headers=headers)
        try:
            with _opener.open(request, timeout=timeout_s) as response:
                return Reply(response.status, response.read(max_bytes + 1))
        except urllib.error.HTTPError as exc:
            if 300 <= exc.code < 400:
                raise ProtocolError("the office folder redirects elsewhere") from exc
            return Reply(exc.code, exc.read(max_bytes + 1))
        except TimeoutError as exc:
            raise SlowServerError("the office folder was too slow to answer (timed out)") from exc
        except (urllib.error.URLError, ConnectionError) as exc:
            if isinstance(getattr(exc, "reason", None), TimeoutError):
                raise SlowServerError("the office folder was too slow to answer (timed out)") from exc
            raise OfflineError("the office folder did not answer") from exc

    return await asyncio.to_thread(ask)


@pytest.fixture
def dav(tmp_path):
    server = DavServer(tmp_path / "server", tmp_path / "requests.log", cors=ORIGIN)
    yield server
    server.stop()


def fetch_transport(server: DavServer, timeout_s: float = 10.0) -> FetchTransport:
    return FetchTransport(target_for(server, timeout_s), urllib_fetch)


def test_bundles_arrive_whole_and_verified_over_fetch(tmp_path, dav, store):
    made = queue(store, tmp_path / "exports", count=3)
    dav.start()
    report = asyncio.run(sync_once_async(store, fetch_transport(dav), now=T0))
    assert report.error is None and len(report.sent) == 3 and report.waiting == 0
    assert delivered(dav, made)
    methods = [line.split()[0] for line in dav.requests()]
    # per bundle: MKCOL of its temporary folder, PUT and GET of each of its three files (JSON, PDF,
    # manifest), one MOVE (RFC 4918 9.9)
    assert methods.count("MOVE") == 3 and methods.count("PUT") == methods.count("GET") == 9


def test_a_second_send_is_refused_by_the_lease_and_nothing_is_sent_twice(tmp_path, dav, store):
    made = queue(store, tmp_path / "exports", count=2)
    dav.start()

    async def both():
        return await asyncio.gather(sync_once_async(store, fetch_transport(dav), now=T0),
                                    sync_once_async(store, fetch_transport(dav), now=T0))

    first, second = asyncio.run(both())
    assert sorted([first.busy, second.busy]) == [False, True]
    assert delivered(dav, made)


def test_a_refused_password_is_an_auth_error_that_never_shows_it(tmp_path, dav, store):
    queue(store, tmp_path / "exports", count=1)
    dav.start()
    wrong = FetchTransport(SyncTarget(dav.url, dav.user, "not-the-password", 10.0), urllib_fetch)
    report = asyncio.run(sync_once_async(store, wrong, now=T0))
    assert report.error_kind == "auth" and "not-the-password" not in (report.error or "")
    assert Outbox(store.db).waiting()


def test_a_trickling_server_is_held_to_the_deadline(tmp_path, dav, store):
    queue(store, tmp_path / "exports", count=2)
    dav.start("--trickle", "0.5:100:GET")
    started = time.monotonic()
    report = asyncio.run(sync_once_async(store, fetch_transport(dav, timeout_s=2.0), now=T0,
                                         limits=SyncLimits(run_s=3.0, bundle_s=2.0)))
    assert time.monotonic() - started < 3.0 + 2.5
    assert report.error_kind in ("timeout", "limit") and not report.sent


def test_the_cors_setting_answers_the_preflight_without_the_password(dav):
    # W3C Fetch standard 3.2.2-3.2.3: a preflight carries no credentials; the answer must allow the
    # origin, each method and header the sync uses.
    dav.start()
    for method in METHODS:
        request = urllib.request.Request(dav.url, method="OPTIONS", headers={
            "Origin": ORIGIN, "Access-Control-Request-Method": method,
            "Access-Control-Request-Headers": ", ".join(h.lower() for h in ALLOWED_HEADERS)})
        with urllib.request.urlopen(request, timeout=10) as response:
            assert response.status in (200, 204)
            assert response.headers["Access-Control-Allow-Origin"] == ORIGIN
            assert method in response.headers["Access-Control-Allow-Methods"]
            allowed = response.headers["Access-Control-Allow-Headers"].lower()
            assert all(h.lower() in allowed for h in ALLOWED_HEADERS)
    other = urllib.request.Request(dav.url, method="OPTIONS", headers={
        "Origin": "https://elsewhere.example", "Access-Control-Request-Method": "PUT"})
    with urllib.request.urlopen(other, timeout=10) as response:
        assert response.headers["Access-Control-Allow-Origin"] is None


def test_the_loop_sends_when_woken_after_the_server_returns(tmp_path, dav, store):
    from mobile_app.sync import connect

    made = queue(store, tmp_path / "exports", count=1)
    save_target(store, dav.url, dav.user, dav.password)
    reports = []
    connect.use_async_transport(lambda target: FetchTransport(target, urllib_fetch))
    try:
        async def scenario() -> None:
            loop = SyncLoop(store, reports.append, idle_s=30.0)
            running = asyncio.create_task(loop.run())
            while not reports:  # the run at start: the server is down
                await asyncio.sleep(0.05)
            dav.start()
            loop.wake(force=True)  # what the browser's `online` event does
            while len(reports) < 2:
                await asyncio.sleep(0.05)
            loop.stop()
            await running

        asyncio.run(asyncio.wait_for(scenario(), 60))
    finally:
        connect._installed.clear()
    assert reports[0].error_kind == "offline" and not reports[0].sent
    assert reports[1].sent and reports[1].error is None
    assert delivered(dav, made)
    sent = Outbox(store.db).sent()
    assert sent and datetime.fromisoformat(sent[0]["sent_at"]) > T0.replace(tzinfo=UTC)


def test_a_sync_awaited_over_the_blocking_transport_runs_each_request_in_a_thread(tmp_path, dav, store):
    # The server form's screens await the same runner over webdav4 (connect.open_async_transport).
    made = queue(store, tmp_path / "exports", count=1)
    dav.start()
    save_target(store, dav.url, dav.user, dav.password)
    from mobile_app.sync import sync_store_async

    report = asyncio.run(sync_store_async(store, force=True))
    assert report.sent and delivered(dav, made)


def test_the_fetch_module_imports_no_network_library():
    source = Path("mobile_app/sync/fetch.py").read_text(encoding="utf-8")
    assert "import httpx" not in source and "import js" not in source
