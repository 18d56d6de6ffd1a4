"""The job store on browser storage: the worker's IndexedDB mount, one tab owning it.

The page's Python worker (site/python-worker.js) mounts the store's folder on IndexedDB only in the tab
that holds the store's Web Lock, and offers `flush()`, which copies the folder to browser storage. Here
the store is opened in that folder and `flush()` is installed as the store's after-commit hook, so every
committed write is copied at once (not on a timer).

In the browser the store keeps a rollback journal instead of a write-ahead log: after each commit the
database file then holds every committed change by itself, so the copy in browser storage never
depends on a log and an index file copied alongside it.
"""

from __future__ import annotations

import asyncio
from collections.abc import Callable
from pathlib import Path
from typing import Any

from mobile_app.store import Store
from mobile_app.store.core import after_commit


def bridge() -> Any:
    """The worker's storage functions (`boardside_js`: dataDir, openStorage, flush, mark)."""
    import boardside_js  # type: ignore[import-not-found]  # registered by the page's Python worker

    return boardside_js


async def claim(js: Any) -> bool:
    """Whether this tab owns the store: the worker holds its lock and has mounted its folder."""
    return bool(await js.openStorage())


def open_store(js: Any, copy_failed: Callable[[str], None]) -> Store:
    """Open the store in the mounted folder with a rollback journal, copy every commit to browser
    storage, and copy it now once (opening may have created or migrated the file). `copy_failed` hears
    why a copy failed (the save is committed in the page, but not yet kept by the browser)."""
    store = Store.open(Path(str(js.dataDir)), journal="DELETE")

    async def watch(copied: Any) -> None:
        failure = await copied
        if failure:
            copy_failed(str(failure))

    def copy() -> None:
        asyncio.ensure_future(watch(js.flush()))

    after_commit(store.db, copy)
    copy()
    return store
