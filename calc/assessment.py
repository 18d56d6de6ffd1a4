"""`assess`: one circuit's input to its complete assessment: every check with its outcome (pass, fail,
not shown), the figure that decided it and its limit, the verdict with one primary cause, and the
working shown step by step."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from calc.capacity import breaking_capacity
from calc.checks import FAIL, NOT_SHOWN, PASS, Check, overall
from calc.circuit_test_checks import test_checks
from calc.conductors import Clearing, k_values, line_checks, protective_conductor
from calc.devices import OperatingTime, make_device
from calc.disconnection import disconnection, earth_path, touch_voltage
from calc.inputs import CircuitInput, read_input
from calc.limits import max_disconnection_time
from calc.steps import CAUTIONS, Step, StepThunk
from calc.verdict import PrimaryCause, plausibility, primary_cause, reasons
from calc.version import __version__
from calc.walk import (
    device_time_step,
    fault_current_step,
    limit_step,
    loop_impedance,
    rcd_step,
    system_step,
    zs_max_step,
)


@dataclass(eq=False, slots=True)
class Assessment:
    """A circuit's assessment: the headline figures, the checks, the verdict and the steps in walk order.

    Read-only by convention: it is not a frozen dataclass because setting fifty fields through a frozen
    dataclass's `object.__setattr__` cost more than the rest of the walk (see README, benchmarks); its
    fields are slots, which a plain instance dictionary of fifty keys costs a third more to fill.
    """

    inputs: CircuitInput
    device: str
    zs_ohm: float | None
    zs_source: str
    earth_fault_current_a: float | None
    short_circuit_current_a: float | None
    max_disconnection_time_s: float | None
    device_time_s: float | None
    rcd_time_s: float | None
    disconnection_time_s: float | None
    device_time_at_short_circuit_s: float | None
    zs_max_ohm: float | None
    zs_limit_ohm: float | None
    zs_limit_at_test_temp_ohm: float | None
    zs_at_operating_temp_ohm: float | None
    zs_rule_of_thumb_ohm: float | None
    zs_margin_ok: bool | None
    disconnection_ok: bool | None
    earth_path_ok: bool | None
    touch_voltage_v: float | None
    touch_voltage_ok: bool | None
    breaking_capacity_ok: bool | None
    k_line: float
    k_cpc: float
    line_withstand_time_s: float | None
    line_withstand_ok: bool | None
    line_withstand_max_ok: bool | None
    line_withstand_min_ok: bool | None
    cpc_proportional_min_mm2: float
    cpc_min_csa_mm2: float | None
    cpc_by_proportional_rule: bool
    cpc_adiabatic_ok: bool | None
    cpc_ok: bool | None
    insulation_ok: bool | None
    insulation_min_mohm: float | None
    continuity_ok: bool | None
    expected_r1r2_ohm: float | None
    ring_ok: bool | None
    ring_expected_r1r2_ohm: float | None
    polarity_ok: bool | None
    rcd_time_ok: bool | None
    rcd_time_limit_1x_s: float | None
    rcd_time_limit_5x_s: float | None
    rcd_button_ok: bool | None
    verdict: str
    reasons: tuple[str, ...]
    checks: tuple[Check, ...]
    primary_cause: PrimaryCause | None
    plausibility: tuple[str, ...]
    step_thunks: tuple[StepThunk, ...] = field(repr=False, compare=False)
    _steps: tuple[Step, ...] | None = field(default=None, init=False, repr=False, compare=False)

    @property
    def steps(self) -> tuple[Step, ...]:
        """The steps in walk order, each with its formula, working, value, unit and verdict (written
        when first read)."""
        if self._steps is None:
            self._steps = tuple(thunk() for thunk in self.step_thunks)
        return self._steps

    def to_dict(self) -> dict[str, Any]:
        """The assessment as JSON-ready data (the calc command line's output)."""
        out: dict[str, Any] = {
            "calc_version": __version__,
            "verdict": self.verdict,
            "reasons": list(self.reasons),
            "primary_cause": None if self.primary_cause is None else self.primary_cause.to_dict(),
        }
        for name in HEADLINE:
            out[name] = getattr(self, name)
        out["checks"] = [check.to_dict() for check in self.checks]
        out["plausibility"] = list(self.plausibility)
        out["steps"] = [step.to_dict() for step in self.steps]
        out["cautions"] = list(CAUTIONS)
        out["inputs"] = self.inputs.to_dict()
        return out


HEADLINE = (
    "device",
    "zs_ohm",
    "zs_source",
    "earth_fault_current_a",
    "short_circuit_current_a",
    "max_disconnection_time_s",
    "device_time_s",
    "rcd_time_s",
    "disconnection_time_s",
    "device_time_at_short_circuit_s",
    "zs_max_ohm",
    "zs_limit_ohm",
    "zs_limit_at_test_temp_ohm",
    "zs_at_operating_temp_ohm",
    "zs_rule_of_thumb_ohm",
    "zs_margin_ok",
    "disconnection_ok",
    "earth_path_ok",
    "touch_voltage_v",
    "touch_voltage_ok",
    "breaking_capacity_ok",
    "k_line",
    "k_cpc",
    "line_withstand_time_s",
    "line_withstand_ok",
    "line_withstand_max_ok",
    "line_withstand_min_ok",
    "cpc_proportional_min_mm2",
    "cpc_min_csa_mm2",
    "cpc_by_proportional_rule",
    "cpc_adiabatic_ok",
    "cpc_ok",
    "insulation_ok",
    "insulation_min_mohm",
    "continuity_ok",
    "expected_r1r2_ohm",
    "ring_ok",
    "ring_expected_r1r2_ohm",
    "polarity_ok",
    "rcd_time_ok",
    "rcd_time_limit_1x_s",
    "rcd_time_limit_5x_s",
    "rcd_button_ok",
)
"""The headline keys of the JSON output, in order (`verdict`, `reasons`, `primary_cause`, `checks`,
`plausibility`, `steps`, `cautions` and `inputs` follow)."""


def assess(data: dict[str, Any]) -> Assessment:
    """Assess one circuit given as the calc JSON shape; raises InputError naming a bad field.

    The walk: supply, Zs, If and Isc (IEC 60364-4-41 411.4.4), maximum disconnection time (Table 41.1),
    device and RCD times, maximum Zs, disconnection at operating temperature, the circuit's own earth
    path, TT touch voltage (411.5.3), breaking capacity (IEC 60364-4-43 434.5.1), k values (Table 43A,
    IEC 60364-5-54 Annex A), the line conductor at both ends of its fault-current range (434.5.2), the
    protective conductor (IEC 60364-5-54 543.1, Table 54.2), then the circuit's other tests.
    """
    return assess_input(read_input(data))


def _ok(check: Check | None) -> bool | None:
    return None if check is None else check.ok


def assess_input(inp: CircuitInput) -> Assessment:
    """Assess an already checked input."""
    s = inp.supply
    device = make_device(inp.device)
    steps: list[StepThunk] = [system_step(inp)]
    loop, zs_step = loop_impedance(inp)
    steps.append(zs_step)
    if_a, if_step = fault_current_step(
        "earth-fault-current", "Earth fault current", "If", "Zs", s.u0_v, s.cmin, loop.zs_ohm, "needs Zs"
    )
    isc_a, isc_step = fault_current_step(
        "short-circuit-current",
        "Short-circuit current at the circuit's end",
        "Isc",
        "Zsc",
        s.u0_v,
        s.cmin,
        inp.readings.zsc_ohm,
        "Zsc not measured",
    )
    steps += [if_step, isc_step]
    limit = max_disconnection_time(s.system, s.u0_v, inp.role, inp.device.rating_a, inp.final_circuit_max_a)
    steps.append(limit_step(limit))
    op, op_step = device_time_step("device-time", "Device time at If", device, "If", if_a)
    steps.append(op_step)
    rcd_time, rcd_time_step = rcd_step(inp, if_a)
    if rcd_time_step is not None:
        steps.append(rcd_time_step)
    zs_max, zs_max_s = zs_max_step(inp, device, limit)
    steps.append(zs_max_s)
    k_l, k_p, k_steps = k_values(inp)
    disc, disc_step = disconnection(inp, loop, if_a, limit, op, rcd_time, zs_max, k_p)
    steps.append(disc_step)
    own, own_step = earth_path(inp, loop, disc.lim, k_p)
    touch, touch_step = touch_voltage(inp, loop)
    capacity, capacity_step = breaking_capacity(inp)
    steps += [thunk for thunk in (own_step, touch_step) if thunk is not None]
    steps.append(capacity_step)
    steps += k_steps
    failed = disc.check.outcome == FAIL
    earth = _earth_clearing(op, rcd_time, disc.cleared_by)
    sc_time = device.time_at(isc_a).time_s if isc_a is not None else None
    lines, line_steps = line_checks(inp, device, k_l, if_a, isc_a, earth, failed)
    steps += line_steps
    cpc, cpc_steps = protective_conductor(inp, k_l, k_p, if_a, earth, failed)
    steps += cpc_steps
    others, other_steps = test_checks(inp)
    steps += other_steps
    checks = (
        tuple(
            c
            for c in (disc.check, own, touch, capacity, lines.largest, lines.smallest, cpc.fault, cpc.minimum)
            if c is not None
        )
        + others.checks()
    )
    verdict = overall(checks)
    cause = primary_cause(checks)
    why = reasons(checks)
    steps.append(lambda: _verdict_step(verdict, checks, cause))
    judgement = disc.judgement
    hot = judgement.hot if judgement is not None else None
    limit_at_test = None
    if hot is not None and disc.lim is not None:
        ze = hot.ze_ohm or 0.0
        limit_at_test = ze + (disc.lim.ohm - ze) / hot.factor
    margin_ok = None
    if judgement is not None and judgement.outcome != NOT_SHOWN:
        margin_ok = judgement.outcome == PASS
    return Assessment(
        inputs=inp,
        device=device.label,
        zs_ohm=loop.zs_ohm,
        zs_source=loop.source,
        earth_fault_current_a=if_a,
        short_circuit_current_a=isc_a,
        max_disconnection_time_s=limit.time_s,
        device_time_s=op.time_s if op else None,
        rcd_time_s=rcd_time,
        disconnection_time_s=disc.clearing_time_s,
        device_time_at_short_circuit_s=sc_time,
        zs_max_ohm=zs_max,
        zs_limit_ohm=disc.lim.ohm if disc.lim is not None else None,
        zs_limit_at_test_temp_ohm=limit_at_test,
        zs_at_operating_temp_ohm=hot.ohm if hot is not None else None,
        zs_rule_of_thumb_ohm=judgement.rule_ohm if judgement is not None else None,
        zs_margin_ok=margin_ok,
        disconnection_ok=disc.check.ok,
        earth_path_ok=_ok(own),
        touch_voltage_v=touch.figure if touch is not None else None,
        touch_voltage_ok=_ok(touch),
        breaking_capacity_ok=capacity.ok,
        k_line=k_l.k,
        k_cpc=k_p.k,
        line_withstand_time_s=lines.deciding.withstand_s if lines.deciding is not None else None,
        line_withstand_ok=lines.ok,
        line_withstand_max_ok=lines.largest.ok,
        line_withstand_min_ok=lines.smallest.ok,
        cpc_proportional_min_mm2=cpc.proportional_min_mm2,
        cpc_min_csa_mm2=cpc.min_csa_mm2,
        cpc_by_proportional_rule=cpc.by_rule,
        cpc_adiabatic_ok=cpc.adiabatic_ok,
        cpc_ok=cpc.ok,
        insulation_ok=others.insulation.ok,
        insulation_min_mohm=others.insulation_min_mohm,
        continuity_ok=others.continuity.ok,
        expected_r1r2_ohm=others.expected_r1r2_ohm,
        ring_ok=_ok(others.ring),
        ring_expected_r1r2_ohm=others.ring_expected_r1r2_ohm,
        polarity_ok=others.polarity.ok,
        rcd_time_ok=_ok(others.rcd_time),
        rcd_time_limit_1x_s=others.rcd_time_limit_1x_s,
        rcd_time_limit_5x_s=others.rcd_time_limit_5x_s,
        rcd_button_ok=_ok(others.rcd_button),
        verdict=verdict,
        reasons=why,
        checks=checks,
        primary_cause=cause,
        plausibility=plausibility(inp, if_a, isc_a),
        step_thunks=tuple(steps),
    )


def _earth_clearing(op: OperatingTime | None, rcd_time_s: float | None, by: str) -> Clearing | None:
    """How the earth fault is actually cleared: by the RCD where it is faster, else by the device."""
    if by == "RCD" and rcd_time_s is not None:
        return Clearing(
            OperatingTime(rcd_time_s, "upper-bound", "the RCD clears the earth fault first"), "RCD"
        )
    if op is None:
        return None
    return Clearing(op, "device")


def _verdict_step(verdict: str, checks: tuple[Check, ...], cause: PrimaryCause | None) -> Step:
    words = {PASS: "pass", FAIL: "fail", NOT_SHOWN: "not shown"}
    return Step(
        "verdict",
        "Verdict",
        "pass only when every check passes",
        "; ".join(f"{c.title} {words[c.outcome]}" for c in checks),
        verdict,
        "",
        verdict,
        cause.text if cause is not None else "every check passes",
    )


__all__ = ["HEADLINE", "Assessment", "assess", "assess_input"]
