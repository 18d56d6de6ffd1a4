"""Device library: saved manufacturer curves, and a new curve entered point by point with a preview."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.screen import screen
from mobile_app.components.tc_chart import tc_chart
from mobile_app.components.undo_bar import undo_bar
from mobile_app.state.library import CurveDraft, library_rows


def build(shell: Any) -> ft.View:
    """The device library screen."""
    draft: CurveDraft = shell.session_value("curve-draft", CurveDraft)
    preview = ft.Container(key="curve-preview")
    problem = ft.Text("", color=ft.Colors.ERROR, size=15, key="curve-problem")
    rows = ft.Column(spacing=8)

    def refresh() -> None:
        text = draft.problem()
        problem.value = text or "Curve accepted: times fall as current rises."
        problem.color = ft.Colors.ERROR if text and draft.started else None
        model = draft.preview()
        preview.content = tc_chart(model, height=240) if model else ft.Text(
            "The preview appears when the points make a valid curve.", size=14)

    def cell(index: int, column: str, label: str, value: str, error: str | None) -> ft.TextField:
        def changed(e: ft.Event[ft.TextField]) -> None:
            draft.set_cell(index, column, e.control.value or "")
            row = draft.rows[index]
            e.control.error = row.current_error if column == "current" else row.time_error
            refresh()
            e.control.update()
            problem.update()
            preview.update()

        return ft.TextField(key=f"point-{index}-{column}", label=label, value=value, error=error,
                            keyboard_type=ft.KeyboardType.NUMBER, expand=True, on_change=changed)

    def fill_rows() -> None:
        rows.controls = [
            ft.Row([
                ft.Text(number, size=16, width=20),
                cell(i, "current", "Current", r.current, r.current_error),
                cell(i, "time", "Time", r.time, r.time_error),
            ], spacing=8)
            for i, number, r in draft.numbered_rows()
        ]

    def add_point(_e: Any) -> None:
        draft.add_row()
        shell.render()

    def saver(as_new: bool) -> Any:
        def save(_e: Any) -> None:
            draft.name = name.value or ""
            draft.rating = rating.value or ""
            if draft.save(shell.store, as_new=as_new) is not None:
                shell.toast(draft.message or "Saved")
                shell.forget("curve-draft")
                shell.render()
            else:
                problem.value = draft.message or ""
                problem.color = ft.Colors.ERROR
                problem.update()

        return save

    def open_saved(device_id: int) -> None:
        device = shell.store.library.find(device_id)
        if device is not None:
            shell.forget("curve-draft")
            shell.session_value("curve-draft", lambda: CurveDraft.from_saved(device))
            shell.render()

    def delete(device_id: int) -> None:
        done = shell.undo.delete("curve", device_id)
        if not done.ok:
            shell.toast(done.message)
        shell.render()

    def new_curve(_e: Any) -> None:
        shell.forget("curve-draft")
        shell.render()

    name = ft.TextField(key="curve-name", label="Name (maker, type, rating)", value=draft.name,
                        on_change=lambda e: setattr(draft, "name", e.control.value or ""))
    rating = ft.TextField(key="curve-rating", label="Rating In (optional)", value=draft.rating,
                          keyboard_type=ft.KeyboardType.NUMBER,
                          on_change=lambda e: setattr(draft, "rating", e.control.value or ""))
    fill_rows()
    refresh()
    listed = library_rows(shell.store)
    saved: list[ft.Control] = [
        ft.Row([
            ft.ListTile(leading=ft.Icon(ft.Icons.SHOW_CHART), title=ft.Text(row.name, size=16),
                        subtitle=ft.Text(row.detail), key=f"curve-{row.id}", expand=True,
                        on_click=lambda _e, i=row.id: open_saved(i)),
            ft.IconButton(ft.Icon(ft.Icons.DELETE_OUTLINE, semantics_label=f"Delete curve {row.name}"),
                          key=f"delete-curve-{row.id}", on_click=lambda _e, i=row.id: delete(i)),
        ], spacing=0)
        for row in listed
    ] or [ft.Text("No curves saved yet.", size=14)]
    if listed:
        saved.insert(0, ft.Text("Tap a curve to open and change it.", size=14))
    body: list[ft.Control] = [undo_bar(shell)] if shell.undo.offer else []
    body += [
        ft.Text("Saved curves", size=20, weight=ft.FontWeight.BOLD),
        *saved,
        ft.Text(f"Changing: {draft.name}" if draft.editing is not None else "New curve", size=20,
                weight=ft.FontWeight.BOLD, key="curve-heading"),
        ft.Text("Read points off the maker's time–current chart: current (e.g. 500 A, 1.2 kA) and "
                "the upper time (e.g. 20 s, 80 ms). Times must fall as current rises.", size=14),
        name,
        rating,
        rows,
        ft.OutlinedButton("Add point", icon=ft.Icons.ADD, height=48, key="add-point",
                          on_click=add_point),
        problem,
        preview,
    ]
    if draft.editing is None:
        body.append(ft.FilledButton("Save curve", icon=ft.Icons.SAVE, height=48, key="save-curve",
                                    on_click=saver(False)))
    else:
        body += [
            ft.FilledButton("Save changes", icon=ft.Icons.SAVE, height=48, key="save-changes",
                            on_click=saver(False)),
            ft.OutlinedButton("Save as a new curve", icon=ft.Icons.ADD, height=48, key="save-as-new",
                              on_click=saver(True)),
            ft.TextButton("Start a new curve instead", height=48, key="new-curve", on_click=new_curve),
        ]
    return screen("/library", "Device library", body, shell.go, tab=1)
