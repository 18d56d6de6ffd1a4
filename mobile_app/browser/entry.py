"""The page's Python entry (static build): `warm()` and `prepare()` while the web client loads, `run()`
when it connects.

`warm` imports the app's code and nothing else (the worker keeps a memory snapshot after it, so later
starts skip it); `prepare` claims the job store (one tab owns it) and opens it, and installs the
browser's platform edges (`platform`: fetch for the sync, the device key, the PDF's libraries on
demand), all before the client asks, so the jobs list is sent as soon as it connects; the store's
integrity check (the whole audit trail hashed) follows once the list is on screen. Once it is sent,
the outbox's sync starts (and runs again whenever the connection comes back). A tab that does not own
the store shows a screen saying so, with a way to try again once the other tab is closed; it never
opens its own copy.
"""

from __future__ import annotations

from typing import Any

_state: dict[str, Any] = {}

SCREEN_CONTROLS: tuple[str, ...] = (
    "AnimationStyle", "AppBar", "Border", "BorderSide", "BottomAppBar", "BottomSheet", "Button",
    "ButtonStyle", "Card", "Colors", "Column", "Container", "CrossAxisAlignment", "FilePicker",
    "FilledButton", "FontWeight", "Icon", "IconButton", "Icons", "Image", "KeyboardType", "ListTile",
    "MainAxisAlignment", "NavigationBar", "NavigationBarDestination", "OutlinedButton", "Padding",
    "Page", "ProgressBar", "ProgressRing", "ResponsiveRow", "RoundedRectangleBorder", "Row", "SafeArea",
    "ScrollMode", "Semantics", "Share", "ShareFile", "SnackBar", "Text", "TextButton", "TextField",
    "TextOverflow", "TextStyle", "TextTheme", "Theme", "ThemeMode", "View",
)
"""The Flet names the screens use (Flet imports each on first use; tests/test_webbuild.py keeps this
list in step with mobile_app/views and mobile_app/components)."""


def warm() -> None:
    """Import the screens' code and the Flet controls they build.

    The worker keeps a memory snapshot after this, so later starts skip it. Nothing here may touch the
    page (no JavaScript object may be held by Python in a snapshot) nor load a compiled extension
    (msgpack's, which the Flet connection loads), which a snapshot cannot restore.
    """
    import flet as ft

    import mobile_app.browser.platform  # noqa: F401
    import mobile_app.browser.storage  # noqa: F401
    import mobile_app.sync.fetch  # noqa: F401
    import mobile_app.sync.schedule  # noqa: F401
    from mobile_app.main import import_screens

    import_screens()
    for name in SCREEN_CONTROLS:
        getattr(ft, name)
    _ready_controls(ft)


def _ready_controls(ft: Any) -> None:
    """Load the icon table and compile each screen control's validation rules (Flet does both on a
    control's first use, which would otherwise fall in the first screen's time)."""
    import inspect

    from flet.controls.base_control import BaseControl
    from flet.utils.validation import validate

    samples = {"Icon": lambda: ft.Icon(ft.Icons.ADD), "SnackBar": lambda: ft.SnackBar(ft.Text("")),
               "SafeArea": lambda: ft.SafeArea(ft.Text(""))}
    for name in SCREEN_CONTROLS:
        cls = getattr(ft, name)
        if not (inspect.isclass(cls) and issubclass(cls, BaseControl)):
            continue
        try:
            validate(samples[name]() if name in samples else cls())
        except (TypeError, ValueError):
            pass  # needs arguments: its rules compiled before the check failed, or on first use


async def prepare() -> None:
    """Claim and open the store, install the platform's edges (runs before the client connects)."""
    from mobile_app.browser import platform, storage

    js = storage.bridge()
    _state["js"] = js
    if await storage.claim(js):
        platform.install(js, await platform.device_key(js))
        _state["store"] = storage.open_store(js, _copy_failed)
    import flet.app  # noqa: F401  (the connection's code, with msgpack's extension: not in the snapshot)
    import flet.messaging.pyodide_connection  # noqa: F401


def run() -> None:
    """Start the Flet app on the page's connection (returns at once; the connection runs it)."""
    import flet as ft

    ft.run(_main)


def _copy_failed(reason: str) -> None:
    """Say on screen that browser storage refused the copy of the store (the work stays in the page)."""
    import flet as ft

    page = _state.get("page")
    if page is not None:
        page.show_dialog(ft.SnackBar(ft.Text(
            f"Not kept by the browser ({reason}). Keep this tab open and free some space on the device;"
            " the next save tries again."), duration=10000))


async def _main(page: Any) -> None:
    _state["js"].mark("session-started")
    _state["page"] = page
    store = _state.get("store")
    if store is not None:
        _start(page, store)
        return
    import flet as ft

    from mobile_app.browser import storage
    from mobile_app.components.palette import app_theme
    from mobile_app.views import another_tab_view

    async def retry() -> None:
        from mobile_app.browser import platform

        if not await storage.claim(_state["js"]):
            page.show_dialog(ft.SnackBar(ft.Text("Still open in another tab."), duration=2500))
            return
        platform.install(_state["js"], await platform.device_key(_state["js"]))
        _state["store"] = storage.open_store(_state["js"], _copy_failed)
        page.views.clear()
        _start(page, _state["store"])

    page.title = "Boardside"
    page.theme = page.dark_theme = app_theme()
    page.views.clear()
    page.views.append(another_tab_view.build(retry))
    page.update()


def _start(page: Any, store: Any) -> None:
    """The app's first screen on the store, then the outbox's sync (after the screen is sent)."""
    from mobile_app.browser import platform
    from mobile_app.main import make_main

    loop = _state.get("sync") or platform.start_sync(store, lambda _report: None)
    _state["sync"] = loop
    make_main(store, loop, check_after_first_screen=True)(page)
    _state["js"].mark("first-screen-sent")
