"""Whole assessments: verdicts, nulls for what cannot be computed, and the steps in walk order."""

from __future__ import annotations

import json

import pytest

from calc import CAUTIONS, InputError, assess

REQUIRED_KEYS = {
    "earth_fault_current_a",
    "short_circuit_current_a",
    "max_disconnection_time_s",
    "device_time_s",
    "device_time_at_short_circuit_s",
    "zs_max_ohm",
    "disconnection_ok",
    "k_line",
    "k_cpc",
    "line_withstand_time_s",
    "line_withstand_ok",
    "cpc_min_csa_mm2",
    "cpc_by_proportional_rule",
    "cpc_ok",
    "verdict",
    "steps",
}
STEP_KEYS = {"id", "title", "formula", "working", "value", "unit", "verdict", "note"}


def test_output_has_the_contract_keys(circuit):
    out = assess(circuit).to_dict()
    assert REQUIRED_KEYS <= out.keys()
    assert all(set(step) == STEP_KEYS for step in out["steps"])
    assert out["cautions"] == list(CAUTIONS)
    json.dumps(out)


def test_b32_at_0_62_ohm_passes(circuit):
    out = assess(circuit).to_dict()
    # If = 230 × 0.95 / 0.62 = 352.4 A (IEC 60364-4-41 411.4.4 with Cmin 0.95)
    assert out["earth_fault_current_a"] == pytest.approx(352.42, abs=0.01)
    assert out["max_disconnection_time_s"] == 0.4  # IEC 60364-4-41 Table 41.1, TN, 230 V
    assert out["device_time_s"] == 0.1
    assert out["zs_max_ohm"] == pytest.approx(1.37, abs=0.01)  # BS 7671:2018 Table 41.3
    assert out["k_line"] == 115 and out["k_cpc"] == 115  # Table 43A, Table A.54.3
    assert out["verdict"] == "pass"


def test_missing_zs_is_incomplete_and_nulls_are_null(circuit):
    circuit["measured"] = {}
    out = assess(circuit).to_dict()
    assert out["verdict"] == "incomplete"
    for key in ("earth_fault_current_a", "device_time_s", "disconnection_ok", "cpc_min_csa_mm2"):
        assert out[key] is None
    assert out["short_circuit_current_a"] is None


def test_zs_from_ze_plus_r1r2(circuit):
    circuit["measured"] = {"ze": 0.35, "r1r2": 0.3}
    out = assess(circuit).to_dict()
    assert out["zs_ohm"] == pytest.approx(0.65)
    assert out["zs_source"] == "Ze + (R1+R2)"


def test_large_difference_between_zs_and_ze_plus_r1r2_is_flagged(circuit):
    circuit["measured"] = {"zs": 1.0, "ze": 0.35, "r1r2": 0.3}
    step = next(s for s in assess(circuit).to_dict()["steps"] if s["id"] == "zs")
    assert step["verdict"] == "check"
    assert "differ" in step["note"]


def test_disconnection_flips_at_the_limit(circuit):
    # B32 max Zs 1.366 Ω (U0 230 V, Cmin 0.95, 5 In = 160 A, IEC 60898-1): just inside and just outside.
    limit = 230 * 0.95 / 160
    circuit["measured"] = {"zs": limit * 0.999}
    assert assess(circuit).disconnection_ok is True
    circuit["measured"] = {"zs": limit * 1.001}
    result = assess(circuit)
    assert result.disconnection_ok is False
    assert result.verdict == "fail"


def test_rule_of_thumb_decides_without_a_test_temperature(circuit):
    # common practice: Zs ≤ 0.8 × Zs max when no test temperature is given
    limit = 230 * 0.95 / 160
    circuit["measured"] = {"zs": 0.85 * limit}
    result = assess(circuit)
    assert result.disconnection_ok is True
    assert result.zs_margin_ok is False
    assert result.verdict == "fail"


def test_temperature_corrected_limit_decides_when_given(circuit):
    # IEC 60228 Annex B resistance ratio for copper, 70 °C operating, 20 °C test: 254.5/304.5 = 0.836
    limit = 230 * 0.95 / 160
    circuit["measured"] = {"zs": 0.84 * limit, "test_temp_c": 20}
    result = assess(circuit)
    assert result.zs_limit_at_test_temp_ohm == pytest.approx(limit * 254.5 / 304.5)
    assert result.zs_margin_ok is False
    circuit["measured"] = {"zs": 0.83 * limit, "test_temp_c": 20}
    assert assess(circuit).zs_margin_ok is True


def test_line_withstand_with_let_through_energy(circuit):
    # Energy-limiting class 3 B32 at 6 kA lets through at most 45 000 A²s (EN 60898-1 Annex ZA, from
    # memory); 2.5 mm² copper thermoplastic withstands (115 × 2.5)² = 82 656 A²s (Table 43A, 434.5.2).
    circuit["measured"] = {"zs": 0.62, "zsc": 0.04}
    circuit["circuit"]["let_through_i2t"] = 45000
    out = assess(circuit).to_dict()
    step = next(s for s in out["steps"] if s["id"] == "line-withstand")
    assert step["value"] == pytest.approx(82656.25)
    assert out["line_withstand_ok"] is True
    circuit["circuit"]["line"]["csa"] = 1.5  # (115 × 1.5)² = 29 756 A²s < 45 000
    circuit["circuit"]["cpc"]["csa"] = 1.0
    assert assess(circuit).line_withstand_ok is False


