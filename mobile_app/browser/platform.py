"""The browser's platform edges, installed into the app's seams before its first screen.

- the sync's transport: the browser's fetch (`network`), through `mobile_app.sync.use_async_transport`;
- the device key that seals the sync password, kept apart from the store (`keys`), through
  `mobile_app.sync.use_key_store`;
- the PDF's libraries and fonts, an archive the worker unpacks on the first export only, through
  `mobile_app.export.use_loader`;
- the outbox's sync, run by a `SyncLoop` on the page's event loop: at start, at each bundle's next
  try, when an export is queued, and on the page's `online` event (the connection came back), which
  the page forwards to the worker (site/python.js): a worker does not reliably hear its own.
"""

from __future__ import annotations

import importlib
import warnings
from collections.abc import Callable
from typing import Any

from mobile_app.browser.keys import BrowserKeyStore


def install(js: Any, device_key: bytes | None) -> None:
    """Install fetch, the device key and the export loader (before any screen runs)."""
    from mobile_app.browser import network
    from mobile_app.export import use_loader
    from mobile_app.sync import FetchTransport, use_async_transport, use_key_store

    use_async_transport(lambda target: FetchTransport(target, network.fetch))
    use_key_store(BrowserKeyStore(device_key))

    async def load_export() -> None:
        from mobile_app.export import LibrariesError

        failure = await js.loadExtra("export")
        if failure:
            raise LibrariesError(str(failure))
        importlib.invalidate_caches()
        # fpdf2 says once that it cannot place images without Pillow; Boardside's PDF has none
        warnings.filterwarnings("ignore", message="Pillow could not be imported")

    use_loader(load_export)


async def device_key(js: Any) -> bytes | None:
    """The device key's bytes from the worker (None where the browser keeps none)."""
    key = await js.deviceKey()
    return None if key is None else bytes(key.to_py())


def start_sync(store: Any, on_report: Callable[[Any], None]) -> Any:
    """Start the outbox's SyncLoop on the page's event loop and wake it on the page's `online` event."""
    import asyncio

    import boardside_js  # type: ignore[import-not-found]  # registered by the page's Python worker
    from pyodide.ffi import create_proxy  # type: ignore[import-not-found]

    from mobile_app.sync.schedule import SyncLoop

    loop = SyncLoop(store, on_report)
    boardside_js.whenOnline(create_proxy(lambda *_args: loop.wake(force=True)))
    asyncio.ensure_future(loop.run())
    return loop
