"""Helpers for the static browser build in tests and benchmarks: build a site, serve it with a plain
static server on loopback, count what a page asks of other hosts."""

from __future__ import annotations

import base64
import subprocess
import sys
from dataclasses import dataclass, field
from pathlib import Path

from test_e2e_walk import ROOT, free_port, stop_server, wait_http

WHEEL_CACHE = ROOT / "build" / "web-wheels"
"""Browser wheels downloaded by test builds (the build folder is not committed)."""


def build(out: Path, spec: object | None = None):
    """Build a static site into `out` (Boardside unless `spec` says otherwise); return the Site."""
    from mobile_app.webbuild import build_site

    return build_site(out, spec, cache=WHEEL_CACHE)  # type: ignore[arg-type]


def serve(folder: Path, port: int | None = None) -> tuple[subprocess.Popen[bytes], str]:
    """`python -m http.server` on 127.0.0.1 for `folder`, in its own process group; (process, base URL)."""
    port = port or free_port()
    process = subprocess.Popen(
        [sys.executable, "-m", "http.server", "--bind", "127.0.0.1", "--directory", str(folder), str(port)],
        stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, start_new_session=True,
    )
    url = f"http://127.0.0.1:{port}/"
    try:
        wait_http(url)
    except TimeoutError:
        stop_server(process)
        raise
    return process, url


@dataclass
class Elsewhere:
    """Requests to any host but loopback, aborted and kept for the check (there must be none)."""

    urls: list[str] = field(default_factory=list)

    def guard(self, context) -> None:
        """Abort and record every request of `context` that leaves loopback."""

        def route(request_route) -> None:
            url = request_route.request.url
            if url.startswith(("http://127.0.0.1:", "http://localhost:")) or not url.startswith("http"):
                request_route.continue_()
            else:
                self.urls.append(url)
                request_route.abort()

        context.route("**/*", route)


INJECT = """async ([name, data]) => {
    const bytes = Uint8Array.from(atob(data), (c) => c.charCodeAt(0));
    const db = await new Promise((resolve, reject) => {
        const request = indexedDB.open("/data", 21);
        request.onupgradeneeded = () => {
            const store = request.result.createObjectStore("FILE_DATA");
            store.createIndex("timestamp", "timestamp", { unique: false });
        };
        request.onsuccess = () => resolve(request.result);
        request.onerror = () => reject(request.error);
    });
    await new Promise((resolve, reject) => {
        const transaction = db.transaction("FILE_DATA", "readwrite");
        transaction.objectStore("FILE_DATA").put(
            { timestamp: new Date(1), mode: 33188, contents: bytes }, "/data/" + name);
        transaction.oncomplete = resolve;
        transaction.onerror = () => reject(transaction.error);
    });
    db.close();
}"""
"""Put a store file into browser storage as the worker's IndexedDB mount keeps it (an Emscripten IDBFS
entry), before the app opens it."""


def put_store(context, url: str, data: bytes) -> None:
    """Put a store file into the browser storage of the site at `url` (opened once on a small file of
    the site, so the storage is that origin's), before the app opens it."""
    page = context.new_page()
    page.goto(url + "favicon.png")
    page.evaluate(INJECT, ["boardside.sqlite", base64.b64encode(data).decode()])
    page.close()
