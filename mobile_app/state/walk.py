"""The walk for one circuit: one step per screen; typing shown and judged at once, saved after a
short pause or when the field is left, against the version the screen showed.

While a person types, the verdict so far is worked out from the typed text without saving it
(`store.circuits.preview`). A save names the version of the circuit the screen showed; when another
tab or device saved the same field since, the typed text is kept and both texts are offered
(`keep_mine` / `take_theirs`); a change elsewhere to other fields is taken in and shown.
"""

from __future__ import annotations

import datetime
import time
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from mobile_app.state.entry import (
    QuickPick,
    Units,
    join_unit,
    picked,
    quick_picks,
    shorthand,
    shorthand_text,
    split_unit,
    units_for,
)
from mobile_app.state.fields import STEP_TITLES, STEPS, Choice, FieldSpec, label_for, specs_for_step
from mobile_app.state.form import parsed_text
from mobile_app.state.live import LiveVerdict, live_verdict
from mobile_app.state.pending import PAUSE_S, Conflict, Pending
from mobile_app.state.results import ResultsPanel, results_panel
from mobile_app.store import ConflictError, StoreError


@dataclass(frozen=True)
class FieldView:
    """What one input shows: the text as typed (and in its box, without the unit of its chip), the
    parsed value, what is wrong, the unit chips and quick picks, and a conflict to settle."""

    spec: FieldSpec
    raw: str
    value: float | str | None
    error: str | None
    save_error: str | None
    choices: tuple[Choice, ...]
    text: str = ""
    units: Units | None = None
    unit: str | None = None
    picks: tuple[QuickPick, ...] = ()
    picked: str | None = None
    conflict: Conflict | None = None
    expands: str = ""

    @property
    def parsed_text(self) -> str:
        """`= 0.62 Ω` under a number field once its text parses (what a shorthand stands for)."""
        return self.expands or parsed_text(self.spec, self.raw, self.value, self.error)

    @property
    def message(self) -> str | None:
        """The one line shown under the field: a save failure first, then a parse error."""
        return self.save_error or self.error


@dataclass(frozen=True)
class SaveResult:
    """What a save did: fields saved, fields now in conflict, fields the store refused (their text
    kept, the reason at the field), and whether the step must be drawn again (a shorthand filled
    other fields, a choice showed or hid some, a reason is to be shown, or another tab's save was
    taken in)."""

    saved: tuple[str, ...] = ()
    conflicts: tuple[str, ...] = ()
    redraw: bool = False
    failed: tuple[str, ...] = ()

    @property
    def anything(self) -> bool:
        """Whether the save did or refused anything a screen must show."""
        return bool(self.saved or self.conflicts or self.failed)


def field_message(name: str, error: str | None) -> str | None:
    """A store/calc error (`measured.zs: must be greater than zero`) as `Zs: must be ...`."""
    if not error:
        return None
    head, sep, problem = error.partition(": ")
    if sep and ("." in head or head == name) and " " not in head:
        return f"{label_for(name)}: {problem}"
    return f"{label_for(name)}: {error}"


def _local_time(iso: str | None) -> str:
    if not iso:
        return "just now"
    try:
        return datetime.datetime.fromisoformat(iso).astimezone().strftime("%H:%M:%S")
    except ValueError:
        return iso


