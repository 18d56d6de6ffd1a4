"""One number or text field of the walk as a control: quick picks above it, unit chips beside it,
and, when another tab or device saved the same field meanwhile, both texts with a choice."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import flet as ft

from mobile_app.components.live import update_if_shown
from mobile_app.components.text_input import text_input
from mobile_app.state.entry import QuickPick
from mobile_app.state.walk import FieldView


@dataclass(frozen=True)
class EntryActions:
    """What the field's parts do: typing, the unit the typed text is now in, a unit chip, a quick
    pick, leaving, the action key, and the two answers to a conflict."""

    typed: Callable[[str], tuple[str, str | None]]
    unit_now: Callable[[], str | None]
    unit: Callable[[str], None]
    pick: Callable[[QuickPick], None]
    leave: Callable[[], None]
    submit: Callable[[], None]
    keep_mine: Callable[[], None]
    take_theirs: Callable[[], None]


def _chip(key: str, label: str, selected: bool, on_click: Callable[[], None], disabled: bool,
          height: int = 44) -> ft.Semantics:
    """A compact toggle: filled and ticked when selected (and said so to a screen reader)."""
    button = ft.Button(content=label, key=key, height=height, disabled=disabled,
                       on_click=lambda _e: on_click())
    mark = ft.Semantics(content=button)
    _select(mark, selected)
    return mark


def _select(mark: ft.Semantics, selected: bool) -> None:
    button = mark.content
    assert isinstance(button, ft.Button)
    mark.selected = selected
    button.icon = ft.Icons.CHECK if selected else None
    button.style = ft.ButtonStyle(
        bgcolor=ft.Colors.PRIMARY if selected else ft.Colors.SURFACE_CONTAINER_HIGHEST,
        color=ft.Colors.ON_PRIMARY if selected else ft.Colors.ON_SURFACE,
        shape=ft.RoundedRectangleBorder(radius=10),
        padding=ft.Padding.symmetric(horizontal=10),
    )


def _conflict_box(key: str, view: FieldView, actions: EntryActions) -> ft.Control:
    conflict = view.conflict
    assert conflict is not None
    return ft.Container(
        key=f"{key}-conflict",
        padding=10,
        border=ft.Border.all(2, ft.Colors.ERROR),
        border_radius=8,
        content=ft.Column(
            [
                ft.Text(f"Changed in another tab or device by {conflict.who} at {conflict.at}: "
                        f"“{conflict.theirs or '(blank)'}”. Yours is “{conflict.mine or '(blank)'}”; "
                        "neither is lost until you choose.", size=14),
                ft.Row(
                    [
                        ft.FilledButton(f"Keep mine: {conflict.mine or '(blank)'}", height=48,
                                        key=f"{key}-keep-mine", on_click=lambda _e: actions.keep_mine()),
                        ft.OutlinedButton(f"Take theirs: {conflict.theirs or '(blank)'}", height=48,
                                          key=f"{key}-take-theirs",
                                          on_click=lambda _e: actions.take_theirs()),
                    ],
                    wrap=True, spacing=8, run_spacing=8,
                ),
            ],
            spacing=8,
        ),
    )


def entry_field(key: str, view: FieldView, actions: EntryActions, *, locked: bool,
                autofocus: bool) -> ft.Control:
    """The field's controls: quick picks, the box with its unit chips, the conflict if any."""
    parts: list[ft.Control] = []
    if view.picks:
        parts.append(ft.Row(
            [_chip(f"{key}-pick-{i}", pick.label, pick.label == view.picked,
                   lambda p=pick: actions.pick(p), locked)
             for i, pick in enumerate(view.picks)],
            wrap=True, spacing=6, run_spacing=6, key=f"{key}-picks",
        ))
    chips: list[ft.Semantics] = []
    shown = [view.unit]

    def typed(text: str) -> tuple[str, str | None]:
        helper, problem = actions.typed(text)
        unit = actions.unit_now()
        if chips and unit != shown[0]:  # a unit typed with the number: its chip follows
            shown[0] = unit
            for chip, name in zip(chips, view.units.chips if view.units else (), strict=True):
                _select(chip, name == unit)
            update_if_shown(*chips)
        return helper, problem

    box = text_input(
        key, view.spec.label, view.text, typed,
        numeric=view.spec.numeric, hint="" if view.units else view.spec.hint, helper=view.parsed_text,
        error=view.message,
        read_only=locked, multiline=view.spec.multiline, autofocus=autofocus,
        on_blur=actions.leave,
        on_submit=actions.submit if view.spec.numeric else None,
        expand=True if view.units else None,
    )
    if view.units and len(view.units.chips) == 1:  # the one unit, as a word: not a button
        unit = ft.Container(ft.Text(view.units.chips[0], size=20), padding=ft.Padding.only(top=14))
        parts.append(ft.Row([box, unit], spacing=8, vertical_alignment=ft.CrossAxisAlignment.START))
    elif view.units:
        chips += [_chip(f"{key}-unit-{unit}", unit, unit == view.unit, lambda u=unit: actions.unit(u),
                        locked, height=56)
                  for unit in view.units.chips]
        parts.append(ft.Row([box, *chips], spacing=6, vertical_alignment=ft.CrossAxisAlignment.START))
    else:
        parts.append(box)
    if view.conflict is not None:
        parts.append(_conflict_box(key, view, actions))
    if len(parts) == 1:
        return parts[0]
    return ft.Column(parts, spacing=6, horizontal_alignment=ft.CrossAxisAlignment.STRETCH)
