"""Checks of a circuit's other tests: insulation resistance (IEC 60364-6 Table 6.1), continuity of the
protective conductor (R1+R2 or R2 against the length, IEC 60228), a ring final circuit's end-to-end
readings, polarity, RCD operating times (IEC 61008-1 / IEC 61009-1 Table 1) and the RCD's test button.
A test not recorded leaves its check not shown."""

from __future__ import annotations

import bisect
import math
from functools import lru_cache
from typing import NamedTuple

from calc import tables
from calc.checks import FAIL, NOT_SHOWN, PASS, Check, judged
from calc.circuit_tests import Bounded
from calc.formulas import resistance_ratio
from calc.inputs import CircuitInput, Conductor
from calc.kvalues import beta_c
from calc.numbers import fmt
from calc.steps import Step, StepThunk

CONTINUITY_TOLERANCE_OHM = 0.05
CONTINUITY_TOLERANCE_FRACTION = 0.20
"""Common practice: a continuity reading within the larger of 0.05 Ω and 20 % of the value expected from
the length agrees with it (lengths on site are estimates)."""
RING_TOLERANCE_OHM = 0.05
"""Common practice: a ring's end-to-end r1 and rn agree within 0.05 Ω; r2 is about r1 × (line size /
protective conductor size), within the larger of 0.05 Ω and 10 % of that figure."""
RING_R2_FRACTION = 0.10
INSULATION_SOURCE = "IEC 60364-6 Table 6.1"
RCD_SOURCE = "IEC 61008-1 / IEC 61009-1 Table 1"


class TestChecks(NamedTuple):
    """The other tests' checks (None where the test does not apply) and their headline figures."""

    insulation: Check
    continuity: Check
    ring: Check | None
    polarity: Check
    rcd_time: Check | None
    rcd_button: Check | None
    insulation_min_mohm: float | None
    expected_r1r2_ohm: float | None
    ring_expected_r1r2_ohm: float | None
    rcd_time_limit_1x_s: float | None
    rcd_time_limit_5x_s: float | None

    def checks(self) -> tuple[Check, ...]:
        """The applicable checks in walk order."""
        return tuple(
            c
            for c in (
                self.insulation,
                self.continuity,
                self.ring,
                self.polarity,
                self.rcd_time,
                self.rcd_button,
            )
            if c is not None
        )


class InsulationMinimum(NamedTuple):
    """A row of IEC 60364-6 Table 6.1: the circuits it covers, the d.c. test voltage and the least
    insulation resistance."""

    circuits: str
    test_voltage_v: float
    min_mohm: float


@lru_cache(maxsize=32)
def insulation_minimum(selv: bool, nominal_v: float) -> InsulationMinimum:
    """The row of IEC 60364-6 Table 6.1 for a circuit: SELV/PELV, or by nominal voltage."""
    rows = tables.load("insulation")["row"]
    if selv:
        row = next(r for r in rows if r["selv"])
    else:
        row = next(r for r in rows if not r["selv"] and nominal_v <= r["nominal_max_v"])
    return InsulationMinimum(row["circuits"], float(row["test_voltage_v"]), float(row["min_mohm"]))


def nominal_voltage_v(u0_v: float) -> float:
    """The circuit's nominal voltage for Table 6.1: the system's line-to-line voltage U0 · √3 (for a
    230/400 V system 400 V), which errs toward the stricter row."""
    return u0_v * math.sqrt(3.0)


