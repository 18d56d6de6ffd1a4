"""A board's details: name, location, what feeds it, its own supply (system, Ze or Zdb, PFC, RA),
its main switch or device, and at the origin the earthing and main bonding conductor sizes."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import flet as ft

from mobile_app.components.cautions import cautions_box
from mobile_app.components.form_field import form_field
from mobile_app.components.redraw import redrawing
from mobile_app.components.screen import screen
from mobile_app.state.records import BoardScreen


def build(shell: Any, job_id: str, board_id: str) -> ft.View:
    """The board details screen."""
    board = shell.session_value(f"board-{board_id}", lambda: BoardScreen(shell.store, int(board_id)))
    board.form.reload()
    locked = board.read_only

    def make(redraw: Callable[[], None], generation: int) -> list[ft.Control]:
        return [form_field(f"board-{field.spec.name}-{generation}", board.form, field, locked, lambda: None,
                           redraw)
                for field in board.form.fields()]

    body: list[ft.Control] = []
    if locked:
        body.append(ft.Text("This job is locked while in review or approved: details are shown, not "
                            "changed.", size=14, key="board-locked"))
    body += [
        ft.Text("Left blank, the board's supply is the job's. A board's own Ze (or Zdb), fault current "
                "and RA are used for its circuits.", size=14),
        redrawing(make),
        cautions_box(),
    ]
    done = ft.FilledButton("Back to job", icon=ft.Icons.LIST, height=52, expand=True, key="board-done",
                           on_click=lambda _e: shell.go(f"/job/{job_id}"))
    return screen(f"/job/{job_id}/board/{board_id}", board.title, body, shell.go, back=f"/job/{job_id}",
                  bottom=ft.Row([done]))
