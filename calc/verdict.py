"""The circuit verdict from its checks, the one primary cause an electrician reads first (with its
remedies and the checks that follow from it), and plausibility notes on valid but unusual readings."""

from __future__ import annotations

from typing import Any, NamedTuple

from calc.checks import FAIL, NOT_SHOWN, OUTCOME_WORDS, PASS, Check, overall
from calc.inputs import CircuitInput
from calc.numbers import fmt

PRIORITY = (
    "polarity",
    "insulation",
    "disconnection",
    "touch-voltage",
    "earth-path",
    "breaking-capacity",
    "line-withstand-min",
    "line-withstand-max",
    "cpc",
    "cpc-minimum-size",
    "continuity",
    "ring",
    "rcd-time",
    "rcd-button",
)
"""Which failing check is named first: dangers that make the other readings meaningless first, then
disconnection (the conductor checks follow from it)."""
OPEN_PRIORITY = (
    "disconnection",
    "earth-path",
    "touch-voltage",
    "line-withstand-min",
    "line-withstand-max",
    "cpc",
    "cpc-minimum-size",
    "breaking-capacity",
    "insulation",
    "continuity",
    "ring",
    "polarity",
    "rcd-time",
    "rcd-button",
)
"""Which check not shown is named first when none fails: the fault-current chain the electrician is
working through before the records still to be made."""

REMEDIES: dict[str, tuple[str, ...]] = {
    "disconnection": (
        "lower Zs: check connections, a larger or shorter cable",
        "add an RCD for fault protection (IEC 60364-4-41 411.4.5)",
        "a device that clears this fault current in time (another curve or rating)",
    ),
    "touch-voltage": ("lower the earth electrode resistance RA", "an RCD of lower IΔn"),
    "earth-path": (
        "find why Zs is well below Ze + (R1+R2): remeasure R1+R2 and Ze",
        "make the circuit's own protective conductor meet the limit alone",
    ),
    "breaking-capacity": (
        "a device with a breaking capacity at least the PFC",
        "confirm back-up protection by a device upstream (maker's data)",
    ),
    "line-withstand-min": (
        "a larger line conductor",
        "a faster device at this current (lower rating or curve, or an energy-limiting device)",
    ),
    "line-withstand-max": (
        "an energy-limiting device whose let-through I²t the conductor withstands",
        "a larger line conductor",
    ),
    "cpc": ("a larger protective conductor", "a faster device at the earth fault current (or an RCD)"),
    "cpc-minimum-size": ("a larger separate protective conductor, or mechanical protection",),
    "insulation": ("find and clear the insulation fault before energising",),
    "polarity": ("correct the connections: single-pole devices in the line conductor only",),
    "continuity": ("find the break or high-resistance joint in the protective conductor",),
    "ring": ("find the break or interconnection in the ring",),
    "rcd-time": ("replace the RCD, or have it checked",),
    "rcd-button": ("replace the RCD",),
}


class PrimaryCause(NamedTuple):
    """The check named first, what it found, what would remedy it, and the checks that follow from it."""

    check: str
    outcome: str
    text: str
    remedies: tuple[str, ...]
    follows: tuple[str, ...]

    def to_dict(self) -> dict[str, Any]:
        return {
            "check": self.check,
            "outcome": self.outcome,
            "text": self.text,
            "remedies": list(self.remedies),
            "follows": list(self.follows),
        }


_FAILING_RANK = {check_id: rank for rank, check_id in enumerate(PRIORITY)}
_OPEN_RANK = {check_id: rank for rank, check_id in enumerate(OPEN_PRIORITY)}


def _rank(check: Check, ranks: dict[str, int] = _FAILING_RANK) -> int:
    return ranks.get(check.id, len(ranks))


def primary_cause(checks: tuple[Check, ...]) -> PrimaryCause | None:
    """The first failing check by priority (or, with none failing, the first not shown that does not
    follow from another); None when every check passes."""
    verdict = overall(checks)
    if verdict not in (FAIL, NOT_SHOWN):
        return None
    wanted = FAIL if verdict == FAIL else NOT_SHOWN
    candidates = [c for c in checks if c.outcome == wanted and c.follows_from is None]
    if not candidates:
        candidates = [c for c in checks if c.outcome == wanted]
    ranks = _FAILING_RANK if wanted == FAIL else _OPEN_RANK
    first = min(candidates, key=lambda c: _rank(c, ranks))
    follows = tuple(c.id for c in checks if c.follows_from == first.id)
    text = f"{first.title}: {first.why}" if first.why else first.title
    if first.outcome == NOT_SHOWN and first.needs:
        text += f" — to decide: {first.needs}"
    remedies = REMEDIES.get(first.id, ()) if first.outcome == FAIL else ()
    return PrimaryCause(first.id, first.outcome, text, remedies, follows)


def reasons(checks: tuple[Check, ...]) -> tuple[str, ...]:
    """ "title: outcome" for every check that does not pass, primary-ordered."""
    undecided_or_failing = [c for c in checks if c.outcome != PASS]
    return tuple(f"{c.title}: {OUTCOME_WORDS[c.outcome]}" for c in sorted(undecided_or_failing, key=_rank))


PLAUSIBLE_FAULT_CURRENT_A = 100e3
"""Common practice: a fault current above 100 kA at a low-voltage final board deserves a second look."""
PLAUSIBLE_TN_ZS_OHM = 200.0
"""Common practice: a TN loop impedance above 200 Ω points to an open protective conductor or a misread."""


def plausibility(inp: CircuitInput, if_a: float | None, isc_a: float | None) -> tuple[str, ...]:
    """Notes on readings that are valid but unusual (they change no outcome)."""
    notes = []
    for name, current in (("If", if_a), ("Isc", isc_a), ("PFC", inp.supply.pfc_a)):
        if current is not None and current > PLAUSIBLE_FAULT_CURRENT_A:
            notes.append(f"{name} {fmt(current)} A is above 100 kA: check the reading and its unit")
    zs = inp.readings.zs_ohm
    if inp.supply.system != "TT" and zs is not None and zs > PLAUSIBLE_TN_ZS_OHM:
        notes.append(
            f"Zs {fmt(zs)} Ω is above 200 Ω on a TN system: check the protective conductor and the reading"
        )
    return tuple(notes)
