"""Boardside in web mode: open the store, route between screens, serve on 127.0.0.1 without a CDN.

Nothing runs at import time; `serve` (called by `python -m mobile_app`) starts the server.
"""

from __future__ import annotations

import asyncio
import os
import re
import sys
from collections.abc import Callable
from pathlib import Path
from typing import Any

import flet as ft

from mobile_app.components.palette import FONTS, app_theme, theme_mode
from mobile_app.state.integrity import IntegrityNotice
from mobile_app.state.recorder import Recorder
from mobile_app.state.recovery import Recovery
from mobile_app.state.settings import SettingsState
from mobile_app.state.undo import UndoTrail
from mobile_app.state.walk import Walk
from mobile_app.store import NotFoundError, Store, StoreError

ASSETS_DIR = Path(__file__).resolve().parent.parent / "assets"


class Shell:
    """One browser session: its page, its store and the route it shows."""

    def __init__(self, page: ft.Page, store: Any, recovery: Recovery | None = None,
                 sync_loop: Any = None) -> None:
        self.page = page
        self.store = store
        self.recovery = recovery or Recovery(None)
        self.sync_loop = sync_loop
        self._walks: dict[int, Walk] = {}
        self._values: dict[str, Any] = {}
        self._renders = 0
        self.undo = UndoTrail(store)

    def go(self, route: str) -> None:
        """Show another screen (pushes a browser history entry, so reload and back work)."""
        self.page.run_task(self.page.push_route, route)

    def toast(self, message: str) -> None:
        """A short message at the bottom of the screen."""
        self.page.show_dialog(ft.SnackBar(ft.Text(message), duration=2500))

    def sync_soon(self) -> None:
        """Wake the background sync, if this platform runs one (the browser build), e.g. after an
        export was queued."""
        if self.sync_loop is not None:
            self.sync_loop.wake()

    def synced(self, report: Any) -> None:
        """The background sync ran: say what it sent (and whom the office's roster enrolled), and show
        the outbox again if it is on screen."""
        if report.sent:
            count = len(report.sent)
            roster = report.roster
            news = f". {roster.message}" if roster is not None and (roster.pinned or roster.enrolled) else ""
            self.toast(f"{count} export{'s' * (count != 1)} sent to the office{news}")
        if (self.page.route or "").split("?", 1)[0] == "/outbox":
            self.render()

    def walk(self, circuit_id: int, step: str) -> Walk:
        """The walk state of a circuit, kept for the session so unsaved text survives step changes;
        its saves are recorded under the person recording on this device."""
        walk = self._walks.get(circuit_id)
        if walk is None:
            walk = self._walks[circuit_id] = Walk(self.store, circuit_id, step)
        else:
            walk.step = step
            walk.reload()
        walk.by = Recorder(self.store).person_id
        return walk

    def save_typed(self) -> None:
        """Save what was typed and not saved yet on any walk of the session (the screen is being
        left, or the browser tab closed)."""
        for walk in self._walks.values():
            if walk.unsaved:
                try:
                    walk.save()
                except StoreError as exc:
                    print(f"Boardside: typed text not saved: {exc}", file=sys.stderr)

    def session_value(self, key: str, factory: Callable[[], Any]) -> Any:
        """A state object kept for the session (e.g. a curve being entered), made on first use."""
        if key not in self._values:
            self._values[key] = factory()
        return self._values[key]

    def forget(self, key: str) -> None:
        """Drop a session state object."""
        self._values.pop(key, None)

    def apply_theme(self) -> None:
        """Theme mode from the settings."""
        self.page.theme_mode = theme_mode(SettingsState(self.store).get("theme"))

    def render(self) -> None:
        """Build the view for the current route.

        Each build gets a fresh View key, so Flet adds the new tree instead of diffing it against the
        old one by control keys (a keyed diff would freeze the new controls and refuse later updates).
        """
        self.save_typed()
        self.undo.enter(self.page.route or "/")
        try:
            view = route_view(self, self.page.route or "/")
        except NotFoundError as exc:
            self.toast(f"Not found: {exc}")
            view = route_view(self, "/")
        self._renders += 1
        view.key = f"view-{self._renders}"
        self.page.views.clear()
        self.page.views.append(view)
        self.page.update()


def _routes() -> list[tuple[re.Pattern[str], Callable[..., ft.View]]]:
    from mobile_app.views import (
        board_view,
        details_view,
        job_view,
        jobs_view,
        library_view,
        new_job_view,
        observations_view,
        outbox_view,
        review_view,
        settings_view,
        walk_view,
    )

    return [
        (re.compile(r"^/?$"), jobs_view.build),
        (re.compile(r"^/new$"), new_job_view.build),
        (re.compile(r"^/job/(\d+)$"), job_view.build),
        (re.compile(r"^/job/(\d+)/review$"), review_view.build),
        (re.compile(r"^/job/(\d+)/details$"), details_view.build),
        (re.compile(r"^/job/(\d+)/observations$"), observations_view.build),
        (re.compile(r"^/job/(\d+)/board/(\d+)$"), board_view.build),
        (re.compile(r"^/job/(\d+)/circuit/(\d+)/(\w+)$"), walk_view.build),
        (re.compile(r"^/library$"), library_view.build),
        (re.compile(r"^/outbox$"), outbox_view.build),
        (re.compile(r"^/settings$"), settings_view.build),
    ]


