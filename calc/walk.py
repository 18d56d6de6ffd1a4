"""The walk for one circuit, step by step: loop impedance, fault currents, device times, disconnection
and the temperature view of the measurement. Conductor checks are in `conductors.py`."""

from __future__ import annotations

from typing import NamedTuple

from calc.devices import BEYOND_CURVE, Device, OperatingTime
from calc.formulas import fault_current_a, max_loop_impedance_ohm, touch_voltage_v
from calc.inputs import CircuitInput
from calc.limits import TimeLimit, rcd_break_time_s, touch_voltage_limit_v
from calc.steps import CHECK, INCOMPLETE, INFO, Step, StepThunk, fmt, verdict_of

ZS_AGREEMENT_OHM = 0.05
ZS_AGREEMENT_FRACTION = 0.10
"""Common practice: Zs and Ze + (R1+R2) that differ by more than this deserve a second look."""


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
    """The earth fault loop impedance used for the walk and where it came from."""

    zs_ohm: float | None
    source: str
    ze_ohm: float | None


def loop_impedance(inp: CircuitInput) -> tuple[Loop, StepThunk]:
    """Zs as measured, or Ze + (R1+R2) when Zs was not measured; a flag when the two disagree."""
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
                INCOMPLETE,
                "measure Zs, or Ze and R1+R2, to go on",
            )
        summed = parts[0] + parts[1]
        return Loop(summed, "Ze + (R1+R2)", ze), lambda: Step(
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
    tolerance = max(ZS_AGREEMENT_OHM, ZS_AGREEMENT_FRACTION * measured)
    large = abs(difference) > tolerance
    note = (
        (
            lambda: (
                f"Zs and Ze + (R1+R2) differ by {fmt(abs(difference))} Ω, more than "
                f"{fmt(tolerance)} Ω (common practice): check the readings and connections"
            )
        )
        if large
        else (lambda: "Zs and Ze + (R1+R2) agree within the common-practice tolerance")
    )
    return Loop(measured, "measured", ze), lambda: Step(
        "zs",
        title,
        "Zs measured; compared with Ze + (R1+R2)",
        f"Zs = {fmt(measured)} Ω; Ze + (R1+R2) = {fmt(parts[0])} + {fmt(parts[1])} = {fmt(summed)} Ω; "
        f"difference {fmt(difference)} Ω",
        measured,
        "Ω",
        CHECK if large else INFO,
        note(),
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
            step_id, title, formula, f"{loop} not available", None, "A", INCOMPLETE, missing
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
        INFO if limit.time_s is not None else INCOMPLETE,
        limit.rule,
    )


def device_time_step(
    step_id: str, title: str, device: Device, symbol: str, current_a: float | None
) -> tuple[OperatingTime | None, StepThunk]:
    """The device's operating time (an upper bound) at a fault current, as a step."""
    formula = f"t = device time at {symbol} ({device.label})"
    if current_a is None:
        return None, lambda: Step(
            step_id, title, formula, f"{symbol} not available", None, "s", INCOMPLETE, ""
        )
    op = device.time_at(current_a)
    if op.time_s is None:
        verdict = INCOMPLETE if op.status == BEYOND_CURVE else INFO
        shown = "beyond the data entered" if op.status == BEYOND_CURVE else "not known to operate"
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
            "rcd-time", "RCD break time", formula(), "If not available", None, "s", INCOMPLETE, ""
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
        "IEC 61008-1 / IEC 61009-1 Table 1 (from memory)",
    )


def zs_max_step(inp: CircuitInput, device: Device, limit: TimeLimit) -> tuple[float | None, StepThunk]:
    """Maximum Zs for the required time, Zs = U0 · Cmin / Ia (IEC 60364-4-41 411.4.4)."""
    formula = "Zs max = U0 · Cmin / Ia"
    if limit.time_s is None:
        return None, lambda: Step(
            "zs-max", "Maximum Zs", formula, "no required time", None, "Ω", INCOMPLETE, ""
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


def disconnection_step(
    limit: TimeLimit, device_op: OperatingTime | None, rcd_time_s: float | None, fault_a: float | None
) -> tuple[bool | None, float | None, StepThunk]:
    """Is the fault cleared within the maximum time? IEC 60364-4-41 411.3.2 and 411.4.4."""
    formula = "t (device or RCD) ≤ t max"
    title = "Disconnection"
    if fault_a is None or limit.time_s is None:
        return (
            None,
            None,
            lambda: Step("disconnection", title, formula, "not enough to decide", None, "s", INCOMPLETE, ""),
        )
    candidates = [t for t in (device_op.time_s if device_op else None, rcd_time_s) if t is not None]
    if not candidates:
        beyond = device_op is not None and device_op.status == BEYOND_CURVE
        return (
            (None if beyond else False),
            None,
            lambda: Step(
                "disconnection",
                title,
                formula,
                f"at {fmt(fault_a)} A the device is not known to operate",
                None,
                "s",
                INCOMPLETE if beyond else "fail",
                "add curve points for this current" if beyond else "the fault would not be cleared",
            ),
        )
    time_s = min(candidates)
    by = (
        "RCD"
        if rcd_time_s is not None
        and time_s == rcd_time_s
        and (device_op is None or device_op.time_s is None or rcd_time_s < device_op.time_s)
        else "device"
    )
    ok = time_s <= limit.time_s
    return (
        ok,
        time_s,
        lambda: Step(
            "disconnection",
            title,
            formula,
            f"{fmt(time_s)} s ({by}) {'≤' if ok else '>'} {fmt(limit.time_s)} s",
            time_s,
            "s",
            verdict_of(ok),
            f"margin {fmt(limit.time_s - time_s)} s" if ok else f"too slow by {fmt(time_s - limit.time_s)} s",
        ),
    )


def ra_step(inp: CircuitInput, zs_ohm: float | None) -> tuple[bool | None, float | None, StepThunk | None]:
    """TT with an RCD: RA · IΔn ≤ 50 V (IEC 60364-4-41 411.5.3), with Zs as an upper bound of RA."""
    if inp.supply.system != "TT" or inp.rcd is None:
        return None, None, None
    formula = "RA · IΔn ≤ 50 V"
    limit_v = touch_voltage_limit_v()
    if zs_ohm is None:
        return (
            None,
            None,
            lambda: Step("ra", "Touch voltage (TT)", formula, "no Zs", None, "V", INCOMPLETE, ""),
        )
    volts = touch_voltage_v(zs_ohm, inp.rcd.idn_a)
    ok = volts <= limit_v
    return (
        ok,
        volts,
        lambda: Step(
            "ra",
            "Touch voltage (TT)",
            formula,
            f"{fmt(zs_ohm)} × {fmt(inp.rcd.idn_a)} = {fmt(volts)} V {'≤' if ok else '>'} {fmt(limit_v)} V",
            volts,
            "V",
            verdict_of(ok),
            f"Zs used as an upper bound of RA; RA ≤ {fmt(limit_v / inp.rcd.idn_a)} Ω at this IΔn",
        ),
    )
