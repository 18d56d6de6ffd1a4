"""The working of an assessment as plain text for a person (`python -m calc assess --text`)."""

from __future__ import annotations

from calc.assessment import Assessment
from calc.steps import CAUTIONS, fmt

_MARK = {"pass": "PASS", "fail": "FAIL", "incomplete": "----", "check": "CHECK", "info": ""}


def render_text(result: Assessment) -> str:
    """Every step with its formula, working, value and verdict, then the cautions."""
    lines = [f"Circuit protected by {result.device}: {result.verdict.upper()}", ""]
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
