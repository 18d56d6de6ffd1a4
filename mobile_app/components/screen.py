"""The frame of every screen: top bar with back arrow and title, scrolling body, bottom navigation."""

from __future__ import annotations

from collections.abc import Callable

import flet as ft

from mobile_app.components.palette import BRAND

TABS: tuple[tuple[str, str, str], ...] = (
    ("Jobs", "/", "WORK_OUTLINE"),
    ("Library", "/library", "SHOW_CHART"),
    ("Outbox", "/outbox", "OUTBOX"),
    ("Settings", "/settings", "SETTINGS_OUTLINED"),
)


def screen(
    route: str,
    title: str,
    body: list[ft.Control],
    go: Callable[[str], None],
    *,
    back: str | None = None,
    tab: int | None = None,
    actions: list[ft.Control] | None = None,
    bottom: ft.Control | None = None,
    bottom_height: int = 80,
) -> ft.View:
    """A View: AppBar (up arrow when `back` is a route), the body in a column (narrower on wide
    screens), tabs or a bottom bar (`bottom_height` tall, pinned above the on-screen keyboard)."""
    leading = (
        ft.IconButton(ft.Icons.ARROW_BACK, tooltip="Up one level", on_click=lambda _e: go(back), key="up")
        if back
        else ft.Container(ft.Image(src="icons/icon-192.png", width=32, height=32), padding=12)
    )
    navigation = None
    if tab is not None:
        navigation = ft.NavigationBar(
            selected_index=tab,
            destinations=[
                ft.NavigationBarDestination(icon=getattr(ft.Icons, icon), label=label)
                for label, _route, icon in TABS
            ],
            on_change=lambda e: go(TABS[int(e.control.selected_index)][1]),
        )
    return ft.View(
        route=route,
        appbar=ft.AppBar(
            leading=leading,
            title=ft.Text(title, size=20, weight=ft.FontWeight.BOLD),
            bgcolor=BRAND,
            color="#FFFFFF",
            actions=actions or [],
            automatically_imply_leading=False,
        ),
        controls=[
            ft.SafeArea(
                ft.Container(
                    ft.ResponsiveRow(
                        [
                            ft.Column(
                                body,
                                spacing=14,
                                horizontal_alignment=ft.CrossAxisAlignment.STRETCH,
                                col={"xs": 12, "md": 10, "lg": 8, "xl": 6},
                            )
                        ],
                        alignment=ft.MainAxisAlignment.CENTER,
                    ),
                    padding=ft.Padding.symmetric(horizontal=16, vertical=12),
                ),
            )
        ],
        navigation_bar=navigation,
        bottom_appbar=ft.BottomAppBar(bottom, height=bottom_height, padding=8) if bottom else None,
        scroll=ft.ScrollMode.AUTO,
        padding=0,
        horizontal_alignment=ft.CrossAxisAlignment.CENTER,
    )
