"""The walk for one circuit, step by step: the supply, the loop impedance, fault currents, the maximum
disconnection time, device and RCD times and the maximum Zs. The checks built on them are in
`disconnection.py`, `conductors.py`, `capacity.py` and `circuit_test_checks.py`."""

from __future__ import annotations

from typing import NamedTuple

from calc.devices import OUTSIDE_DATA, Device, OperatingTime
from calc.formulas import fault_current_a, max_loop_impedance_ohm
from calc.inputs import CircuitInput
from calc.limits import TimeLimit, rcd_break_time_s
from calc.numbers import fmt
from calc.steps import INFO, NOT_SHOWN, Step, StepThunk

ZS_AGREEMENT_OHM = 0.05
ZS_AGREEMENT_FRACTION = 0.10
"""Common practice: a measured Zs that differs from the expected Ze + (R1+R2) by more than the larger of
0.05 Ω and 10 % of that expected value deserves a second look (published guidance says a Zs well below
it points to parallel earth paths). The tolerance is set on the expected value, so a bad reading does
not widen its own tolerance."""


def system_step(inp: CircuitInput) -> StepThunk:
    """The supply as the first step (written out when read)."""
    return lambda: _system_step(inp)


def _system_step(inp: CircuitInput) -> Step:
    s = inp.supply
    extra = []
    if s.ze_ohm is not None:
        extra.append(f"Ze {fmt(s.ze_ohm)} Ω")
    if s.pfc_a is not None:
        extra.append(f"prospective fault current {fmt(s.pfc_a)} A")
    working = f"{s.system}, U0 = {fmt(s.u0_v)} V, Cmin = {fmt(s.cmin)}"
    if extra:
        working += " (origin: " + ", ".join(extra) + ")"
    return Step(
        "supply",
        "Supply",
        "system, U0, Cmin",
        working,
        s.u0_v,
        "V",
        INFO,
        "Cmin: minimum voltage factor, IEC 60909-0 Table 1",
    )


class Loop(NamedTuple):
    """The earth fault loop impedance used for the walk, where it came from, Ze, and Ze + (R1+R2)
    with how the measured Zs compares with it ("below", "above", "agrees" or "" when not compared)."""

    zs_ohm: float | None
    source: str
    ze_ohm: float | None
    expected_ohm: float | None = None
    comparison: str = ""


def agreement_tolerance_ohm(expected_ohm: float) -> float:
    """How far a measured Zs may sit from Ze + (R1+R2) before it deserves a look (common practice)."""
    return max(ZS_AGREEMENT_OHM, ZS_AGREEMENT_FRACTION * expected_ohm)


def loop_impedance(inp: CircuitInput) -> tuple[Loop, StepThunk]:
    """Zs as measured, or Ze + (R1+R2) when Zs was not measured; compared with Ze + (R1+R2) when both
    are known, with the tolerance set on the expected value (common practice)."""
    r = inp.readings
    ze = r.ze_ohm if r.ze_ohm is not None else inp.supply.ze_ohm
    parts = (ze, r.r1r2_ohm) if ze is not None and r.r1r2_ohm is not None else None
    title = "Earth fault loop impedance"
    zs = r.zs_ohm
    if zs is None:
        if parts is None:
            return Loop(None, "", ze), lambda: Step(
                "zs",
                title,
                "Zs measured, or Ze + (R1+R2)",
                "no Zs, and no Ze with R1+R2",
                None,
                "Ω",
                NOT_SHOWN,
                "measure Zs, or Ze and R1+R2, to go on",
            )
        summed = parts[0] + parts[1]
        return Loop(summed, "Ze + (R1+R2)", ze, summed), lambda: Step(
            "zs",
            title,
            "Zs = Ze + (R1+R2)",
            f"Zs = {fmt(parts[0])} + {fmt(parts[1])} = {fmt(summed)} Ω",
            summed,
            "Ω",
            INFO,
            "Zs not measured: taken from Ze and R1+R2",
        )
    measured = zs
    if parts is None:
        return Loop(measured, "measured", ze), lambda: Step(
            "zs", title, "Zs measured", f"Zs = {fmt(measured)} Ω (measured)", measured, "Ω", INFO, ""
        )
    summed = parts[0] + parts[1]
    difference = measured - summed
    tolerance = agreement_tolerance_ohm(summed)
    comparison = "below" if difference < -tolerance else "above" if difference > tolerance else "agrees"
    notes = {
        "below": "Zs is well below Ze + (R1+R2): part of the fault current may take a parallel earth "
        "path that will not always be there (the circuit's own path is checked below)",
        "above": "Zs is well above Ze + (R1+R2): check the readings and the connections (the measured, "
        "higher Zs is used)",
        "agrees": "Zs and Ze + (R1+R2) agree",
    }
    return Loop(measured, "measured", ze, summed, comparison), lambda: Step(
        "zs",
        title,
        "Zs measured; compared with Ze + (R1+R2)",
        f"Zs = {fmt(measured)} Ω; Ze + (R1+R2) = {fmt(parts[0])} + {fmt(parts[1])} = {fmt(summed)} Ω; "
        f"difference {fmt(difference)} Ω, tolerance ±{fmt(tolerance)} Ω",
        measured,
        "Ω",
        INFO,
        notes[comparison] + " (tolerance: common practice)",
    )


