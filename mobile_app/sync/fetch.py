"""WebDAV over a fetch function: the transport of the static build in the browser.

`FetchTransport(target, fetcher)` implements `mobile_app.sync.transport.AsyncTransport` with the few
requests a sync needs (RFC 4918: PROPFIND Depth 0, MKCOL, PUT, GET, MOVE, DELETE), each one call of
`fetcher`. In the browser the fetcher is the page's own `fetch` (`mobile_app.browser.network`), which
the browser entry installs with `connect.use_async_transport`; it imports nothing of the network
itself, so the same code is tested here against a real WebDAV server with another fetcher.

A page may ask another host only when that host allows it (CORS, W3C Fetch standard section 3.2): the
office server must answer the preflight `OPTIONS` without asking for the password and allow the
site's origin, these methods and the headers `Authorization`, `Content-Type`, `Depth`, `Destination`
and `Overwrite` (README, "Sync to the office"). The password goes in a Basic `Authorization` header
set here (RFC 7617), never the browser's own credential store, and redirects are not followed.

The deadline (`set_deadline`) bounds each whole request, body included: the fetcher is given the
seconds left and ends the request then, so a server that trickles bytes cannot hold it.
"""

from __future__ import annotations

import base64
from dataclasses import dataclass
from typing import Protocol
from urllib.parse import quote

from mobile_app.sync.target import (
    MAX_XML_BYTES,
    ProtocolError,
    SlowServerError,
    SyncTarget,
    TimeLimitError,
    check_done,
    check_url,
    parse_file_names,
    parse_is_collection,
    status_error,
)
from mobile_app.sync.transport import remaining_s

PROPFIND_BODY = (b'<?xml version="1.0" encoding="utf-8"?>'
                 b'<d:propfind xmlns:d="DAV:"><d:prop><d:resourcetype/></d:prop></d:propfind>')
ALLOWED_HEADERS = ("Authorization", "Content-Type", "Depth", "Destination", "Overwrite")
"""The request headers the office server's CORS setting must allow."""
METHODS = ("PROPFIND", "MKCOL", "PUT", "GET", "MOVE", "DELETE")
"""The methods the office server's CORS setting must allow."""


@dataclass(frozen=True)
class Reply:
    """A server's answer: its HTTP status and (at most the asked number of bytes of) its body."""

    status: int
    body: bytes = b""


class Fetcher(Protocol):
    """One HTTP request, awaited: the status and at most `max_bytes` + 1 bytes of the body.

    Raises only the sync's typed errors: OfflineError when nothing answered (which, in a browser,
    includes a server that refused the page's origin), SlowServerError when `timeout_s` ran out,
    ProtocolError for a redirect.
    """

    async def __call__(self, method: str, url: str, headers: dict[str, str], body: bytes | None,
                       max_bytes: int, timeout_s: float | None) -> Reply: ...


def basic_auth(user: str, password: str) -> str:
    """The `Authorization` value for HTTP Basic (RFC 7617 section 2, UTF-8 as its section 2.1 allows)."""
    return "Basic " + base64.b64encode(f"{user}:{password}".encode()).decode("ascii")


class FetchTransport:
    """The office folder through a fetch function (see `AsyncTransport` for each method)."""

    def __init__(self, target: SyncTarget, fetcher: Fetcher) -> None:
        self.target = target
        self.url = check_url(target.url)
        self.fetcher = fetcher
        self.deadline_s: float | None = None
        self.headers = {"Authorization": basic_auth(target.user, target.password)} if target.user else {}

    def set_deadline(self, at_s: float | None) -> None:
        self.deadline_s = at_s

    def close(self) -> None:
        """Nothing to close: each request is one fetch."""

    def _url(self, path: str) -> str:
        """The URL of a path below the office folder, each segment percent-encoded (RFC 3986 2.1)."""
        return self.url + quote(path, safe="/")

    async def _ask(self, method: str, path: str, headers: dict[str, str] | None = None,
                   body: bytes | None = None, max_bytes: int = 0) -> Reply:
        """One request with the credentials, ended at the deadline (TimeLimitError once it passed)."""
        wait_s = remaining_s(self.deadline_s, self.target.timeout_s if self.deadline_s is None else None)
        try:
            return await self.fetcher(method, self._url(path), {**self.headers, **(headers or {})}, body,
                                      max_bytes, wait_s)
        except SlowServerError as exc:
            if self.deadline_s is not None:
                try:
                    remaining_s(self.deadline_s)
                except TimeLimitError as passed:
                    raise passed from exc
            raise

    async def kind(self, path: str) -> str | None:
        headers = {"Depth": "0", "Content-Type": "application/xml; charset=utf-8"}
        reply = await self._ask("PROPFIND", path, headers, PROPFIND_BODY, MAX_XML_BYTES)
        if reply.status == 404:
            return None
        if reply.status != 207:
            raise status_error(reply.status) if reply.status >= 300 else \
                ProtocolError("the office address is not a WebDAV folder (no multistatus)")
        return "folder" if parse_is_collection(reply.body) else "file"

    async def files(self, path: str) -> list[str]:
        headers = {"Depth": "1", "Content-Type": "application/xml; charset=utf-8"}
        reply = await self._ask("PROPFIND", path, headers, PROPFIND_BODY, MAX_XML_BYTES)
        if reply.status == 404:
            return []
        if reply.status != 207:
            raise status_error(reply.status) if reply.status >= 300 else \
                ProtocolError("the office address is not a WebDAV folder (no multistatus)")
        return parse_file_names(reply.body)

    async def make_folder(self, path: str) -> bool:
        reply = await self._ask("MKCOL", path)
        if reply.status == 405:
            return False
        if reply.status == 409:
            raise ProtocolError("the office folder's parent does not exist on the server (HTTP 409)")
        if reply.status >= 300:
            raise status_error(reply.status)
        return True

    async def put(self, path: str, data: bytes) -> None:
        reply = await self._ask("PUT", path, {"Content-Type": "application/octet-stream"}, data)
        if reply.status >= 300:
            raise status_error(reply.status)

    async def get(self, path: str, max_bytes: int) -> bytes | None:
        reply = await self._ask("GET", path, max_bytes=max_bytes)
        if reply.status == 404:
            return None
        if reply.status != 200:
            raise status_error(reply.status)
        return reply.body[: max_bytes + 1]

    async def move(self, source: str, destination: str, overwrite: bool = False) -> bool:
        reply = await self._ask("MOVE", source, {"Destination": self._url(destination),
                                                 "Overwrite": "T" if overwrite else "F"})
        if reply.status == 412:
            return False
        check_done(reply.status)
        return True

    async def delete(self, path: str) -> bool:
        reply = await self._ask("DELETE", path)
        if reply.status == 404:
            return False
        check_done(reply.status)
        return True
