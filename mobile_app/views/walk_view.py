"""The walk for one circuit: one step per screen with back and next; the last step shows the results."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.cautions import cautions_box
from mobile_app.components.choice_row import choice_row
from mobile_app.components.screen import screen
from mobile_app.components.suggestions import suggestions
from mobile_app.components.text_input import text_input
from mobile_app.components.verdict_badge import verdict_badge
from mobile_app.state.fields import STEPS, specs_for_step
from mobile_app.state.jobs import JobScreen
from mobile_app.state.text import verdict_mark
from mobile_app.state.walk import FieldView, Walk
from mobile_app.views import results_panel_view


def _field(
    walk: Walk, view: FieldView, on_saved: Any, rebuild: Any, locked: bool, generation: int
) -> ft.Control:
    """One field of the step; `rebuild` redraws the step's fields (in place, keeping the scroll) after a
    choice that shows or hides others; `generation` keeps the redrawn controls' keys new."""
    name = view.spec.name
    key = f"field-{name}" + (f"-{generation}" if generation else "")
    if view.spec.kind == "choice":

        def picked(value: str) -> None:
            walk.set_field(name, value)
            if any(name in s.shown_when or name in s.required_when for s in _step_specs(walk)):
                rebuild()
            else:
                on_saved()

        return choice_row(key, view.spec.label, view.choices, view.raw, picked,
                          message=view.message, disabled=locked, clearable=not walk.required(view.spec))

    def changed(text: str) -> tuple[str, str | None]:
        saved = walk.set_field(name, text)
        on_saved()
        return saved.parsed_text, saved.message

    control = text_input(
        key, view.spec.label, view.raw, changed,
        numeric=view.spec.numeric, hint=view.spec.hint, helper=view.parsed_text,
        error=view.message, read_only=locked, multiline=view.spec.multiline,
    )
    if not view.spec.suggestions or locked:
        return control

    def chosen(words: str) -> None:
        saved = walk.set_field(name, words)
        control.value = words
        control.helper = saved.parsed_text or None
        control.error = saved.message
        control.update()
        on_saved()

    return ft.Column([control, suggestions(f"{key}-pick", view.spec.suggestions, chosen)], spacing=4,
                     horizontal_alignment=ft.CrossAxisAlignment.STRETCH)


def _step_specs(walk: Walk) -> list[Any]:
    return [spec for step in STEPS for spec in specs_for_step(step)]


def build(shell: Any, job_id: str, circuit_id: str, step: str) -> ft.View:
    """The walk screen for `step` of a circuit."""
    walk = shell.walk(int(circuit_id), step if step in STEPS else "device")
    locked = JobScreen(shell.store, int(job_id)).read_only
    base = f"/job/{job_id}/circuit/{circuit_id}"
    progress = ft.Column(
        [
            ft.Text(walk.progress_text, size=14),
            ft.ProgressBar(value=walk.progress, height=6),
        ],
        spacing=4,
    )
    blockers = ft.Text("", color=ft.Colors.ERROR, size=14, key="walk-blockers")
    live = ft.Row(spacing=8, key="live-verdict")
    back = ft.OutlinedButton("Back", icon=ft.Icons.ARROW_BACK, height=52, expand=True, key="walk-back",
                             disabled=not walk.can_back(),
                             on_click=lambda _e: shell.go(f"{base}/{walk.previous_step}"))
    nxt = ft.FilledButton("Next", icon=ft.Icons.ARROW_FORWARD, height=52, expand=True, key="walk-next")

    def refresh_controls() -> None:
        missing = walk.missing()
        blockers.value = ("To go on: " + "; ".join(missing)) if missing else ""
        nxt.disabled = not walk.can_next()
        if walk.step in ("tests", "readings"):
            mark = verdict_mark(walk.circuit.get("verdict"))
            live.controls = [ft.Text("Verdict so far", size=14), verdict_badge(mark, size=15)]

    def saved() -> None:
        refresh_controls()
        blockers.update()
        nxt.update()
        if walk.step in ("tests", "readings"):
            live.update()

    def go_next(_e: Any) -> None:
        if walk.can_next():
            shell.go(f"{base}/{walk.next_step}")
        else:
            saved()

    nxt.on_click = go_next
    refresh_controls()
    fields = ft.Column(spacing=14, horizontal_alignment=ft.CrossAxisAlignment.STRETCH)
    generation = [0]

    def make_fields() -> list[ft.Control]:
        return [_field(walk, view, saved, redraw, locked, generation[0]) for view in walk.fields()]

    def redraw() -> None:
        generation[0] += 1
        fields.controls = make_fields()
        fields.update()
        saved()

    body: list[ft.Control] = [progress]
    if walk.step == "results":
        body.extend(results_panel_view.controls(walk.results()))
        nxt = ft.FilledButton("Back to job", icon=ft.Icons.LIST, height=52, expand=True,
                              key="walk-done", on_click=lambda _e: shell.go(f"/job/{job_id}"))
    else:
        if locked:
            body.append(ft.Text("This job is locked while in review or approved: readings are shown, "
                                "not changed.", size=14, key="walk-locked"))
        fields.controls = make_fields()
        body.append(fields)
        body.append(blockers)
        if walk.step in ("tests", "readings"):
            body += [live, cautions_box()]
    bar = ft.Row([back, nxt], spacing=12)
    return screen(f"{base}/{walk.step}", walk.title, body, shell.go, back=f"/job/{job_id}", bottom=bar)
