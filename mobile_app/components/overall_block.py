"""A job's overall outcome: its badge (icon and word) and the reasons for it."""

from __future__ import annotations

import flet as ft

from mobile_app.components.verdict_badge import verdict_badge
from mobile_app.state.records import Overall


def overall_block(overall: Overall, key: str = "overall") -> ft.Control:
    """The overall outcome's badge and its reasons."""
    lines: list[ft.Control] = [ft.Row([ft.Text("Overall outcome", size=16, weight=ft.FontWeight.BOLD),
                                       verdict_badge(overall.mark, size=14, key=f"{key}-badge")],
                                      spacing=8, wrap=True)]
    lines.extend(ft.Text(f"• {reason}", size=14) for reason in overall.reasons)
    return ft.Container(ft.Column(lines, spacing=4), key=key)
