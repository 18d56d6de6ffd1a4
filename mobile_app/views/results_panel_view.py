"""The results step's body: overall verdict, margins, the picture, one card per step, cautions."""

from __future__ import annotations

import flet as ft

from mobile_app.components.cautions import cautions_box
from mobile_app.components.step_card import step_card
from mobile_app.components.tc_chart import tc_chart
from mobile_app.components.verdict_badge import verdict_badge
from mobile_app.state.results import Margin, ResultsPanel


def _margin_row(margin: Margin) -> ft.Control:
    return ft.ListTile(
        leading=ft.Icon(ft.Icons.CHECK if margin.ok else ft.Icons.CLOSE),
        title=ft.Text(margin.label, size=15),
        subtitle=ft.Text(f"{margin.actual} against {margin.limit}: {margin.text}", size=14),
    )


def controls(panel: ResultsPanel) -> list[ft.Control]:
    """Controls of the results panel, in reading order."""
    parts: list[ft.Control] = [
        ft.Container(
            ft.Column(
                [verdict_badge(panel.mark, size=28, key="overall-verdict"),
                 ft.Text(panel.headline, size=18, weight=ft.FontWeight.BOLD),
                 ft.Row([ft.Icon(ft.Icons.WARNING_AMBER, size=18),
                         ft.Text(panel.cautions[0], size=13, expand=True)], spacing=6)],
                spacing=8,
            ),
            padding=ft.Padding.only(bottom=4),
        )
    ]
    if panel.problem:
        parts.append(ft.Text(f"Why: {panel.problem}", size=15, key="results-problem"))
    if panel.margins:
        parts.append(ft.Text("Margins", size=18, weight=ft.FontWeight.BOLD))
        parts.extend(_margin_row(m) for m in panel.margins)
    if panel.chart is not None:
        parts.append(ft.Text("Time–current picture (log–log)", size=18, weight=ft.FontWeight.BOLD))
        parts.append(tc_chart(panel.chart))
    if panel.cards:
        parts.append(ft.Text("Working, step by step", size=18, weight=ft.FontWeight.BOLD))
        parts.extend(step_card(card) for card in panel.cards)
    parts.append(cautions_box())
    return parts
