"""Automatic disconnection in case of an earth fault (IEC 60364-4-41 411.3.2, 411.4.4), judged on the
loop impedance at the conductors' operating temperature; the circuit's own earth path where a parallel
path is suspected; and the touch voltage of a TT installation protected by an RCD (411.5.3)."""

from __future__ import annotations

from typing import NamedTuple

from calc import tables
from calc.checks import FAIL, NOT_SHOWN, PASS, Check, judged
from calc.devices import OUTSIDE_DATA, OperatingTime
from calc.formulas import max_loop_impedance_ohm, resistance_ratio, touch_voltage_v
from calc.inputs import CircuitInput, Conductor
from calc.kvalues import KValue, beta_c, operating_temperature_c
from calc.limits import TimeLimit, rcd_multiple_for_time, touch_voltage_limit_v
from calc.numbers import fmt
from calc.steps import Step, StepThunk
from calc.walk import Loop

RULE_OF_THUMB_FACTOR = 0.8
"""Published national guidance (a rule of thumb for a Zs measured at ambient temperature): a reading at
or below 0.8 × the tabulated maximum is enough to show the limit is met when the conductors are at their
operating temperature. It is a sufficient check only: a reading above it is not a failure."""
SOURCE = "IEC 60364-4-41 411.3.2, 411.4.4, Table 41.1"


class LoopLimit(NamedTuple):
    """The largest earth fault loop impedance at which the fault is still cleared in time, by the
    overcurrent device or, where it has one, the circuit's RCD (whichever allows more)."""

    ohm: float
    by: str
    device_ohm: float | None
    rcd_ohm: float | None


def loop_limit(inp: CircuitInput, zs_max: float | None, limit: TimeLimit) -> LoopLimit | None:
    """The device's Zs max and the RCD's: U0 · Cmin / (m · IΔn), m the smallest multiple of IΔn at which
    the RCD is certain to break within the time (IEC 61008-1 / IEC 61009-1 Table 1)."""
    rcd_ohm = None
    if inp.rcd is not None and limit.time_s is not None:
        multiple = rcd_multiple_for_time(inp.rcd.type, limit.time_s)
        if multiple is not None:
            rcd_ohm = max_loop_impedance_ohm(inp.supply.u0_v, inp.supply.cmin, multiple * inp.rcd.idn_a)
    if zs_max is None and rcd_ohm is None:
        return None
    if rcd_ohm is not None and (zs_max is None or rcd_ohm > zs_max):
        return LoopLimit(rcd_ohm, "RCD", zs_max, rcd_ohm)
    assert zs_max is not None
    return LoopLimit(zs_max, "device", zs_max, rcd_ohm)


class HotLoop(NamedTuple):
    """A loop impedance taken from the test temperature to the conductors' operating temperature."""

    ohm: float
    factor: float
    part_ohm: float
    ze_ohm: float | None
    theta_line_c: float
    theta_cpc_c: float


def _share_of_line(line: Conductor, cpc: Conductor) -> float:
    """The line conductor's share of R1+R2 from resistivity and size (same length; IEC 60364-5-54
    Table A.54.1 resistivities)."""
    materials = tables.load("materials")
    r_line = materials[line.material]["rho20_ohm_mm"] / line.csa_mm2
    r_cpc = materials[cpc.material]["rho20_ohm_mm"] / cpc.csa_mm2
    return r_line / (r_line + r_cpc)


def hot_loop(inp: CircuitInput, z_ohm: float, ze_ohm: float | None, k_cpc: KValue, test_c: float) -> HotLoop:
    """Zs at operating temperature from Zs at the test temperature θt (the conductors' temperature
    during the test).

    The circuit part (Zs − Ze, or the whole loop when Ze is not known, which errs safe) is scaled by
    each conductor's own resistance ratio (β + θop)/(β + θt) (IEC 60228 Annex B), weighted by its share
    of R1+R2. θop of the line conductor is its insulation's maximum operating temperature (IEC
    60364-4-43 Table 43A); of the protective conductor the initial temperature of its k table (IEC
    60364-5-54 Tables A.54.2–A.54.4).
    """
    theta_line = operating_temperature_c(inp.line.insulation)
    theta_cpc = k_cpc.theta_i_c
    share = _share_of_line(inp.line, inp.cpc)
    factor = share * resistance_ratio(beta_c(inp.line.material), test_c, theta_line) + (
        1.0 - share
    ) * resistance_ratio(beta_c(inp.cpc.material), test_c, theta_cpc)
    if ze_ohm is not None and ze_ohm < z_ohm:
        part = z_ohm - ze_ohm
        return HotLoop(ze_ohm + part * factor, factor, part, ze_ohm, theta_line, theta_cpc)
    return HotLoop(z_ohm * factor, factor, z_ohm, None, theta_line, theta_cpc)