def insulation_check(inp: CircuitInput) -> tuple[Check, float | None]:
    """Insulation resistance: every reading at least the minimum of Table 6.1, at a test voltage that
    suits the circuit (at least the table's)."""
    title = "Insulation resistance"
    row = insulation_minimum(inp.selv, nominal_voltage_v(inp.supply.u0_v))
    need_v, minimum = row.test_voltage_v, row.min_mohm
    ins = inp.tests.insulation
    if ins is None or ins.line_earth is None:
        return Check(
            "insulation",
            title,
            NOT_SHOWN,
            None,
            minimum,
            "MΩ",
            False,
            "no line–earth reading",
            lambda: f"test insulation resistance at {fmt(need_v)} V d.c. (at least {fmt(minimum)} MΩ)",
            INSULATION_SOURCE,
        ), None
    line_line, line_earth = ins.line_line, ins.line_earth
    if line_line is not None and line_line.value <= line_earth.value:
        lowest_name, lowest = "L–L", line_line
    else:
        lowest_name, lowest = "L–E", line_earth
    volts = ins.test_voltage_v
    if volts is None or volts < need_v:
        said = "not recorded" if volts is None else f"{fmt(volts)} V"
        return Check(
            "insulation",
            title,
            NOT_SHOWN,
            lowest.value,
            minimum,
            "MΩ",
            False,
            f"test voltage {said}; this circuit ({row.circuits}) needs {fmt(need_v)} V d.c.",
            f"record a test at {fmt(need_v)} V d.c.",
            INSULATION_SOURCE,
        ), lowest.value
    if lowest.value >= minimum:
        outcome = PASS
    elif lowest.above:
        outcome = NOT_SHOWN
    else:
        outcome = FAIL

    def why() -> str:
        shown = f"L–E {_bounded(line_earth)} MΩ"
        if line_line is not None:
            shown = f"L–L {_bounded(line_line)} MΩ, " + shown
        missing = "" if line_line is not None else "; L–L not recorded"
        sign = "≥" if outcome == PASS else "<"
        return f"{shown} at {fmt(volts or 0.0)} V: lowest ({lowest_name}) {sign} {fmt(minimum)} MΩ{missing}"

    return Check(
        "insulation",
        title,
        outcome,
        lowest.value,
        minimum,
        "MΩ",
        False,
        why,
        "a reading the instrument can show below its range" if outcome == NOT_SHOWN else "",
        INSULATION_SOURCE,
    ), lowest.value


def _bounded(reading: Bounded) -> str:
    return (">" if reading.above else "") + fmt(reading.value)


def resistance_per_m(conductor: Conductor) -> float | None:
    """Maximum resistance at 20 °C in Ω/m of a copper or aluminium conductor of a standard size (IEC
    60228 Tables 1 and 2), or None (another material or size)."""
    data = tables.load("conductor_resistance").get(conductor.material)
    if data is None:
        return None
    sizes = data["csa_mm2"]
    index = bisect.bisect_left(sizes, conductor.csa_mm2 - 1e-9)
    if index >= len(sizes) or abs(sizes[index] - conductor.csa_mm2) > 1e-9:
        return None
    return float(data["ohm_per_km"][index]) / 1000.0


def expected_r1r2_ohm(inp: CircuitInput, cpc_only: bool = False) -> float | None:
    """R1+R2 (or R2 alone) expected from the length and the IEC 60228 resistances, taken to the test
    temperature (20 °C when not given) with each conductor's own β (IEC 60228 Annex B).

    A ring's length is the whole loop; at the point farthest round it the two legs are in parallel, so
    each point reads about a quarter of the end-to-end figure (common practice, (r1 + r2)/4)."""
    if inp.length_m is None:
        return None
    r_line, r_cpc = resistance_per_m(inp.line), resistance_per_m(inp.cpc)
    if r_cpc is None or (r_line is None and not cpc_only):
        return None
    test_c = inp.readings.test_temp_c if inp.readings.test_temp_c is not None else 20.0
    cpc = r_cpc * resistance_ratio(beta_c(inp.cpc.material), 20.0, test_c)
    share = 0.25 if inp.ring else 1.0
    if cpc_only:
        return cpc * inp.length_m * share
    assert r_line is not None
    line = r_line * resistance_ratio(beta_c(inp.line.material), 20.0, test_c)
    return (line + cpc) * inp.length_m * share