def import_screens() -> None:
    """Import every screen's code now (the browser build does it before it takes its start-up snapshot)."""
    _routes()


def route_view(shell: Shell, route: str) -> ft.View:
    """The view for a route; unknown routes show the jobs list."""
    path = route.split("?", 1)[0]
    for pattern, build in _routes():
        match = pattern.match(path)
        if match:
            return build(shell, *match.groups())
    return _routes()[0][1](shell)


def make_main(store: Any, sync_loop: Any = None, check_after_first_screen: bool = False
              ) -> Callable[[ft.Page], None]:
    """The Flet entry point for one session, on the server's one open store.

    Sessions share one store (its lock keeps their transactions apart) and the notice about a
    damaged store file, if one was moved aside at open. `sync_loop` is the platform's background
    sync (`mobile_app.sync.schedule.SyncLoop`, the browser build's), whose reports the screen hears.
    With `check_after_first_screen` (the browser build, where the check takes a noticeable part of
    start-up) the jobs list is sent before the store's integrity check, and shown again with its
    notice if the check finds the store altered.
    """
    recovery = Recovery(store.recovered)

    def main(page: ft.Page) -> None:
        page.title = "Boardside"
        page.fonts = FONTS
        page.theme = app_theme()
        page.dark_theme = app_theme()
        page.theme_animation_style = ft.AnimationStyle.no_animation()
        shell = Shell(page, store, recovery, sync_loop)
        if check_after_first_screen:
            notice = shell.session_value("integrity", lambda: IntegrityNotice.pending(store))
            page.run_task(_check_then_show, shell, notice)
        if sync_loop is not None:
            sync_loop.on_report = shell.synced
        shell.apply_theme()
        page.on_route_change = lambda _e: shell.render()
        page.on_disconnect = lambda _e: shell.save_typed()
        shell.render()

    return main


async def _check_then_show(shell: Shell, notice: IntegrityNotice) -> None:
    """Check the store's integrity once the first screen is sent; show the jobs list again if the
    check found something to say."""
    await asyncio.sleep(0)
    if not notice.check().ok and (shell.page.route or "/").split("?", 1)[0] in ("", "/"):
        shell.render()


def run_packaged() -> None:
    """Entry of a `flet build` package (apk, ipa): the store in the app's own data folder."""
    data = os.environ.get("FLET_APP_STORAGE_DATA")
    store = Store.open(Path(data) if data else None)
    ft.run(make_main(store), assets_dir="assets")


def serve(port: int, data_dir: Path | None, demo: bool) -> int:
    """Serve the app on 127.0.0.1:`port` with no CDN; with `demo`, create the demo job first.

    Flet's web app is wrapped in `LoopbackOnly`, so only this server's own page can drive it.
    """
    from mobile_app.state.jobs import demo_if_empty

    try:
        store = Store.open(data_dir)
    except StoreError as exc:
        print(f"python -m mobile_app: {exc}", file=sys.stderr)
        return 2
    if store.recovered is not None:
        print(store.recovered.message, file=sys.stderr)
    with store:
        if demo:
            demo_if_empty(store)
        print(f"Boardside: open http://127.0.0.1:{port} in a browser (Ctrl+C stops); "
              f"jobs are kept in {store.path}", flush=True)
        app = ft.run(make_main(store), no_cdn=True, assets_dir=str(ASSETS_DIR), name="", export_asgi_app=True)
        asyncio.run(_serve_guarded(app, port))
    return 0


async def _serve_guarded(app: Any, port: int) -> None:
    """Run Flet's ASGI app behind LoopbackOnly with uvicorn on 127.0.0.1 (as `ft.run` would, with its
    WebSocket implementation), opening a browser where there is a display."""
    import uvicorn
    from flet.utils import open_in_browser
    from flet.utils.platform_utils import is_linux_server

    from mobile_app.web_guard import LoopbackOnly

    config = uvicorn.Config(LoopbackOnly(app, port), host="127.0.0.1", port=port, log_level="warning",
                            ws="websockets-sansio", timeout_graceful_shutdown=3)
    server = uvicorn.Server(config)
    task = asyncio.create_task(server.serve())
    while not server.started and not task.done():
        await asyncio.sleep(0.05)
    if server.started and not is_linux_server():
        open_in_browser(f"http://127.0.0.1:{port}")
    await task