def test_cpc_proportional_rule_and_adiabatic(circuit):
    circuit["circuit"]["cpc"]["csa"] = 2.5
    result = assess(circuit)
    assert result.cpc_by_proportional_rule is True
    # S = √(352.4² × 0.1)/115 = 0.969 mm² (IEC 60364-5-54 543.1.2, 0.1 s for a sub-0.1 s trip)
    assert result.cpc_min_csa_mm2 == pytest.approx(0.969, abs=0.001)
    assert result.cpc_ok is True


def test_cpc_fails_when_neither_rule_nor_adiabatic_met(circuit):
    circuit["circuit"]["device"] = {"kind": "fuse-gg", "rating": 63}
    circuit["circuit"]["line"]["csa"] = 16
    circuit["circuit"]["cpc"]["csa"] = 1.5
    circuit["measured"] = {"zs": 0.7}
    result = assess(circuit)
    assert result.cpc_by_proportional_rule is False
    assert result.cpc_ok is False
    assert result.verdict == "fail"


def test_separate_cpc_minimum_sizes(circuit):
    # IEC 60364-5-54 543.1.3: separate copper 2.5 mm² with mechanical protection, 4 mm² without
    circuit["circuit"]["cpc"] = {"csa": 2.5, "material": "copper", "arrangement": "separate"}
    circuit["circuit"]["line"]["csa"] = 2.5
    steps = {s["id"]: s for s in assess(circuit).to_dict()["steps"]}
    assert steps["cpc-separate"]["verdict"] == "check"
    circuit["circuit"]["cpc"]["csa"] = 1.5
    assert assess(circuit).cpc_ok is False


def test_tt_with_rcd_touch_voltage(circuit):
    # IEC 60364-4-41 411.5.3: RA × IΔn ≤ 50 V, so 1667 Ω at 30 mA (common practice figure)
    circuit["supply"]["system"] = "TT"
    circuit["circuit"]["rcd"] = {"idn": "30 mA", "type": "general"}
    circuit["measured"] = {"zs": 120}
    result = assess(circuit)
    assert result.touch_voltage_v == pytest.approx(3.6)
    assert result.touch_voltage_ok is True
    assert result.disconnection_ok is True  # RCD clears: 1.8 A = 60 IΔn → ≤ 40 ms (IEC 61008-1, memory)
    assert result.max_disconnection_time_s == 0.2  # Table 41.1, TT 230 V
    circuit["measured"] = {"zs": 1700}
    assert assess(circuit).touch_voltage_ok is False


def test_curve_device_beyond_its_points_is_incomplete(circuit):
    circuit["circuit"]["device"] = {
        "kind": "curve",
        "points": [[40, 100], [150, 5], [300, 0.4]],
        "rating": 32,
    }
    circuit["measured"] = {"zs": 0.3}  # If = 728 A, above the last point
    result = assess(circuit)
    assert result.device_time_s is None
    assert result.verdict == "incomplete"
    circuit["measured"] = {"zs": 7.0}  # If = 31 A, below the first point: not known to operate
    result = assess(circuit)
    assert result.disconnection_ok is False
    assert result.verdict == "fail"


def test_units_as_typed_give_the_same_result(circuit):
    as_numbers = assess(circuit).to_dict()
    circuit["measured"]["zs"] = "620 mΩ"
    circuit["circuit"]["line"]["csa"] = "2.5mm2"
    circuit["circuit"]["cpc"]["csa"] = "1.5mm"
    circuit["circuit"]["device"]["rating"] = "32 A"
    assert assess(circuit).to_dict() == as_numbers


@pytest.mark.parametrize(
    ("path", "value", "field"),
    [
        (("measured", "zs"), -1, "measured.zs"),
        (("measured", "zs"), 0, "measured.zs"),
        (("measured", "zs"), "0.5 mm^2", "measured.zs"),
        (("measured", "zs"), "abc", "measured.zs"),
        (("circuit", "line", "csa"), 0, "circuit.line.csa"),
        (("circuit", "device", "curve"), "E", "circuit.device.curve"),
        (("circuit", "device", "rating"), 33, "circuit.device.rating"),
        (("supply", "system"), "IT", "supply.system"),
        (("measured", "zss"), 1, "measured.zss"),
        (("measured", "zs"), True, "measured.zs"),
        (("measured", "zs"), float("nan"), "measured.zs"),
    ],
)
def test_bad_input_names_the_field(circuit, path, value, field):
    target = circuit
    for key in path[:-1]:
        target = target[key]
    target[path[-1]] = value
    with pytest.raises(InputError) as info:
        assess(circuit)
    assert info.value.field == field


def test_missing_required_fields(circuit):
    del circuit["supply"]["system"]
    with pytest.raises(InputError, match=r"^supply\.system: is required"):
        assess(circuit)


def test_error_message_text():
    with pytest.raises(InputError) as info:
        assess(
            {
                "supply": {"system": "TN-S"},
                "circuit": {
                    "device": {"kind": "mcb", "curve": "B", "rating": 32},
                    "line": {"csa": 2.5},
                    "cpc": {"csa": 1.5},
                },
                "measured": {"zs": -0.2},
            }
        )
    assert str(info.value) == "measured.zs: must be greater than zero"


def test_tt_without_zsc_line_check_counts_the_rcd(circuit):
    # An earth fault on a TT circuit is cleared by the RCD (IEC 60364-4-41 411.5.3): with no Zsc the
    # line conductor is checked at If against the RCD's break time (IEC 61008-1 Table 1, from memory).
    circuit["supply"]["system"] = "TT"
    circuit["circuit"]["rcd"] = {"idn": 0.03, "type": "general"}
    circuit["measured"] = {"zs": 120}
    result = assess(circuit)
    assert result.short_circuit_current_a is None
    assert result.line_withstand_ok is True
    assert result.verdict == "pass"
