"""One calc step as a card: title and verdict, formula, working with numbers, result."""

from __future__ import annotations

import flet as ft

from mobile_app.components.verdict_badge import verdict_badge
from mobile_app.state.results import StepCard


def step_card(card: StepCard) -> ft.Card:
    """Card of one step in walk order."""
    top: list[ft.Control] = [ft.Text(card.title, size=16, weight=ft.FontWeight.BOLD, expand=True)]
    if card.mark.word:  # a step that only works out a figure carries no mark
        top.append(verdict_badge(card.mark, size=13))
    lines: list[ft.Control] = [ft.Row(top, vertical_alignment=ft.CrossAxisAlignment.START)]
    if card.formula:
        lines.append(ft.Text(card.formula, size=15, font_family="monospace"))
    if card.working:
        lines.append(ft.Text(card.working, size=14, key=f"working-{card.id}"))
    lines.append(ft.Text(card.result, size=24, weight=ft.FontWeight.BOLD))
    if card.note:
        lines.append(ft.Text(card.note, size=13, italic=True))
    return ft.Card(
        key=f"step-{card.id}",
        content=ft.Container(ft.Column(lines, spacing=6), padding=14),
    )