def continuity_check(inp: CircuitInput) -> tuple[Check, float | None]:
    """Continuity of the protective conductor: a reading exists, and agrees with the value expected from
    the length where a length is known (tolerance: common practice)."""
    title = "Continuity of the protective conductor"
    r = inp.readings
    ring = inp.tests.ring
    source = "IEC 60364-6 (continuity of protective conductors); expected values from IEC 60228"
    if r.r1r2_ohm is not None:
        reading, name, expected = r.r1r2_ohm, "R1+R2", expected_r1r2_ohm(inp)
    elif inp.tests.r2_ohm is not None:
        reading, name, expected = inp.tests.r2_ohm, "R2", expected_r1r2_ohm(inp, cpc_only=True)
    elif ring is not None and ring.r1_ohm is not None and ring.r2_ohm is not None:
        reading, name, expected = (ring.r1_ohm + ring.r2_ohm) / 4.0, "(r1 + r2)/4", None
    else:
        return Check(
            "continuity",
            title,
            NOT_SHOWN,
            why="no continuity reading",
            needs="measure R1+R2 (or R2)",
            source=source,
        ), expected_r1r2_ohm(inp)
    if expected is None:
        return Check(
            "continuity",
            title,
            PASS,
            reading,
            None,
            "Ω",
            why=lambda: f"{name} {fmt(reading)} Ω: continuous (no length to compare with)",
            source=source,
        ), None
    tolerance = max(CONTINUITY_TOLERANCE_OHM, CONTINUITY_TOLERANCE_FRACTION * expected)
    agrees = abs(reading - expected) <= tolerance

    def why() -> str:
        return (
            f"{name} {fmt(reading)} Ω against about {fmt(expected or 0.0)} Ω expected for "
            f"{fmt(inp.length_m or 0.0)} m (±{fmt(tolerance)} Ω)"
        )

    if agrees:
        return Check(
            "continuity", title, PASS, reading, expected + tolerance, "Ω", True, why, source=source
        ), expected
    return Check(
        "continuity",
        title,
        NOT_SHOWN,
        reading,
        expected + tolerance,
        "Ω",
        True,
        why,
        "check the length and the connections: the reading does not agree with the cable",
        source,
    ), expected


def ring_check(inp: CircuitInput) -> tuple[Check | None, float | None]:
    """A ring final circuit's end-to-end readings (common practice): r1 and rn agree; r2 matches r1
    scaled by the size ratio. After cross-connection each point reads about (r1 + r2)/4."""
    if not inp.ring:
        return None, None
    title = "Ring final circuit continuity"
    ring = inp.tests.ring
    source = "common practice (ring final circuit end-to-end test)"
    if ring is None or None in (ring.r1_ohm, ring.rn_ohm, ring.r2_ohm):
        return Check(
            "ring",
            title,
            NOT_SHOWN,
            why="end-to-end readings missing",
            needs="record r1, rn and r2 end to end",
            source=source,
        ), None
    r1, rn, r2 = float(ring.r1_ohm or 0.0), float(ring.rn_ohm or 0.0), float(ring.r2_ohm or 0.0)
    expected_r2 = r1 * inp.line.csa_mm2 / inp.cpc.csa_mm2
    r2_tolerance = max(RING_TOLERANCE_OHM, RING_R2_FRACTION * expected_r2)
    line_neutral_differ = abs(r1 - rn) > RING_TOLERANCE_OHM
    r2_off = abs(r2 - expected_r2) > r2_tolerance
    expected = (r1 + r2) / 4.0

    def why() -> str:
        problems = []
        if line_neutral_differ:
            problems.append(
                f"r1 {fmt(r1)} Ω and rn {fmt(rn)} Ω differ by more than {fmt(RING_TOLERANCE_OHM)} Ω"
            )
        if r2_off:
            problems.append(
                f"r2 {fmt(r2)} Ω is not about r1 × {fmt(inp.line.csa_mm2)}/{fmt(inp.cpc.csa_mm2)} = "
                f"{fmt(expected_r2)} Ω"
            )
        return "; ".join(problems) or (
            f"r1 {fmt(r1)}, rn {fmt(rn)}, r2 {fmt(r2)} Ω agree; each point about (r1 + r2)/4 = "
            f"{fmt(expected)} Ω"
        )

    ok = not (line_neutral_differ or r2_off)
    return Check(
        "ring", title, judged(ok), abs(r1 - rn), RING_TOLERANCE_OHM, "Ω", True, why, "", source
    ), expected


def flag_check(check_id: str, title: str, value: bool | None, needs: str, source: str) -> Check:
    """A yes/no test: confirmed → pass, found wrong → fail, not recorded → not shown."""
    if value is None:
        return Check(check_id, title, NOT_SHOWN, why="not recorded", needs=needs, source=source)
    return Check(check_id, title, judged(value), why="confirmed" if value else "found wrong", source=source)


