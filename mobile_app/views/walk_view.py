"""The walk for one circuit: one step per screen with back and next, the verdict so far pinned above
the keyboard; the last step shows the results.

Typing is judged at once and saved after a short pause (a page task, no thread) or when the field
is left; every way off the screen saves what was typed first. The fields are drawn from the walk's
state only: after a choice or a save the step is drawn again from what was saved, never from a
button's own idea of it; a field whose view did not change keeps its control (and the focus and
the text being typed in it), the others are made anew.
"""

from __future__ import annotations

import asyncio
from typing import Any

import flet as ft

from mobile_app.components.cautions import cautions_box
from mobile_app.components.choice_row import choice_row
from mobile_app.components.entry_field import EntryActions, entry_field
from mobile_app.components.live import on_page, update_if_shown
from mobile_app.components.live_bar import live_bar
from mobile_app.components.screen import screen
from mobile_app.components.suggestions import suggestions
from mobile_app.state.fields import STEPS
from mobile_app.state.jobs import JobScreen
from mobile_app.state.pending import PAUSE_S
from mobile_app.state.walk import FieldView, SaveResult, Walk
from mobile_app.views import results_panel_view


def _signature(view: FieldView, required: bool) -> tuple[Any, ...]:
    """What a field's control shows: when it changes, the control is made anew."""
    return (view.raw, view.unit, view.picked, view.conflict, view.message, view.choices, required,
            view.expands)


class _Step:
    """The controls of one step and what redraws them."""

    def __init__(self, shell: Any, walk: Walk, locked: bool, base: str) -> None:
        self.shell = shell
        self.walk = walk
        self.locked = locked
        self.base = base
        self.generation = 0
        self.made: dict[str, tuple[tuple[Any, ...], ft.Control]] = {}
        self.fields = ft.Column(spacing=14, horizontal_alignment=ft.CrossAxisAlignment.STRETCH)
        self.blockers = ft.Text("", color=ft.Colors.ERROR, size=14, key="walk-blockers")
        self.bar = ft.Container(content=live_bar(walk.live()))
        self.next = ft.FilledButton("Next", icon=ft.Icons.ARROW_FORWARD, height=52, expand=True,
                                    key="walk-next", on_click=lambda _e: self.go_next())

    # drawing

    def draw(self, first: bool = False) -> None:
        """Make the step's fields from the walk's state; the lead field is focused when the step
        first opens."""
        focus = self.walk.lead_field() if first and not self.locked else None
        controls = []
        for view in self.walk.fields():
            name, signature = view.spec.name, _signature(view, self.walk.required(view.spec))
            made = self.made.get(name)
            if made is None or made[0] != signature:
                self.generation += 1
                made = self.made[name] = (signature, self._control(view, focus))
            controls.append(made[1])
        self.fields.controls = controls
        self.refresh()

    def redraw(self) -> None:
        """Draw the fields again in place, keeping the scroll: changed ones with new keys."""
        self.draw()
        update_if_shown(self.fields)

    def refresh(self) -> None:
        """What follows a keystroke or a save: why the walk cannot go on, Next, the verdict bar."""
        blocking = self.walk.missing() + self.walk.open_conflicts()
        self.blockers.value = ("To go on: " + "; ".join(blocking)) if blocking else ""
        self.next.disabled = not self.walk.can_next()
        self.bar.content = live_bar(self.walk.live())
        update_if_shown(self.blockers, self.next, self.bar)

    def after(self, _result: SaveResult) -> None:
        self.redraw()

    # acts

    def leave(self, route: str) -> None:
        """Every way off the screen saves what was typed first."""
        self.walk.save()
        self.shell.go(route)

    def go_next(self) -> None:
        self.after(self.walk.save())
        if self.walk.can_next():
            self.shell.go(f"{self.base}/{self.walk.next_step}")

    def typed(self, name: str, text: str) -> tuple[str, str | None]:
        view = self.walk.edit(name, text)
        made = self.made.get(name)
        if made is not None:  # the control shows what was typed: keep it at the next redraw
            self.made[name] = (_signature(view, self.walk.required(view.spec)), made[1])
        self.refresh()
        self.shell.page.run_task(self._save_after_pause)
        return view.parsed_text, view.message

    async def _save_after_pause(self) -> None:
        await asyncio.sleep(PAUSE_S + 0.05)
        if not on_page(self.fields):
            return
        result = self.walk.save_due()
        if result.anything:
            self.after(result)

    def left(self, name: str) -> None:
        result = self.walk.save([name])
        if result.anything:
            self.after(result)

    def _control(self, view: FieldView, focus: str | None) -> ft.Control:
        walk, name = self.walk, view.spec.name
        key = f"field-{name}-{self.generation}"
        if view.spec.kind == "choice":
            return choice_row(key, view.spec.label, view.choices, view.raw,
                              lambda value: self.after(walk.pick(name, value)), message=view.message,
                              disabled=self.locked, clearable=not walk.required(view.spec))
        actions = EntryActions(
            typed=lambda text: self.typed(name, text),
            unit_now=lambda: walk.field(name).unit,
            unit=lambda unit: self.after(walk.set_unit(name, unit)),
            pick=lambda pick: self.after(walk.fill(pick)),
            leave=lambda: self.left(name),
            submit=self.go_next,
            keep_mine=lambda: self.after(walk.keep_mine(name)),
            take_theirs=lambda: self.after(walk.take_theirs(name)),
        )
        control = entry_field(key, view, actions, locked=self.locked, autofocus=name == focus)
        if not view.spec.suggestions or self.locked:
            return control

        def chosen(words: str) -> None:
            walk.set_field(name, words)
            self.redraw()

        return ft.Column([control, suggestions(f"{key}-pick", view.spec.suggestions, chosen)], spacing=4,
                         horizontal_alignment=ft.CrossAxisAlignment.STRETCH)


