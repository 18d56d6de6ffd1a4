"""A text or number input that saves on every change and shows the parsed value or the error."""

from __future__ import annotations

from collections.abc import Callable

import flet as ft


def text_input(
    key: str,
    label: str,
    value: str,
    on_change: Callable[[str], tuple[str, str | None]],
    *,
    numeric: bool = False,
    hint: str = "",
    helper: str = "",
    error: str | None = None,
    read_only: bool = False,
    password: bool = False,
    multiline: bool = False,
) -> ft.TextField:
    """A TextField; `on_change(text)` saves and returns (helper text, error message or None)."""

    def changed(e: ft.Event[ft.TextField]) -> None:
        shown, problem = on_change(e.control.value or "")
        e.control.helper = shown or None
        e.control.error = problem
        e.control.update()

    return ft.TextField(
        key=key,
        label=label,
        value=value,
        hint_text=hint or None,
        helper=helper or None,
        error=error,
        keyboard_type=ft.KeyboardType.NUMBER if numeric else ft.KeyboardType.TEXT,
        text_size=20 if numeric else 16,
        read_only=read_only,
        password=password,
        can_reveal_password=password,
        on_change=changed,
        error_max_lines=3,
        multiline=multiline,
        min_lines=3 if multiline else None,
        max_lines=8 if multiline else None,
    )
