"""`assess`: one circuit's input to its complete assessment, with the working shown step by step."""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property
from typing import Any

from calc.conductors import k_values, line_withstand, protective_conductor
from calc.devices import make_device
from calc.inputs import CircuitInput, read_input
from calc.limits import max_disconnection_time
from calc.margin import margin_steps
from calc.steps import CAUTIONS, FAIL, INCOMPLETE, PASS, Step, StepThunk
from calc.version import __version__
from calc.walk import (
    device_time_step,
    disconnection_step,
    fault_current_step,
    limit_step,
    loop_impedance,
    ra_step,
    rcd_step,
    system_step,
    zs_max_step,
)


@dataclass(frozen=True)
class Assessment:
    """A circuit's assessment: the headline figures, the verdicts and the steps in walk order."""

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
    zs_limit_at_test_temp_ohm: float | None
    zs_rule_of_thumb_ohm: float | None
    zs_margin_ok: bool | None
    disconnection_ok: bool | None
    touch_voltage_v: float | None
    touch_voltage_ok: bool | None
    k_line: float
    k_cpc: float
    line_withstand_time_s: float | None
    line_withstand_ok: bool | None
    cpc_proportional_min_mm2: float
    cpc_min_csa_mm2: float | None
    cpc_by_proportional_rule: bool
    cpc_adiabatic_ok: bool | None
    cpc_ok: bool | None
    verdict: str
    reasons: tuple[str, ...]
    step_thunks: tuple[StepThunk, ...] = field(repr=False, compare=False)

    @cached_property
    def steps(self) -> tuple[Step, ...]:
        """The steps in walk order, each with its formula, working, value, unit and verdict."""
        return tuple(thunk() for thunk in self.step_thunks)

    def to_dict(self) -> dict[str, Any]:
        """The assessment as JSON-ready data (the calc command line's output)."""
        out: dict[str, Any] = {
            "calc_version": __version__,
            "verdict": self.verdict,
            "reasons": list(self.reasons),
        }
        for name in _HEADLINE:
            out[name] = getattr(self, name)
        out["steps"] = [step.to_dict() for step in self.steps]
        out["cautions"] = list(CAUTIONS)
        out["inputs"] = self.inputs.to_dict()
        return out


_HEADLINE = (
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
    "zs_limit_at_test_temp_ohm",
    "zs_rule_of_thumb_ohm",
    "zs_margin_ok",
    "disconnection_ok",
    "touch_voltage_v",
    "touch_voltage_ok",
    "k_line",
    "k_cpc",
    "line_withstand_time_s",
    "line_withstand_ok",
    "cpc_proportional_min_mm2",
    "cpc_min_csa_mm2",
    "cpc_by_proportional_rule",
    "cpc_adiabatic_ok",
    "cpc_ok",
)


def _overall(checks: dict[str, bool | None]) -> tuple[str, tuple[str, ...]]:
    failed = tuple(f"{name}: fail" for name, ok in checks.items() if ok is False)
    if failed:
        return FAIL, failed
    missing = tuple(f"{name}: not decided" for name, ok in checks.items() if ok is None)
    if missing:
        return INCOMPLETE, missing
    return PASS, ()


def assess(data: dict[str, Any]) -> Assessment:
    """Assess one circuit given as the calc JSON shape; raises InputError naming a bad field.

    The walk: supply, Zs, If and Isc (IEC 60364-4-41 411.4.4), maximum disconnection time (Table 41.1),
    device and RCD times, maximum Zs, disconnection, TT touch voltage (411.5.3), the limit at the test
    temperature, k values (IEC 60364-4-43 Table 43A, IEC 60364-5-54 Annex A), line withstand (434.5.2),
    protective conductor (IEC 60364-5-54 543.1, Table 54.2).
    """
    return assess_input(read_input(data))


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
        "Short-circuit current",
        "Isc",
        "Zsc",
        s.u0_v,
        s.cmin,
        inp.readings.zsc_ohm,
        "Zsc not measured: the line check uses If",
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
    disc_ok, disc_time, disc_step = disconnection_step(limit, op, rcd_time, if_a)
    steps.append(disc_step)
    ra_ok, ra_v, ra_s = ra_step(inp, loop.zs_ohm)
    if ra_s is not None:
        steps.append(ra_s)
    device_alone = (
        op is not None and op.time_s is not None and limit.time_s is not None and op.time_s <= limit.time_s
    )
    margin, m_steps = margin_steps(inp, loop, zs_max, deciding=inp.rcd is None or device_alone)
    steps += m_steps
    k_l, k_p, k_steps = k_values(inp)
    steps += k_steps
    line, line_steps = line_withstand(inp, device, k_l, isc_a, if_a, rcd_time)
    steps += line_steps
    cpc, cpc_steps = protective_conductor(inp, k_l, k_p, if_a, disc_time, op)
    steps += cpc_steps
    checks = {"disconnection": disc_ok, "line conductor": line.ok, "protective conductor": cpc.ok}
    if ra_s is not None:
        checks["touch voltage"] = ra_ok
    if m_steps and margin.ok is not None:
        checks["Zs margin"] = margin.ok
    verdict, reasons = _overall(checks)
    steps.append(
        lambda: Step(
            "verdict",
            "Verdict",
            "all checks",
            "; ".join(
                f"{name} {'—' if ok is None else ('pass' if ok else 'fail')}" for name, ok in checks.items()
            ),
            verdict,
            "",
            verdict,
            "; ".join(reasons),
        )
    )
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
        disconnection_time_s=disc_time,
        device_time_at_short_circuit_s=line.device_time_s if isc_a is not None else None,
        zs_max_ohm=zs_max,
        zs_limit_at_test_temp_ohm=margin.limit_at_test_ohm,
        zs_rule_of_thumb_ohm=margin.rule_of_thumb_ohm,
        zs_margin_ok=margin.ok,
        disconnection_ok=disc_ok,
        touch_voltage_v=ra_v,
        touch_voltage_ok=ra_ok,
        k_line=k_l.k,
        k_cpc=k_p.k,
        line_withstand_time_s=line.withstand_time_s,
        line_withstand_ok=line.ok,
        cpc_proportional_min_mm2=cpc.proportional_min_mm2,
        cpc_min_csa_mm2=cpc.min_csa_mm2,
        cpc_by_proportional_rule=cpc.by_rule,
        cpc_adiabatic_ok=cpc.adiabatic_ok,
        cpc_ok=cpc.ok,
        verdict=verdict,
        reasons=reasons,
        step_thunks=tuple(steps),
    )
