"""The working of an assessment as plain text for a person (`python -m calc assess --text`)."""

from __future__ import annotations

from calc.assessment import Assessment
from calc.checks import OUTCOME_WORDS, margin_text
from calc.numbers import fmt
from calc.steps import CAUTIONS

_MARK = {"pass": "PASS", "fail": "FAIL", "not-shown": "NOT SHOWN", "info": ""}


def render_text(result: Assessment) -> str:
    """The verdict and its primary cause, every check with its deciding figure, every step with its
    formula, working, value and mark, then the cautions."""
    lines = [f"Circuit protected by {result.device}: {_MARK[result.verdict]}"]
    cause = result.primary_cause
    if cause is not None:
        lines.append(f"First: {cause.text}")
        lines.extend(f"  remedy: {remedy}" for remedy in cause.remedies)
        if cause.follows:
            lines.append(f"  follows from it: {', '.join(cause.follows)}")
    lines.extend(f"note: {note}" for note in result.plausibility)
    lines += ["", "Checks"]
    for check in result.checks:
        figure = ""
        if check.figure is not None and check.limit is not None:
            relation = "≤" if check.at_most else "≥"
            figure = (
                f" — {fmt(check.figure)} {check.unit} against {relation} {fmt(check.limit)} {check.unit}, "
                f"{margin_text(check.margin_pct)}"
            )
        lines.append(f"  {OUTCOME_WORDS[check.outcome].upper():9} {check.title}{figure}")
        if check.needs:
            lines.append(f"            to decide: {check.needs}")
    lines += ["", "Working"]
    for number, step in enumerate(result.steps, start=1):
        value = step.value
        shown = fmt(value) if isinstance(value, float) else (value or "—")
        mark = _MARK.get(step.verdict, step.verdict)
        lines.append(f"{number:2}. {step.title}  {mark}".rstrip())
        lines.append(f"    {step.formula}")
        lines.append(f"    {step.working}")
        if step.id != "verdict":
            lines.append(f"    = {shown} {step.unit}".rstrip())
        if step.note:
            lines.append(f"    note: {step.note}")
    lines.append("")
    lines.extend(f"! {caution}" for caution in CAUTIONS)
    return "\n".join(lines)
