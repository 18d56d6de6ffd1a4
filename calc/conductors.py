"""Conductor checks of the walk: k values, the line conductor at both ends of its fault-current range
(IEC 60364-4-43 434.5.2), and the protective conductor by proportion (IEC 60364-5-54 Table 54.2), by
the adiabatic size at the earth fault current (543.1.2) and by the minimum size of a separate conductor
(543.1.3)."""

from __future__ import annotations

from typing import NamedTuple

from calc import labels, tables
from calc.adiabatic import OUTSIDE, Withstand, min_csa_mm2, withstand
from calc.checks import FAIL, NOT_SHOWN, PASS, Check, judged, text, worse
from calc.devices import Device, OperatingTime
from calc.errors import InputError
from calc.formulas import proportional_cpc_csa_mm2
from calc.inputs import CircuitInput
from calc.kvalues import KValue, k_line, k_protective
from calc.numbers import fmt
from calc.steps import INFO, Step, StepThunk

SEPARATE_MIN_MM2 = {"copper": (2.5, 4.0), "aluminium": (16.0, 16.0)}
"""IEC 60364-5-54 543.1.3: a protective conductor not part of a cable, with / without mechanical
protection."""
LINE_SOURCE = "IEC 60364-4-43 434.5.2"
CPC_SOURCE = "IEC 60364-5-54 543.1"
_EPS = 1e-9


def cpc_table(inp: CircuitInput) -> str:
    """The k table row of the protective conductor: a separate conductor bunched with cables takes the
    row of a core of a cable (IEC 60364-5-54 Table A.54.3), one not bunched Table A.54.2."""
    if inp.cpc.arrangement == "separate" and inp.cpc.bunched:
        return "in-cable"
    return inp.cpc.arrangement or "in-cable"


def k_values(inp: CircuitInput) -> tuple[KValue, KValue, list[StepThunk]]:
    """k of the line and of the protective conductor, from the tables, as steps."""
    line = k_line(inp.line.material, inp.line.insulation, inp.line.csa_mm2)
    arrangement = cpc_table(inp)
    cpc = k_protective(inp.cpc.material, arrangement, inp.cpc.insulation)
    if cpc is None:
        field = "circuit.cpc.bunched" if arrangement != inp.cpc.arrangement else "circuit.cpc.arrangement"
        raise InputError(
            field,
            f"no tabulated k for {inp.cpc.material} {labels.arrangement(inp.cpc, bunched_note=True)} "
            f"with {labels.insulation(inp.cpc.insulation)} insulation",
        )
    steps = [
        lambda: Step(
            "k-line",
            "k of the line conductor",
            "k from the table",
            f"{inp.line.material}, {labels.insulation(inp.line.insulation)}, {fmt(line.theta_i_c)} → "
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
            f"{inp.cpc.material}, {labels.arrangement(inp.cpc, bunched_note=True)}, "
            f"{labels.insulation(inp.cpc.insulation)}, {fmt(cpc.theta_i_c)} → {fmt(cpc.theta_f_c)} °C: "
            f"k = {fmt(cpc.k)}",
            cpc.k,
            "A·s½/mm²",
            INFO,
            cpc.source,
        ),
    ]
    return line, cpc, steps


class Clearing(NamedTuple):
    """How an earth fault is cleared: the operating time (an upper bound) and by what ("device", "RCD")."""

    op: OperatingTime
    by: str


class FaultCase(NamedTuple):
    """One fault the line conductor must survive: its current, how it is cleared, and a name."""

    name: str
    current_a: float
    op: OperatingTime
    by: str


def _case_check(check_id: str, title: str, case: FaultCase, result: Withstand, follows: str | None) -> Check:
    outcome = result.outcome
    needs = result.needs
    follows_from = None
    if result.mode == OUTSIDE and follows is not None:
        follows_from, needs = follows, "follows from the disconnection failure"

    def why() -> str:
        return f"{case.name}, {fmt(case.current_a)} A cleared by the {case.by}: {text(result.why)}"

    return Check(
        check_id,
        title,
        outcome,
        result.figure,
        result.limit,
        result.unit,
        result.at_most,
        why,
        needs,
        LINE_SOURCE,
        follows_from,
        case.current_a,
        result.clearing_s,
    )