class LoopJudgement(NamedTuple):
    """A loop impedance held against the loop limit, hot where the test temperature is known, by the
    0.8 rule of thumb otherwise."""

    outcome: str
    figure: float
    limit: float
    hot: HotLoop | None
    rule_ohm: float


def judge_loop(
    inp: CircuitInput, z_ohm: float, ze_ohm: float | None, lim: LoopLimit, k_cpc: KValue
) -> LoopJudgement:
    """At the test temperature the reading must meet the limit; at operating temperature it decides
    (pass or fail) when θt is known, and the 0.8 rule shows a pass otherwise (else not shown)."""
    rule = RULE_OF_THUMB_FACTOR * lim.ohm
    test_c = inp.readings.test_temp_c
    if z_ohm > lim.ohm:
        return LoopJudgement(FAIL, z_ohm, lim.ohm, None, rule)
    if test_c is not None:
        hot = hot_loop(inp, z_ohm, ze_ohm, k_cpc, test_c)
        return LoopJudgement(judged(hot.ohm <= lim.ohm), hot.ohm, lim.ohm, hot, rule)
    if z_ohm <= rule:
        return LoopJudgement(PASS, z_ohm, rule, None, rule)
    return LoopJudgement(NOT_SHOWN, z_ohm, rule, None, rule)


class Disconnection(NamedTuple):
    """The disconnection check and the figures the headline reports."""

    check: Check
    clearing_time_s: float | None
    cleared_by: str
    lim: LoopLimit | None
    judgement: LoopJudgement | None


def _clearing(op: OperatingTime | None, rcd_time_s: float | None) -> tuple[float | None, str]:
    device_time = op.time_s if op is not None else None
    if rcd_time_s is not None and (device_time is None or rcd_time_s < device_time):
        return rcd_time_s, "RCD"
    return device_time, "device"


def disconnection(
    inp: CircuitInput,
    loop: Loop,
    if_a: float | None,
    limit: TimeLimit,
    op: OperatingTime | None,
    rcd_time_s: float | None,
    zs_max: float | None,
    k_cpc: KValue,
) -> tuple[Disconnection, StepThunk]:
    """Is the earth fault cleared within the maximum time, with the conductors at their operating
    temperature? (IEC 60364-4-41 411.3.2, 411.4.4: Zs · Ia ≤ U0, with Cmin.)"""
    title = "Disconnection"
    zs = loop.zs_ohm

    def result(
        check: Check,
        clearing: float | None = None,
        by: str = "",
        lim: LoopLimit | None = None,
        judgement: LoopJudgement | None = None,
    ) -> tuple[Disconnection, StepThunk]:
        return Disconnection(check, clearing, by, lim, judgement), lambda: _step(check, judgement, lim, inp)

    if zs is None or if_a is None:
        return result(
            Check(
                "disconnection",
                title,
                NOT_SHOWN,
                needs="measure Zs, or Ze and R1+R2",
                why="no loop impedance",
                source=SOURCE,
            )
        )
    if limit.time_s is None:
        return result(
            Check(
                "disconnection",
                title,
                NOT_SHOWN,
                needs="a U0 that Table 41.1 covers",
                why=limit.rule,
                source=SOURCE,
            )
        )
    lim = loop_limit(inp, zs_max, limit)
    clearing, by = _clearing(op, rcd_time_s)
    if clearing is None and op is not None and op.status in OUTSIDE_DATA:
        return result(
            Check(
                "disconnection",
                title,
                NOT_SHOWN,
                current_a=if_a,
                why=op.note,
                needs=lambda: f"add points around {fmt(if_a)} A from the maker's chart",
                source=SOURCE,
            ),
            lim=lim,
        )
    if clearing is None or clearing > limit.time_s:
        check = Check(
            "disconnection",
            title,
            FAIL,
            zs if lim else clearing,
            lim.ohm if lim else limit.time_s,
            "Ω" if lim else "s",
            why=lambda: _not_cleared_why(zs, if_a, clearing, by, limit, lim),
            source=SOURCE,
            current_a=if_a,
            time_s=clearing,
        )
        return result(check, clearing, by, lim)
    assert lim is not None
    judgement = judge_loop(inp, zs, loop.ze_ohm, lim, k_cpc)
    check = Check(
        "disconnection",
        title,
        judgement.outcome,
        judgement.figure,
        judgement.limit,
        "Ω",
        why=lambda: _loop_why(judgement, lim, "Zs"),
        needs=(lambda: _test_temperature_needed(zs, lim, judgement))
        if judgement.outcome == NOT_SHOWN
        else "",
        source=SOURCE,
        current_a=if_a,
        time_s=clearing,
    )
    return result(check, clearing, by, lim, judgement)