class Walk:
    """Screen state of the walk for one circuit: current step, fields, typing and saving, next/back."""

    def __init__(self, store: Any, circuit_id: int, step: str = "device", by: int | None = None,
                 clock: Callable[[], float] = time.monotonic):
        self.store = store
        self.circuit_id = circuit_id
        self.by = by
        self.clock = clock
        self.step = step if step in STEPS else STEPS[0]
        self.pending = Pending()
        self._save_errors: dict[str, str] = {}
        self._chips: dict[str, str] = {}
        self._preview: dict[str, Any] | None = None
        self.reload()

    def reload(self) -> None:
        """Read the circuit again from the store (after a save elsewhere or a page reload); text not
        saved yet stays as typed."""
        self.circuit: dict[str, Any] = self.store.circuits.get(self.circuit_id)
        self.version: int = int(self.circuit["version"])
        self._refresh_preview()

    @property
    def title(self) -> str:
        """`Circuit 3 · Live tests`."""
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
        """`Step 3 of 5 · Supply-off tests`."""
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

    # what is shown

    def stored(self, name: str) -> str:
        """The text of a field as saved."""
        return (self.circuit["fields"].get(name) or {}).get("raw") or ""

    def raw(self, name: str) -> str:
        """The text of a field as it would be saved: typed (with its chip's unit), else as saved."""
        if name not in self.pending.text:
            return self.stored(name)
        units = units_for(name)
        text = self.pending.text[name]
        if units is None:
            return text
        return join_unit(text, self.chip(name), units)

    def chip(self, name: str) -> str | None:
        """The unit chip a number typed into `name` is read in: the one tapped, else the saved
        text's, else the usual one."""
        units = units_for(name)
        if units is None:
            return None
        return self._chips.get(name) or split_unit(self.stored(name), units)[1]

    def _choices(self, spec: FieldSpec) -> tuple[Choice, ...]:
        if spec.name == "library_device_id":
            return tuple(Choice(str(d["id"]), d["name"]) for d in self.store.library.all())
        return spec.choices

    def _visible(self, spec: FieldSpec) -> bool:
        return all(self.raw(other) in allowed for other, allowed in spec.shown_when.items())

    def required(self, spec: FieldSpec) -> bool:
        """Whether a field must be filled in before going on (an RCBO needs its RCD's IΔn)."""
        if spec.required:
            return True
        return bool(spec.required_when) and all(
            self.raw(other) in allowed for other, allowed in spec.required_when.items())

    def _expansion(self, name: str) -> dict[str, str] | None:
        if name not in self.pending.text:
            return None
        return shorthand(name, self.pending.text[name], self.raw("device_kind"))

    def field(self, name: str) -> FieldView:
        """One field's view."""
        spec = next(s for s in self._all_specs() if s.name == name)
        raw = self.raw(name)
        units = units_for(name)
        if name in self.pending.text and self._preview is not None:
            parsed = self._preview["fields"].get(name) or {}
        else:
            parsed = self.circuit["fields"].get(name) or {}
        expansion = self._expansion(name)
        text, unit = (raw, None) if units is None else split_unit(raw, units)
        if name in self.pending.text:
            text = self.pending.text[name]
        if units is not None and not raw.strip():
            unit = self.chip(name) or units.default
        return FieldView(
            spec=spec,
            raw=raw,
            value=parsed.get("value"),
            error=None if expansion else field_message(name, parsed.get("error")),
            save_error=self._save_errors.get(name),
            choices=self._choices(spec),
            text=text,
            units=units,
            unit=unit,
            picks=quick_picks(name),
            picked=picked(name, {f: self.raw(f) for f in ("device_rating", "line_csa", "cpc_csa",
                                                          "rcd_idn", "breaking_capacity")}),
            conflict=self.pending.conflicts.get(name),
            expands=shorthand_text(expansion) if expansion else "",
        )

    @staticmethod
    def _all_specs() -> tuple[FieldSpec, ...]:
        return tuple(spec for step in STEPS for spec in specs_for_step(step))

    def fields(self) -> list[FieldView]:
        """The current step's visible fields in screen order."""
        return [self.field(s.name) for s in specs_for_step(self.step) if self._visible(s)]

    def lead_field(self) -> str | None:
        """The first number field of the step still blank (focused when the step opens): R1+R2 on
        the supply-off tests, Zs on the live tests."""
        if self.step not in ("tests", "readings"):
            return None
        for view in self.fields():
            if view.spec.numeric and not view.raw.strip():
                return view.spec.name
        return None

    def live(self) -> LiveVerdict:
        """The verdict so far, with the typed text taken into account (the bar above the keyboard)."""
        if self._preview is not None:
            return live_verdict(self._preview["verdict"], self._preview["assessment"])
        return live_verdict(self.circuit.get("verdict"), self.circuit.get("assessment"))

    # typing

    def _typed_raws(self) -> dict[str, str]:
        raws: dict[str, str] = {}
        for name in self.pending.names():
            raws.update(self._expansion(name) or {name: self.raw(name)})
        return raws

    def _refresh_preview(self) -> None:
        typed = self._typed_raws()
        self._preview = self.store.circuits.preview(self.circuit_id, typed) if typed else None

    def edit(self, name: str, text: str) -> FieldView:
        """The box of `name` now holds `text`: shown parsed and judged at once, saved on a pause
        (`save_due`) or when the field is left (`save`)."""
        self.pending.edit(name, text, self.stored(name), self.clock())
        self._save_errors.pop(name, None)
        self._refresh_preview()
        return self.field(name)

    def set_unit(self, name: str, unit: str) -> SaveResult:
        """A unit chip tapped: the number in the box is now in `unit`; saved at once."""
        units = units_for(name)
        if units is None or unit not in units.chips:
            return SaveResult()
        text = self.pending.text.get(name, split_unit(self.stored(name), units)[0])
        self.pending.edit(name, text, self.stored(name), self.clock())
        self._chips[name] = unit
        return self.save([name])

    def pick(self, name: str, value: str) -> SaveResult:
        """A choice tapped: saved at once; the step is drawn again from what was saved."""
        self.pending.edit(name, value, self.stored(name), self.clock())
        result = self.save([name])
        return SaveResult(result.saved, result.conflicts, True, result.failed)

    def fill(self, pick: QuickPick) -> SaveResult:
        """A quick pick tapped: each field it fills saved at once."""
        for name, text in pick.fills:
            self.pending.edit(name, text, self.stored(name), self.clock())
            self._chips.pop(name, None)
        result = self.save([name for name, _text in pick.fills])
        return SaveResult(result.saved, result.conflicts, True, result.failed)

    def set_field(self, name: str, raw: str) -> FieldView:
        """Type and save one field at once (what a pause or leaving the field does)."""
        self.pending.edit(name, raw, self.stored(name), self.clock())
        self._chips.pop(name, None)
        self.save([name])
        return self.field(name)

    def save_due(self) -> SaveResult:
        """Save the fields left alone for the pause (called by the screen's timer)."""
        return self.save(self.pending.due(self.clock(), PAUSE_S))

    def save(self, names: list[str] | None = None) -> SaveResult:
        """Save the named fields' typed text (every typed field when None), each against the version
        the screen showed; a failed save keeps the text and says why."""
        wanted = [n for n in (self.pending.names() if names is None else names)
                  if n in self.pending.text and n not in self.pending.conflicts]
        if not wanted:  # nothing read again either: the screen still shows the version it showed
            return SaveResult()
        saved: list[str] = []
        conflicts: list[str] = []
        failed: list[str] = []
        redraw = False
        for name in wanted:
            expansion = self._expansion(name)
            fills = expansion or {name: self.raw(name)}
            redraw = redraw or expansion is not None
            outcome = self._save_one(name, fills)
            if outcome == "saved":
                saved.append(name)
                self.pending.done(name)
            elif outcome == "conflict":
                conflicts.append(name)
            elif outcome == "failed":
                failed.append(name)
            redraw = redraw or outcome == "merged"
            if outcome == "merged":
                saved.append(name)
                self.pending.done(name)
        before = self.version
        self.reload()
        redraw = redraw or bool(conflicts) or bool(failed) or self.version != before
        return SaveResult(tuple(saved), tuple(conflicts), redraw, tuple(failed))

    def _save_one(self, name: str, fills: dict[str, str]) -> str:
        """Save one typed field (or what its shorthand stands for): `saved`, `merged` (the circuit
        had changed elsewhere, not this field: saved over the new version), `conflict` or `failed`."""
        merged = False
        for field, text in fills.items():
            for _attempt in range(2):
                try:
                    result = self.store.circuits.set_field(self.circuit_id, field, text, by=self.by,
                                                           expected_version=self.version)
                except ConflictError:
                    fresh = self.store.circuits.get(self.circuit_id)
                    theirs = (fresh["fields"].get(field) or {}).get("raw") or ""
                    base = self.stored(field)
                    if field == name:
                        base = self.pending.base.get(name, base)
                    if theirs not in (base, text):
                        self.circuit = fresh
                        self._conflict(name, fresh, theirs)
                        return "conflict"
                    self.version = int(fresh["version"])
                    merged = True
                    continue
                except StoreError as exc:
                    self._save_errors[name] = f"Not saved ({exc}); your text is kept"
                    self.pending.hold(name)
                    return "failed"
                self.version = int(result["version"])
                break
        self._save_errors.pop(name, None)
        return "merged" if merged else "saved"

    def _conflict(self, name: str, fresh: dict[str, Any], theirs: str) -> None:
        who = "someone"
        if fresh.get("updated_by") is not None:
            try:
                who = str(self.store.people.get(int(fresh["updated_by"]))["name"])
            except StoreError:
                who = "someone"
        self.pending.conflicts[name] = Conflict(name, self.raw(name), theirs, who,
                                                _local_time(fresh.get("updated_at")))

    def keep_mine(self, name: str) -> SaveResult:
        """Settle a conflict for the typed text: saved over the other save."""
        if self.pending.conflicts.pop(name, None) is None:
            return SaveResult()
        self.reload()
        self.pending.base[name] = self.stored(name)
        result = self.save([name])
        return SaveResult(result.saved, result.conflicts, True, result.failed)

    def take_theirs(self, name: str) -> SaveResult:
        """Settle a conflict for the other save: the typed text is given up."""
        if self.pending.conflicts.pop(name, None) is None:
            return SaveResult()
        self.pending.done(name)
        self.reload()
        return SaveResult((), (), True)

    @property
    def unsaved(self) -> bool:
        """Whether any typed text is not saved yet."""
        return bool(self.pending.names())

    # going on

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

    def open_conflicts(self) -> list[str]:
        """Fields changed elsewhere while typed here, waiting for a choice."""
        return [f"{label_for(name)} was changed elsewhere: choose which to keep"
                for name in self.pending.conflicts]

    def blocking(self) -> list[str]:
        """Why the walk cannot go on from this step; empty when next is allowed.

        Optional readings never block: a bad optional value is shown at its field and left out.
        """
        return self.missing() + self.invalid() + self.open_conflicts()

    def can_next(self) -> bool:
        """True when the current step's required fields are filled and valid."""
        return self.step != STEPS[-1] and not self.blocking()

    def can_back(self) -> bool:
        """True everywhere but the first step."""
        return self.step != STEPS[0]

    def next(self) -> str:
        """Save what was typed and move on one step when allowed; returns the step now shown."""
        self.save()
        if self.can_next():
            self.step = STEPS[STEPS.index(self.step) + 1]
        return self.step

    def back(self) -> str:
        """Save what was typed and go back one step; returns the step now shown."""
        self.save()
        if self.can_back():
            self.step = STEPS[STEPS.index(self.step) - 1]
        return self.step

    def results(self) -> ResultsPanel:
        """The results panel of the circuit as saved."""
        return results_panel(self.circuit, self.store.circuits.calc_input(self.circuit_id))
