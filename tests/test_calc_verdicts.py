"""The judgement above the arithmetic: which current each check uses, what a bound proves, what the
headline says. One test (or a few) per point of the verdict work, each naming its clause or marked
common practice."""

from __future__ import annotations

import pytest

from calc import InputError, assess


def check(result, check_id):
    return next(c for c in result.checks if c.id == check_id)


# 1. Three outcomes -------------------------------------------------------------------------------------


def test_a_check_the_evidence_does_not_decide_is_not_shown_and_says_what_would(circuit):
    del circuit["supply"]["pfc"]
    result = assess(circuit)
    capacity = check(result, "breaking-capacity")
    assert capacity.outcome == "not-shown" and capacity.ok is None
    assert capacity.needs == "enter the prospective fault current (PFC) at the board"
    assert result.verdict == "not-shown"
    assert result.breaking_capacity_ok is None


def test_a_failure_on_evidence_wins_over_checks_not_shown(circuit):
    del circuit["supply"]["pfc"]
    circuit["measured"]["polarity"] = False
    result = assess(circuit)
    assert result.verdict == "fail"
    assert result.primary_cause.check == "polarity"


# 2. Both ends of the fault-current range ---------------------------------------------------------------


def fuse_circuit(zs: float, zsc: float | None = None) -> dict:
    data = {
        "supply": {"system": "TN-S", "pfc": "2 kA"},
        "circuit": {
            "role": "final",
            "device": {"kind": "fuse-gg", "rating": 50, "breaking_capacity": "80 kA"},
            "line": {"csa": 2.5},
            "cpc": {"csa": 2.5},
        },
        "measured": {"zs": zs},
    }
    if zsc is not None:
        data["measured"]["zsc"] = zsc
    return data


def test_fuse_circuit_fails_at_the_earth_fault_current_though_it_passes_at_isc():
    # gG 50 A: 5 s at 230 × 0.95 / 0.99 = 220.7 A and 0.4 s at 383.3 A (BS 7671:2018 Tables 41.4 and
    # 41.2). At If = 218.5 / 0.7 = 312.1 A it clears within about 1.02 s (log-log between them), while
    # 2.5 mm² copper PVC withstands (115 × 2.5 / 312.1)² = 0.848 s (IEC 60364-4-43 434.5.2).
    # At Isc = 218.5 / 0.42 = 520 A the fuse is faster than the conductor's 0.305 s.
    result = assess(fuse_circuit(0.7, zsc=0.42))
    assert result.disconnection_ok is True  # 5 s for a final circuit above 32 A (411.3.2.3)
    smallest = check(result, "line-withstand-min")
    assert smallest.outcome == "fail"
    assert smallest.current_a == pytest.approx(312.14, abs=0.01)
    assert smallest.figure == pytest.approx((115 * 2.5 / 312.14) ** 2, rel=1e-3)
    assert "earth fault at the circuit's end" in smallest.why
    assert result.line_withstand_ok is False and result.verdict == "fail"


def test_the_largest_current_is_the_prospective_fault_current_at_the_board(circuit):
    # B32 with 2.5 mm² near the board, PFC 1.1 kA: (115 × 2.5 / 1100)² = 0.0683 s < 0.1 s, and the
    # breaker clears in under 0.1 s (IEC 60898-1 Table 7): the bound proves nothing (434.5.2).
    circuit["supply"]["pfc"] = "1.1 kA"
    result = assess(circuit)
    largest = check(result, "line-withstand-max")
    assert largest.outcome == "not-shown"
    assert largest.current_a == 1100
    assert largest.needs == "enter the maker's let-through I²t at 1100 A or above"
    assert result.verdict == "not-shown"


