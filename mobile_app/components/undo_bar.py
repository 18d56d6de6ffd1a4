"""The bar that offers to undo the last deletion on this screen (until the screen is left)."""

from __future__ import annotations

from typing import Any

import flet as ft


def undo_bar(shell: Any) -> ft.Control:
    """`Deleted circuit 3 · Kiln` with an Undo button; the shell's undo trail decides what it offers."""

    def undo(_e: Any) -> None:
        shell.toast(shell.undo.undo().message)
        shell.render()

    return ft.Container(
        key="undo-bar",
        padding=ft.Padding.symmetric(horizontal=12, vertical=4),
        border_radius=8,
        border=ft.Border.all(2, ft.Colors.OUTLINE),
        content=ft.Row(
            [ft.Icon(ft.Icons.DELETE_OUTLINE),
             ft.Text(shell.undo.offer, size=15, expand=True, key="undo-offer"),
             ft.TextButton("Undo", icon=ft.Icons.UNDO, height=48, key="undo", on_click=undo)],
            spacing=8,
        ),
    )
