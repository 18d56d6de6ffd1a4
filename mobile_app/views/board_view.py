"""A board's details: name, location, what feeds it, its own supply (system, Ze or Zdb, PFC, RA),
its main switch or device, and at the origin the earthing and main bonding conductor sizes."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.cautions import cautions_box
from mobile_app.components.form_field import form_field
from mobile_app.components.screen import screen
from mobile_app.state.records import BoardScreen


def build(shell: Any, job_id: str, board_id: str) -> ft.View:
    """The board details screen."""
    board = shell.session_value(f"board-{board_id}", lambda: BoardScreen(shell.store, int(board_id)))
    board.form.reload()
    body: list[ft.Control] = []
    if board.read_only:
        body.append(ft.Text("This job is locked while in review or approved: details are shown, not "
                            "changed.", size=14, key="board-locked"))
    body.append(ft.Text("Left blank, the board's supply is the job's. A board's own Ze (or Zdb), "
                        "fault current and RA are used for its circuits.", size=14))
    body.extend(form_field(f"board-{field.spec.name}", board.form, field, board.read_only, lambda: None,
                           shell.render)
                for field in board.form.fields())
    body.append(cautions_box())
    done = ft.FilledButton("Back to job", icon=ft.Icons.LIST, height=52, expand=True, key="board-done",
                           on_click=lambda _e: shell.go(f"/job/{job_id}"))
    return screen(f"/job/{job_id}/board/{board_id}", board.title, body, shell.go, back=f"/job/{job_id}",
                  bottom=ft.Row([done]))
