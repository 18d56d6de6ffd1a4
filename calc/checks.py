"""A check of the walk and its outcome: pass, fail, or not shown.

*Not shown* means the evidence does not decide the check either way; the check then says what would
(`needs`). A check carries the figure that decided it and the limit it was held against, so every
surface (screen, PDF, CSV, JSON) shows the same judgement with the same numbers.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from calc.numbers import fmt

PASS = "pass"
FAIL = "fail"
NOT_SHOWN = "not-shown"
OUTCOMES = (PASS, FAIL, NOT_SHOWN)
OUTCOME_WORDS = {PASS: "pass", FAIL: "fail", NOT_SHOWN: "not shown"}


Text = str | Callable[[], str]
"""A sentence, or a function that writes it when first read (the walk decides every outcome first and
writes the words only for what someone reads)."""


def text(value: Text) -> str:
    """The sentence of a `Text`."""
    return value if isinstance(value, str) else value()


class Check:
    """One check: its outcome, the deciding figure against its limit, and why or what is needed."""

    __slots__ = (
        "id",
        "title",
        "outcome",
        "figure",
        "limit",
        "unit",
        "at_most",
        "_why",
        "_needs",
        "source",
        "follows_from",
        "current_a",
        "time_s",
    )

    def __init__(
        self,
        id: str,
        title: str,
        outcome: str,
        figure: float | None = None,
        limit: float | None = None,
        unit: str = "",
        at_most: bool = True,
        why: Text = "",
        needs: Text = "",
        source: str = "",
        follows_from: str | None = None,
        current_a: float | None = None,
        time_s: float | None = None,
    ) -> None:
        self.id = id
        self.title = title
        self.outcome = outcome
        self.figure = figure
        self.limit = limit
        self.unit = unit
        self.at_most = at_most
        """True: the figure must be at or below the limit (Zs, a time); False: at or above (a size)."""
        self._why = why
        self._needs = needs
        self.source = source
        self.follows_from = follows_from
        """The id of the check whose failure this one follows from (its own outcome is then not shown)."""
        self.current_a = current_a
        self.time_s = time_s

    @property
    def why(self) -> str:
        """One line a person reads: the figure against the limit, or what the evidence shows."""
        if not isinstance(self._why, str):
            self._why = self._why()
        return self._why

    @property
    def needs(self) -> str:
        """For a check not shown: what would decide it (a reading to enter, a difference to resolve)."""
        if not isinstance(self._needs, str):
            self._needs = self._needs()
        return self._needs

    @property
    def ok(self) -> bool | None:
        """True for pass, False for fail, None for not shown (the `*_ok` keys of the output)."""
        return None if self.outcome == NOT_SHOWN else self.outcome == PASS

    @property
    def margin_pct(self) -> float | None:
        """How far the figure sits inside its limit, in per cent of the limit (negative: beyond); None
        for a check not shown, whose figure decides nothing."""
        if self.outcome == NOT_SHOWN or self.figure is None or self.limit is None or self.limit <= 0:
            return None
        share = (self.limit - self.figure) if self.at_most else (self.figure - self.limit)
        return 100.0 * share / self.limit

    @property
    def deciding(self) -> str:
        """The deciding figure against its limit in words, "0.62 Ω against ≤ 1.093 Ω" (empty without
        both); the one wording every surface prints."""
        if self.figure is None or self.limit is None:
            return ""
        unit = f" {self.unit}" if self.unit else ""
        relation = "≤" if self.at_most else "≥"
        return f"{fmt(self.figure)}{unit} against {relation} {fmt(self.limit)}{unit}"

    def __repr__(self) -> str:
        return f"Check({self.id!r}, {self.outcome!r}, figure={self.figure!r}, limit={self.limit!r})"

    def to_dict(self) -> dict[str, Any]:
        """The check as JSON-ready data."""
        pct = self.margin_pct
        return {
            "id": self.id,
            "title": self.title,
            "outcome": self.outcome,
            "ok": self.ok,
            "figure": self.figure,
            "limit": self.limit,
            "unit": self.unit,
            "relation": "≤" if self.at_most else "≥",
            "margin_pct": None if pct is None else round(pct, 3),
            "margin": margin_text(pct),
            "deciding": self.deciding,
            "why": self.why,
            "needs": self.needs,
            "source": self.source,
            "follows_from": self.follows_from,
            "current_a": self.current_a,
            "time_s": self.time_s,
        }


def margin_text(pct: float | None) -> str:
    """One wording for every margin: "12 % inside the limit", "30 % beyond the limit"."""
    if pct is None:
        return ""
    size = abs(pct)
    amount = "more than 1000" if size > 1000 else f"{size:.0f}" if size >= 1 else f"{size:.1f}"
    return f"{amount} % {'inside' if pct >= 0 else 'beyond'} the limit"


def judged(ok: bool) -> str:
    """The outcome of a check the evidence decides."""
    return PASS if ok else FAIL


def overall(checks: tuple[Check, ...]) -> str:
    """The circuit verdict: pass only when every check passes; fail when any fails on evidence;
    otherwise not shown."""
    outcomes = {check.outcome for check in checks}
    if FAIL in outcomes:
        return FAIL
    if not checks or NOT_SHOWN in outcomes:
        return NOT_SHOWN
    return PASS


_WEIGHT = {FAIL: 0, NOT_SHOWN: 1, PASS: 2}
"""How much an outcome weighs against the circuit (lower: more)."""


def worse(first: Check, second: Check) -> Check:
    """The check that weighs more against the circuit: fail, then not shown, then the smaller margin."""
    weight_first, weight_second = _WEIGHT[first.outcome], _WEIGHT[second.outcome]
    if weight_first != weight_second:
        return first if weight_first < weight_second else second
    a, b = first.margin_pct, second.margin_pct
    if a is None:
        return second if b is not None else first
    return first if b is None or a <= b else second
