"""The results panel: the verdict and its primary cause, every check with the figure that decided it,
one card per calc step, cautions and the picture."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from mobile_app.state.chart import ChartModel, chart_for
from mobile_app.state.devices import rating_mismatch
from mobile_app.state.text import CAUTIONS, OLD_WORDS, VerdictMark, format_quantity, verdict_mark


@dataclass(frozen=True)
class StepCard:
    """One calc step as a card: formula, working with numbers, result with unit, verdict."""

    id: str
    title: str
    formula: str
    working: str
    result: str
    verdict: str
    mark: VerdictMark
    note: str


@dataclass(frozen=True)
class CheckRow:
    """One check as shown: its mark, the figure that decided it against its limit, why, and what
    would decide it when it is not shown. Every surface (screen, PDF, CSV, JSON) shows the same."""

    id: str
    title: str
    outcome: str
    mark: VerdictMark
    why: str
    figure: str
    margin: str
    needs: str
    follows_from: str | None


@dataclass(frozen=True)
class Cause:
    """The one thing to read first: what it found, the remedies, and the checks that follow from it."""

    check: str
    text: str
    remedies: tuple[str, ...]
    follows: tuple[str, ...]


@dataclass(frozen=True)
class ResultsPanel:
    """Everything the results step shows, in order."""

    verdict: str
    mark: VerdictMark
    headline: str
    cause: Cause | None
    checks: tuple[CheckRow, ...]
    cards: tuple[StepCard, ...]
    notes: tuple[str, ...]
    cautions: tuple[str, ...]
    chart: ChartModel | None
    problem: str | None


def _num(value: Any) -> float | None:
    return float(value) if isinstance(value, int | float) and not isinstance(value, bool) else None


def check_rows(assessment: dict[str, Any]) -> tuple[CheckRow, ...]:
    """The checks of an assessment as rows, in walk order."""
    rows = []
    for check in assessment.get("checks") or ():
        outcome = str(check.get("outcome") or "not-shown")
        rows.append(
            CheckRow(
                id=str(check.get("id", "")),
                title=str(check.get("title", "")),
                outcome=outcome,
                mark=verdict_mark(outcome),
                why=str(check.get("why") or ""),
                figure=str(check.get("deciding") or ""),
                margin=str(check.get("margin") or ""),
                needs=str(check.get("needs") or ""),
                follows_from=check.get("follows_from"),
            )
        )
    return tuple(rows)


def _card(step: dict[str, Any]) -> StepCard:
    value = _num(step.get("value"))
    result = format_quantity(value, step.get("unit") or "") if value is not None else str(
        step.get("value") or "—"
    )
    verdict = OLD_WORDS.get(str(step.get("verdict")), step.get("verdict") or "info")
    return StepCard(
        id=str(step.get("id", "")),
        title=str(step.get("title", "")),
        formula=str(step.get("formula") or ""),
        working=str(step.get("working") or ""),
        result=result,
        verdict=verdict,
        mark=verdict_mark(verdict),
        note=str(step.get("note") or ""),
    )


_HEADLINES = {
    "pass": "Every check passes",
    "fail": "Fails",
    "not-shown": "Not shown yet",
}


def headline(verdict: str, cause: dict[str, Any] | None) -> str:
    """The sentence under the verdict: the one primary cause (calc's `primary_cause`) when there is one."""
    word = _HEADLINES.get(verdict, _HEADLINES["not-shown"])
    if verdict == "pass" or not cause:
        return word
    return f"{word}: {cause.get('text', '')}"


def _cause(cause: dict[str, Any] | None) -> Cause | None:
    if not cause:
        return None
    return Cause(
        check=str(cause.get("check", "")),
        text=str(cause.get("text", "")),
        remedies=tuple(str(r) for r in cause.get("remedies") or ()),
        follows=tuple(str(f) for f in cause.get("follows") or ()),
    )


def results_panel(circuit: dict[str, Any], calc_input: dict[str, Any]) -> ResultsPanel:
    """The panel for a circuit as the store returned it (`circuits.get`) and its calc input."""
    assessment = circuit.get("assessment") or {}
    said = str(assessment.get("verdict") or circuit.get("verdict") or "not-shown")
    verdict = OLD_WORDS.get(said, said)
    device = (calc_input.get("circuit") or {}).get("device") or {}
    fields = circuit.get("fields") or {}
    mismatch = rating_mismatch((fields.get("device_kind") or {}).get("value"),
                               (fields.get("device_rating") or {}).get("value"),
                               (circuit.get("library_device") or {}).get("rating_a"))
    return ResultsPanel(
        verdict=verdict,
        mark=verdict_mark(verdict),
        headline=headline(verdict, assessment.get("primary_cause")),
        cause=_cause(assessment.get("primary_cause")),
        checks=check_rows(assessment),
        cards=tuple(_card(step) for step in assessment.get("steps") or ()),
        notes=tuple([mismatch] * bool(mismatch) + [str(n) for n in assessment.get("plausibility") or ()]),
        cautions=CAUTIONS,
        chart=chart_for(device, assessment) if device else None,
        problem=circuit.get("assessment_error"),
    )
