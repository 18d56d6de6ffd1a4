"""Limits the walk checks against: maximum disconnection times and RCD break times."""

from __future__ import annotations

from functools import lru_cache
from typing import NamedTuple

from calc import tables


class TimeLimit(NamedTuple):
    """A maximum disconnection time and the rule it comes from."""

    time_s: float | None
    rule: str


@lru_cache(maxsize=256)
def max_disconnection_time(
    system: str, u0_v: float, role: str, rating_a: float | None, final_circuit_max_a: float
) -> TimeLimit:
    """Maximum disconnection time by system, U0 and circuit role.

    IEC 60364-4-41 Table 41.1 for final circuits up to `final_circuit_max_a` (32 A by default; some
    national rules extend it to 63 A); 411.3.2.3 (TN, 5 s) and 411.3.2.4 (TT, 1 s) for distribution
    circuits and larger final circuits. A final circuit of unknown rating takes Table 41.1.
    """
    data = tables.load("disconnection_times")
    column = "tt_s" if system == "TT" else "tn_s"
    earthing = "TT" if system == "TT" else "TN"
    in_table = role == "final" and (rating_a is None or rating_a <= final_circuit_max_a)
    if not in_table:
        clause = "411.3.2.4" if system == "TT" else "411.3.2.3"
        why = (
            "distribution circuit"
            if role == "distribution"
            else f"final circuit above {final_circuit_max_a:g} A"
        )
        return TimeLimit(data["other_circuits"][column], f"IEC 60364-4-41 {clause}, {earthing}, {why}")
    lower = data["u0_min_v"]
    for band in data["band"]:
        if u0_v <= band["u0_max_v"]:
            return TimeLimit(
                band[column],
                f"IEC 60364-4-41 Table 41.1, {earthing}, {lower:g} V < U0 ≤ {band['u0_max_v']:g} V",
            )
        lower = band["u0_max_v"]
    return TimeLimit(None, "IEC 60364-4-41 Table 41.1 does not cover this U0")


def rcd_break_time_s(rcd_type: str, residual_current_a: float, idn_a: float) -> float | None:
    """Maximum break time of an RCD at a residual current, or None below IΔn.

    IEC 61008-1 / IEC 61009-1 Table 1: the time for the largest tabulated multiple of IΔn that the
    current reaches.
    """
    row = tables.load("rcd")[rcd_type]
    multiple = residual_current_a / idn_a
    best: float | None = None
    for m, t in zip(row["multiples"], row["max_time_s"], strict=True):
        if multiple >= m:
            best = t
    return best


def rcd_multiple_for_time(rcd_type: str, time_s: float) -> float | None:
    """The smallest tabulated multiple of IΔn at which an RCD is certain to break within `time_s`, or
    None (IEC 61008-1 / IEC 61009-1 Table 1)."""
    row = tables.load("rcd")[rcd_type]
    for multiple, limit in zip(row["multiples"], row["max_time_s"], strict=True):
        if limit <= time_s:
            return float(multiple)
    return None


def touch_voltage_limit_v() -> float:
    """Conventional touch voltage limit for TT with an RCD, IEC 60364-4-41 411.5.3 (50 V)."""
    return float(tables.load("rcd")["touch_voltage_limit_v"])