def test_an_rcd_never_stands_in_for_the_overcurrent_device_on_a_line_neutral_fault(circuit):
    # TN with a 30 mA RCD, Zs 2 Ω: a B32 is only certain to trip within 60 s at 109 A (IEC 60898-1
    # Table 7), the RCD clears the earth fault within 40 ms (IEC 61008-1 Table 1). Without Zsc, If
    # stands in for the line–neutral fault, which only the breaker clears: outside the adiabatic range.
    circuit["circuit"]["rcd"] = {"idn": "30 mA"}
    circuit["measured"].update(
        {"zs": 2.0, "rcd_time_1x": "25 ms", "rcd_time_5x": "12 ms", "rcd_test_button": True}
    )
    result = assess(circuit)
    assert result.disconnection_ok is True
    smallest = check(result, "line-withstand-min")
    assert smallest.outcome == "not-shown"
    assert smallest.follows_from is None
    assert "cleared by the device" in smallest.why


def test_tt_without_zsc_leaves_the_line_check_at_the_far_end_open(circuit):
    # TT: the earth fault loop runs through the electrodes, so If says nothing of the line–neutral
    # fault; an RCD does not clear one (IEC 60364-4-41 411.5.3 for the earth fault only).
    circuit["supply"]["system"] = "TT"
    circuit["circuit"]["rcd"] = {"idn": 0.03}
    circuit["measured"] = {"zs": 120, "polarity": True}
    smallest = check(assess(circuit), "line-withstand-min")
    assert smallest.outcome == "not-shown"
    assert smallest.needs.startswith("measure Zsc at the circuit's end")


def test_the_protective_conductor_uses_the_time_that_clears_the_earth_fault(circuit):
    # With an RCD clearing first, the CPC is checked at If with the RCD's time (IEC 60364-5-54 543.1.2).
    circuit["circuit"]["rcd"] = {"idn": 0.03}
    circuit["measured"]["zs"] = 2.0
    cpc = check(assess(circuit), "cpc")
    assert cpc.time_s == 0.04  # IEC 61008-1 Table 1: 40 ms at 5 IΔn and above


# 3. Below 0.1 s ----------------------------------------------------------------------------------------


def test_below_0_1_s_a_failed_bound_is_not_a_failure(circuit):
    circuit["supply"]["pfc"] = "1.1 kA"
    largest = check(assess(circuit), "line-withstand-max")
    assert largest.outcome == "not-shown" and largest.ok is None


def test_the_makers_let_through_decides_at_or_below_the_current_it_is_stated_at(circuit):
    # EN 60898-1 Annex ZA class 3, B 16–32 A at 6 kA: at most 45 000 A²s (from memory); 2.5 mm² copper
    # PVC withstands (115 × 2.5)² = 82 656 A²s (Table 43A, 434.5.2).
    circuit["supply"]["pfc"] = "1.1 kA"
    circuit["circuit"]["let_through_i2t"] = 45000
    circuit["circuit"]["let_through_at"] = "6 kA"
    largest = check(assess(circuit), "line-withstand-max")
    assert largest.outcome == "pass"
    assert largest.figure == 45000 and largest.limit == pytest.approx(82656.25)
    circuit["circuit"]["line"]["csa"] = 1.5  # (115 × 1.5)² = 29 756 A²s < 45 000
    circuit["circuit"]["cpc"]["csa"] = 1.0
    assert check(assess(circuit), "line-withstand-max").outcome == "fail"


def test_a_let_through_stated_below_the_check_current_does_not_apply(circuit):
    circuit["supply"]["pfc"] = "1.1 kA"
    circuit["circuit"]["let_through_i2t"] = 45000
    circuit["circuit"]["let_through_at"] = "1 kA"
    largest = check(assess(circuit), "line-withstand-max")
    assert largest.outcome == "not-shown"
    assert "stated at 1000 A, below the 1100 A" in largest.needs
    del circuit["circuit"]["let_through_at"]
    largest = check(assess(circuit), "line-withstand-max")
    assert largest.needs == "record the prospective current the maker states the let-through I²t at"


