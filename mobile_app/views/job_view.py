"""A job: its overall outcome, its boards (each with its details and circuits with their verdict
marks), links to the job's details and instruments and to its observations, and its supply."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.cautions import cautions_box
from mobile_app.components.choice_row import choice_row
from mobile_app.components.overall_block import overall_block
from mobile_app.components.screen import screen
from mobile_app.components.text_input import text_input
from mobile_app.components.verdict_badge import verdict_badge
from mobile_app.state.jobs import BoardView, JobField, JobScreen
from mobile_app.state.records import overall_of


def _input(job: JobScreen, field: JobField, after_save: Any) -> ft.Control:
    """One job field; `after_save` runs after each save (supply changes reassess the circuits)."""
    name = field.spec.name
    if field.spec.kind == "choice":

        def picked(value: str) -> None:
            job.set_field(name, value)
            after_save()

        return choice_row(
            f"job-{name}", field.spec.label, field.spec.choices, field.raw, picked,
            disabled=job.read_only, message=field.message,
        )

    def changed(text: str) -> tuple[str, str | None]:
        saved = job.set_field(name, text)
        after_save()
        return saved.parsed_text, saved.message

    return text_input(
        f"job-{name}", field.spec.label, field.raw, changed,
        numeric=field.spec.kind == "number", hint=field.spec.hint, helper=field.parsed_text,
        error=field.message, read_only=job.read_only,
    )


def _folded_board(board: BoardView, unfold: Any) -> ft.Control:
    """A board of a big job, folded: its name and counts, and a way to show its circuits."""
    title = board.designation + (f" · {board.location}" if board.location else "")
    return ft.Card(
        content=ft.Container(
            ft.Column(
                [
                    ft.Text(title, size=18, weight=ft.FontWeight.BOLD),
                    ft.Text(board.summary, size=14),
                    ft.OutlinedButton("Show circuits", icon=ft.Icons.EXPAND_MORE, height=48,
                                      key=f"show-board-{board.id}", on_click=lambda _e: unfold(board.id)),
                ],
                spacing=4,
            ),
            padding=12,
        )
    )


def _board(shell: Any, job: JobScreen, board: BoardView) -> ft.Control:
    tiles: list[ft.Control] = [
        ft.ListTile(
            key=f"circuit-{c.id}",
            leading=ft.Text(c.number, size=20, weight=ft.FontWeight.BOLD),
            title=ft.Text(c.description or f"Circuit {c.number}", size=16),
            trailing=verdict_badge(c.mark, size=13),
            on_click=lambda _e, cid=c.id: shell.go(f"/job/{job.job_id}/circuit/{cid}/device"),
            min_height=56,
        )
        for c in board.circuits
    ]
    if not tiles:
        tiles.append(ft.Text("No circuits yet.", size=14))

    def add(_e: Any) -> None:
        circuit_id = job.add_circuit(board.id)
        shell.go(f"/job/{job.job_id}/circuit/{circuit_id}/device")

    if not job.read_only:
        tiles.append(
            ft.OutlinedButton("Add circuit", icon=ft.Icons.ADD, height=48,
                              key=f"add-circuit-{board.id}", on_click=add)
        )
    tiles.append(ft.TextButton(f"Board {board.designation} details", icon=ft.Icons.TUNE, height=44,
                               key=f"board-details-{board.id}",
                               on_click=lambda _e: shell.go(f"/job/{job.job_id}/board/{board.id}")))
    title = board.designation + (f" · {board.location}" if board.location else "")
    return ft.Card(
        content=ft.Container(
            ft.Column([ft.Text(title, size=18, weight=ft.FontWeight.BOLD), *tiles], spacing=4),
            padding=12,
        )
    )


def build(shell: Any, job_id: str) -> ft.View:
    """The job screen."""
    job = JobScreen(shell.store, int(job_id))

    def add_board(_e: Any) -> None:
        job.add_board()
        shell.render()

    body: list[ft.Control] = [
        ft.Row(
            [ft.Icon(ft.Icons.LOCK if job.read_only else ft.Icons.EDIT_NOTE),
             ft.Text(f"Status: {job.status_word}", size=16, weight=ft.FontWeight.BOLD,
                     key="job-status")],
            spacing=6,
        ),
    ]
    if job.read_only:
        body.append(ft.Text("This job is locked while in review or approved.", size=14))
    overall = ft.Column([overall_block(overall_of(shell.store, job.job_id))], key="job-overall")
    observations = len(shell.store.observations.of_job(job.job_id))
    body += [
        overall,
        ft.OutlinedButton("Job details and instruments", icon=ft.Icons.ASSIGNMENT, height=48,
                          key="open-details", on_click=lambda _e: shell.go(f"/job/{job.job_id}/details")),
        ft.OutlinedButton(f"Observations ({observations})", icon=ft.Icons.VISIBILITY, height=48,
                          key="open-observations",
                          on_click=lambda _e: shell.go(f"/job/{job.job_id}/observations")),
    ]
    boards = ft.Column(spacing=8, key="boards")
    opened: set[int] = shell.session_value(f"open-boards-{job_id}", set)

    def unfold(board_id: int) -> None:
        opened.add(board_id)
        refresh_boards()

    def fill_boards() -> None:
        views = job.boards()
        folds = job.folds(views)
        boards.controls = [
            _folded_board(board, unfold) if folds and board.id not in opened else _board(shell, job, board)
            for board in views
        ]

    def refresh_boards() -> None:
        fill_boards()
        overall.controls = [overall_block(overall_of(shell.store, job.job_id))]
        boards.update()
        overall.update()

    fill_boards()
    body += [ft.Text("Boards and circuits", size=20, weight=ft.FontWeight.BOLD), boards]
    if not job.read_only:
        body.append(ft.OutlinedButton("Add board", icon=ft.Icons.ADD, height=48, key="add-board",
                                      on_click=add_board))
    body.append(ft.Text("Supply at the origin", size=20, weight=ft.FontWeight.BOLD))
    body.extend(_input(job, field, refresh_boards) for field in job.supply_fields())
    body.append(cautions_box())
    review = ft.FilledButton("Review", icon=ft.Icons.RATE_REVIEW, height=48, key="open-review",
                             on_click=lambda _e: shell.go(f"/job/{job.job_id}/review"))
    return screen(f"/job/{job_id}", job.title, body, shell.go, back="/", bottom=review)
