"""A circuit's other tests against their published limits: insulation resistance (IEC 60364-6 Table
6.1), continuity against IEC 60228 resistances, ring final circuit readings (common practice), polarity,
RCD operating times (IEC 61008-1 / IEC 61009-1 Table 1) and the test button."""

from __future__ import annotations

import pytest

from calc import InputError, assess


def check(result, check_id):
    return next(c for c in result.checks if c.id == check_id)


# Insulation resistance ---------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("selv", "volts", "reading", "outcome"),
    [
        (False, 500, 1.0, "pass"),  # IEC 60364-6 Table 6.1 (from memory): ≤ 500 V circuits, 500 V, ≥ 1 MΩ
        (False, 500, 0.9, "fail"),
        (True, 250, 0.5, "pass"),  # SELV/PELV: 250 V, ≥ 0.5 MΩ
        (True, 250, 0.45, "fail"),
        (False, 250, 50, "not-shown"),  # a 230 V circuit needs a 500 V test
    ],
)
def test_insulation_against_table_6_1(circuit, selv, volts, reading, outcome):
    circuit["circuit"]["selv"] = selv
    circuit["measured"]["insulation"] = {"test_voltage": volts, "line_line": ">999", "line_earth": reading}
    result = assess(circuit)
    assert check(result, "insulation").outcome == outcome
    assert result.insulation_min_mohm == reading


def test_insulation_above_the_meters_range_passes_and_a_missing_test_is_not_shown(circuit):
    circuit["measured"]["insulation"] = {"test_voltage": "500 V", "line_earth": ">999"}
    result = assess(circuit)
    assert result.insulation_ok is True
    assert "L–L not recorded" in check(result, "insulation").why
    del circuit["measured"]["insulation"]
    missing = check(assess(circuit), "insulation")
    assert missing.outcome == "not-shown"
    assert missing.needs == "test insulation resistance at 500 V d.c. (at least 1 MΩ)"


def test_insulation_readings_take_units(circuit):
    circuit["measured"]["insulation"] = {"test_voltage": 500, "line_line": "2000 kΩ", "line_earth": "3 MΩ"}
    assert assess(circuit).insulation_min_mohm == pytest.approx(2.0)
    circuit["measured"]["insulation"]["line_earth"] = "3 V"
    with pytest.raises(InputError) as info:
        assess(circuit)
    assert info.value.field == "measured.insulation.line_earth"


# Continuity --------------------------------------------------------------------------------------------


def test_expected_r1r2_from_the_length_and_iec_60228(circuit):
    # IEC 60228 Table 1/2: 2.5 mm² copper 7.41 Ω/km, 1.5 mm² 12.1 Ω/km; 20 m → 0.39 Ω at 20 °C.
    circuit["circuit"]["length_m"] = 20
    circuit["measured"]["r1r2"] = 0.40
    result = assess(circuit)
    assert result.expected_r1r2_ohm == pytest.approx(20 * (7.41 + 12.1) / 1000)
    assert result.continuity_ok is True


def test_expected_r1r2_at_the_test_temperature(circuit):
    # Copper 20 → 10 °C: (234.5 + 10)/(234.5 + 20) (IEC 60228 Annex B).
    circuit["circuit"]["length_m"] = 20
    circuit["measured"]["test_temp_c"] = 10
    expected = 20 * (7.41 + 12.1) / 1000 * 244.5 / 254.5
    assert assess(circuit).expected_r1r2_ohm == pytest.approx(expected)


def test_a_reading_far_from_the_length_is_not_shown(circuit):
    # Common practice tolerance: the larger of 0.05 Ω and 20 % of the expected 0.39 Ω.
    circuit["circuit"]["length_m"] = 20
    circuit["measured"]["r1r2"] = 0.9
    continuity = check(assess(circuit), "continuity")
    assert continuity.outcome == "not-shown"
    assert "check the length and the connections" in continuity.needs


def test_continuity_from_r2_alone(circuit):
    # IEC 60228: 1.5 mm² copper 12.1 Ω/km, 30 m → 0.363 Ω.
    del circuit["measured"]["r1r2"]
    circuit["circuit"]["length_m"] = 30
    circuit["measured"]["r2"] = 0.37
    result = assess(circuit)
    assert result.expected_r1r2_ohm == pytest.approx(0.363)
    assert result.continuity_ok is True
    del circuit["measured"]["r2"]
    assert check(assess(circuit), "continuity").needs == "measure R1+R2 (or R2)"


# Ring final circuits (common practice) -----------------------------------------------------------------


def test_a_ring_whose_readings_agree(circuit):
    # Common practice: r1 ≈ rn within 0.05 Ω; r2 ≈ r1 × 2.5/1.5 = 1.67 r1; each point (r1 + r2)/4.
    circuit["measured"]["ring"] = {"r1": 0.5, "rn": 0.51, "r2": 0.83}
    result = assess(circuit)
    assert result.ring_ok is True
    assert result.ring_expected_r1r2_ohm == pytest.approx((0.5 + 0.83) / 4)