# 4. Outside the method's range -------------------------------------------------------------------------


def test_d16_at_0_93_ohm_is_a_disconnection_failure_with_no_conductor_sizing():
    # D16 max Zs = 230 × 0.95 / 320 = 0.683 Ω (BS 7671:2018 Table 41.3: 0.68 Ω); at 0.93 Ω, If = 235 A
    # is below 20 In, where IEC 60898-1 Table 7 only promises tripping within 60 s, beyond the
    # adiabatic method's 5 s (IEC 60364-4-43 434.5.2).
    data = {
        "supply": {"system": "TN-C-S", "pfc": "1.2 kA"},
        "circuit": {
            "device": {"kind": "mcb", "curve": "D", "rating": 16, "breaking_capacity": "6 kA"},
            "line": {"csa": 2.5},
            "cpc": {"csa": 1.5},
        },
        "measured": {"zs": 0.93},
    }
    result = assess(data)
    assert result.verdict == "fail"
    assert [c.id for c in result.checks if c.outcome == "fail"] == ["disconnection"]
    assert result.cpc_min_csa_mm2 is None
    for follower in ("line-withstand-min", "cpc"):
        assert check(result, follower).follows_from == "disconnection"
    cause = result.primary_cause
    assert cause.check == "disconnection"
    assert "0.93 Ω is above the 0.6828 Ω allowed" in cause.text
    assert any("RCD" in remedy for remedy in cause.remedies)
    assert set(cause.follows) == {"line-withstand-min", "cpc"}


# 5. Parallel earth paths -------------------------------------------------------------------------------


def test_a_zs_far_below_ze_plus_r1r2_with_an_own_path_above_the_limit_is_not_a_pass(circuit):
    # Published guidance: a Zs well below Ze + (R1+R2) points to parallel paths. Own path 0.35 + 1.2 =
    # 1.55 Ω > B32's 1.366 Ω.
    circuit["measured"].update({"zs": 0.4, "ze": 0.35, "r1r2": 1.2})
    result = assess(circuit)
    own = check(result, "earth-path")
    assert own.outcome == "not-shown"
    assert own.needs.startswith("resolve the difference between Zs 0.4 Ω and Ze + (R1+R2) 1.55 Ω")
    assert result.verdict != "pass"


def test_an_own_path_that_meets_the_limit_says_so(circuit):
    circuit["measured"].update({"zs": 0.3, "ze": 0.2, "r1r2": 0.5})
    own = check(assess(circuit), "earth-path")
    assert own.outcome == "pass"
    assert "own path meets the limit" in own.why


def test_the_agreement_tolerance_is_set_on_the_expected_value(circuit):
    # Common practice: max(0.05 Ω, 10 % of Ze + (R1+R2)). Expected 1.0 Ω, measured 1.11 Ω: outside
    # ±0.10 Ω (a tolerance on the measured value, ±0.111 Ω, would have let the reading widen it).
    circuit["measured"].update({"zs": 1.11, "ze": 0.35, "r1r2": 0.65})
    step = next(s for s in assess(circuit).steps if s.id == "zs")
    assert "tolerance ±0.1 Ω" in step.working
    assert "well above" in step.note


# 6. Temperature ----------------------------------------------------------------------------------------


def test_a_reading_that_fails_at_operating_temperature_fails_disconnection(circuit):
    # Copper 20 → 70 °C: (234.5 + 70)/(234.5 + 20) = 1.196 (IEC 60228 Annex B; β from IEC 60364-5-54
    # Table A.54.1). Circuit part 1.25 − 0.35 = 0.9 Ω → 0.35 + 0.9 × 1.196 = 1.427 Ω > 1.366 Ω.
    circuit["measured"].update({"zs": 1.25, "ze": 0.35, "r1r2": 0.9, "test_temp_c": 20})
    result = assess(circuit)
    assert result.zs_at_operating_temp_ohm == pytest.approx(0.35 + 0.9 * 304.5 / 254.5, rel=1e-6)
    assert result.disconnection_ok is False
    assert result.zs_margin_ok is False


