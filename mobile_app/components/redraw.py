"""A screen's body that redraws itself in place (the scroll position stays): after a choice that
shows or hides fields, or after an item is added or removed."""

from __future__ import annotations

from collections.abc import Callable

import flet as ft


def redrawing(make: Callable[[Callable[[], None], int], list[ft.Control]]) -> ft.Column:
    """A column whose controls are `make(redraw, generation)`; calling `redraw()` makes them again
    (with `generation` raised, so that every key is new) and updates the column."""
    column = ft.Column(spacing=14, horizontal_alignment=ft.CrossAxisAlignment.STRETCH)
    generation = [0]

    def redraw() -> None:
        generation[0] += 1
        column.controls = make(redraw, generation[0])
        column.update()

    column.controls = make(redraw, 0)
    return column
