"""Conductor checks of the walk: k values, line conductor withstand (adiabatic), protective conductor
by proportion, by the adiabatic minimum size and by the minimum sizes for a separate conductor."""

from __future__ import annotations

from typing import NamedTuple

from calc.devices import BEYOND_CURVE, UPPER_BOUND, Device, OperatingTime
from calc.errors import InputError
from calc.formulas import (
    adiabatic_energy_limit_a2s,
    adiabatic_min_csa_from_energy_mm2,
    adiabatic_min_csa_mm2,
    adiabatic_withstand_time_s,
    proportional_cpc_csa_mm2,
)
from calc.inputs import CircuitInput
from calc.kvalues import KValue, k_line, k_protective
from calc.steps import CHECK, FAIL, INCOMPLETE, INFO, PASS, Step, StepThunk, fmt, verdict_of

ADIABATIC_MIN_TIME_S = 0.1
ADIABATIC_MAX_TIME_S = 5.0
"""IEC 60364-4-43 434.5.2: t = (kS/I)² holds from 0.1 s to 5 s; below 0.1 s compare I²t with k²S²."""
SEPARATE_MIN_MM2 = {"copper": (2.5, 4.0), "aluminium": (16.0, 16.0)}
"""IEC 60364-5-54 543.1.3: a protective conductor not part of a cable, with / without mechanical
protection."""
_EPS = 1e-9


def k_values(inp: CircuitInput) -> tuple[KValue, KValue, list[StepThunk]]:
    """k of the line and of the protective conductor, from the tables, as steps."""
    line = k_line(inp.line.material, inp.line.insulation, inp.line.csa_mm2)
    cpc = k_protective(inp.cpc.material, inp.cpc.arrangement or "in-cable", inp.cpc.insulation)
    if cpc is None:
        raise InputError(
            "circuit.cpc.arrangement",
            f"no tabulated k for {inp.cpc.material} as {inp.cpc.arrangement} of a {inp.cpc.insulation} cable",
        )
    steps = [
        lambda: Step(
            "k-line",
            "k of the line conductor",
            "k from the table",
            f"{inp.line.material}, {inp.line.insulation}, {fmt(line.theta_i_c)} → "
            f"{fmt(line.theta_f_c)} °C: k = {fmt(line.k)}",
            line.k,
            "A·s½/mm²",
            INFO,
            line.source,
        ),
        lambda: Step(
            "k-cpc",
            "k of the protective conductor",
            "k from the table",
            f"{inp.cpc.material}, {inp.cpc.arrangement}, {fmt(cpc.theta_i_c)} → {fmt(cpc.theta_f_c)} °C: "
            f"k = {fmt(cpc.k)}",
            cpc.k,
            "A·s½/mm²",
            INFO,
            cpc.source + (" (value from memory)" if cpc.from_memory else ""),
        ),
    ]
    return line, cpc, steps


def _fast(op: OperatingTime) -> bool:
    return op.time_s is not None and op.time_s <= ADIABATIC_MIN_TIME_S + _EPS


class LineWithstand(NamedTuple):
    """Result of the line conductor check."""

    current_a: float | None
    withstand_time_s: float | None
    device_time_s: float | None
    ok: bool | None