class LineChecks(NamedTuple):
    """The line conductor at its largest and its smallest fault current."""

    largest: Check
    smallest: Check
    deciding: Withstand | None

    @property
    def ok(self) -> bool | None:
        return worse(self.largest, self.smallest).ok


def _smallest_cases(
    inp: CircuitInput, device: Device, if_a: float | None, isc_a: float | None, earth: Clearing | None
) -> tuple[list[FaultCase], str]:
    """The faults at the circuit's far end: line–neutral (cleared by the overcurrent device alone, never
    an RCD) and line–earth (cleared by the faster of device and RCD). Without Zsc the earth fault current
    stands in for the line–neutral one in TN systems where the protective conductor's resistance is at
    least the line's (the neutral is then no worse), else the case is not shown."""
    cases: list[FaultCase] = []
    if if_a is not None and earth is not None:
        cases.append(FaultCase("earth fault at the circuit's end", if_a, earth.op, earth.by))
    if isc_a is not None:
        cases.append(
            FaultCase("line–neutral fault at the circuit's end", isc_a, device.time_at(isc_a), "device")
        )
        return cases, ""
    stands_in = inp.supply.system != "TT" and _cpc_resistance_at_least_line(inp)
    if if_a is not None and stands_in:
        cases.append(
            FaultCase(
                "line–neutral fault at the circuit's end (If stands in: no Zsc)",
                if_a,
                device.time_at(if_a),
                "device",
            )
        )
        return cases, ""
    return (
        cases,
        "measure Zsc at the circuit's end: a line–neutral fault is cleared by the overcurrent device alone",
    )


def _cpc_resistance_at_least_line(inp: CircuitInput) -> bool:
    materials = tables.load("materials")
    r_line = materials[inp.line.material]["rho20_ohm_mm"] / inp.line.csa_mm2
    r_cpc = materials[inp.cpc.material]["rho20_ohm_mm"] / inp.cpc.csa_mm2
    return r_cpc + _EPS >= r_line


def line_checks(
    inp: CircuitInput,
    device: Device,
    k: KValue,
    if_a: float | None,
    isc_a: float | None,
    earth: Clearing | None,
    disconnection_failed: bool,
) -> tuple[LineChecks, list[StepThunk]]:
    """Line conductor withstand (IEC 60364-4-43 434.5.2) at both ends of its fault-current range: the
    largest current its device sees (the prospective fault current at the board, cleared by the device),
    and the smallest (faults at the circuit's end; for fuses and other time-graded devices the harder
    case)."""
    s = inp.line.csa_mm2
    follows = "disconnection" if disconnection_failed else None
    lt = inp.let_through
    title_max = "Line conductor at the largest fault current"
    pfc = inp.supply.pfc_a
    if pfc is None:
        largest = Check(
            "line-withstand-max",
            title_max,
            NOT_SHOWN,
            source=LINE_SOURCE,
            why="the prospective fault current at the board is not known",
            needs="enter the prospective fault current (PFC) at the board",
        )
        result_max = None
    else:
        case = FaultCase("prospective fault at the board", pfc, device.time_at(pfc), "device")
        result_max = withstand(k.k, s, pfc, case.op, lt)
        largest = _case_check("line-withstand-max", title_max, case, result_max, None)
    title_min = "Line conductor at the smallest fault current"
    cases, missing = _smallest_cases(inp, device, if_a, isc_a, earth)
    results = [withstand(k.k, s, case.current_a, case.op, lt) for case in cases]
    checks = [
        _case_check("line-withstand-min", title_min, c, r, follows)
        for c, r in zip(cases, results, strict=True)
    ]
    if missing:
        checks.append(
            Check(
                "line-withstand-min",
                title_min,
                NOT_SHOWN,
                source=LINE_SOURCE,
                why="no line–neutral loop impedance",
                needs=missing,
            )
        )
    if not checks:
        checks.append(
            Check(
                "line-withstand-min",
                title_min,
                NOT_SHOWN,
                source=LINE_SOURCE,
                why="no fault current",
                needs="measure Zs, or Ze and R1+R2",
            )
        )
    smallest = checks[0]
    for other in checks[1:]:
        smallest = worse(smallest, other)
    deciding = next((r for c, r in zip(checks, results, strict=False) if c is smallest), result_max)
    steps = [_line_step(largest, k, s), _line_step(smallest, k, s)]
    return LineChecks(largest, smallest, deciding), steps


