"""Device library: saved manufacturer curves, and a new curve entered point by point with a preview."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.screen import screen
from mobile_app.components.tc_chart import tc_chart
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
        problem.color = ft.Colors.ERROR if text else None
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

    def save(_e: Any) -> None:
        draft.name = name.value or ""
        draft.rating = rating.value or ""
        if draft.save(shell.store) is not None:
            shell.toast(draft.message or "Saved")
            shell.forget("curve-draft")
            shell.render()
        else:
            problem.value = draft.message or ""
            problem.color = ft.Colors.ERROR
            problem.update()

    name = ft.TextField(key="curve-name", label="Name (maker, type, rating)", value=draft.name,
                        on_change=lambda e: setattr(draft, "name", e.control.value or ""))
    rating = ft.TextField(key="curve-rating", label="Rating In (optional)", value=draft.rating,
                          keyboard_type=ft.KeyboardType.NUMBER,
                          on_change=lambda e: setattr(draft, "rating", e.control.value or ""))
    fill_rows()
    refresh()
    saved = [
        ft.ListTile(leading=ft.Icon(ft.Icons.SHOW_CHART), title=ft.Text(row.name, size=16),
                    subtitle=ft.Text(row.detail))
        for row in library_rows(shell.store)
    ] or [ft.Text("No curves saved yet.", size=14)]
    body: list[ft.Control] = [
        ft.Text("Saved curves", size=20, weight=ft.FontWeight.BOLD),
        *saved,
        ft.Text("New curve", size=20, weight=ft.FontWeight.BOLD),
        ft.Text("Read points off the maker's time–current chart: current (e.g. 500 A, 1.2 kA) and "
                "the upper time (e.g. 20 s, 80 ms). Times must fall as current rises.", size=14),
        name,
        rating,
        rows,
        ft.OutlinedButton("Add point", icon=ft.Icons.ADD, height=48, key="add-point",
                          on_click=add_point),
        problem,
        preview,
        ft.FilledButton("Save curve", icon=ft.Icons.SAVE, height=48, key="save-curve", on_click=save),
    ]
    return screen("/library", "Device library", body, shell.go, tab=1)
