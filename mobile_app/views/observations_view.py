"""The job's observations: each with its severity in plain words, where it is, what was found and
the circuits it concerns."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.form_field import form_field
from mobile_app.components.overall_block import overall_block
from mobile_app.components.screen import screen
from mobile_app.state.records import ObservationsScreen, ObservationView


def _chips(shell: Any, screen_state: ObservationsScreen, view: ObservationView, locked: bool) -> ft.Control:
    """The circuits this observation concerns, as chips to pick or drop."""

    def toggle(circuit_id: int) -> Any:
        def handler(_e: Any) -> None:
            screen_state.toggle_circuit(view.id, circuit_id)
            shell.render()

        return handler

    chips = [
        ft.Button(
            content=chip.label, key=f"observation-{view.number}-circuit-{chip.id}", height=36,
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


def build(shell: Any, job_id: str) -> ft.View:
    """The observations screen."""
    state = shell.session_value(f"observations-{job_id}",
                                lambda: ObservationsScreen(shell.store, int(job_id)))
    locked = state.read_only
    body: list[ft.Control] = [overall_block(state.overall())]
    if locked:
        body.append(ft.Text("This job is locked while in review or approved.", size=14))
    items = state.items()
    if not items:
        body.append(ft.Text("No observations yet. Record what the inspection found, with how much it "
                            "matters: serious (unsafe now or likely to become so), needs attention, or "
                            "a note.", size=14))
    for view in items:
        parts: list[ft.Control] = [ft.Text(f"Observation {view.number}", size=18, weight=ft.FontWeight.BOLD)]
        parts.extend(form_field(f"observation-{view.number}-{field.spec.name}", view.form, field, locked,
                                lambda: None, shell.render) for field in view.form.fields())
        parts.append(_chips(shell, state, view, locked))
        if not locked:
            def remove(_e: Any, item: int = view.id) -> None:
                state.remove(item)
                shell.render()

            parts.append(ft.TextButton("Remove this observation", icon=ft.Icons.DELETE_OUTLINE,
                                       key=f"remove-observation-{view.number}", on_click=remove))
        body.append(ft.Card(content=ft.Container(ft.Column(parts, spacing=8), padding=12)))
    missing = state.missing()
    if missing:
        body.append(ft.Text("Still needed: " + "; ".join(missing), color=ft.Colors.ERROR, size=14,
                            key="observations-missing"))
    if not locked:
        def add(_e: Any) -> None:
            state.add()
            shell.render()

        body.append(ft.OutlinedButton("Add observation", icon=ft.Icons.ADD, height=48, key="add-observation",
                                      on_click=add))
    done = ft.FilledButton("Back to job", icon=ft.Icons.LIST, height=52, expand=True,
                           key="observations-done", on_click=lambda _e: shell.go(f"/job/{job_id}"))
    return screen(f"/job/{job_id}/observations", "Observations", body, shell.go, back=f"/job/{job_id}",
                  bottom=ft.Row([done]))
