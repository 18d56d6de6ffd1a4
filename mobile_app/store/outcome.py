"""A job's overall outcome, from its circuits' verdicts and its observations (pure, no SQL).

Unsatisfactory when any circuit fails on evidence or any observation is serious; satisfactory when
every circuit passes and every observation has a severity and none is serious; otherwise not shown,
with what keeps it open (the same three outcomes as a circuit's checks).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

SATISFACTORY = "satisfactory"
UNSATISFACTORY = "unsatisfactory"
NOT_SHOWN = "not-shown"
_LISTED = 24
"""How many circuits a reason names before it says "and N more"."""


@dataclass(frozen=True)
class CircuitVerdict:
    """A circuit as the overall outcome sees it: its label (`DB-1 / 3`) and its verdict."""

    label: str
    verdict: str | None


@dataclass(frozen=True)
class ObservationSeverity:
    """An observation as the overall outcome sees it: its number, severity and finding."""

    number: int
    severity: str | None
    finding: str


@dataclass(frozen=True)
class Overall:
    """The job's overall outcome and the reasons for it, first the deciding ones."""

    outcome: str
    reasons: tuple[str, ...]

    def to_dict(self) -> dict[str, Any]:
        """As exported: `{"outcome": ..., "reasons": [...]}`."""
        return {"outcome": self.outcome, "reasons": list(self.reasons)}


def _names(labels: list[str]) -> str:
    """`DB-1 / 3, DB-1 / 7` with at most `_LISTED` named."""
    shown = ", ".join(labels[:_LISTED])
    return shown + (f" and {len(labels) - _LISTED} more" if len(labels) > _LISTED else "")


def _short(text: str, chars: int = 160) -> str:
    one = " ".join(text.split())
    return one if len(one) <= chars else one[: chars - 1] + "…"


def overall_outcome(
    circuits: Sequence[CircuitVerdict], observations: Sequence[ObservationSeverity]
) -> Overall:
    """The overall outcome of a job (see the module docstring)."""
    failing = [c.label for c in circuits if c.verdict == "fail"]
    serious = [o for o in observations if o.severity == "serious"]
    if failing or serious:
        reasons = []
        if failing:
            word = "circuit fails" if len(failing) == 1 else f"{len(failing)} circuits fail"
            reasons.append(f"{word}: {_names(failing)}")
        reasons += [f"observation {o.number} is serious: {_short(o.finding) or '(no finding written)'}"
                    for o in serious]
        return Overall(UNSATISFACTORY, tuple(reasons))
    open_reasons = []
    if not circuits:
        open_reasons.append("no circuit is recorded")
    undecided = [c.label for c in circuits if c.verdict != "pass"]
    if undecided:
        word = "circuit is" if len(undecided) == 1 else f"{len(undecided)} circuits are"
        open_reasons.append(f"{word} not shown to pass: {_names(undecided)}")
    unrated = [str(o.number) for o in observations if o.severity is None]
    if unrated:
        open_reasons.append(f"observation {', '.join(unrated)} has no severity")
    if open_reasons:
        return Overall(NOT_SHOWN, tuple(open_reasons))
    return Overall(SATISFACTORY, ("every circuit passes and no observation is serious",))
