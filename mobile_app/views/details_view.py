"""The job's details: client, site, purpose, dates and limitations; the test instruments used; and
the job's overall outcome with its reasons."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import flet as ft

from mobile_app.components.form_field import form_field
from mobile_app.components.overall_block import overall_block
from mobile_app.components.redraw import redrawing
from mobile_app.components.screen import screen
from mobile_app.state.records import JobDetails


def _instrument(details: JobDetails, item: tuple[int, int, Any], locked: bool, redraw: Callable[[], None],
                generation: int) -> ft.Control:
    """One instrument's card: its fields and a way to remove it."""
    item_id, number, form = item
    parts: list[ft.Control] = [ft.Text(f"Instrument {number}", size=16, weight=ft.FontWeight.BOLD)]
    parts.extend(form_field(f"instrument-{number}-{field.spec.name}-{generation}", form, field, locked,
                            lambda: None, redraw) for field in form.fields())
    if not locked:
        def remove(_e: Any) -> None:
            details.remove_instrument(item_id)
            redraw()

        parts.append(ft.TextButton("Remove this instrument", icon=ft.Icons.DELETE_OUTLINE,
                                   key=f"remove-instrument-{number}-{generation}", on_click=remove))
    return ft.Card(content=ft.Container(
        ft.Column(parts, spacing=8, horizontal_alignment=ft.CrossAxisAlignment.STRETCH), padding=12))


def build(shell: Any, job_id: str) -> ft.View:
    """The job details screen."""
    details = shell.session_value(f"details-{job_id}", lambda: JobDetails(shell.store, int(job_id)))
    details.form.reload()
    locked = details.read_only

    def make(redraw: Callable[[], None], generation: int) -> list[ft.Control]:
        body: list[ft.Control] = [overall_block(details.overall(), key=f"overall-{generation}")]
        if locked:
            body.append(ft.Text("This job is locked while in review or approved.", size=14))
        body.append(ft.Text("Job", size=20, weight=ft.FontWeight.BOLD))
        body.extend(form_field(f"job-{field.spec.name}-{generation}", details.form, field, locked,
                               lambda: None, redraw) for field in details.form.fields())
        body.append(ft.Text("Test instruments used", size=20, weight=ft.FontWeight.BOLD))
        instruments = details.instruments()
        if not instruments:
            body.append(ft.Text("No instruments yet.", size=14))
        body.extend(_instrument(details, item, locked, redraw, generation) for item in instruments)
        if not locked:
            def add(_e: Any) -> None:
                details.add_instrument()
                redraw()

            body.append(ft.OutlinedButton("Add instrument", icon=ft.Icons.ADD, height=48,
                                          key=f"add-instrument-{generation}", on_click=add))
        return body

    done = ft.FilledButton("Back to job", icon=ft.Icons.LIST, height=52, expand=True, key="details-done",
                           on_click=lambda _e: shell.go(f"/job/{job_id}"))
    return screen(f"/job/{job_id}/details", "Job details", [redrawing(make)], shell.go,
                  back=f"/job/{job_id}", bottom=ft.Row([done]))
