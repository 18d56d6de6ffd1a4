"""The verdict so far, pinned above the keyboard while a person types: the mark and the primary
cause in a few words."""

from __future__ import annotations

import flet as ft

from mobile_app.components.verdict_badge import verdict_badge
from mobile_app.state.live import LiveVerdict


def live_bar(live: LiveVerdict) -> ft.Container:
    """A one- or two-line bar: `Verdict so far`, the mark, and why (nothing more on a pass)."""
    cause = ft.Text(live.cause or "Every check passes", size=13, max_lines=2,
                    overflow=ft.TextOverflow.ELLIPSIS, expand=True, key="live-cause")
    return ft.Container(
        key="live-verdict",
        content=ft.Row(
            [ft.Column([ft.Text("Verdict so far", size=11), verdict_badge(live.mark, size=13)],
                       spacing=2, tight=True),
             cause],
            spacing=10,
            vertical_alignment=ft.CrossAxisAlignment.CENTER,
        ),
        padding=ft.Padding.symmetric(horizontal=8, vertical=4),
        border=ft.Border.only(bottom=ft.BorderSide(1, ft.Colors.OUTLINE_VARIANT)),
        height=52,
    )
