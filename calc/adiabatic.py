"""The adiabatic method and its range: a conductor's thermal withstand at one fault current, judged on
the time (or the let-through energy) that actually clears it.

IEC 60364-4-43 434.5.2: t = (k · S / I)² holds for durations from 0.1 s to 5 s. Below 0.1 s the bound
(kS/I)² ≥ 0.1 s is sufficient only; where it fails, the maker's let-through I²t at (or above) the
prospective current decides, I²t ≤ k²S². Beyond 5 s the method does not apply, and no conductor size is
derived from it.
"""

from __future__ import annotations

import math
from typing import NamedTuple

from calc.checks import NOT_SHOWN, PASS, Text, judged
from calc.devices import OUTSIDE_DATA, OperatingTime
from calc.formulas import adiabatic_energy_limit_a2s, adiabatic_withstand_time_s
from calc.inputs import LetThrough
from calc.numbers import fmt

MIN_TIME_S = 0.1
MAX_TIME_S = 5.0
"""IEC 60364-4-43 434.5.2: the range of durations the adiabatic formula covers."""
_EPS = 1e-9

TIME = "time"
BOUND = "bound"
ENERGY = "energy"
OUTSIDE = "outside"


class Withstand(NamedTuple):
    """A conductor against one fault current: outcome, the mode that decided it, the figure and limit.

    Modes: `time` (withstand time against the clearing time, 0.1–5 s), `bound` (withstand time against
    0.1 s for a device clearing faster), `energy` (let-through I²t against k²S²), `outside` (no time in
    the method's range: not shown).
    """

    outcome: str
    mode: str
    current_a: float
    clearing_s: float | None
    withstand_s: float
    energy_limit_a2s: float
    figure: float | None
    limit: float | None
    unit: str
    at_most: bool
    why: Text
    needs: Text


def let_through_applies(let_through: LetThrough | None, current_a: float) -> bool:
    """A maker's let-through figure bounds the energy at currents up to the one it is stated at."""
    return (
        let_through is not None
        and let_through.at_current_a is not None
        and let_through.at_current_a + _EPS >= current_a
    )


def let_through_needs(let_through: LetThrough | None, current_a: float) -> str:
    """What to enter so that a let-through figure decides at `current_a`."""
    if let_through is None:
        return f"enter the maker's let-through I²t at {fmt(current_a)} A or above"
    if let_through.at_current_a is None:
        return "record the prospective current the maker states the let-through I²t at"
    return (
        f"the let-through I²t is stated at {fmt(let_through.at_current_a)} A, below the {fmt(current_a)} A "
        "of this check: enter the maker's figure at this current or above"
    )


def withstand(
    k: float, csa_mm2: float, current_a: float, op: OperatingTime | None, let_through: LetThrough | None
) -> Withstand:
    """The conductor (k, S) at `current_a`, cleared as `op` says (an upper bound of the clearing time)."""
    withstand_s = adiabatic_withstand_time_s(k, csa_mm2, current_a)
    energy = adiabatic_energy_limit_a2s(k, csa_mm2)
    clearing = op.time_s if op is not None else None

    def make(
        outcome: str,
        mode: str,
        figure: float | None,
        limit: float | None,
        unit: str,
        at_most: bool,
        why: Text,
        needs: Text = "",
    ) -> Withstand:
        return Withstand(
            outcome, mode, current_a, clearing, withstand_s, energy, figure, limit, unit, at_most, why, needs
        )

    if clearing is None:
        if op is not None and op.status in OUTSIDE_DATA:
            return make(
                NOT_SHOWN,
                OUTSIDE,
                None,
                None,
                "s",
                False,
                op.note,
                lambda: f"add points around {fmt(current_a)} A from the maker's chart",
            )
        return make(
            NOT_SHOWN,
            OUTSIDE,
            None,
            None,
            "s",
            False,
            lambda: f"the device is not known to operate at {fmt(current_a)} A",
        )
    if clearing > MAX_TIME_S + _EPS:
        return make(
            NOT_SHOWN,
            OUTSIDE,
            None,
            None,
            "s",
            False,
            lambda: (
                f"the device is only certain to clear {fmt(current_a)} A within {fmt(clearing or 0.0)} s, "
                f"beyond the adiabatic method's {fmt(MAX_TIME_S)} s (IEC 60364-4-43 434.5.2)"
            ),
            "a lower loop impedance, or the maker's curve showing a faster time",
        )
    if clearing > MIN_TIME_S + _EPS:
        ok = withstand_s + _EPS >= clearing
        return make(
            judged(ok),
            TIME,
            withstand_s,
            clearing,
            "s",
            False,
            lambda: (
                f"withstands {fmt(withstand_s)} s {'≥' if ok else '<'} cleared within "
                f"{fmt(clearing or 0.0)} s"
            ),
        )
    if withstand_s + _EPS >= MIN_TIME_S:
        return make(
            PASS,
            BOUND,
            withstand_s,
            MIN_TIME_S,
            "s",
            False,
            lambda: f"withstands {fmt(withstand_s)} s ≥ 0.1 s, and the device clears within 0.1 s",
        )
    if let_through is not None and let_through_applies(let_through, current_a):
        ok = let_through.energy_a2s <= energy
        return make(
            judged(ok),
            ENERGY,
            let_through.energy_a2s,
            energy,
            "A²s",
            True,
            lambda: (
                f"let-through {fmt(let_through.energy_a2s)} A²s (stated at "
                f"{fmt(let_through.at_current_a or 0.0)} A) {'≤' if ok else '>'} k²S² {fmt(energy)} A²s"
            ),
        )
    return make(
        NOT_SHOWN,
        BOUND,
        withstand_s,
        MIN_TIME_S,
        "s",
        False,
        lambda: f"withstands {fmt(withstand_s)} s < 0.1 s: the bound proves nothing below 0.1 s",
        lambda: let_through_needs(let_through, current_a),
    )


def min_csa_mm2(
    k: float, current_a: float, op: OperatingTime | None, let_through: LetThrough | None
) -> float | None:
    """The smallest conductor the adiabatic method shows adequate (S = √(I²t)/k, IEC 60364-5-54
    543.1.2), or None outside its range; below 0.1 s it uses 0.1 s, or the let-through where that decides."""
    clearing = op.time_s if op is not None else None
    if clearing is None or clearing > MAX_TIME_S + _EPS:
        return None
    if clearing <= MIN_TIME_S + _EPS:
        by_bound = math.sqrt(current_a * current_a * MIN_TIME_S) / k
        if let_through is not None and let_through_applies(let_through, current_a):
            return min(by_bound, math.sqrt(let_through.energy_a2s) / k)
        return by_bound
    return math.sqrt(current_a * current_a * clearing) / k