def _line_step(check: Check, k: KValue, s: float) -> StepThunk:
    def step() -> Step:
        if check.unit == "A²s":
            formula = "I²t (let-through) ≤ k² · S²"
        else:
            formula = "t = (k · S / I)² ≥ clearing time"
        working = check.why
        if check.current_a is not None and check.unit != "A²s":
            withstand_s = (k.k * s / check.current_a) ** 2
            working = (
                f"t = ({fmt(k.k)} × {fmt(s)} / {fmt(check.current_a)})² = {fmt(withstand_s)} s; " + working
            )
        return Step(
            check.id,
            check.title,
            formula,
            working,
            check.figure,
            check.unit,
            check.outcome,
            check.needs or check.source,
        )

    return step


class CpcChecks(NamedTuple):
    """The protective conductor: size for the fault, and a separate conductor's minimum size."""

    fault: Check
    minimum: Check | None
    proportional_min_mm2: float
    by_rule: bool
    min_csa_mm2: float | None
    adiabatic_ok: bool | None

    @property
    def ok(self) -> bool | None:
        return self.fault.ok if self.minimum is None else worse(self.fault, self.minimum).ok


def _separate_minimum(inp: CircuitInput) -> Check | None:
    if inp.cpc.arrangement != "separate":
        return None
    title = "Separate protective conductor size"
    source = "IEC 60364-5-54 543.1.3"
    sizes = SEPARATE_MIN_MM2.get(inp.cpc.material)
    s = inp.cpc.csa_mm2
    if sizes is None:
        return Check(
            "cpc-minimum-size",
            title,
            NOT_SHOWN,
            s,
            None,
            "mm²",
            False,
            f"no minimum tabulated here for {inp.cpc.material}",
            "check the rules in force",
            source,
        )
    protected, unprotected = sizes
    need = protected if inp.cpc.protected else unprotected
    if inp.cpc.protected is None and s + _EPS < unprotected:
        if s + _EPS < protected:
            return Check(
                "cpc-minimum-size",
                title,
                FAIL,
                s,
                protected,
                "mm²",
                False,
                lambda: (
                    f"{fmt(s)} mm² is below {fmt(protected)} mm², the least even with mechanical protection"
                ),
                "",
                source,
            )
        return Check(
            "cpc-minimum-size",
            title,
            NOT_SHOWN,
            s,
            unprotected,
            "mm²",
            False,
            lambda: f"{fmt(s)} mm² is enough only with mechanical protection",
            lambda: f"say whether it is mechanically protected (else at least {fmt(unprotected)} mm²)",
            source,
        )
    ok = s + _EPS >= need
    return Check(
        "cpc-minimum-size",
        title,
        judged(ok),
        s,
        need,
        "mm²",
        False,
        lambda: (
            f"{fmt(s)} mm² {'≥' if ok else '<'} {fmt(need)} mm² "
            f"({'with' if need == protected else 'without'} mechanical protection)"
        ),
        "",
        source,
    )