def _test_temperature_needed(zs: float, lim: LoopLimit, judgement: LoopJudgement) -> str:
    return (
        f"enter the test temperature to decide: Zs {fmt(zs)} Ω is within the {fmt(lim.ohm)} Ω allowed but "
        f"above 0.8 × {fmt(lim.ohm)} = {fmt(judgement.rule_ohm)} Ω"
    )


def _not_cleared_why(
    zs: float, if_a: float, clearing: float | None, by: str, limit: TimeLimit, lim: LoopLimit | None
) -> str:
    if clearing is None:
        why = f"at If = {fmt(if_a)} A the device is not known to operate: the fault would not be cleared"
    else:
        why = f"cleared in up to {fmt(clearing)} s ({by}), more than the {fmt(limit.time_s or 0.0)} s allowed"
    if lim is not None:
        why = f"Zs {fmt(zs)} Ω is above the {fmt(lim.ohm)} Ω allowed; " + why
    return why


def _loop_why(judgement: LoopJudgement, lim: LoopLimit, name: str) -> str:
    limit_name = "Zs max" if lim.by == "device" else "the RCD's limit"
    if judgement.hot is not None:
        sign = "≤" if judgement.outcome == PASS else ">"
        return (
            f"{name} at operating temperature {fmt(judgement.figure)} Ω {sign} {limit_name} {fmt(lim.ohm)} Ω"
        )
    if judgement.outcome == FAIL:
        return f"{name} {fmt(judgement.figure)} Ω > {limit_name} {fmt(lim.ohm)} Ω"
    sign = "≤" if judgement.outcome == PASS else ">"
    return (
        f"{name} {fmt(judgement.figure)} Ω {sign} 0.8 × {limit_name} = {fmt(judgement.rule_ohm)} Ω "
        "(rule of thumb: sufficient only)"
    )


def _step(check: Check, judgement: LoopJudgement | None, lim: LoopLimit | None, inp: CircuitInput) -> Step:
    lines = [check.why]
    if lim is not None and lim.rcd_ohm is not None:
        lines.append(f"RCD limit U0 · Cmin / (m · IΔn) = {fmt(lim.rcd_ohm)} Ω")
    if judgement is not None and judgement.hot is not None:
        hot = judgement.hot
        base = f"{fmt(hot.ze_ohm)} + {fmt(hot.part_ohm)}" if hot.ze_ohm is not None else fmt(hot.part_ohm)
        lines.append(
            f"θt {fmt(inp.readings.test_temp_c or 0.0)} °C (conductors at the test) → θop "
            f"{fmt(hot.theta_line_c)} °C line, {fmt(hot.theta_cpc_c)} °C protective conductor: "
            f"{base} × {fmt(hot.factor)} = "
            f"{fmt(hot.ohm)} Ω"
        )
    note = check.needs or check.source
    if judgement is not None and judgement.hot is None and judgement.outcome == PASS:
        note = "0.8 × Zs max: published guidance for a Zs measured at ambient; " + check.source
    if judgement is not None and judgement.hot is not None:
        note = (
            "each conductor's own β (IEC 60228 Annex B), share of R1+R2 by resistivity and size; "
            + check.source
        )
    return Step(
        "disconnection",
        check.title,
        "Zs (at operating temperature) ≤ Zs max; t (device or RCD) ≤ t max",
        "; ".join(lines),
        check.figure,
        check.unit,
        check.outcome,
        note,
    )


