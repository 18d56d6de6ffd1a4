"""A text or number input that shows the parsed value or the error as it is typed."""

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
    autofocus: bool = False,
    on_focus: Callable[[], None] | None = None,
    on_blur: Callable[[], None] | None = None,
    on_submit: Callable[[], None] | None = None,
    expand: bool | None = None,
) -> ft.TextField:
    """A TextField; `on_change(text)` keeps (or saves) it and returns (helper text, error or None).
    Numbers are typed on the numeric keyboard; `on_blur` runs when the field is left and
    `on_submit` on the keyboard's action key."""

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
        autofocus=autofocus,
        on_focus=(lambda _e: on_focus()) if on_focus else None,
        on_blur=(lambda _e: on_blur()) if on_blur else None,
        on_submit=(lambda _e: on_submit()) if on_submit else None,
        expand=expand,
    )
