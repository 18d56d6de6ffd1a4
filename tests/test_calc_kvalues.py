"""k values against IEC 60364-4-43 Table 43A and IEC 60364-5-54 Tables A.54.2–A.54.4, and the k formula
of IEC 60364-5-54 Annex A / IEC 60949. Published tables round inconsistently: compared to ±1."""

from __future__ import annotations

import pytest

from calc import tables
from calc.kvalues import k_formula, k_line, k_protective

# (material, θi, θf, tabulated k, source)
FORMULA_CASES = [
    ("copper", 70, 160, 115, "IEC 60364-4-43 Table 43A, thermoplastic 70 °C"),
    ("copper", 90, 250, 143, "IEC 60364-4-43 Table 43A, thermosetting 90 °C"),
    ("copper", 30, 160, 143, "IEC 60364-5-54 Table A.54.2, separate, thermoplastic"),
    ("copper", 90, 160, 100, "IEC 60364-4-43 Table 43A, thermoplastic 90 °C"),
    ("aluminium", 70, 160, 76, "IEC 60364-4-43 Table 43A, thermoplastic 70 °C"),
    ("aluminium", 90, 250, 94, "IEC 60364-4-43 Table 43A, thermosetting 90 °C"),
    ("steel", 60, 200, 51, "IEC 60364-5-54 Table A.54.4, armour of 70 °C cable"),
    ("steel", 80, 200, 46, "IEC 60364-5-54 Table A.54.4, armour of 90 °C cable"),
    ("copper", 30, 250, 176, "IEC 60364-5-54 Table A.54.2, separate, thermosetting"),
]


@pytest.mark.parametrize(("material", "theta_i", "theta_f", "k", "source"), FORMULA_CASES)
def test_k_formula_reproduces_the_tables(material, theta_i, theta_f, k, source):
    assert k_formula(material, theta_i, theta_f) == pytest.approx(k, abs=1.0), source


def test_k_formula_check_figures():
    # Check figures of the formula itself, IEC 60364-5-54 Annex A constants: copper 70→160 °C 114.8,
    # 90→250 °C 142.9, 30→160 °C 142.7; steel 60→200 °C 51.2, 80→200 °C 46.6.
    assert k_formula("copper", 70, 160) == pytest.approx(114.8, abs=0.05)
    assert k_formula("copper", 90, 250) == pytest.approx(142.9, abs=0.05)
    assert k_formula("copper", 30, 160) == pytest.approx(142.7, abs=0.05)
    assert k_formula("steel", 60, 200) == pytest.approx(51.2, abs=0.05)
    assert k_formula("steel", 80, 200) == pytest.approx(46.6, abs=0.05)


def test_iec_60949_worked_example():
    # IEC 60949 example: 95 mm² copper XLPE 90→250 °C, 1 s, K = 225.669 gives 13.6 kA;
    # K·√ln((β+θf)/(β+θi)) is the k of IEC 60364, so k·S/√t must give the same current.
    import math

    k_from_iec_60949 = 225.669 * math.sqrt(math.log((234.5 + 250) / (234.5 + 90)))
    assert k_from_iec_60949 == pytest.approx(k_formula("copper", 90, 250), rel=1e-3)
    assert k_line("copper", "thermosetting-90", 95).k * 95 / math.sqrt(1.0) == pytest.approx(13600, rel=0.01)


@pytest.mark.parametrize(
    ("material", "insulation", "csa", "k"),
    [
        ("copper", "thermoplastic-70", 2.5, 115),  # IEC 60364-4-43 Table 43A
        ("copper", "thermoplastic-70", 400, 103),  # Table 43A, above 300 mm²
        ("aluminium", "thermoplastic-70", 50, 76),  # Table 43A
        ("aluminium", "thermoplastic-70", 400, 68),  # Table 43A, above 300 mm²
        ("copper", "thermoplastic-90", 10, 100),  # Table 43A
        ("copper", "thermosetting-90", 95, 143),  # Table 43A
        ("aluminium", "thermosetting-90", 95, 94),  # Table 43A
        ("copper", "rubber-60", 4, 141),  # Table 43A
    ],
)
def test_line_k_from_table_43a(material, insulation, csa, k):
    assert k_line(material, insulation, csa).k == k


@pytest.mark.parametrize(
    ("material", "arrangement", "insulation", "k"),
    [
        ("copper", "separate", "thermoplastic-70", 143),  # IEC 60364-5-54 Table A.54.2
        ("aluminium", "separate", "thermoplastic-70", 95),  # Table A.54.2
        ("steel", "separate", "thermoplastic-70", 52),  # Table A.54.2
        ("copper", "separate", "thermosetting-90", 176),  # Table A.54.2
        ("copper", "in-cable", "thermoplastic-70", 115),  # Table A.54.3
        ("copper", "in-cable", "thermosetting-90", 143),  # Table A.54.3
        ("aluminium", "in-cable", "thermoplastic-90", 66),  # Table A.54.3
        ("steel", "armour", "thermoplastic-70", 51),  # Table A.54.4
        ("steel", "armour", "thermosetting-90", 46),  # Table A.54.4
        ("aluminium", "armour", "thermoplastic-70", 93),  # Table A.54.4
    ],
)
def test_protective_k_from_tables_a54(material, arrangement, insulation, k):
    assert k_protective(material, arrangement, insulation).k == k


def test_values_marked_from_memory_are_flagged():
    # Copper armour k (141 / 128) is recalled, not read from Table A.54.4: the data must say so.
    assert k_protective("copper", "armour", "thermoplastic-70").from_memory
    assert not k_protective("steel", "armour", "thermoplastic-70").from_memory


def test_every_tabulated_protective_k_agrees_with_the_formula():
    for arrangement, rows in tables.load("k_protective").items():
        if not isinstance(rows, dict):
            continue
        for insulation, row in rows.items():
            for material in ("copper", "aluminium", "steel"):
                if material in row:
                    expected = k_formula(material, row["theta_i_c"], row["theta_f_c"])
                    assert row[material] == pytest.approx(expected, abs=1.0), (arrangement, insulation)