def build(shell: Any, job_id: str, circuit_id: str, step: str) -> ft.View:
    """The walk screen for `step` of a circuit."""
    walk = shell.walk(int(circuit_id), step if step in STEPS else "device")
    locked = JobScreen(shell.store, int(job_id)).read_only
    base = f"/job/{job_id}/circuit/{circuit_id}"
    state = _Step(shell, walk, locked, base)
    progress = ft.Column(
        [
            ft.Text(walk.progress_text, size=14),
            ft.ProgressBar(value=walk.progress, height=6),
        ],
        spacing=4,
    )
    back = ft.OutlinedButton("Back", icon=ft.Icons.ARROW_BACK, height=52, expand=True, key="walk-back",
                             disabled=not walk.can_back(),
                             on_click=lambda _e: state.leave(f"{base}/{walk.previous_step}"))
    body: list[ft.Control] = [progress]
    if walk.step == "results":
        body.extend(results_panel_view.controls(walk.results()))
        done = ft.FilledButton("Back to job", icon=ft.Icons.LIST, height=52, expand=True,
                               key="walk-done", on_click=lambda _e: shell.go(f"/job/{job_id}"))
        return screen(f"{base}/{walk.step}", walk.title, body, shell.go, back=f"/job/{job_id}",
                      bottom=ft.Row([back, done], spacing=12))
    if locked:
        body.append(ft.Text("This job is locked while in review or approved: readings are shown, "
                            "not changed.", size=14, key="walk-locked"))
    state.draw(first=True)
    body += [state.fields, state.blockers]
    if walk.step in ("tests", "readings"):
        body.append(cautions_box())
    bottom = ft.Column([state.bar, ft.Row([back, state.next], spacing=12)], spacing=6, tight=True)
    return screen(f"{base}/{walk.step}", walk.title, body, state.leave, back=f"/job/{job_id}",
                  bottom=bottom, bottom_height=136)
