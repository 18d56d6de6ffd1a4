"""One field of a form (a board, a job's details, an instrument, an observation) as a control:
choices as buttons, text and numbers saved as typed with the parsed value or the error under them,
quick choices for short free text."""

from __future__ import annotations

from collections.abc import Callable

import flet as ft

from mobile_app.components.choice_row import choice_row
from mobile_app.components.suggestions import suggestions
from mobile_app.components.text_input import text_input
from mobile_app.state.form import Form, FormField


def form_field(key: str, form: Form, field: FormField, read_only: bool,
               after: Callable[[], None], rebuild: Callable[[], None]) -> ft.Control:
    """The control for `field` of `form`; `after` runs after each typed save (or quick choice, which
    puts its words in the field), `rebuild` redraws the form in place after a choice (it may show or
    hide other fields, or change the outcome shown)."""
    name = field.spec.name

    if field.spec.kind == "choice":
        def picked(value: str) -> None:
            form.set_field(name, value)
            rebuild()

        return choice_row(key, field.spec.label, field.choices, field.raw, picked, disabled=read_only,
                          message=field.message, clearable=not field.spec.required)

    def changed(text: str) -> tuple[str, str | None]:
        saved = form.set_field(name, text)
        after()
        return saved.parsed_text, saved.message

    control = text_input(key, field.spec.label, field.raw, changed, numeric=field.spec.numeric,
                         hint=field.spec.hint, helper=field.parsed_text, error=field.message,
                         read_only=read_only, multiline=field.spec.multiline)
    if not field.spec.suggestions or read_only:
        return control

    def chosen(words: str) -> None:
        saved = form.set_field(name, words)
        control.value = words
        control.helper = saved.parsed_text or None
        control.error = saved.message
        control.update()
        after()

    return ft.Column([control, suggestions(f"{key}-pick", field.spec.suggestions, chosen)], spacing=4,
                     horizontal_alignment=ft.CrossAxisAlignment.STRETCH)
