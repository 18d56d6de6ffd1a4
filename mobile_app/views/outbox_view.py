"""Outbox: exports waiting for the office, what was sent (when and where), "send now" with progress,
and each export's files handed to the person (download, or the phone's share sheet)."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components import hand_over
from mobile_app.components.screen import screen
from mobile_app.state.outbox import NO_FOLDER_DETAIL, OutboxRow, OutboxState


def _row(row: OutboxRow) -> ft.Control:
    return ft.ListTile(
        key=f"outbox-{row.id}",
        leading=ft.Icon(ft.Icons.CLOUD_DONE if row.sent else ft.Icons.SCHEDULE),
        title=ft.Text(row.title, size=15),
        subtitle=ft.Text(("Sent · " if row.sent else "Waiting · ") + "\n".join(row.lines), size=13),
    )


def _no_folder(shell: Any) -> ft.Control:
    """The plain notice that nothing can be sent yet, with the way to change that."""
    return ft.Container(
        key="outbox-no-folder",
        padding=12,
        border_radius=8,
        border=ft.Border.all(2, ft.Colors.OUTLINE),
        content=ft.Column(
            [
                ft.Row([ft.Icon(ft.Icons.FOLDER_OFF_OUTLINED),
                        ft.Text("No office folder set", size=16, weight=ft.FontWeight.BOLD)]),
                ft.Text(NO_FOLDER_DETAIL, size=14),
                ft.FilledButton("Set office folder", icon=ft.Icons.SETTINGS, height=48,
                                key="set-office-folder", on_click=lambda _e: shell.go("/settings")),
            ],
            spacing=8,
            tight=True,
        ),
    )


def _files(shell: Any, outbox: OutboxState, row: OutboxRow) -> ft.Control:
    """Buttons that hand the export's PDF, JSON and CSV to the person, one by one or all shared."""

    def documents() -> list[Any]:
        found, problem = outbox.documents(row.id)
        if problem:
            shell.toast(problem)
        return found

    async def one(suffix: str) -> None:
        found = [d for d in documents() if d.name.lower().endswith(suffix)]
        if found:
            await hand_over.download(found[0])

    async def all_shared(_e: Any) -> None:
        found = documents()
        if found:
            await hand_over.share(found, row.title)

    def button(label: str, suffix: str) -> ft.Control:
        async def clicked(_e: Any) -> None:
            await one(suffix)

        return ft.TextButton(label, icon=ft.Icons.DOWNLOAD, key=f"download-{suffix[1:]}-{row.id}",
                             on_click=clicked)

    return ft.Row([button("PDF", ".pdf"), button("JSON", ".json"), button("CSV", ".csv"),
                   ft.TextButton("Share", icon=ft.Icons.SHARE, key=f"share-{row.id}", on_click=all_shared)],
                  wrap=True, spacing=0)


def build(shell: Any) -> ft.View:
    """The outbox screen."""
    outbox = OutboxState(shell.store)
    busy = ft.ProgressRing(visible=False, width=28, height=28, key="outbox-busy")

    async def send(_e: Any) -> None:
        busy.visible = True
        send_button.disabled = True
        busy.update()
        send_button.update()
        shell.toast(await outbox.send_now_async())
        shell.render()

    send_button = ft.FilledButton("Send now", icon=ft.Icons.CLOUD_UPLOAD, height=48, key="send-now",
                                  on_click=send)
    listing: list[ft.Control] = []
    for r in outbox.rows():
        listing += [_row(r), _files(shell, outbox, r)]
    listing = listing or [ft.Text("Nothing waits. Export a job from its review screen to queue it here.",
                                  size=15)]
    body: list[ft.Control] = [
        ft.Text(outbox.summary(), size=18, weight=ft.FontWeight.BOLD, key="outbox-summary"),
    ]
    if outbox.configured:
        body.append(ft.Row([send_button, busy], spacing=12))
    else:
        body.append(_no_folder(shell))
    body += [
        *listing,
        ft.Text("Nothing on this device is deleted by sending.", size=13),
    ]
    return screen("/outbox", "Outbox", body, shell.go, tab=2)