def test_the_0_8_rule_is_sufficient_only_the_c40_cooker_circuit():
    # C40 max Zs = 230 × 0.95 / 400 = 0.546 Ω (BS 7671:2018 Table 41.3 gives 0.55 Ω). 0.52 Ω is within
    # it but above 0.8 × 0.546 = 0.437 Ω (published guidance): with no test temperature, not shown.
    data = {
        "supply": {"system": "TN-C-S"},
        "circuit": {
            "device": {"kind": "mcb", "curve": "C", "rating": 40},
            "line": {"csa": 6},
            "cpc": {"csa": 2.5},
        },
        "measured": {"zs": 0.52},
    }
    disconnection = check(assess(data), "disconnection")
    assert disconnection.outcome == "not-shown"
    assert disconnection.needs.startswith("enter the test temperature to decide")
    assert disconnection.limit == pytest.approx(0.8 * 230 * 0.95 / 400)


def test_each_conductor_takes_its_own_beta(circuit):
    # Steel armour (β 202 °C, IEC 60364-5-54 Table A.54.1) at its A.54.4 initial 60 °C; copper line
    # (β 234.5 °C) at 70 °C. Each ratio weighted by its share of R1+R2 from ρ20/S.
    circuit["circuit"]["cpc"] = {"csa": 16, "material": "steel", "arrangement": "armour"}
    circuit["measured"].update({"zs": 0.8, "ze": 0.35, "test_temp_c": 10})
    r_line, r_cpc = 17.241e-6 / 2.5, 138e-6 / 16
    share = r_line / (r_line + r_cpc)
    factor = share * (234.5 + 70) / (234.5 + 10) + (1 - share) * (202 + 60) / (202 + 10)
    result = assess(circuit)
    assert result.zs_at_operating_temp_ohm == pytest.approx(0.35 + 0.45 * factor, rel=1e-9)


# 7. Protective conductor k -----------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("cpc", "k"),
    [
        ({"arrangement": "separate", "bunched": False}, 143),  # A.54.2, PVC, 30 → 160 °C
        ({"arrangement": "separate", "bunched": True}, 115),  # A.54.3, PVC, 70 → 160 °C
        ({"arrangement": "separate"}, 115),  # bunched unless said otherwise: the safer k
        ({"arrangement": "separate", "bunched": False, "insulation": "thermosetting-90"}, 176),  # A.54.2
        ({"arrangement": "in-cable"}, 143),  # A.54.3, the cable's own XLPE, 90 → 250 °C
    ],
)
def test_protective_conductor_k_from_its_own_insulation_and_bunching(circuit, cpc, k):
    # A PVC protective conductor beside an XLPE cable keeps the PVC k (IEC 60364-5-54 Tables A.54.2
    # and A.54.3), not the cable's.
    circuit["circuit"]["line"]["insulation"] = "thermosetting-90"
    circuit["circuit"]["cpc"] = {"csa": 2.5, "material": "copper", **cpc}
    assert assess(circuit).k_cpc == k


def test_the_cpc_choice_shows_in_json_and_in_the_working(circuit):
    circuit["circuit"]["cpc"] = {
        "csa": 2.5,
        "material": "copper",
        "arrangement": "separate",
        "bunched": False,
    }
    out = assess(circuit).to_dict()
    assert out["inputs"]["circuit"]["cpc"]["bunched"] is False
    assert out["inputs"]["circuit"]["cpc"]["insulation"] == "thermoplastic-70"
    step = next(s for s in out["steps"] if s["id"] == "k-cpc")
    assert "separate conductor, not bunched with cables, 70 °C thermoplastic (PVC)" in step["working"]


# 8. Breaking capacity ----------------------------------------------------------------------------------