def fault_current_step(
    step_id: str,
    title: str,
    symbol: str,
    loop: str,
    u0_v: float,
    cmin: float,
    z_ohm: float | None,
    missing: str,
) -> tuple[float | None, StepThunk]:
    """I = U0 · Cmin / Z as a step (IEC 60364-4-41 411.4.4; Cmin from IEC 60909-0 Table 1)."""
    formula = f"{symbol} = U0 · Cmin / {loop}"
    if z_ohm is None:
        return None, lambda: Step(
            step_id, title, formula, f"{loop} not available", None, "A", NOT_SHOWN, missing
        )
    current = fault_current_a(u0_v, cmin, z_ohm)
    return current, lambda: Step(
        step_id,
        title,
        formula,
        f"{symbol} = {fmt(u0_v)} × {fmt(cmin)} / {fmt(z_ohm)} = {fmt(current)} A",
        current,
        "A",
        INFO,
        "",
    )


def limit_step(limit: TimeLimit) -> StepThunk:
    """The maximum disconnection time as a step."""
    return lambda: Step(
        "max-disconnection-time",
        "Maximum disconnection time",
        "by system, U0 and circuit",
        f"{fmt(limit.time_s)} s" if limit.time_s is not None else "no tabulated time",
        limit.time_s,
        "s",
        INFO if limit.time_s is not None else NOT_SHOWN,
        limit.rule,
    )


def device_time_step(
    step_id: str, title: str, device: Device, symbol: str, current_a: float | None
) -> tuple[OperatingTime | None, StepThunk]:
    """The device's operating time (an upper bound) at a fault current, as a step."""
    formula = f"t = device time at {symbol} ({device.label})"
    if current_a is None:
        return None, lambda: Step(
            step_id, title, formula, f"{symbol} not available", None, "s", NOT_SHOWN, ""
        )
    op = device.time_at(current_a)
    if op.time_s is None:
        verdict = NOT_SHOWN if op.status in OUTSIDE_DATA else INFO
        shown = "outside the data entered" if op.status in OUTSIDE_DATA else "not known to operate"
        return op, lambda: Step(
            step_id, title, formula, f"at {fmt(current_a)} A: {shown}", None, "s", verdict, op.note
        )
    bound = "< " if op.status == "instantaneous" else "≤ "
    return op, lambda: Step(
        step_id,
        title,
        formula,
        f"at {fmt(current_a)} A: t {bound}{fmt(op.time_s)} s",
        op.time_s,
        "s",
        INFO,
        op.note,
    )


def rcd_step(inp: CircuitInput, fault_a: float | None) -> tuple[float | None, StepThunk | None]:
    """The RCD's maximum break time at the earth fault current (IEC 61008-1/61009-1 Table 1)."""
    rcd = inp.rcd
    if rcd is None:
        return None, None

    def formula() -> str:
        return f"t = RCD break time at If (IΔn {fmt(rcd.idn_a * 1000)} mA, type {rcd.type})"

    if fault_a is None:
        return None, lambda: Step(
            "rcd-time", "RCD break time", formula(), "If not available", None, "s", NOT_SHOWN, ""
        )
    time_s = rcd_break_time_s(rcd.type, fault_a, rcd.idn_a)
    multiple = fault_a / rcd.idn_a
    return time_s, lambda: Step(
        "rcd-time",
        "RCD break time",
        formula(),
        f"If = {fmt(multiple)} × IΔn: t ≤ {fmt(time_s)} s" if time_s is not None else "If is below IΔn",
        time_s,
        "s",
        INFO,
        "IEC 61008-1 / IEC 61009-1 Table 1",
    )


def zs_max_step(inp: CircuitInput, device: Device, limit: TimeLimit) -> tuple[float | None, StepThunk]:
    """Maximum Zs for the required time, Zs = U0 · Cmin / Ia (IEC 60364-4-41 411.4.4)."""
    formula = "Zs max = U0 · Cmin / Ia"
    if limit.time_s is None:
        return None, lambda: Step(
            "zs-max", "Maximum Zs", formula, "no required time", None, "Ω", NOT_SHOWN, ""
        )
    ia = device.current_for_time(limit.time_s)
    if ia is None:
        return None, lambda: Step(
            "zs-max",
            "Maximum Zs",
            formula,
            f"{device.label} is not shown to clear within {fmt(limit.time_s)} s at any current",
            None,
            "Ω",
            INFO,
            "disconnection must come from an RCD",
        )
    zs_max = max_loop_impedance_ohm(inp.supply.u0_v, inp.supply.cmin, ia)
    return zs_max, lambda: Step(
        "zs-max",
        "Maximum Zs",
        formula,
        f"Ia = {fmt(ia)} A for {fmt(limit.time_s)} s; Zs max = {fmt(inp.supply.u0_v)} × "
        f"{fmt(inp.supply.cmin)} / {fmt(ia)} = {fmt(zs_max)} Ω",
        zs_max,
        "Ω",
        INFO,
        f"Ia: current at which {device.label} is certain to clear within {fmt(limit.time_s)} s",
    )
