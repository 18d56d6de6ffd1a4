"""The equations against published worked examples and tables."""

from __future__ import annotations

import pytest

from calc.formulas import (
    adiabatic_min_csa_mm2,
    adiabatic_withstand_time_s,
    fault_current_a,
    max_loop_impedance_ohm,
    proportional_cpc_csa_mm2,
    resistance_ratio,
)
from calc.limits import max_disconnection_time, rcd_break_time_s


@pytest.mark.parametrize(
    ("current_a", "time_s", "k", "csa"),
    [
        (200, 0.4, 115, 1.10),  # Linsley, Basic Electrical Installation Work, adiabatic example
        (90, 0.4, 115, 0.49),  # same source, second example
    ],
)
def test_adiabatic_minimum_size_textbook(current_a, time_s, k, csa):
    assert adiabatic_min_csa_mm2(current_a, time_s, k) == pytest.approx(csa, abs=0.005)


def test_withstand_time_is_the_inverse_of_the_minimum_size():
    # IEC 60364-4-43 434.5.2 and IEC 60364-5-54 543.1.2 are the same equation solved for t and for S.
    t = adiabatic_withstand_time_s(115, 1.10, 200)
    assert t == pytest.approx(0.4, rel=0.01)  # Linsley example read backwards


def test_fault_current_and_max_zs():
    # IEC 60364-4-41 411.4.4 with Cmin 0.95 (IEC 60909-0 Table 1): B32 instantaneous at 160 A
    # gives 1.37 Ω (BS 7671:2018 Table 41.3).
    assert max_loop_impedance_ohm(230, 0.95, 160) == pytest.approx(1.37, abs=0.005)
    assert fault_current_a(230, 0.95, 1.37) == pytest.approx(160, rel=0.01)


@pytest.mark.parametrize(
    ("line", "cpc"),
    [(1.5, 1.5), (16, 16), (25, 16), (35, 16), (50, 25), (120, 60)],  # IEC 60364-5-54 Table 54.2
)
def test_proportional_rule_same_material(line, cpc):
    assert proportional_cpc_csa_mm2(line, 1.0, 1.0) == cpc


def test_proportional_rule_other_material():
    # IEC 60364-5-54 Table 54.2 note: another material → × k1/k2; copper line (k1 115, Table 43A)
    # with a steel armour (k2 51, Table A.54.4): 16 mm² line needs 16 × 115/51 = 36.1 mm² of steel.
    assert proportional_cpc_csa_mm2(16, 115, 51) == pytest.approx(36.08, abs=0.01)


def test_copper_resistance_temperature_factor():
    # IEC 60228 Annex B: copper from 20 °C to 70 °C ≈ ×1.20, to 90 °C ≈ ×1.28 (α20 = 1/254.5)
    assert resistance_ratio(234.5, 20, 70) == pytest.approx(1.20, abs=0.005)
    assert resistance_ratio(234.5, 20, 90) == pytest.approx(1.28, abs=0.005)


@pytest.mark.parametrize(
    ("system", "u0", "time_s"),
    [
        ("TN-S", 230, 0.4),
        ("TN-C-S", 230, 0.4),
        ("TT", 230, 0.2),
        ("TN-S", 110, 0.8),
        ("TT", 110, 0.3),
        ("TN-S", 400, 0.2),
        ("TT", 400, 0.07),
        ("TN-S", 690, 0.1),
        ("TT", 690, 0.04),
    ],
)
def test_table_41_1(system, u0, time_s):
    # IEC 60364-4-41 Table 41.1, final circuits ≤ 32 A
    assert max_disconnection_time(system, u0, "final", 32, 32).time_s == time_s


def test_distribution_and_larger_final_circuits():
    # IEC 60364-4-41 411.3.2.3 (TN 5 s) and 411.3.2.4 (TT 1 s)
    assert max_disconnection_time("TN-S", 230, "distribution", 100, 32).time_s == 5.0
    assert max_disconnection_time("TT", 230, "distribution", 100, 32).time_s == 1.0
    assert max_disconnection_time("TN-S", 230, "final", 40, 32).time_s == 5.0
    assert max_disconnection_time("TN-S", 230, "final", 40, 63).time_s == 0.4  # extended scope setting


def test_rcd_break_times():
    # IEC 61008-1 Table 1 (from memory): general type 300 ms at IΔn, 150 ms at 2 IΔn, 40 ms at 5 IΔn
    assert rcd_break_time_s("general", 0.03, 0.03) == 0.3
    assert rcd_break_time_s("general", 0.06, 0.03) == 0.15
    assert rcd_break_time_s("general", 10.0, 0.03) == 0.04
    assert rcd_break_time_s("s", 10.0, 0.1) == 0.15
    assert rcd_break_time_s("general", 0.02, 0.03) is None
