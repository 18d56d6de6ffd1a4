"""Words, marks and number formats shared by every screen."""

from __future__ import annotations

from dataclasses import dataclass

import calc

CAUTIONS: tuple[str, ...] = tuple(calc.CAUTIONS)
"""The cautions shown wherever results are shown: the calculation core's own words."""


@dataclass(frozen=True)
class VerdictMark:
    """How a verdict is shown: a word, an icon name (Flet Icons member) and a colour role."""

    word: str
    icon: str
    tone: str


_MARKS: dict[str, VerdictMark] = {
    "pass": VerdictMark("PASS", "CHECK_CIRCLE", "good"),
    "fail": VerdictMark("FAIL", "CANCEL", "bad"),
    "not-shown": VerdictMark("NOT SHOWN", "HELP_OUTLINE", "unknown"),
    "info": VerdictMark("", "", "neutral"),
}
OLD_WORDS = {"incomplete": "not-shown", "check": "not-shown"}
_OVERALL_MARKS: dict[str, VerdictMark] = {
    "satisfactory": VerdictMark("SATISFACTORY", "CHECK_CIRCLE", "good"),
    "unsatisfactory": VerdictMark("UNSATISFACTORY", "CANCEL", "bad"),
    "not-shown": VerdictMark("NOT SHOWN YET", "HELP_OUTLINE", "unknown"),
}


def overall_mark(outcome: str | None) -> VerdictMark:
    """The word, icon and tone of a job's overall outcome; anything else reads as not shown yet."""
    return _OVERALL_MARKS.get(outcome or "", _OVERALL_MARKS["not-shown"])
"""Verdict words of assessments saved by calc 0.1, read as now."""


def verdict_mark(verdict: str | None) -> VerdictMark:
    """The word, icon and tone for an outcome; unknown or missing ones read as not shown."""
    word = OLD_WORDS.get(verdict or "", verdict or "not-shown")
    return _MARKS.get(word, _MARKS["not-shown"])


_STATUS_WORDS = {
    "draft": "Draft",
    "in_review": "In review",
    "in-review": "In review",
    "review": "In review",
    "submitted": "In review",
    "returned": "Returned",
    "approved": "Approved",
}


def status_word(status: str | None) -> str:
    """The word shown for a job's status."""
    return _STATUS_WORDS.get(status or "draft", (status or "draft").replace("_", " ").capitalize())


def format_number(value: float) -> str:
    """A number with three significant figures, without exponent for everyday magnitudes."""
    if value == 0:
        return "0"
    magnitude = abs(value)
    if magnitude >= 1000:
        return f"{value:,.0f}".replace(",", " ")
    if magnitude >= 100:
        return f"{value:.0f}"
    if magnitude >= 10:
        return f"{value:.1f}"
    if magnitude >= 1:
        return f"{value:.2f}"
    if magnitude >= 0.001:
        return f"{value:.3g}"
    return f"{value:.2e}"


def format_quantity(value: float | None, unit: str) -> str:
    """`0.62 Ω`, `370 A`, `0.0123 s`; an em dash when there is no value."""
    if value is None:
        return "—"
    text = format_number(float(value))
    return f"{text} {unit}".strip()