def line_withstand(
    inp: CircuitInput,
    device: Device,
    k: KValue,
    isc_a: float | None,
    if_a: float | None,
    rcd_time_s: float | None = None,
) -> tuple[LineWithstand, list[StepThunk]]:
    """Line conductor withstand, t = (kS/I)² against the device time (IEC 60364-4-43 434.5.2).

    Checked at Isc when Zsc was measured; otherwise at the earth fault current If, which an RCD also
    clears, so there the faster of the device and the RCD counts.
    """
    current = isc_a if isc_a is not None else if_a
    symbol = "Isc" if isc_a is not None else "If"
    s = inp.line.csa_mm2
    title = "Line conductor withstand"
    formula = f"t = (k · S / {symbol})² ≥ device time"
    if current is None:
        return LineWithstand(None, None, None, None), [
            lambda: Step(
                "line-withstand",
                title,
                formula,
                "no fault current",
                None,
                "s",
                INCOMPLETE,
                "measure Zsc or Zs",
            )
        ]
    op = device.time_at(current)
    if isc_a is None and rcd_time_s is not None and (op.time_s is None or rcd_time_s < op.time_s):
        op = OperatingTime(rcd_time_s, UPPER_BOUND, "the earth fault is cleared by the RCD first")
    op_time = op.time_s
    note_current = "" if isc_a is not None else "Zsc not measured: checked at the earth fault current; "
    withstand = adiabatic_withstand_time_s(k.k, s, current)
    energy = adiabatic_energy_limit_a2s(k.k, s)
    if op_time is None:
        ok: bool | None = None if op.status == BEYOND_CURVE else False
        mode = "none"
    elif _fast(op) and inp.let_through_a2s is not None:
        ok, mode = inp.let_through_a2s <= energy, "energy"
    elif _fast(op):
        ok, mode = withstand >= ADIABATIC_MIN_TIME_S, "fast"
    else:
        ok, mode = withstand + _EPS >= op_time, "time"

    def time_step() -> Step:
        bound = "< " if op.status == "instantaneous" else "≤ "
        shown = f"t {bound}{fmt(op_time)} s" if op_time is not None else "not known to operate"
        return Step(
            "device-time-at-short-circuit",
            f"Device time at {symbol}",
            f"t = device time at {symbol}",
            f"at {fmt(current)} A: {shown}",
            op_time,
            "s",
            INCOMPLETE if op.status == BEYOND_CURVE else INFO,
            op.note,
        )

    def check_step() -> Step:
        base = f"t = ({fmt(k.k)} × {fmt(s)} / {fmt(current)})² = {fmt(withstand)} s"
        sign = "≥" if ok else "<"
        if mode == "none":
            return Step(
                "line-withstand",
                title,
                formula,
                base + "; the device is not known to clear this current",
                withstand,
                "s",
                verdict_of(ok),
                note_current + op.note,
            )
        if mode == "energy":
            let_through = inp.let_through_a2s or 0.0
            return Step(
                "line-withstand",
                title,
                "I²t (device) ≤ k² · S²",
                f"k²S² = ({fmt(k.k)} × {fmt(s)})² = {fmt(energy)} A²s; let-through "
                f"{fmt(let_through)} A²s {'≤' if ok else '>'} {fmt(energy)} A²s",
                energy,
                "A²s",
                verdict_of(ok),
                note_current + "device clears in under 0.1 s: let-through energy "
                "from the maker compared (IEC 60364-4-43 434.5.2)",
            )
        if mode == "fast":
            return Step(
                "line-withstand",
                title,
                formula,
                f"{base} {sign} 0.1 s",
                withstand,
                "s",
                verdict_of(ok),
                note_current + "device clears in under 0.1 s: 0.1 s used; enter "
                "the maker's let-through I²t for the energy check",
            )
        device_s = op_time or 0.0
        note = note_current + (
            f"margin {fmt(withstand - device_s)} s" if ok else f"short by {fmt(device_s - withstand)} s"
        )
        if device_s > ADIABATIC_MAX_TIME_S:
            note += "; beyond 5 s the adiabatic method no longer applies (IEC 60364-4-43 434.5.2)"
        return Step(
            "line-withstand",
            title,
            formula,
            f"{base} {sign} {fmt(device_s)} s",
            withstand,
            "s",
            verdict_of(ok),
            note,
        )

    return LineWithstand(current, withstand, op_time, ok), [time_step, check_step]


class CpcResult(NamedTuple):
    """Result of the protective conductor checks."""

    proportional_min_mm2: float
    by_rule: bool
    min_csa_mm2: float | None
    adiabatic_ok: bool | None
    separate_ok: bool | None
    ok: bool | None


def _separate_step(inp: CircuitInput) -> tuple[bool | None, StepThunk | None]:
    if inp.cpc.arrangement != "separate":
        return None, None
    sizes = SEPARATE_MIN_MM2.get(inp.cpc.material)
    s = inp.cpc.csa_mm2
    if sizes is None:
        return None, lambda: Step(
            "cpc-separate",
            "Separate protective conductor",
            "minimum size",
            f"no minimum tabulated here for {inp.cpc.material}",
            None,
            "mm²",
            INFO,
            "",
        )
    protected, unprotected = sizes
    if s + _EPS >= unprotected:
        ok, verdict, note = True, PASS, "meets the size without mechanical protection"
    elif s + _EPS >= protected:
        ok, verdict, note = True, CHECK, "acceptable only with mechanical protection"
    else:
        ok, verdict, note = False, FAIL, "below the minimum size"
    return ok, lambda: Step(
        "cpc-separate",
        "Separate protective conductor",
        f"S ≥ {fmt(protected)} mm² protected, ≥ {fmt(unprotected)} mm² unprotected",
        f"S = {fmt(s)} mm²",
        s,
        "mm²",
        verdict,
        note + " (IEC 60364-5-54 543.1.3)",
    )


