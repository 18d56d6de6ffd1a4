"""The transport of the platform the app runs on (the one place that knows which network library).

In the server form this is `WebDavTransport` (webdav4 over httpx), imported only when a sync needs
the network; the static build in the browser adds its fetch-based transport here.
"""

from __future__ import annotations

from mobile_app.sync.target import SyncTarget
from mobile_app.sync.transport import Transport


def open_transport(target: SyncTarget) -> Transport:
    """A transport to the office folder `target` (checks its address before any traffic)."""
    from mobile_app.sync.webdav import WebDavTransport

    return WebDavTransport(target)