def protective_conductor(
    inp: CircuitInput,
    k_l: KValue,
    k_p: KValue,
    if_a: float | None,
    earth: Clearing | None,
    disconnection_failed: bool,
) -> tuple[CpcChecks, list[StepThunk]]:
    """Protective conductor: Table 54.2 proportion, or the adiabatic minimum S = √(If² · t)/k (543.1.2)
    at the earth fault current with the time that actually clears it; and a separate conductor's
    minimum size (543.1.3)."""
    s = inp.cpc.csa_mm2
    same = inp.cpc.material == inp.line.material
    rule_min = proportional_cpc_csa_mm2(inp.line.csa_mm2, 1.0 if same else k_l.k, 1.0 if same else k_p.k)
    by_rule = s + _EPS >= rule_min
    title = "Protective conductor"
    minimum = _separate_minimum(inp)
    min_csa = None
    adiabatic_ok: bool | None = None
    result: Withstand | None = None
    if if_a is not None and earth is not None:
        result = withstand(k_p.k, s, if_a, earth.op, inp.let_through)
        min_csa = min_csa_mm2(k_p.k, if_a, earth.op, inp.let_through)
        adiabatic_ok = None if result.outcome == NOT_SHOWN else result.outcome == PASS
    if by_rule:
        fault = Check(
            "cpc",
            title,
            PASS,
            s,
            rule_min,
            "mm²",
            False,
            lambda: f"{fmt(s)} mm² ≥ {fmt(rule_min)} mm² by proportion to the line conductor (Table 54.2)",
            source="IEC 60364-5-54 Table 54.2",
        )
    elif result is None:
        fault = Check(
            "cpc",
            title,
            NOT_SHOWN,
            s,
            rule_min,
            "mm²",
            False,
            lambda: (
                f"{fmt(s)} mm² is below the proportion ({fmt(rule_min)} mm²) and there is no fault current"
            ),
            "measure Zs, or Ze and R1+R2",
            CPC_SOURCE,
        )
    elif result.mode == OUTSIDE:
        follows = "disconnection" if disconnection_failed else None
        outside = result
        fault = Check(
            "cpc",
            title,
            NOT_SHOWN,
            None,
            None,
            "mm²",
            False,
            lambda: f"below the proportion ({fmt(rule_min)} mm²); {text(outside.why)}",
            "follows from the disconnection failure" if follows else outside.needs,
            CPC_SOURCE,
            follows,
            if_a,
            result.clearing_s,
        )
    else:
        limit = min_csa if min_csa is not None else rule_min
        needs = result.needs
        decided = result

        def why() -> str:
            words = f"at If = {fmt(if_a or 0.0)} A: {text(decided.why)}"
            if decided.outcome == FAIL and min_csa is not None:
                words += f"; at least {fmt(min_csa)} mm² needed"
            return words

        fault = Check(
            "cpc",
            title,
            result.outcome,
            s,
            limit,
            "mm²",
            False,
            why,
            needs,
            CPC_SOURCE,
            None,
            if_a,
            result.clearing_s,
        )
    steps = [_proportion_step(inp, k_l, k_p, rule_min, by_rule, same), _fault_step(fault, k_p, if_a, result)]
    if minimum is not None:
        steps.append(
            lambda: Step(
                minimum.id,
                minimum.title,
                "S ≥ 2.5 mm² protected, ≥ 4 mm² unprotected (copper)",
                minimum.why,
                s,
                "mm²",
                minimum.outcome,
                minimum.needs or minimum.source,
            )
        )
    return CpcChecks(fault, minimum, rule_min, by_rule, min_csa, adiabatic_ok), steps


def _proportion_step(
    inp: CircuitInput, k_l: KValue, k_p: KValue, rule_min: float, by_rule: bool, same: bool
) -> StepThunk:
    s = inp.cpc.csa_mm2
    return lambda: Step(
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


def _fault_step(fault: Check, k_p: KValue, if_a: float | None, result: Withstand | None) -> StepThunk:
    def step() -> Step:
        working = fault.why
        formula = "S ≥ √(If² · t) / k"
        if result is not None and result.mode == "energy":
            formula = "S ≥ √(I²t let-through) / k"
        elif (
            result is not None
            and result.clearing_s is not None
            and if_a is not None
            and result.mode != OUTSIDE
        ):
            used = max(result.clearing_s, 0.1)
            working = (
                f"S = √({fmt(if_a)}² × {fmt(used)}) / {fmt(k_p.k)} = "
                f"{fmt((if_a * if_a * used) ** 0.5 / k_p.k)} mm²; " + working
            )
        return Step(
            "cpc",
            fault.title,
            formula,
            working,
            fault.limit,
            "mm²",
            fault.outcome,
            fault.needs or fault.source,
        )

    return step
