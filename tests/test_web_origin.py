"""Only our own page drives the server: foreign Origin and Host headers are refused, on a real server.

Raw WebSocket handshakes and HTTP requests (the `websockets` and `urllib` clients) against
`python -m mobile_app` on loopback, and a real Chromium page served from another loopback origin that
tries to open the app's WebSocket.
"""

from __future__ import annotations

import asyncio
import http.server
import threading
import urllib.error
import urllib.request
from collections.abc import Iterator
from pathlib import Path

import pytest
import websockets
from test_e2e_walk import CHROMIUM, CHROMIUM_ARGS, free_port, open_app, start_server, stop_server, wait_http

from mobile_app.web_guard import own_hosts, refusal

HOSTS = own_hosts(8550)


@pytest.mark.parametrize(("host", "origin", "websocket", "refused"), [
    ("127.0.0.1:8550", "http://127.0.0.1:8550", True, None),
    ("localhost:8550", "http://localhost:8550", True, None),
    ("127.0.0.1:8550", None, False, None),                      # a plain page load sends no Origin
    ("127.0.0.1:8550", None, True, "a WebSocket needs an Origin"),
    ("127.0.0.1:8550", "http://evil.example", True, "Origin 'http://evil.example' is not this server's page"),
    ("127.0.0.1:8550", "http://127.0.0.1:8551", True, "Origin 'http://127.0.0.1:8551' is not this "
     "server's page"),
    ("127.0.0.1:8550", "https://127.0.0.1:8550", False, "Origin 'https://127.0.0.1:8550' is not this "
     "server's page"),
    ("127.0.0.1:8550", "null", True, "Origin 'null' is not this server's page"),
    ("evil.example:8550", "http://evil.example:8550", True, "Host 'evil.example:8550' is not this server"),
    ("127.0.0.1", None, False, "Host '127.0.0.1' is not this server"),
    (None, None, False, "Host None is not this server"),
])
def test_refusal_rules(host, origin, websocket, refused):
    # RFC 6455 10.2 (Origin on WebSocket handshakes), RFC 6454 (origins), RFC 9110 7.2 (Host).
    assert refusal(host, origin, websocket, HOSTS) == refused


@pytest.fixture(scope="module")
def app_url(tmp_path_factory: pytest.TempPathFactory) -> Iterator[str]:
    data = tmp_path_factory.mktemp("origin-store")
    port = free_port()
    process = start_server(data, port, "--demo")
    try:
        wait_http(f"http://127.0.0.1:{port}/")
        yield f"http://127.0.0.1:{port}"
    finally:
        stop_server(process)


def handshake(url: str, origin: str | None, host: str | None = None) -> int:
    """The HTTP status of a raw WebSocket handshake to the app's /ws."""
    async def attempt() -> int:
        headers = {"Host": host} if host else None
        try:
            async with websockets.connect(url.replace("http", "ws") + "/ws", origin=origin,
                                          additional_headers=headers, open_timeout=10) as ws:
                return int(ws.response.status_code)
        except websockets.InvalidStatus as error:
            return int(error.response.status_code)

    return asyncio.run(attempt())


def http_status(url: str, **headers: str) -> int:
    try:
        with urllib.request.urlopen(urllib.request.Request(url, headers=headers), timeout=10) as response:
            return int(response.status)
    except urllib.error.HTTPError as error:
        return int(error.code)


def test_a_websocket_with_a_foreign_origin_is_refused(app_url: str) -> None:
    assert handshake(app_url, "http://evil.example") == 403
    assert handshake(app_url, "http://127.0.0.1:1") == 403
    assert handshake(app_url, None) == 403


def test_a_websocket_through_a_rebound_name_is_refused(app_url: str) -> None:
    port = app_url.rsplit(":", 1)[1]
    assert handshake(app_url, f"http://evil.example:{port}", host=f"evil.example:{port}") == 403


def test_our_own_origin_opens_the_websocket(app_url: str) -> None:
    assert handshake(app_url, app_url) == 101


def test_http_with_a_foreign_origin_or_host_is_refused(app_url: str) -> None:
    port = app_url.rsplit(":", 1)[1]
    assert http_status(app_url + "/") == 200
    assert http_status(app_url + "/", Origin=app_url) == 200
    assert http_status(app_url + "/", Origin="http://evil.example") == 403
    assert http_status(app_url + "/", Host=f"evil.example:{port}") == 403


class _Quiet(http.server.SimpleHTTPRequestHandler):
    def log_message(self, *args: object) -> None:
        return


@pytest.mark.browser
@pytest.mark.skipif(not CHROMIUM.exists(), reason="needs Debian chromium at /usr/bin/chromium")
def test_a_page_from_another_origin_cannot_open_the_apps_websocket(app_url: str, tmp_path: Path) -> None:
    from functools import partial

    from playwright.sync_api import sync_playwright

    (tmp_path / "index.html").write_text(
        "<script>const ws = new WebSocket('" + app_url.replace("http", "ws") + "/ws');"
        "ws.onopen = () => document.title = 'open'; ws.onerror = () => document.title = 'refused';"
        "</script>", encoding="utf-8")
    other = http.server.ThreadingHTTPServer(("127.0.0.1", 0), partial(_Quiet, directory=str(tmp_path)))
    thread = threading.Thread(target=other.serve_forever, daemon=True)
    thread.start()
    try:
        with sync_playwright() as pw:
            browser = pw.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
            page = browser.new_context(viewport={"width": 390, "height": 844}).new_page()
            page.goto(f"http://127.0.0.1:{other.server_address[1]}/index.html")
            page.wait_for_function("document.title !== ''", timeout=15000)
            assert page.title() == "refused"
            open_app(page, app_url)
            page.get_by_text("TY-2026-118", exact=False).first.wait_for(timeout=30000)
            browser.close()
    finally:
        other.shutdown()
        thread.join(timeout=5)
