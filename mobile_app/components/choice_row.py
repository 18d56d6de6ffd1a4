"""A row of large choice buttons (one selected), saving on tap."""

from __future__ import annotations

from collections.abc import Callable

import flet as ft

from mobile_app.components.live import update_if_shown
from mobile_app.state.fields import Choice


def choice_row(
    key: str,
    label: str,
    choices: tuple[Choice, ...],
    selected: str,
    on_pick: Callable[[str], None],
    *,
    disabled: bool = False,
    message: str | None = None,
    clearable: bool = False,
) -> ft.Column:
    """Label, then one button per choice; the selected one is filled and ticked (and says so to a
    screen reader). With `clearable` (an optional answer), tapping the selected one again clears it.

    A tap on a row the screen has since drawn anew (a stale frame) still saves, and leaves the
    drawing to the screen that now shows the field."""
    buttons: list[ft.Button] = []
    marks: list[ft.Semantics] = []
    current = [selected]

    def pick(value: str) -> Callable[[ft.Event[ft.Button]], None]:
        def handler(e: ft.Event[ft.Button]) -> None:
            chosen = "" if clearable and current[0] == value else value
            current[0] = chosen
            for button, mark in zip(buttons, marks, strict=True):
                _style(button, mark, button.data == chosen)
            update_if_shown(row)
            on_pick(chosen)  # last: it may redraw the screen, leaving this row off the page

        return handler

    for choice in choices:
        button = ft.Button(
            content=choice.label,
            key=f"{key}-{choice.value}",
            data=choice.value,
            on_click=pick(choice.value),
            disabled=disabled,
            height=48,
        )
        mark = ft.Semantics(content=button)
        _style(button, mark, choice.value == selected)
        buttons.append(button)
        marks.append(mark)
    row = ft.Row(marks, wrap=True, spacing=8, run_spacing=8)
    parts: list[ft.Control] = [ft.Text(label, size=14, weight=ft.FontWeight.W_600), row]
    if message:
        parts.append(ft.Text(message, color=ft.Colors.ERROR, size=13))
    return ft.Column(parts, spacing=6, key=key)


def _style(button: ft.Button, mark: ft.Semantics, selected: bool) -> None:
    mark.selected = selected
    button.icon = ft.Icons.CHECK if selected else None
    button.style = ft.ButtonStyle(
        bgcolor=ft.Colors.PRIMARY if selected else ft.Colors.SURFACE_CONTAINER_HIGHEST,
        color=ft.Colors.ON_PRIMARY if selected else ft.Colors.ON_SURFACE,
        shape=ft.RoundedRectangleBorder(radius=10),
        padding=ft.Padding.symmetric(horizontal=14),
    )
