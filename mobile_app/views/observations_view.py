"""The job's observations: each with its severity in plain words, where it is, what was found and
the circuits it concerns."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import flet as ft

from mobile_app.components.form_field import form_field
from mobile_app.components.overall_block import overall_block
from mobile_app.components.redraw import redrawing
from mobile_app.components.screen import screen
from mobile_app.state.records import ObservationsScreen, ObservationView


def _chips(state: ObservationsScreen, view: ObservationView, locked: bool, redraw: Callable[[], None],
           generation: int) -> ft.Control:
    """The circuits this observation concerns, as chips to pick or drop."""

    def toggle(circuit_id: int) -> Any:
        def handler(_e: Any) -> None:
            state.toggle_circuit(view.id, circuit_id)
            redraw()

        return handler

    chips = [
        ft.Button(
            content=chip.label, key=f"observation-{view.number}-circuit-{chip.id}-{generation}", height=36,
            icon=ft.Icons.CHECK if chip.picked else None, disabled=locked, on_click=toggle(chip.id),
            style=ft.ButtonStyle(
                bgcolor=ft.Colors.PRIMARY if chip.picked else ft.Colors.SURFACE_CONTAINER_HIGHEST,
                color=ft.Colors.ON_PRIMARY if chip.picked else ft.Colors.ON_SURFACE,
            ),
        )
        for chip in view.circuits
    ]
    return ft.Column([ft.Text("Circuits it concerns (optional)", size=14, weight=ft.FontWeight.W_600),
                      ft.Row(chips, wrap=True, spacing=6, run_spacing=6)], spacing=6)


def _card(state: ObservationsScreen, view: ObservationView, locked: bool, redraw: Callable[[], None],
          generation: int) -> ft.Control:
    """One observation's card: severity, where, what was found, circuits, and a way to remove it."""
    parts: list[ft.Control] = [ft.Text(f"Observation {view.number}", size=18, weight=ft.FontWeight.BOLD)]
    parts.extend(form_field(f"observation-{view.number}-{field.spec.name}-{generation}", view.form, field,
                            locked, lambda: None, redraw) for field in view.form.fields())
    parts.append(_chips(state, view, locked, redraw, generation))
    if not locked:
        def remove(_e: Any) -> None:
            state.remove(view.id)
            redraw()

        parts.append(ft.TextButton("Remove this observation", icon=ft.Icons.DELETE_OUTLINE,
                                   key=f"remove-observation-{view.number}-{generation}", on_click=remove))
    return ft.Card(content=ft.Container(
        ft.Column(parts, spacing=8, horizontal_alignment=ft.CrossAxisAlignment.STRETCH), padding=12))


def build(shell: Any, job_id: str) -> ft.View:
    """The observations screen."""
    state = shell.session_value(f"observations-{job_id}",
                                lambda: ObservationsScreen(shell.store, int(job_id)))
    locked = state.read_only

    def make(redraw: Callable[[], None], generation: int) -> list[ft.Control]:
        body: list[ft.Control] = [overall_block(state.overall(), key=f"overall-{generation}")]
        if locked:
            body.append(ft.Text("This job is locked while in review or approved.", size=14))
        items = state.items()
        if not items:
            body.append(ft.Text("No observations yet. Record what the inspection found, with how much it "
                                "matters: serious (unsafe now or likely to become so), needs attention, "
                                "or a note.", size=14))
        body.extend(_card(state, view, locked, redraw, generation) for view in items)
        missing = state.missing()
        if missing:
            body.append(ft.Text("Still needed: " + "; ".join(missing), color=ft.Colors.ERROR, size=14))
        if not locked:
            def add(_e: Any) -> None:
                state.add()
                redraw()

            body.append(ft.OutlinedButton("Add observation", icon=ft.Icons.ADD, height=48,
                                          key=f"add-observation-{generation}", on_click=add))
        return body

    done = ft.FilledButton("Back to job", icon=ft.Icons.LIST, height=52, expand=True,
                           key="observations-done", on_click=lambda _e: shell.go(f"/job/{job_id}"))
    return screen(f"/job/{job_id}/observations", "Observations", [redrawing(make)], shell.go,
                  back=f"/job/{job_id}", bottom=ft.Row([done]))