def protective_conductor(
    inp: CircuitInput,
    k_l: KValue,
    k_p: KValue,
    if_a: float | None,
    disconnection_time_s: float | None,
    op: OperatingTime | None,
) -> tuple[CpcResult, list[StepThunk]]:
    """Protective conductor: Table 54.2 proportion, adiabatic minimum S = √(I²t)/k (543.1.2) at the
    earth fault current and the disconnection time, and the minimum sizes of a separate conductor."""
    s = inp.cpc.csa_mm2
    same = inp.cpc.material == inp.line.material
    rule_min = proportional_cpc_csa_mm2(
        inp.line.csa_mm2, k_l.k if not same else 1.0, k_p.k if not same else 1.0
    )
    by_rule = s + _EPS >= rule_min
    steps: list[StepThunk] = [
        lambda: Step(
            "cpc-proportional",
            "Protective conductor by proportion",
            "S ≤ 16 → S; 16 < S ≤ 35 → 16; S > 35 → S/2" + ("" if same else ", × k1/k2"),
            f"line {fmt(inp.line.csa_mm2)} mm²"
            f"{'' if same else f' × k1/k2 = × {fmt(k_l.k)}/{fmt(k_p.k)}'} → at least {fmt(rule_min)} mm²; "
            f"CPC {fmt(s)} mm²",
            rule_min,
            "mm²",
            PASS if by_rule else INFO,
            "IEC 60364-5-54 Table 54.2" + ("" if by_rule else "; not met: the adiabatic check decides"),
        )
    ]
    min_csa, adiabatic_ok = _adiabatic(inp, k_p, if_a, disconnection_time_s, op, steps, by_rule)
    separate_ok, separate_step = _separate_step(inp)
    if separate_step is not None:
        steps.append(separate_step)
    if by_rule or adiabatic_ok:
        ok: bool | None = separate_ok is not False
    elif adiabatic_ok is None:
        ok = None
    else:
        ok = False
    steps.append(
        lambda: Step(
            "cpc",
            "Protective conductor",
            "proportion or adiabatic, and minimum size",
            f"proportion {'met' if by_rule else 'not met'}; adiabatic "
            f"{ {True: 'met', False: 'not met', None: 'not decided'}[adiabatic_ok] }",
            s,
            "mm²",
            verdict_of(ok),
            "IEC 60364-5-54 543.1",
        )
    )
    return CpcResult(rule_min, by_rule, min_csa, adiabatic_ok, separate_ok, ok), steps


def _adiabatic(
    inp: CircuitInput,
    k: KValue,
    if_a: float | None,
    time_s: float | None,
    op: OperatingTime | None,
    steps: list[StepThunk],
    by_rule: bool,
) -> tuple[float | None, bool | None]:
    s = inp.cpc.csa_mm2
    title = "Protective conductor, adiabatic"
    if if_a is None or time_s is None:
        steps.append(
            lambda: Step(
                "cpc-adiabatic",
                title,
                "S = √(If² · t) / k",
                "no fault current or no clearing time",
                None,
                "mm²",
                INCOMPLETE,
                "not known to clear" if if_a is not None else "",
            )
        )
        return None, None
    let_through = inp.let_through_a2s
    use_energy = (
        time_s <= ADIABATIC_MIN_TIME_S + _EPS and op is not None and _fast(op) and let_through is not None
    )
    used = max(time_s, ADIABATIC_MIN_TIME_S)
    if use_energy and let_through is not None:
        min_csa = adiabatic_min_csa_from_energy_mm2(let_through, k.k)
    else:
        min_csa = adiabatic_min_csa_mm2(if_a, used, k.k)
    ok = s + _EPS >= min_csa

    def step() -> Step:
        note = "IEC 60364-5-54 543.1.2"
        if use_energy:
            formula = "S = √(I²t let-through) / k"
            working = f"S = √{fmt(let_through or 0.0)} / {fmt(k.k)} = {fmt(min_csa)} mm²"
            note += "; device clears in under 0.1 s: maker's let-through energy used"
        else:
            formula = "S = √(If² · t) / k"
            working = f"S = √({fmt(if_a)}² × {fmt(used)}) / {fmt(k.k)} = {fmt(min_csa)} mm²"
            if used != time_s:
                note += "; clears in under 0.1 s: 0.1 s used (enter the maker's let-through I²t)"
            if used > ADIABATIC_MAX_TIME_S:
                note += "; beyond 5 s the adiabatic method no longer applies"
        if not ok and by_rule:
            note += "; not met, but the proportion is"
        return Step(
            "cpc-adiabatic",
            title,
            formula,
            f"{working}; CPC {fmt(s)} mm² {'≥' if ok else '<'} {fmt(min_csa)} mm²",
            min_csa,
            "mm²",
            PASS if ok else (INFO if by_rule else FAIL),
            note,
        )

    steps.append(step)
    return min_csa, ok
