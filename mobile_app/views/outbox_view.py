"""Outbox: exports waiting for the office, what was sent, and "send now" with progress."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.screen import screen
from mobile_app.state.outbox import OutboxState


def build(shell: Any) -> ft.View:
    """The outbox screen."""
    outbox = OutboxState(shell.store)
    busy = ft.ProgressRing(visible=False, width=28, height=28, key="outbox-busy")
    message = ft.Text("", size=15, key="outbox-message")

    def send(_e: Any) -> None:
        busy.visible = True
        send_button.disabled = True
        busy.update()
        send_button.update()
        shell.page.run_thread(_send)

    def _send() -> None:
        result = outbox.send_now()
        shell.toast(result)
        shell.render()

    send_button = ft.FilledButton("Send now", icon=ft.Icons.CLOUD_UPLOAD, height=48, key="send-now",
                                  on_click=send)
    rows = outbox.rows()
    listing: list[ft.Control] = [
        ft.ListTile(
            leading=ft.Icon(ft.Icons.CLOUD_DONE if r.sent else ft.Icons.SCHEDULE),
            title=ft.Text(r.title, size=15),
            subtitle=ft.Text(("Sent · " if r.sent else "Waiting · ") + r.detail, size=13),
        )
        for r in rows
    ] or [ft.Text("Nothing waits. Export a job from its review screen to queue it here.", size=15)]
    body: list[ft.Control] = [
        ft.Text(outbox.summary(), size=18, weight=ft.FontWeight.BOLD, key="outbox-summary"),
        ft.Row([send_button, busy], spacing=12),
        message,
        *listing,
        ft.Text("The office folder is set in Settings. Nothing on this device is deleted by sending.",
                size=13),
    ]
    return screen("/outbox", "Outbox", body, shell.go, tab=2)
