"""The walk for one circuit: one step per screen, every field saved as it is typed."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from mobile_app.state.fields import STEP_TITLES, STEPS, Choice, FieldSpec, label_for, specs_for_step
from mobile_app.state.form import parsed_text
from mobile_app.state.results import ResultsPanel, results_panel
from mobile_app.store import StoreError


@dataclass(frozen=True)
class FieldView:
    """What one input shows: the text as typed, the parsed value, and what is wrong, if anything."""

    spec: FieldSpec
    raw: str
    value: float | str | None
    error: str | None
    save_error: str | None
    choices: tuple[Choice, ...]

    @property
    def parsed_text(self) -> str:
        """`= 0.62 Ω` under a number field once its text parses; empty otherwise."""
        return parsed_text(self.spec, self.raw, self.value, self.error)

    @property
    def message(self) -> str | None:
        """The one line shown under the field: a save failure first, then a parse error."""
        return self.save_error or self.error


def field_message(name: str, error: str | None) -> str | None:
    """A store/calc error (`measured.zs: must be greater than zero`) as `Zs: must be ...`."""
    if not error:
        return None
    head, sep, problem = error.partition(": ")
    if sep and ("." in head or head == name) and " " not in head:
        return f"{label_for(name)}: {problem}"
    return f"{label_for(name)}: {error}"


class Walk:
    """Screen state of the walk for one circuit: current step, fields, saving, next/back rules."""

    def __init__(self, store: Any, circuit_id: int, step: str = "device", by: int | None = None):
        self.store = store
        self.circuit_id = circuit_id
        self.by = by
        self.step = step if step in STEPS else STEPS[0]
        self._typed: dict[str, str] = {}
        self._save_errors: dict[str, str] = {}
        self.reload()

    def reload(self) -> None:
        """Read the circuit again from the store (after a save elsewhere or a page reload)."""
        self.circuit: dict[str, Any] = self.store.circuits.get(self.circuit_id)

    @property
    def title(self) -> str:
        """`Circuit 3 · Readings`."""
        number = (self.circuit["fields"].get("number") or {}).get("raw") or self.circuit.get("number")
        return f"Circuit {number or '?'} · {STEP_TITLES[self.step]}"

    @property
    def step_number(self) -> int:
        """1-based position of the current step."""
        return STEPS.index(self.step) + 1

    @property
    def progress(self) -> float:
        """Share of the walk reached, 0–1, for the progress bar."""
        return self.step_number / len(STEPS)

    @property
    def progress_text(self) -> str:
        """`Step 3 of 4 · Readings`."""
        return f"Step {self.step_number} of {len(STEPS)} · {STEP_TITLES[self.step]}"

    @property
    def previous_step(self) -> str | None:
        """The step before this one, or None on the first."""
        index = STEPS.index(self.step)
        return STEPS[index - 1] if index > 0 else None

    @property
    def next_step(self) -> str | None:
        """The step after this one, or None on the last."""
        index = STEPS.index(self.step)
        return STEPS[index + 1] if index + 1 < len(STEPS) else None

    def raw(self, name: str) -> str:
        """The text of a field as last typed (kept even when the save failed)."""
        if name in self._typed:
            return self._typed[name]
        stored = self.circuit["fields"].get(name) or {}
        return stored.get("raw") or ""

    def _choices(self, spec: FieldSpec) -> tuple[Choice, ...]:
        if spec.name == "library_device_id":
            return tuple(
                Choice(str(d["id"]), d["name"]) for d in self.store.library.all()
            )
        return spec.choices

    def _visible(self, spec: FieldSpec) -> bool:
        return all(self.raw(other) in allowed for other, allowed in spec.shown_when.items())

    def required(self, spec: FieldSpec) -> bool:
        """Whether a field must be filled in before going on (an RCBO needs its RCD's IΔn)."""
        if spec.required:
            return True
        return bool(spec.required_when) and all(
            self.raw(other) in allowed for other, allowed in spec.required_when.items())

    def field(self, name: str) -> FieldView:
        """One field's view."""
        spec = next(s for s in self._all_specs() if s.name == name)
        stored = self.circuit["fields"].get(name) or {}
        return FieldView(
            spec=spec,
            raw=self.raw(name),
            value=stored.get("value"),
            error=field_message(name, stored.get("error")),
            save_error=self._save_errors.get(name),
            choices=self._choices(spec),
        )

    @staticmethod
    def _all_specs() -> tuple[FieldSpec, ...]:
        return tuple(spec for step in STEPS for spec in specs_for_step(step))

    def fields(self) -> list[FieldView]:
        """The current step's visible fields in screen order."""
        return [self.field(s.name) for s in specs_for_step(self.step) if self._visible(s)]

    def set_field(self, name: str, raw: str) -> FieldView:
        """Save one field at once; on a failed save keep the typed text and say why."""
        self._typed[name] = raw
        try:
            self.store.circuits.set_field(self.circuit_id, name, raw, by=self.by)
        except StoreError as exc:
            self._save_errors[name] = f"Not saved ({exc}); your text is kept"
            return self.field(name)
        self._save_errors.pop(name, None)
        self._typed.pop(name, None)
        self.reload()
        return self.field(name)

    def missing(self) -> list[str]:
        """Required fields of this step still blank, as `Rating In is needed`."""
        return [
            f"{label_for(view.spec.name)} is needed"
            for view in self.fields()
            if self.required(view.spec) and view.raw.strip() == ""
        ]

    def invalid(self) -> list[str]:
        """Messages of required fields (and Zs) whose text does not parse or did not save."""
        return [
            view.message
            for view in self.fields()
            if view.message and view.raw.strip() and (self.required(view.spec) or view.spec.name == "zs")
        ]

    def blocking(self) -> list[str]:
        """Why the walk cannot go on from this step; empty when next is allowed.

        Optional readings never block: a bad optional value is shown at its field and left out.
        """
        return self.missing() + self.invalid()

    def can_next(self) -> bool:
        """True when the current step's required fields are filled and valid."""
        return self.step != STEPS[-1] and not self.blocking()

    def can_back(self) -> bool:
        """True everywhere but the first step."""
        return self.step != STEPS[0]

    def next(self) -> str:
        """Move on one step when allowed; returns the step now shown."""
        if self.can_next():
            self.step = STEPS[STEPS.index(self.step) + 1]
        return self.step

    def back(self) -> str:
        """Go back one step; returns the step now shown."""
        if self.can_back():
            self.step = STEPS[STEPS.index(self.step) - 1]
        return self.step

    def results(self) -> ResultsPanel:
        """The results panel of the circuit as saved."""
        return results_panel(self.circuit, self.store.circuits.calc_input(self.circuit_id))
