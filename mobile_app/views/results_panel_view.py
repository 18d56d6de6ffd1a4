"""The results step's body: the verdict and its first cause, every check with the figure that decided it,
the picture, one card per step, cautions."""

from __future__ import annotations

import flet as ft

from mobile_app.components.cautions import cautions_box
from mobile_app.components.step_card import step_card
from mobile_app.components.tc_chart import tc_chart
from mobile_app.components.verdict_badge import verdict_badge
from mobile_app.state.results import CheckRow, ResultsPanel


def _check_row(row: CheckRow) -> ft.Control:
    """A check: its mark and title, the deciding figure with its margin, why, and what would decide it."""
    lines: list[ft.Control] = [
        ft.Row(
            [verdict_badge(row.mark, size=13), ft.Text(row.title, size=15, weight=ft.FontWeight.W_600,
                                                      expand=True)],
            spacing=8,
            vertical_alignment=ft.CrossAxisAlignment.START,
        )
    ]
    if row.figure:
        figure = row.figure + (f" · {row.margin}" if row.margin else "")
        lines.append(ft.Text(figure, size=14, key=f"check-figure-{row.id}"))
    if row.why:
        lines.append(ft.Text(row.why, size=13))
    if row.needs:
        lines.append(ft.Text(f"To decide: {row.needs}", size=13, weight=ft.FontWeight.W_600,
                             key=f"check-needs-{row.id}"))
    return ft.Container(ft.Column(lines, spacing=4), key=f"check-{row.id}",
                        padding=ft.Padding.symmetric(vertical=6))


def controls(panel: ResultsPanel) -> list[ft.Control]:
    """Controls of the results panel, in reading order."""
    head: list[ft.Control] = [
        verdict_badge(panel.mark, size=28, key="overall-verdict"),
        ft.Text(panel.headline, size=18, weight=ft.FontWeight.BOLD, key="results-headline"),
    ]
    if panel.cause is not None and panel.cause.remedies:
        head.append(ft.Text("What would put it right:", size=14, weight=ft.FontWeight.W_600))
        head.extend(ft.Text(f"• {remedy}", size=14) for remedy in panel.cause.remedies)
    head.append(ft.Row([ft.Icon(ft.Icons.WARNING_AMBER, size=18),
                        ft.Text(panel.cautions[0], size=13, expand=True)], spacing=6))
    parts: list[ft.Control] = [ft.Container(ft.Column(head, spacing=8), padding=ft.Padding.only(bottom=4))]
    if panel.problem:
        parts.append(ft.Text(f"Why: {panel.problem}", size=15, key="results-problem"))
    parts.extend(ft.Text(f"Note: {note}", size=14, italic=True) for note in panel.notes)
    if panel.checks:
        parts.append(ft.Text("Checks", size=18, weight=ft.FontWeight.BOLD))
        parts.extend(_check_row(row) for row in panel.checks)
    if panel.chart is not None:
        parts.append(ft.Text("Time–current picture (log–log)", size=18, weight=ft.FontWeight.BOLD))
        parts.append(tc_chart(panel.chart))
    if panel.cards:
        parts.append(ft.Text("Working, step by step", size=18, weight=ft.FontWeight.BOLD))
        parts.extend(step_card(card) for card in panel.cards)
    parts.append(cautions_box())
    return parts
