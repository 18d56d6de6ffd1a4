"""A verdict as icon + word: never colour alone, and never shaped like a button (it does nothing
when tapped): a flat, square-cornered tag with no shadow, smaller than any button beside it."""

from __future__ import annotations

import flet as ft

from mobile_app.components.palette import tone
from mobile_app.state.text import VerdictMark


def verdict_badge(mark: VerdictMark, size: int = 16, key: str | None = None) -> ft.Container:
    """A flat tag: icon and word, white on the verdict's colour, square corners."""
    background, foreground = tone(mark.tone)
    return ft.Container(
        key=key,
        content=ft.Row(
            [
                ft.Icon(getattr(ft.Icons, mark.icon), color=foreground, size=size + 2),
                ft.Text(mark.word, color=foreground, size=size, weight=ft.FontWeight.BOLD),
            ],
            spacing=4,
            tight=True,
        ),
        bgcolor=background,
        border_radius=3,
        padding=ft.Padding.symmetric(horizontal=6, vertical=2),
    )
