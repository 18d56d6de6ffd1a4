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


def test_not_shown_without_zs(walk: Walk) -> None:
    panel = walk.results()
    assert panel.verdict == "not-shown"
    assert panel.mark.word == "NOT SHOWN"
    assert panel.cautions == CAUTIONS
    disconnection = next(row for row in panel.checks if row.id == "disconnection")
    assert disconnection.needs == "measure Zs, or Ze and R1+R2"


def test_cards_in_walk_order_with_working(walk: Walk) -> None:
    walk.set_field("zs", "0.62")
    panel = walk.results()
    ids = [card.id for card in panel.cards]
    assert ids[:3] == ["supply", "zs", "earth-fault-current"]
    assert ids[-1] == "verdict"
    assert all(card.mark.word for card in panel.cards if card.verdict != "info")
    assert all(not card.mark.word for card in panel.cards if card.verdict == "info")
    assert any("0.62" in card.working for card in panel.cards)
    assert len(panel.cautions) == 3


def test_each_check_shows_the_figure_that_decided_it(walk: Walk) -> None:
    # B32: Zs max 1.366 Ω (IEC 60898-1, 0.4 s, Cmin 0.95); with no test temperature the 0.8 figure
    # (published guidance) shows the pass: 0.62 Ω against ≤ 1.093 Ω.
    walk.set_field("zs", "0.62")
    row = next(r for r in walk.results().checks if r.id == "disconnection")
    assert row.outcome == "pass" and row.mark.word == "PASS"
    assert row.figure == "0.62 Ω against ≤ 1.093 Ω"
    assert row.margin == "43 % inside the limit"


def test_a_fail_names_its_cause_and_no_check_is_ticked_beside_it(walk: Walk) -> None:
    walk.set_field("zs", "2.0")
    panel = walk.results()
    assert panel.verdict == "fail"
    assert panel.mark.word == "FAIL"
    assert panel.headline.startswith("Fails: Disconnection: Zs 2 Ω is above the 1.366 Ω allowed")
    assert panel.cause is not None and panel.cause.remedies
    row = next(r for r in panel.checks if r.id == "disconnection")
    assert row.mark.word == "FAIL" and row.margin.endswith("beyond the limit")


def test_an_open_check_reads_not_shown_with_what_would_decide_it(walk: Walk) -> None:
    # C-type question from the field: 1.2 Ω on a B32 is within 1.366 Ω but above 0.8 × 1.366 Ω.
    walk.set_field("zs", "1.2")
    row = next(r for r in walk.results().checks if r.id == "disconnection")
    assert row.mark.word == "NOT SHOWN"
    assert row.needs.startswith("enter the test temperature to decide")
    assert row.margin == ""


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
    assert verdict_mark(None).word == "NOT SHOWN"
    assert verdict_mark("incomplete").word == "NOT SHOWN"  # saved by calc 0.1


def test_quantity_format() -> None:
    assert format_quantity(352.419, "A") == "352 A"
    assert format_quantity(0.62, "Ω") == "0.62 Ω"
    assert format_quantity(1500, "A") == "1 500 A"
    assert format_quantity(None, "s") == "—"


def test_headline_is_the_primary_cause() -> None:
    from mobile_app.state.results import headline

    assert headline("pass", None) == "Every check passes"
    assert headline("fail", {"text": "Disconnection: Zs too high"}) == "Fails: Disconnection: Zs too high"
    cause = {"text": "Polarity: not recorded"}
    assert headline("not-shown", cause) == "Not shown yet: Polarity: not recorded"
