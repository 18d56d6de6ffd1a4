"""Jobs: search, each job's status and failing circuits, new job, open the demo."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.choice_row import choice_row
from mobile_app.components.screen import screen
from mobile_app.components.undo_bar import undo_bar
from mobile_app.state.integrity import IntegrityNotice
from mobile_app.state.jobs import STATUS_FILTERS, JobRow, JobsList, ensure_demo


def _job_card(row: JobRow, go: Any, mark: str | None, delete: Any) -> ft.Card:
    status_icon = {"approved": ft.Icons.VERIFIED, "draft": ft.Icons.EDIT_NOTE}.get(
        row.status, ft.Icons.RATE_REVIEW
    )
    failing = (
        ft.Row(
            [ft.Icon(ft.Icons.CANCEL, color="#B3141B", size=20),
             ft.Text(f"{row.failing} failing", weight=ft.FontWeight.BOLD)],
            spacing=4,
            tight=True,
        )
        if row.failing
        else ft.Row([ft.Icon(ft.Icons.CHECK_CIRCLE_OUTLINE, size=20), ft.Text("none failing")],
                    spacing=4, tight=True)
    )
    lines: list[ft.Control] = [
        ft.Text(row.subtitle or "No site address"),
        ft.Row([ft.Icon(status_icon, size=20), ft.Text(row.status_word), failing], spacing=8, wrap=True),
        ft.Text(row.summary, size=13),
    ]
    if mark:
        lines.append(ft.Row([ft.Icon(ft.Icons.GPP_MAYBE, color="#B3141B", size=20),
                             ft.Text(mark, size=13, weight=ft.FontWeight.BOLD, expand=True)], spacing=4))
    tile = ft.ListTile(
        title=ft.Text(row.title, size=18, weight=ft.FontWeight.BOLD),
        subtitle=ft.Column(lines, spacing=4, tight=True),
        on_click=lambda _e: go(f"/job/{row.id}"),
        min_height=72,
        expand=True,
    )
    trailing: list[ft.Control] = []
    if row.status == "draft":
        icon = ft.Icon(ft.Icons.DELETE_OUTLINE, semantics_label=f"Delete job {row.title}")
        trailing.append(ft.IconButton(icon, key=f"delete-job-{row.id}", on_click=lambda _e: delete(row.id)))
    return ft.Card(key=f"job-{row.id}", content=ft.Row([tile, *trailing], spacing=0))


def _integrity_banner(text: str) -> ft.Control:
    """The notice that the store was changed outside the app (its affected jobs are marked)."""
    return ft.Container(
        key="integrity-banner",
        padding=12,
        border_radius=8,
        border=ft.Border.all(2, "#B3141B"),
        content=ft.Row([ft.Icon(ft.Icons.GPP_MAYBE, color="#B3141B"), ft.Text(text, size=15, expand=True)],
                       spacing=8),
    )


def _recovery_banner(shell: Any) -> ft.Control:
    """The damaged-store notice, with a way to bring back the jobs still readable in the kept file."""
    recovery = shell.recovery

    def recover(_e: Any) -> None:
        shell.toast(recovery.recover(shell.store))
        shell.forget("integrity")  # jobs were imported: check them again
        shell.render()

    def dismiss(_e: Any) -> None:
        recovery.dismissed = True
        shell.render()

    return ft.Container(
        key="store-recovered",
        padding=12,
        border_radius=8,
        border=ft.Border.all(2, "#B3141B"),
        content=ft.Column(
            [
                ft.Row([ft.Icon(ft.Icons.WARNING_AMBER, color="#B3141B"),
                        ft.Text("Job store moved aside", weight=ft.FontWeight.BOLD, size=16)]),
                ft.Text(recovery.message),
                ft.Row(
                    [
                        ft.FilledButton("Recover readable jobs", icon=ft.Icons.RESTORE, height=48,
                                        key="recover-jobs", on_click=recover),
                        ft.TextButton("Dismiss", height=48, on_click=dismiss),
                    ],
                    wrap=True,
                ),
            ],
            spacing=8,
            tight=True,
        ),
    )


def build(shell: Any) -> ft.View:
    """The jobs list."""
    jobs = JobsList(shell.store)
    integrity: IntegrityNotice = shell.session_value("integrity", lambda: IntegrityNotice(shell.store))
    listing = ft.Column(spacing=8, key="job-list")

    def delete(job_id: int) -> None:
        done = shell.undo.delete("job", job_id)
        if not done.ok:
            shell.toast(done.message)
        shell.render()

    def fill() -> None:
        rows = jobs.rows()
        listing.controls = [_job_card(row, shell.go, integrity.mark(row.id), delete) for row in rows] or [
            ft.Text("No jobs match." if jobs.search else "No jobs yet: start a new one.", size=16)
        ]

    def searched(e: ft.Event[ft.TextField]) -> None:
        jobs.search = e.control.value or ""
        fill()
        listing.update()

    def filtered(value: str) -> None:
        jobs.status = value
        fill()
        listing.update()

    def open_demo(_e: Any) -> None:
        shell.go(f"/job/{ensure_demo(shell.store)}")

    fill()
    body: list[ft.Control] = [_recovery_banner(shell)] if shell.recovery.visible else []
    if integrity.banner:
        body.append(_integrity_banner(integrity.banner))
    if shell.undo.offer:
        body.append(undo_bar(shell))
    body += [
        ft.TextField(
            key="job-search",
            label="Search jobs",
            prefix_icon=ft.Icons.SEARCH,
            on_change=searched,
        ),
        ft.Row(
            [
                ft.FilledButton("New job", icon=ft.Icons.ADD, key="new-job", height=48,
                                on_click=lambda _e: shell.go("/new")),
                ft.OutlinedButton("Open demo", icon=ft.Icons.SCHOOL_OUTLINED, key="open-demo",
                                  height=48, on_click=open_demo),
            ],
            wrap=True,
            spacing=10,
        ),
        choice_row("job-status", "Status", STATUS_FILTERS, jobs.status, filtered),
        listing,
    ]
    return screen("/", "Boardside", body, shell.go, tab=0)
