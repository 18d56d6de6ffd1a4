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
from mobile_app.components.undo_bar import undo_bar
from mobile_app.components.verdict_badge import verdict_badge
from mobile_app.state.jobs import FIRST_TEST_STEP, BoardView, CircuitRow, JobField, JobScreen
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


def _circuit(shell: Any, job: JobScreen, board: BoardView, c: CircuitRow) -> ft.Control:
    """One circuit: tap for its results (or the walk when it has no readings yet), a menu to copy
    or delete it."""
    lines: list[ft.Control] = [
        ft.Row([verdict_badge(c.mark, size=12),
                ft.Text(c.detail, size=13, max_lines=2, overflow=ft.TextOverflow.ELLIPSIS, expand=True)],
               spacing=8),
    ]
    if c.cause:
        lines.append(ft.Text(c.cause, size=13, max_lines=2, overflow=ft.TextOverflow.ELLIPSIS, italic=True))
    if c.rating_note:
        lines.append(ft.Row([ft.Icon(ft.Icons.WARNING_AMBER, size=16),
                             ft.Text(c.rating_note, size=13, expand=True)], spacing=4))
    trailing: ft.Control | None = None
    if not job.read_only:

        def copy(_e: Any) -> None:
            copy_id, message = job.copy_circuit(c.id)
            shell.toast(message)
            if copy_id is not None:
                shell.go(f"/job/{job.job_id}/circuit/{copy_id}/{FIRST_TEST_STEP}")

        def delete(_e: Any) -> None:
            done = shell.undo.delete("circuit", c.id)
            if not done.ok:
                shell.toast(done.message)
            shell.render()

        def actions(_e: Any) -> None:
            chosen: list[Any] = []

            def run(action: Any) -> Any:
                def handler(_e: Any) -> None:
                    chosen.append(action)
                    sheet.open = False
                    sheet.update()

                return handler

            def dismissed(e: Any) -> None:
                for action in chosen:
                    action(e)

            title = f"{board.designation} circuit {c.number}" + (f" · {c.description}" * bool(c.description))
            sheet = ft.BottomSheet(ft.Container(ft.Column([
                ft.Text(title, size=16, weight=ft.FontWeight.BOLD),
                ft.FilledButton("Copy circuit", icon=ft.Icons.CONTENT_COPY, height=52, key="copy-circuit",
                                on_click=run(copy)),
                ft.OutlinedButton("Delete circuit", icon=ft.Icons.DELETE_OUTLINE, height=52,
                                  key="delete-circuit", on_click=run(delete)),
                ft.TextButton("Cancel", height=48, on_click=run(lambda _e: None)),
            ], spacing=10, tight=True, horizontal_alignment=ft.CrossAxisAlignment.STRETCH), padding=20),
                on_dismiss=dismissed)
            shell.page.show_dialog(sheet)

        label = f"Copy or delete {board.designation} circuit {c.number}"
        trailing = ft.IconButton(ft.Icon(ft.Icons.MORE_VERT, semantics_label=label),
                                 key=f"circuit-menu-{c.id}", on_click=actions)
    tile = ft.ListTile(
        key=f"circuit-{c.id}",
        leading=ft.Text(c.number, size=20, weight=ft.FontWeight.BOLD),
        title=ft.Text(c.description or f"Circuit {c.number}", size=16),
        subtitle=ft.Column(lines, spacing=4, tight=True),
        on_click=lambda _e: shell.go(f"/job/{job.job_id}/circuit/{c.id}/{c.step}"),
        min_height=64,
        content_padding=ft.Padding.only(left=4, right=0),
        expand=True,
    )
    return tile if trailing is None else ft.Row([tile, trailing], spacing=0)


def _board(shell: Any, job: JobScreen, board: BoardView) -> ft.Control:
    tiles: list[ft.Control] = [_circuit(shell, job, board, c) for c in board.circuits]
    if not tiles:
        tiles.append(ft.Text("No circuits yet.", size=14))

    def add(_e: Any) -> None:
        circuit_id = job.add_circuit(board.id)
        shell.go(f"/job/{job.job_id}/circuit/{circuit_id}/device")

    def delete(_e: Any) -> None:
        done = shell.undo.delete("board", board.id)
        if not done.ok:
            shell.toast(done.message)
        shell.render()

    if not job.read_only and job.circuit_filter == "all":
        tiles.append(
            ft.OutlinedButton("Add circuit", icon=ft.Icons.ADD, height=48,
                              key=f"add-circuit-{board.id}", on_click=add)
        )
    tiles.append(ft.TextButton(f"Board {board.designation} details", icon=ft.Icons.TUNE, height=44,
                               key=f"board-details-{board.id}",
                               on_click=lambda _e: shell.go(f"/job/{job.job_id}/board/{board.id}")))
    title = board.designation + (f" · {board.location}" if board.location else "")
    head: list[ft.Control] = [ft.Text(title, size=18, weight=ft.FontWeight.BOLD, expand=True)]
    if not job.read_only:
        label = f"Delete board {board.designation}"
        head.append(ft.IconButton(ft.Icon(ft.Icons.DELETE_OUTLINE, semantics_label=label),
                                  key=f"delete-board-{board.id}", on_click=delete))
    return ft.Card(
        content=ft.Container(
            ft.Column([ft.Row(head, spacing=4), *tiles], spacing=4),
            padding=12,
        )
    )


def _add_board(shell: Any, job: JobScreen) -> ft.Control:
    """The new board's name first, then the button that adds it."""
    name = ft.TextField(key="new-board-name", label="New board's name", hint_text="e.g. DB2, Garage board",
                        expand=True, error_max_lines=3)

    def add(_e: Any) -> None:
        board_id, message = job.add_board(name.value or "")
        if board_id is None:
            name.error = message
            name.update()
            return
        shell.toast(message)
        shell.render()

    name.on_submit = add
    return ft.Row([name, ft.OutlinedButton("Add board", icon=ft.Icons.ADD, height=48, key="add-board",
                                           on_click=add)], spacing=8)


def build(shell: Any, job_id: str) -> ft.View:
    """The job screen."""
    job = JobScreen(shell.store, int(job_id))
    filters: dict[str, str] = shell.session_value("circuit-filters", dict)
    job.circuit_filter = filters.get(job_id, "all")

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
    if shell.undo.offer:
        body.append(undo_bar(shell))
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
        ] or [ft.Text(job.filter_empty_text or "No boards yet.", size=15)]

    def refresh_boards() -> None:
        fill_boards()
        overall.controls = [overall_block(overall_of(shell.store, job.job_id))]
        boards.update()
        overall.update()

    fill_boards()

    def filtered(value: str) -> None:
        filters[job_id] = value
        shell.render()

    body += [ft.Text("Boards and circuits", size=20, weight=ft.FontWeight.BOLD),
             choice_row("circuit-filter", "Show", job.filter_choices(), job.circuit_filter, filtered),
             boards]
    if not job.read_only:
        body.append(_add_board(shell, job))
    body.append(ft.Text("Supply at the origin", size=20, weight=ft.FontWeight.BOLD))
    body.extend(_input(job, field, refresh_boards) for field in job.supply_fields())
    body.append(cautions_box())
    review = ft.FilledButton("Review", icon=ft.Icons.RATE_REVIEW, height=48, key="open-review",
                             on_click=lambda _e: shell.go(f"/job/{job.job_id}/review"))
    return screen(f"/job/{job_id}", job.title, body, shell.go, back="/", bottom=review)
