"""The transport of the platform the app runs on (the one place that knows which network library).

In the server form that is `WebDavTransport` (webdav4 over httpx), imported only when a sync needs
the network: blocking for the command line and `SyncTask` (`open_transport`), each request in a
worker thread for a screen that awaits the sync (`open_async_transport`). The static build in the
browser has neither httpx nor threads: its entry installs the browser's fetch
(`use_async_transport`, see `mobile_app.sync.fetch`) before any screen is shown.
"""

from __future__ import annotations

from collections.abc import Callable

from mobile_app.sync.target import SyncTarget
from mobile_app.sync.transport import AsyncTransport, Threaded, Transport

_installed: list[Callable[[SyncTarget], AsyncTransport]] = []


def open_transport(target: SyncTarget) -> Transport:
    """A blocking transport to the office folder `target` (checks its address before any traffic)."""
    from mobile_app.sync.webdav import WebDavTransport

    return WebDavTransport(target)


def open_async_transport(target: SyncTarget) -> AsyncTransport:
    """The platform's transport for a sync that is awaited: the one installed by the platform's
    entry, else the blocking one with each request in a worker thread."""
    if _installed:
        return _installed[-1](target)
    return Threaded(open_transport(target))


def use_async_transport(opener: Callable[[SyncTarget], AsyncTransport]) -> None:
    """Install the platform's own transport for awaited syncs (the browser entry installs fetch)."""
    _installed.clear()
    _installed.append(opener)