@pytest.mark.parametrize(("rated", "pfc", "outcome"), [("6 kA", "8 kA", "fail"), ("6 kA", "1.5 kA", "pass")])
def test_breaking_capacity_against_the_pfc(circuit, rated, pfc, outcome):
    # IEC 60364-4-43 434.5.1: the rated breaking capacity is at least the prospective fault current.
    circuit["circuit"]["device"]["breaking_capacity"] = rated
    circuit["supply"]["pfc"] = pfc
    circuit["circuit"]["let_through_i2t"] = 45000
    circuit["circuit"]["let_through_at"] = "10 kA"
    assert check(assess(circuit), "breaking-capacity").outcome == outcome


def test_breaking_capacity_unknown_is_not_shown(circuit):
    del circuit["circuit"]["device"]["breaking_capacity"]
    capacity = check(assess(circuit), "breaking-capacity")
    assert capacity.outcome == "not-shown"
    assert "rated breaking capacity" in capacity.needs


# 9. A maker's curve outside its points -----------------------------------------------------------------


@pytest.mark.parametrize("zs", [0.3, 7.0])
def test_a_makers_curve_outside_its_points_is_not_shown_at_both_ends(circuit, zs):
    circuit["circuit"]["device"] = {
        "kind": "curve",
        "points": [[40, 100], [150, 5], [300, 0.4]],
        "rating": 32,
    }
    circuit["measured"]["zs"] = zs  # If = 728 A above the last point; 31 A below the first
    result = assess(circuit)
    assert check(result, "disconnection").outcome == "not-shown"
    assert "add points" in check(result, "disconnection").needs
    assert result.verdict == "not-shown"


# 10. Input hygiene -------------------------------------------------------------------------------------


def test_cmin_above_1_is_refused_as_a_cmax(circuit):
    circuit["supply"]["cmin"] = 1.1
    with pytest.raises(InputError) as info:
        assess(circuit)
    assert info.value.field == "supply.cmin"
    assert "Cmax" in info.value.problem


@pytest.mark.parametrize(
    ("text", "field"), [("45,000", "circuit.let_through_i2t"), ("1,500 A", "supply.pfc")]
)
def test_a_comma_before_three_digits_is_refused(circuit, text, field):
    section, name = field.split(".", 1)
    target = circuit[section]
    target[name] = text
    with pytest.raises(InputError) as info:
        assess(circuit)
    assert info.value.field == field
    assert "without separators" in info.value.problem


def test_a_decimal_comma_stays_accepted(circuit):
    circuit["measured"]["zs"] = "0,84"
    assert assess(circuit).zs_ohm == pytest.approx(0.84)


@pytest.mark.parametrize("value", [int("9" * 400), "9" * 400, "1e400"])
def test_a_value_too_large_names_the_field(circuit, value):
    circuit["measured"]["zs"] = value
    with pytest.raises(InputError) as info:
        assess(circuit)
    assert info.value.field == "measured.zs"


def test_implausible_readings_carry_a_note(circuit):
    # Common practice: a fault current above 100 kA, or Zs above 200 Ω on TN, deserves a second look.
    circuit["measured"]["zs"] = 250
    assert any("above 200 Ω" in note for note in assess(circuit).plausibility)
    circuit["measured"]["zs"] = 0.0015
    assert any("above 100 kA" in note for note in assess(circuit).plausibility)


# 11. Every surface says the same ------------------------------------------------------------------------


def test_margins_have_one_wording_and_sign(circuit):
    out = assess(circuit).to_dict()
    for item in out["checks"]:
        if item["margin_pct"] is not None:
            word = "inside" if item["margin_pct"] >= 0 else "beyond"
            assert item["margin"].endswith(f"% {word} the limit")


def test_trade_words_in_the_working(circuit):
    text = " ".join(s.working for s in assess(circuit).steps)
    assert "70 °C thermoplastic (PVC)" in text
    assert "thermoplastic-70" not in text
