"""A verdict as icon + word on a solid colour: never colour alone."""

from __future__ import annotations

import flet as ft

from mobile_app.components.palette import tone
from mobile_app.state.text import VerdictMark


def verdict_badge(mark: VerdictMark, size: int = 16, key: str | None = None) -> ft.Container:
    """A rounded badge: icon and word, white on the verdict's colour."""
    background, foreground = tone(mark.tone)
    return ft.Container(
        key=key,
        content=ft.Row(
            [
                ft.Icon(getattr(ft.Icons, mark.icon), color=foreground, size=size + 4),
                ft.Text(mark.word, color=foreground, size=size, weight=ft.FontWeight.BOLD),
            ],
            spacing=6,
            tight=True,
        ),
        bgcolor=background,
        border_radius=8,
        padding=ft.Padding.symmetric(horizontal=10, vertical=6),
    )
