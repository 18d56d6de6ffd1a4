"""The device's rated short-circuit breaking capacity against the prospective fault current where it is
installed (IEC 60364-4-43 434.5.1)."""

from __future__ import annotations

from calc.checks import NOT_SHOWN, Check, judged
from calc.inputs import CircuitInput
from calc.numbers import fmt
from calc.steps import Step, StepThunk

SOURCE = "IEC 60364-4-43 434.5.1"


def breaking_capacity(inp: CircuitInput) -> tuple[Check, StepThunk]:
    """Rated breaking capacity ≥ the prospective fault current at the board; not shown without both."""
    title = "Breaking capacity"
    rated = inp.device.breaking_capacity_a
    pfc = inp.supply.pfc_a
    if pfc is None:
        check = Check(
            "breaking-capacity",
            title,
            NOT_SHOWN,
            rated,
            None,
            "A",
            False,
            "the prospective fault current at the board is not known",
            "enter the prospective fault current (PFC) at the board",
            SOURCE,
        )
    elif rated is None:
        check = Check(
            "breaking-capacity",
            title,
            NOT_SHOWN,
            None,
            pfc,
            "A",
            False,
            lambda: f"PFC {fmt(pfc)} A; the device's rated breaking capacity is not known",
            "enter the device's rated breaking capacity (marked on it, e.g. 6 kA)",
            SOURCE,
            None,
            pfc,
        )
    else:
        ok = rated >= pfc
        check = Check(
            "breaking-capacity",
            title,
            judged(ok),
            rated,
            pfc,
            "A",
            False,
            lambda: _rated_against_pfc(rated, pfc, ok),
            "",
            SOURCE,
            None,
            pfc,
        )
    return check, lambda: Step(
        "breaking-capacity",
        title,
        "rated breaking capacity ≥ PFC at the board",
        check.why,
        check.figure,
        "A",
        check.outcome,
        check.needs or SOURCE,
    )


def _rated_against_pfc(rated: float, pfc: float, ok: bool) -> str:
    words = f"rated {fmt(rated)} A {'≥' if ok else '<'} PFC {fmt(pfc)} A"
    if ok:
        return words
    return (
        words + ": fit a device rated for the PFC, or confirm a device upstream protects it (back-up "
        "protection)"
    )