def rcd_time_check(inp: CircuitInput) -> tuple[Check | None, float | None, float | None]:
    """RCD operating times at IΔn and 5 IΔn against IEC 61008-1 / IEC 61009-1 Table 1 (general: ≤ 300 ms
    and ≤ 40 ms; type S: 130–500 ms and 50–150 ms); an RCD for additional protection has IΔn ≤ 30 mA
    (IEC 60364-4-41 415.1.1)."""
    rcd = inp.rcd
    if rcd is None:
        return None, None, None
    title = "RCD operating time"
    data = tables.load("rcd")
    row = data[rcd.type]
    limit_1x, limit_5x = float(row["max_time_s"][0]), float(row["max_time_s"][2])
    minima = row.get("min_time_s")
    min_1x, min_5x = (float(minima[0]), float(minima[2])) if minima else (0.0, 0.0)
    tests = inp.tests
    problems: list[str] = []
    open_parts: list[str] = []
    if rcd.additional and rcd.idn_a > data["additional_protection_max_idn_a"] + 1e-12:
        problems.append(f"IΔn {fmt(rcd.idn_a * 1000)} mA is above the 30 mA of additional protection")
    for name, reading, low, high in (
        ("at IΔn", tests.rcd_time_1x, min_1x, limit_1x),
        ("at 5 IΔn", tests.rcd_time_5x, min_5x, limit_5x),
    ):
        if reading is None:
            open_parts.append(name)
            continue
        if reading.value + 1e-12 < low:
            problems.append(
                f"{_in_ms(reading, name)} is faster than the {fmt(low * 1000)} ms a type S must wait"
            )
        elif reading.value > high + 1e-12 or (reading.above and reading.value >= high - 1e-12):
            problems.append(f"{_in_ms(reading, name)} exceeds {fmt(high * 1000)} ms")
        elif reading.above:
            open_parts.append(f"{name} (a bound below the limit)")

    def limits() -> str:
        return f"at IΔn {_window(min_1x, limit_1x)}, at 5 IΔn {_window(min_5x, limit_5x)}"

    figure = tests.rcd_time_1x.value if tests.rcd_time_1x is not None else None
    if problems:
        check = Check(
            "rcd-time",
            title,
            FAIL,
            figure,
            limit_1x,
            "s",
            True,
            lambda: "; ".join(problems) + f" ({limits()})",
            "",
            RCD_SOURCE,
        )
    elif open_parts:
        check = Check(
            "rcd-time",
            title,
            NOT_SHOWN,
            figure,
            limit_1x,
            "s",
            True,
            lambda: f"not recorded {', '.join(open_parts)} ({limits()})",
            f"test the RCD {' and '.join(open_parts)}",
            RCD_SOURCE,
        )
    else:
        check = Check(
            "rcd-time", title, PASS, figure, limit_1x, "s", True, lambda: f"within {limits()}", "", RCD_SOURCE
        )
    return check, limit_1x, limit_5x


def _in_ms(reading: Bounded, name: str) -> str:
    return f"{_bounded(Bounded(reading.value * 1000, reading.above))} ms {name}"


def _window(low_s: float, high_s: float) -> str:
    return f"{fmt(low_s * 1000)}–{fmt(high_s * 1000)} ms" if low_s else f"≤ {fmt(high_s * 1000)} ms"


def test_checks(inp: CircuitInput) -> tuple[TestChecks, list[StepThunk]]:
    """Every other test's check, and a step each for the working."""
    insulation, lowest = insulation_check(inp)
    continuity, expected = continuity_check(inp)
    ring, ring_expected = ring_check(inp)
    polarity = flag_check(
        "polarity", "Polarity", inp.tests.polarity, "confirm polarity", "IEC 60364-6 (polarity test)"
    )
    rcd_time, limit_1x, limit_5x = rcd_time_check(inp)
    button = None
    if inp.rcd is not None:
        button = flag_check(
            "rcd-button",
            "RCD test button",
            inp.tests.rcd_test_button,
            "operate the RCD's test button",
            "IEC 60364-6 (functional test of RCDs)",
        )
    result = TestChecks(
        insulation,
        continuity,
        ring,
        polarity,
        rcd_time,
        button,
        lowest,
        expected,
        ring_expected,
        limit_1x,
        limit_5x,
    )
    return result, [_step(check) for check in result.checks()]


def _step(check: Check) -> StepThunk:
    return lambda: Step(
        check.id,
        check.title,
        _FORMULAS.get(check.id, ""),
        check.why,
        check.figure,
        check.unit,
        check.outcome,
        check.needs or check.source,
    )


_FORMULAS = {
    "insulation": "lowest reading ≥ minimum of Table 6.1",
    "continuity": "R1+R2 measured ≈ (r1 + r2 per metre) × length",
    "ring": "r1 ≈ rn; r2 ≈ r1 × line size / CPC size",
    "polarity": "every single-pole device in the line conductor",
    "rcd-time": "t at IΔn and at 5 IΔn within Table 1",
    "rcd-button": "the RCD trips on its test button",
}
