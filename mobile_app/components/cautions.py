"""The cautions shown wherever results are shown."""

from __future__ import annotations

import flet as ft

from mobile_app.state.text import CAUTIONS


def cautions_box() -> ft.Container:
    """A bordered box listing every caution, with a warning icon."""
    return ft.Container(
        key="cautions",
        content=ft.Column(
            [
                ft.Row(
                    [ft.Icon(ft.Icons.WARNING_AMBER, size=20),
                     ft.Text("Cautions", weight=ft.FontWeight.BOLD)],
                    spacing=6,
                ),
                *[ft.Text(f"• {line}", size=13) for line in CAUTIONS],
            ],
            spacing=4,
        ),
        padding=12,
        border=ft.Border.all(1, ft.Colors.OUTLINE),
        border_radius=8,
    )