@pytest.mark.parametrize("ring", [{"r1": 0.5, "rn": 0.6, "r2": 0.83}, {"r1": 0.5, "rn": 0.5, "r2": 0.5}])
def test_a_ring_whose_readings_disagree_fails(circuit, ring):
    circuit["measured"]["ring"] = ring
    assert assess(circuit).ring_ok is False


def test_a_ring_circuit_without_its_readings_is_not_shown(circuit):
    circuit["circuit"]["ring"] = True
    ring = check(assess(circuit), "ring")
    assert ring.outcome == "not-shown" and ring.needs == "record r1, rn and r2 end to end"


# Polarity and the RCD ----------------------------------------------------------------------------------


@pytest.mark.parametrize(("value", "outcome"), [(True, "pass"), (False, "fail"), (None, "not-shown")])
def test_polarity(circuit, value, outcome):
    circuit["measured"]["polarity"] = value
    assert check(assess(circuit), "polarity").outcome == outcome


@pytest.mark.parametrize(
    ("kind", "at_1x", "at_5x", "outcome"),
    [
        ("general", "280 ms", "38 ms", "pass"),  # IEC 61008-1 Table 1: ≤ 300 ms, ≤ 40 ms
        ("general", "310 ms", "20 ms", "fail"),
        ("general", "25 ms", "45 ms", "fail"),
        ("general", ">300 ms", "20 ms", "fail"),  # no trip within the test: beyond the limit
        ("s", "200 ms", "100 ms", "pass"),  # type S: 130–500 ms, 50–150 ms
        ("s", "100 ms", "100 ms", "fail"),  # faster than a type S may be
        ("s", "200 ms", "160 ms", "fail"),
        ("general", "0.028", None, "not-shown"),
    ],
)
def test_rcd_operating_times(circuit, kind, at_1x, at_5x, outcome):
    circuit["circuit"]["rcd"] = {"idn": "30 mA", "type": kind}
    circuit["measured"].update({"rcd_time_1x": at_1x, "rcd_test_button": True})
    if at_5x is not None:
        circuit["measured"]["rcd_time_5x"] = at_5x
    result = assess(circuit)
    assert check(result, "rcd-time").outcome == outcome
    assert result.rcd_time_limit_1x_s == {"general": 0.3, "s": 0.5}[kind]
    assert result.rcd_time_limit_5x_s == {"general": 0.04, "s": 0.15}[kind]


def test_additional_protection_needs_30_ma(circuit):
    # IEC 60364-4-41 415.1.1: an RCD for additional protection has IΔn ≤ 30 mA.
    circuit["circuit"]["rcd"] = {"idn": "100 mA", "additional": True}
    circuit["measured"].update({"rcd_time_1x": "20 ms", "rcd_time_5x": "10 ms", "rcd_test_button": True})
    time_check = check(assess(circuit), "rcd-time")
    assert time_check.outcome == "fail" and "30 mA" in time_check.why


def test_rcd_button_and_no_rcd_checks_without_an_rcd(circuit):
    ids = {c.id for c in assess(circuit).checks}
    assert not ids & {"rcd-time", "rcd-button"}
    circuit["circuit"]["rcd"] = {"idn": 0.03}
    circuit["measured"]["rcd_test_button"] = False
    assert assess(circuit).rcd_button_ok is False


def test_each_test_appears_as_a_step(circuit):
    circuit["circuit"]["rcd"] = {"idn": 0.03}
    circuit["circuit"]["ring"] = True
    ids = [s.id for s in assess(circuit).steps]
    for step_id in ("insulation", "continuity", "ring", "polarity", "rcd-time", "rcd-button"):
        assert step_id in ids


def test_tests_round_trip_through_the_normalised_input(circuit):
    circuit["circuit"]["rcd"] = {"idn": 0.03, "type": "s"}
    circuit["circuit"]["length_m"] = 12
    circuit["measured"].update(
        {
            "ring": {"r1": 0.5, "rn": 0.5, "r2": 0.83},
            "rcd_time_1x": ">500 ms",
            "rcd_time_5x": "0.1 s",
            "rcd_test_button": True,
        }
    )
    first = assess(circuit).to_dict()
    assert assess(first["inputs"]).to_dict() == first


def test_a_rings_expected_r1r2_is_a_quarter_of_its_loop(circuit):
    # Common practice: on a ring each point reads about (r1 + r2)/4; IEC 60228: 2.5 mm² 7.41 Ω/km,
    # 1.5 mm² 12.1 Ω/km, so a 60 m loop gives (7.41 + 12.1) × 0.06 / 4 = 0.293 Ω.
    circuit["circuit"]["ring"] = True
    circuit["circuit"]["length_m"] = 60
    circuit["measured"]["r1r2"] = 0.30
    circuit["measured"]["ring"] = {"r1": 0.44, "rn": 0.44, "r2": 0.74}
    result = assess(circuit)
    assert result.expected_r1r2_ohm == pytest.approx((7.41 + 12.1) * 0.06 / 4)
    assert result.continuity_ok is True
