"""The results panel: overall verdict, one card per calc step, margins, cautions and the picture."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from mobile_app.state.chart import ChartModel, chart_for
from mobile_app.state.text import CAUTIONS, VerdictMark, format_quantity, verdict_mark


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
class Margin:
    """How far a measured or computed figure sits from its limit."""

    label: str
    actual: str
    limit: str
    text: str
    ok: bool


@dataclass(frozen=True)
class ResultsPanel:
    """Everything the results step shows, in order."""

    verdict: str
    mark: VerdictMark
    headline: str
    cards: tuple[StepCard, ...]
    margins: tuple[Margin, ...]
    cautions: tuple[str, ...]
    chart: ChartModel | None
    problem: str | None


def _num(value: Any) -> float | None:
    return float(value) if isinstance(value, int | float) and not isinstance(value, bool) else None


def _margin(label: str, actual: float | None, limit: float | None, unit: str, upper: bool) -> Margin | None:
    """`upper`: the actual figure must stay at or below the limit (else at or above it)."""
    if actual is None or limit is None or limit <= 0:
        return None
    share = (limit - actual) / limit if upper else (actual - limit) / limit
    ok = share >= 0
    if abs(share) > 1:
        text = f"{actual / limit:.1f} × the limit"
    else:
        text = f"{abs(share) * 100:.0f} % {'inside' if ok else 'beyond'} the limit"
    return Margin(
        label=label,
        actual=format_quantity(actual, unit),
        limit=format_quantity(limit, unit),
        text=text,
        ok=ok,
    )


def margins_of(assessment: dict[str, Any]) -> tuple[Margin, ...]:
    """Margins to each limit that the assessment has figures for, in walk order."""
    inputs = assessment.get("inputs") or {}
    measured = inputs.get("measured") or {}
    cpc = (inputs.get("circuit") or {}).get("cpc") or {}
    zs = _num(assessment.get("zs_ohm")) or _num(measured.get("zs"))
    # The time that clears the fault: the device's, or an RCD's where that is faster.
    clearing = _num(assessment.get("disconnection_time_s"))
    if clearing is None:
        clearing = _num(assessment.get("device_time_s"))
    # The CPC passes by the adiabatic size or by proportion: measure against the one that is met.
    by_rule_only = assessment.get("cpc_by_proportional_rule") and assessment.get("cpc_adiabatic_ok") is False
    cpc_label, cpc_min = (
        ("CPC size against the proportional rule", _num(assessment.get("cpc_proportional_min_mm2")))
        if by_rule_only
        else ("CPC size against the minimum", _num(assessment.get("cpc_min_csa_mm2")))
    )
    candidates = (
        _margin("Zs against its maximum", zs, _num(assessment.get("zs_max_ohm")), "Ω", upper=True),
        _margin(
            "Disconnection time", clearing, _num(assessment.get("max_disconnection_time_s")), "s", upper=True
        ),
        _margin(
            "Line withstand time against clearing time",
            _num(assessment.get("line_withstand_time_s")),
            _num(assessment.get("device_time_at_short_circuit_s")),
            "s",
            upper=False,
        ),
        _margin(cpc_label, _num(cpc.get("csa")), cpc_min, "mm²", upper=False),
    )
    return tuple(m for m in candidates if m is not None)


def _card(step: dict[str, Any]) -> StepCard:
    value = _num(step.get("value"))
    result = format_quantity(value, step.get("unit") or "") if value is not None else str(
        step.get("value") or "—"
    )
    verdict = step.get("verdict") or "info"
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
    "pass": "All checks pass",
    "fail": "At least one check fails",
    "incomplete": "Not enough to decide yet",
}


def headline(verdict: str, reasons: Any) -> str:
    """The sentence under the verdict, naming the checks that fail or are not decided
    (calc's `reasons`, e.g. "disconnection: fail")."""
    text = _HEADLINES.get(verdict, _HEADLINES["incomplete"])
    names = [str(reason).split(":")[0] for reason in reasons if str(reason).strip()]
    return f"{text}: {', '.join(names)}" if names and verdict != "pass" else text


def results_panel(circuit: dict[str, Any], calc_input: dict[str, Any]) -> ResultsPanel:
    """The panel for a circuit as the store returned it (`store.circuits.get`) and its calc input."""
    assessment = circuit.get("assessment") or {}
    verdict = assessment.get("verdict") or circuit.get("verdict") or "incomplete"
    device = (calc_input.get("circuit") or {}).get("device") or {}
    return ResultsPanel(
        verdict=verdict,
        mark=verdict_mark(verdict),
        headline=headline(verdict, assessment.get("reasons") or ()),
        cards=tuple(_card(step) for step in assessment.get("steps") or ()),
        margins=margins_of(assessment) if assessment else (),
        cautions=CAUTIONS,
        chart=chart_for(device, assessment) if device else None,
        problem=circuit.get("assessment_error"),
    )
