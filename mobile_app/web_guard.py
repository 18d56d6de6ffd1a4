"""Only our own page drives the server: an ASGI wrapper refusing foreign Host and Origin headers.

The app is served on 127.0.0.1 only, but a page from any web site open in the same browser can still
reach a loopback port: by a WebSocket (browsers send no preflight for one, only an `Origin` header)
or by DNS rebinding (a foreign name resolving to 127.0.0.1, seen in the `Host` header). So every HTTP
request and WebSocket handshake must name this server as its Host (RFC 9110 section 7.2), and any
Origin it carries (RFC 6454) must be this server's own; a WebSocket handshake must carry one, as
browsers always do (RFC 6455 section 4.1, item 8, and section 10.2). Refused HTTP requests get 403;
a refused WebSocket is closed before it is accepted, which the server answers with 403 too.
"""

from __future__ import annotations

from collections.abc import Awaitable, Callable, Iterable
from typing import Any

Scope = dict[str, Any]
Receive = Callable[[], Awaitable[dict[str, Any]]]
Send = Callable[[dict[str, Any]], Awaitable[None]]
App = Callable[[Scope, Receive, Send], Awaitable[None]]

LOOPBACK_NAMES = ("127.0.0.1", "localhost")


def own_hosts(port: int) -> frozenset[str]:
    """The Host values that name this server: its loopback address or `localhost`, with its port."""
    return frozenset(f"{name}:{port}" for name in LOOPBACK_NAMES)


def refusal(host: str | None, origin: str | None, websocket: bool, hosts: Iterable[str]) -> str | None:
    """Why a request must be refused, or None: a foreign or missing Host, a foreign Origin, or a
    WebSocket handshake without an Origin."""
    allowed = frozenset(hosts)
    if host is None or host.lower() not in allowed:
        return f"Host {host!r} is not this server"
    if origin is None:
        return "a WebSocket needs an Origin" if websocket else None
    if origin.lower() not in {f"http://{name}" for name in allowed}:
        return f"Origin {origin!r} is not this server's page"
    return None


def _header(scope: Scope, name: bytes) -> str | None:
    for key, value in scope.get("headers") or []:
        if key.lower() == name:
            return bytes(value).decode("latin-1")
    return None


class LoopbackOnly:
    """ASGI middleware around `app` that refuses requests not from this server's own page."""

    def __init__(self, app: App, port: int) -> None:
        self.app = app
        self.hosts = own_hosts(port)
        self.refused = 0

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        kind = scope.get("type")
        if kind in ("http", "websocket"):
            problem = refusal(_header(scope, b"host"), _header(scope, b"origin"), kind == "websocket",
                              self.hosts)
            if problem is not None:
                self.refused += 1
                await (_close_websocket(receive, send) if kind == "websocket" else _forbidden(send, problem))
                return
        await self.app(scope, receive, send)


async def _forbidden(send: Send, problem: str) -> None:
    body = f"refused: {problem}\n".encode()
    await send({"type": "http.response.start", "status": 403,
                "headers": [(b"content-type", b"text/plain; charset=utf-8"),
                            (b"content-length", str(len(body)).encode())]})
    await send({"type": "http.response.body", "body": body})


async def _close_websocket(receive: Receive, send: Send) -> None:
    """Close a WebSocket before accepting it (ASGI: the server then answers the handshake with 403)."""
    message = await receive()
    if message.get("type") == "websocket.connect":
        await send({"type": "websocket.close", "code": 1008})
