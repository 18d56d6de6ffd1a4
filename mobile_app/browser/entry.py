"""The page's Python entry (static build): `prepare()` while the web client loads, `run()` when it connects.

`prepare` claims the job store (one tab owns it), opens it and imports the first screen, all before the
client asks, so the jobs list is sent as soon as it connects. A tab that does not own the store shows a
screen saying so, with a way to try again once the other tab is closed; it never opens its own copy.
"""

from __future__ import annotations

from typing import Any

_state: dict[str, Any] = {}


async def prepare() -> None:
    """Claim and open the store, and import the screens' code (runs before the client connects)."""
    from mobile_app.browser import storage

    js = storage.bridge()
    _state["js"] = js
    if await storage.claim(js):
        _state["store"] = storage.open_store(js)
    import mobile_app.main  # noqa: F401  (the routes and the first screen's code)


def run() -> None:
    """Start the Flet app on the page's connection (returns at once; the connection runs it)."""
    import flet as ft

    ft.run(_main)


async def _main(page: Any) -> None:
    from mobile_app.main import make_main

    store = _state.get("store")
    if store is not None:
        make_main(store)(page)
        _state["js"].mark("first-screen-sent")
        return
    import flet as ft

    from mobile_app.browser import storage
    from mobile_app.components.palette import app_theme
    from mobile_app.views import another_tab_view

    async def retry() -> None:
        if not await storage.claim(_state["js"]):
            page.show_dialog(ft.SnackBar(ft.Text("Still open in another tab."), duration=2500))
            return
        _state["store"] = storage.open_store(_state["js"])
        page.views.clear()
        make_main(_state["store"])(page)

    page.title = "Boardside"
    page.theme = page.dark_theme = app_theme()
    page.views.clear()
    page.views.append(another_tab_view.build(retry))
    page.update()
