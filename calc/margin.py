"""The temperature view of a measurement: the Zs limit corrected to the test temperature, and the
common-practice 0.8 figure; the first decides the verdict when it can."""

from __future__ import annotations

from typing import NamedTuple

from calc.formulas import resistance_ratio
from calc.inputs import CircuitInput
from calc.kvalues import beta_c, operating_temperature_c
from calc.steps import CHECK, PASS, Step, StepThunk, fmt, verdict_of
from calc.walk import Loop

RULE_OF_THUMB_FACTOR = 0.8
"""Common practice (no published source): a Zs measured at ambient should not exceed 0.8 × the limit."""


class Margin(NamedTuple):
    """The measured Zs against its limit, corrected to the test temperature and by the 0.8 figure."""

    limit_at_test_ohm: float | None
    rule_of_thumb_ohm: float | None
    ok: bool | None


def margin_steps(
    inp: CircuitInput, loop: Loop, zs_max: float | None, deciding: bool
) -> tuple[Margin, list[StepThunk]]:
    """The limit corrected to the test temperature (IEC 60228 resistance-temperature relation, from
    R1+R2 when given) and the common-practice 0.8 figure; the first decides when it can."""
    zs = loop.zs_ohm
    if zs is None or zs_max is None:
        return Margin(None, None, None), []
    r = inp.readings
    rule_ohm = RULE_OF_THUMB_FACTOR * zs_max
    rule_ok = zs <= rule_ohm
    steps: list[StepThunk] = []
    limit_at_test: float | None = None
    ok: bool | None = rule_ok if deciding else None
    if r.test_temp_c is not None:
        theta_op = operating_temperature_c(inp.line.insulation)
        factor = resistance_ratio(beta_c(inp.line.material), theta_op, r.test_temp_c)
        ze = loop.ze_ohm
        if r.r1r2_ohm is not None and ze is not None and ze < zs_max:
            limit_at_test = ze + (zs_max - ze) * factor
            formula = "Zs max at θt = Ze + (Zs max − Ze) · (β + θt) / (β + θop)"
            note = "circuit part corrected from its operating temperature to the test temperature"
        else:
            ze = None
            limit_at_test = zs_max * factor
            formula = "Zs max at θt = Zs max · (β + θt) / (β + θop)"
            note = "whole loop corrected (conservative); Ze and R1+R2 give a closer figure"

        def working() -> str:
            if ze is not None:
                return f"{fmt(ze)} + ({fmt(zs_max)} − {fmt(ze)}) × {fmt(factor)} = {fmt(limit_at_test)} Ω"
            return f"{fmt(zs_max)} × {fmt(factor)} = {fmt(limit_at_test)} Ω"

        temp_ok = zs <= limit_at_test
        ok = temp_ok if deciding else None
        steps.append(
            lambda: Step(
                "zs-at-test-temperature",
                "Limit at the test temperature",
                formula,
                f"θop {fmt(theta_op)} °C, θt {fmt(r.test_temp_c)} °C: {working()}; measured "
                f"{fmt(zs)} Ω {'≤' if temp_ok else '>'} {fmt(limit_at_test)} Ω",
                limit_at_test,
                "Ω",
                verdict_of(temp_ok) if deciding else (PASS if temp_ok else CHECK),
                note + ("" if deciding else "; not deciding: disconnection relies on the RCD"),
            )
        )
    rule_decides = deciding and r.test_temp_c is None
    rule_verdict = verdict_of(rule_ok) if rule_decides else (PASS if rule_ok else CHECK)
    steps.append(
        lambda: Step(
            "zs-rule-of-thumb",
            "0.8 × Zs max",
            "Zs ≤ 0.8 · Zs max",
            f"{fmt(zs)} Ω {'≤' if rule_ok else '>'} 0.8 × {fmt(zs_max)} = {fmt(rule_ohm)} Ω",
            rule_ohm,
            "Ω",
            rule_verdict,
            "common practice (no published source); "
            + ("deciding: no test temperature given" if rule_decides else "for comparison"),
        )
    )
    return Margin(limit_at_test, rule_ohm, ok), steps
