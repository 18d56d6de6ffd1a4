"""The browser's fetch as the sync's fetcher (`mobile_app.sync.fetch.Fetcher`), in the page's worker.

Each request is one `fetch` with the credentials in its own `Authorization` header (`credentials:
"omit"`: the browser's stored logins and cookies are never sent, and a refusal never opens the
browser's login box), `redirect: "manual"` (a redirect is refused, as in the server form) and an
`AbortSignal.timeout` for the seconds the sync has left. The body is read in chunks and the read ends
past the bytes asked for. Before the first request to an office folder its origin is named in the cache
the service worker reads (site/sw.js), the one other host the site may reach.

A failed fetch says nothing of why (W3C Fetch standard 4.1: a network error); the message names the
likely causes, among them an office server whose CORS setting does not allow this site.
"""

from __future__ import annotations

from typing import Any
from urllib.parse import urlsplit

from mobile_app.sync.fetch import Reply
from mobile_app.sync.target import OfflineError, ProtocolError, SlowServerError

NO_ANSWER = ("the office folder did not answer (no connection, the server is down, or its CORS setting "
             "does not allow this site: see the README)")
_named: set[str] = set()


def origin_of(url: str) -> str:
    """`scheme://host[:port]` of a URL, as a browser writes an origin (RFC 6454 section 6.1)."""
    parts = urlsplit(url)
    default = {"http": 80, "https": 443}.get(parts.scheme)
    port = f":{parts.port}" if parts.port is not None and parts.port != default else ""
    host = f"[{parts.hostname}]" if parts.hostname and ":" in parts.hostname else parts.hostname
    return f"{parts.scheme}://{host}{port}"


async def name_office(js: Any, origin: str) -> None:
    """Tell the service worker that `origin` is the office folder's (once per origin and start)."""
    if origin in _named:
        return
    bridge = _bridge()
    cache = await js.caches.open(bridge.officeCache)
    await cache.put("office-origin", js.Response.new(origin))
    _named.add(origin)


def _bridge() -> Any:
    import boardside_js  # type: ignore[import-not-found]  # registered by the page's Python worker

    return boardside_js


async def fetch(method: str, url: str, headers: dict[str, str], body: bytes | None, max_bytes: int,
                timeout_s: float | None) -> Reply:
    """One request by the browser's fetch (see the module's docstring); typed errors only."""
    import js  # type: ignore[import-not-found]  # Pyodide's bridge to the worker's JavaScript
    from pyodide.ffi import JsException, to_js  # type: ignore[import-not-found]

    options: dict[str, Any] = {"method": method, "headers": headers, "credentials": "omit",
                               "redirect": "manual", "cache": "no-store", "mode": "cors"}
    if body is not None:
        payload = js.Uint8Array.new(len(body))
        payload.assign(body)
        options["body"] = payload
    if timeout_s is not None:
        options["signal"] = js.AbortSignal.timeout(max(1, int(timeout_s * 1000)))
    try:
        await name_office(js, origin_of(url))
        response = await js.fetch(url, to_js(options, dict_converter=js.Object.fromEntries))
        if response.type == "opaqueredirect":
            raise ProtocolError("the office folder redirects elsewhere: check its address "
                                "(redirects are not followed)")
        return Reply(int(response.status), await _read(response, max_bytes))
    except JsException as exc:
        if getattr(exc, "name", "") in ("TimeoutError", "AbortError"):
            raise SlowServerError("the office folder was too slow to answer (timed out)") from None
        raise OfflineError(NO_ANSWER) from None


async def _read(response: Any, max_bytes: int) -> bytes:
    """At most `max_bytes` + 1 bytes of a response's body, read chunk by chunk."""
    if response.body is None:
        return b""
    reader = response.body.getReader()
    kept: list[bytes] = []
    size = 0
    while size <= max_bytes:
        chunk = await reader.read()
        if chunk.done:
            return b"".join(kept)
        data = chunk.value.to_bytes()
        kept.append(data)
        size += len(data)
    await reader.cancel()
    return b"".join(kept)[: max_bytes + 1]
