"""One stored row's fields on a screen (a board, a job's details, an instrument, an observation):
every field saved as it is typed, the text kept when a save fails, messages naming the field."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from mobile_app.state.fields import Choice, FieldSpec
from mobile_app.state.text import format_quantity
from mobile_app.store import StoreError


def short_label(spec: FieldSpec) -> str:
    """A field's label for messages, without "(optional)" or a trailing question mark."""
    return spec.label.replace(" (optional)", "").rstrip("?").strip()


def parsed_text(spec: FieldSpec, raw: str, value: Any, error: str | None) -> str:
    """`= 0.62 Ω` under a number field once its text parses (`= >999 MΩ` for a beyond-range
    reading); empty otherwise."""
    if spec.kind != "number" or error or value is None or raw.strip() == "":
        return ""
    if isinstance(value, str) and value.startswith(">"):
        try:
            return "= >" + format_quantity(float(value[1:]), spec.unit)
        except ValueError:
            return ""
    if isinstance(value, bool) or not isinstance(value, int | float):
        return ""
    return "= " + format_quantity(float(value), spec.unit)


def field_message(spec: FieldSpec, error: str | None) -> str | None:
    """A store error (`must be one of: no, yes`) as a message naming the field."""
    if not error:
        return None
    head, sep, problem = error.partition(": ")
    if sep and "." in head and " " not in head:
        error = problem
    return f"{short_label(spec)}: {error}"


@dataclass(frozen=True)
class FormField:
    """What one input shows: its spec, the text as typed, the parsed value, the message, choices."""

    spec: FieldSpec
    raw: str
    parsed_text: str
    message: str | None
    choices: tuple[Choice, ...]


class Form:
    """The fields of one stored row: `load()` reads its fields (`{name: {"raw", "value", "error"}}`),
    `save(name, raw)` stores one; `shown(spec, raw_of)` says whether a field is on screen."""

    def __init__(
        self,
        specs: tuple[FieldSpec, ...],
        load: Callable[[], dict[str, dict[str, Any]]],
        save: Callable[[str, str], Any],
        shown: Callable[[FieldSpec, Callable[[str], str]], bool] | None = None,
    ) -> None:
        self.specs = specs
        self._load = load
        self._save = save
        self._shown = shown
        self._typed: dict[str, str] = {}
        self._save_errors: dict[str, str] = {}
        self.stored = load()

    def reload(self) -> None:
        """Read the row again (another screen or session may have changed it); text whose save
        failed stays as typed."""
        self.stored = self._load()

    def raw(self, name: str) -> str:
        """The text of a field as last typed (kept even when the save failed)."""
        if name in self._typed:
            return self._typed[name]
        return (self.stored.get(name) or {}).get("raw") or ""

    def _visible(self, spec: FieldSpec) -> bool:
        if self._shown is not None:
            return self._shown(spec, self.raw)
        return all(self.raw(other) in allowed for other, allowed in spec.shown_when.items())

    def field(self, name: str) -> FormField:
        """One field as shown."""
        spec = next(s for s in self.specs if s.name == name)
        stored = self.stored.get(name) or {}
        raw = self.raw(name)
        message = self._save_errors.get(name) or field_message(spec, stored.get("error"))
        return FormField(spec, raw, parsed_text(spec, raw, stored.get("value"), stored.get("error")),
                         message, spec.choices)

    def fields(self) -> list[FormField]:
        """The fields on screen, in order."""
        return [self.field(spec.name) for spec in self.specs if self._visible(spec)]

    def set_field(self, name: str, raw: str) -> FormField:
        """Save one field at once; a failed save keeps the typed text and says why."""
        self._typed[name] = raw
        try:
            self._save(name, raw)
        except StoreError as exc:
            self._save_errors[name] = f"Not saved ({exc}); your text is kept"
            return self.field(name)
        self._typed.pop(name, None)
        self._save_errors.pop(name, None)
        self.stored = self._load()
        return self.field(name)

    def missing(self) -> list[str]:
        """Required fields on screen still blank, as `Severity is needed`."""
        return [f"{short_label(f.spec)} is needed" for f in self.fields()
                if f.spec.required and not f.raw.strip()]
