"""Quick choices under a free-text field: tapping one puts its words in the field."""

from __future__ import annotations

from collections.abc import Callable

import flet as ft


def suggestions(key: str, words: tuple[str, ...], on_pick: Callable[[str], None],
                disabled: bool = False) -> ft.Row:
    """One small chip per suggestion; `on_pick(words)` saves them as the field's text."""
    return ft.Row(
        [
            ft.OutlinedButton(word, key=f"{key}-{index}", disabled=disabled, height=36,
                              on_click=lambda _e, w=word: on_pick(w))
            for index, word in enumerate(words)
        ],
        wrap=True,
        spacing=6,
        run_spacing=6,
        key=key,
    )
