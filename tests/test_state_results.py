"""What the results panel lists, and the log-log picture's numbers, without Flet."""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from mobile_app.state import CAUTIONS, JobScreen, JobsList, Walk
from mobile_app.state.chart import withstand_points
from mobile_app.state.text import format_quantity, verdict_mark
from mobile_app.store import Store


@pytest.fixture
def walk(tmp_path: Path):
    with Store.open(tmp_path) as store:
        job = JobScreen(store, JobsList(store).new_job("Results test"))
        circuit_id = job.add_circuit(job.boards()[0].id)
        walk = Walk(store, circuit_id, step="results")
        for name, raw in (("device_curve", "B"), ("device_rating", "32"), ("line_csa", "2.5"),
                          ("cpc_csa", "1.5")):
            walk.set_field(name, raw)
        yield walk


def test_incomplete_without_zs(walk: Walk) -> None:
    panel = walk.results()
    assert panel.verdict == "incomplete"
    assert panel.mark.word == "INCOMPLETE"
    assert panel.cautions == CAUTIONS


def test_pass_lists_cards_in_walk_order_with_working(walk: Walk) -> None:
    walk.set_field("zs", "0.62")
    panel = walk.results()
    assert panel.verdict == "pass"
    assert panel.headline == "All checks pass"
    ids = [card.id for card in panel.cards]
    assert ids[:3] == ["supply", "zs", "earth-fault-current"]
    assert ids[-1] == "verdict"
    assert all(card.mark.word for card in panel.cards)
    assert any("0.62" in card.working for card in panel.cards)
    assert len(panel.cautions) == 3


def test_margins_name_limits(walk: Walk) -> None:
    walk.set_field("zs", "0.62")
    margins = {m.label: m for m in walk.results().margins}
    zs = margins["Zs against its maximum"]
    assert zs.ok and zs.actual == "0.62 Ω" and zs.limit == "1.37 Ω"  # B32 1.37 Ω: REFERENCE.md (IEC 60898-1)
    assert zs.text == "55 % inside the limit"


def test_fail_when_zs_too_high(walk: Walk) -> None:
    walk.set_field("zs", "2.0")
    panel = walk.results()
    assert panel.verdict == "fail"
    assert panel.mark.word == "FAIL"
    assert not {m.label: m for m in panel.margins}["Zs against its maximum"].ok


def test_chart_has_every_line_on_log_axes(walk: Walk) -> None:
    walk.set_field("zs", "0.62")
    walk.step = "readings"
    walk.set_field("zsc", "0.41")
    chart = walk.results().chart
    assert chart is not None
    roles = {s.role for s in chart.series}
    assert {"device", "fault", "short", "limit", "line", "cpc"} <= roles
    fault = next(s for s in chart.series if s.role == "fault")
    assert fault.points[0][0] == pytest.approx(math.log10(230 * 0.95 / 0.62))
    limit = next(s for s in chart.series if s.role == "limit")
    assert limit.points[0][1] == pytest.approx(math.log10(0.4))  # IEC 60364-4-41 Table 41.1, TN 230 V
    assert [label for _v, label in chart.y_ticks][:3] == ["0.1", "1", "10"]
    assert chart.x_ticks[0][1] == "10"


def test_withstand_line_is_k2s2_over_i2() -> None:
    points = withstand_points(115, 2.5, 1.0, 4.0, -2.0, 4.0)
    for x, y in points:
        assert 10**y == pytest.approx((115 * 2.5 / 10**x) ** 2)


def test_marks_have_words_not_colour_alone() -> None:
    assert verdict_mark("pass").word == "PASS" and verdict_mark("fail").icon == "CANCEL"
    assert verdict_mark(None).word == "INCOMPLETE"


def test_quantity_format() -> None:
    assert format_quantity(352.419, "A") == "352 A"
    assert format_quantity(0.62, "Ω") == "0.62 Ω"
    assert format_quantity(1500, "A") == "1 500 A"
    assert format_quantity(None, "s") == "—"


def test_far_beyond_a_limit_reads_as_a_multiple() -> None:
    from mobile_app.state.results import margins_of

    (margin,) = margins_of({"device_time_s": 60.0, "max_disconnection_time_s": 0.4})
    assert margin.text == "150.0 × the limit" and not margin.ok


def test_headline_names_the_checks_that_fail() -> None:
    from mobile_app.state.results import headline

    assert headline("pass", []) == "All checks pass"
    assert headline("fail", ["disconnection: fail", "protective conductor: fail"]) == (
        "At least one check fails: disconnection, protective conductor"
    )
    assert headline("incomplete", ["line conductor: not decided"]) == (
        "Not enough to decide yet: line conductor"
    )


def test_margins_follow_what_decides_the_verdict() -> None:
    # An RCD clearing in 0.04 s decides disconnection, not the breaker's 60 s; a CPC that meets the
    # proportional rule (IEC 60364-5-54 Table 54.2) is measured against it, not the adiabatic size.
    from mobile_app.state.results import margins_of

    margins = {
        m.label: m
        for m in margins_of(
            {
                "device_time_s": 60.0,
                "disconnection_time_s": 0.04,
                "max_disconnection_time_s": 0.2,
                "cpc_by_proportional_rule": True,
                "cpc_adiabatic_ok": False,
                "cpc_proportional_min_mm2": 2.5,
                "cpc_min_csa_mm2": 15.8,
                "inputs": {"circuit": {"cpc": {"csa": 2.5}}},
            }
        )
    }
    assert margins["Disconnection time"].ok
    assert margins["CPC size against the proportional rule"].ok
