"""Small helpers every screen's widgets share: whether a control is still on the page."""

from __future__ import annotations

import flet as ft


def on_page(control: ft.Control) -> bool:
    """True while `control` is part of the page shown (a redraw or a new screen takes it off; an
    update then would fail with "Control must be added to the page first")."""
    try:
        return control.page is not None
    except RuntimeError:
        return False


def update_if_shown(*controls: ft.Control) -> None:
    """Update each control that is still on the page; skip the others."""
    for control in controls:
        if on_page(control):
            control.update()
