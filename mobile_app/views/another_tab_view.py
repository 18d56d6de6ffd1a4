"""Shown by the browser build in a tab that does not own the job store: another tab of this browser has it."""

from __future__ import annotations

from collections.abc import Awaitable, Callable
from typing import Any

import flet as ft

from mobile_app.components.palette import BRAND

MESSAGE = (
    "Boardside is open in another tab or window of this browser, and the jobs are kept by that one. "
    "Carry on there, or close it and try again here. Nothing is opened twice, so nothing is lost."
)


def build(retry: Callable[[], Awaitable[None]]) -> ft.View:
    """The another-tab screen; `retry` claims the store and opens the app when it can."""

    async def try_again(_e: Any) -> None:
        await retry()

    return ft.View(
        route="/",
        appbar=ft.AppBar(title=ft.Text("Boardside", size=20, weight=ft.FontWeight.BOLD),
                         bgcolor=BRAND, color="#FFFFFF", automatically_imply_leading=False),
        controls=[
            ft.Container(
                ft.Column(
                    [
                        ft.Icon(ft.Icons.TAB, size=48),
                        ft.Text("Open in another tab", size=22, weight=ft.FontWeight.BOLD),
                        ft.Text(MESSAGE, size=16),
                        ft.FilledButton("Try again", icon=ft.Icons.REFRESH, key="try-again", height=48,
                                        on_click=try_again),
                    ],
                    spacing=16,
                ),
                padding=24,
            )
        ],
    )