def earth_path(
    inp: CircuitInput, loop: Loop, lim: LoopLimit | None, k_cpc: KValue
) -> tuple[Check | None, StepThunk | None]:
    """Where a measured Zs is well below Ze + (R1+R2), part of the fault current may take a parallel
    path that will not always be there: the circuit's own path must meet the limit by itself (published
    guidance; the tolerance is common practice)."""
    if loop.comparison != "below" or loop.expected_ohm is None or lim is None:
        return None, None
    own = loop.expected_ohm
    judgement = judge_loop(inp, own, loop.ze_ohm, lim, k_cpc)
    title = "Circuit's own earth path"
    if judgement.outcome == PASS:
        check = Check(
            "earth-path",
            title,
            PASS,
            judgement.figure,
            judgement.limit,
            "Ω",
            why=lambda: (
                _loop_why(judgement, lim, "Ze + (R1+R2)") + ": the circuit's own path meets the "
                "limit without the parallel path"
            ),
            source=SOURCE,
        )
    else:
        check = Check(
            "earth-path",
            title,
            NOT_SHOWN,
            judgement.figure,
            judgement.limit,
            "Ω",
            why=lambda: _loop_why(judgement, lim, "Ze + (R1+R2)"),
            needs=lambda: (
                f"resolve the difference between Zs {fmt(loop.zs_ohm or 0.0)} Ω and Ze + (R1+R2) "
                f"{fmt(own)} Ω: without the parallel path the circuit's own path does not meet the limit"
            ),
            source=SOURCE,
        )
    return check, lambda: Step(
        "earth-path",
        title,
        "Ze + (R1+R2) ≤ Zs max (at operating temperature)",
        check.why,
        check.figure,
        "Ω",
        check.outcome,
        check.needs or "a parallel earth path may not always be there",
    )


def touch_voltage(inp: CircuitInput, loop: Loop) -> tuple[Check | None, StepThunk | None]:
    """TT with an RCD: RA · IΔn ≤ 50 V (IEC 60364-4-41 411.5.3), with Zs an upper bound of RA."""
    if inp.supply.system != "TT" or inp.rcd is None:
        return None, None
    title = "Touch voltage (TT)"
    formula = "RA · IΔn ≤ 50 V"
    limit_v = touch_voltage_limit_v()
    source = "IEC 60364-4-41 411.5.3"
    ra = inp.supply.ra_ohm
    resistance = ra if ra is not None else loop.zs_ohm
    if resistance is None:
        check = Check("touch-voltage", title, NOT_SHOWN, needs="enter RA, or measure Zs", source=source)
        return check, lambda: Step(
            "touch-voltage", title, formula, "no RA, no Zs", None, "V", NOT_SHOWN, check.needs
        )
    volts = touch_voltage_v(resistance, inp.rcd.idn_a)
    ok = volts <= limit_v
    name = "RA" if ra is not None else "Zs"
    idn_a = inp.rcd.idn_a

    def why() -> str:
        sign = "≤" if ok else ">"
        return f"{name} {fmt(resistance or 0.0)} Ω × {fmt(idn_a)} A = {fmt(volts)} V {sign} {fmt(limit_v)} V"

    check = Check("touch-voltage", title, judged(ok), volts, limit_v, "V", why=why, source=source)
    used = "RA as measured" if ra is not None else "Zs used as an upper bound of RA"
    return check, lambda: Step(
        "touch-voltage",
        title,
        formula,
        check.why,
        volts,
        "V",
        check.outcome,
        f"{used}; RA ≤ {fmt(limit_v / idn_a)} Ω at this IΔn",
    )
