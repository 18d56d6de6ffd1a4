"""The reference tables: each names its source; values sorted, positive and monotonic."""

from __future__ import annotations

import pytest

from calc import tables


@pytest.mark.parametrize("name", tables.TABLE_NAMES)
def test_every_table_names_its_source(name):
    source = tables.load(name)["source"]
    assert "IEC" in source or "BS" in source


def test_mcb_ratings_sorted_and_multiples_ordered():
    data = tables.load("mcb")
    assert data["ratings_a"] == sorted(data["ratings_a"]) and data["ratings_a"][0] > 0
    for curve in data["curve"].values():
        assert 0 < curve["instantaneous_no_trip"] < curve["instantaneous_trip"]
    assert data["conventional_tripping_multiple"] < data["c_test_multiple"]


def test_fuse_rows_sorted_positive_and_gates_ordered():
    rows = tables.load("fuse_gg")["rating"]
    ratings = [r["in_a"] for r in rows]
    assert ratings == sorted(ratings)
    for row in rows:
        assert row["zs_5_ohm"] > row.get("zs_0_4_ohm", 0) > -1
        if "gates_a" in row:
            g = row["gates_a"]
            assert 0 < g["imin_10s"] < g["imax_5s"] and g["imin_0_1s"] < g["imax_0_1s"]
    zs5 = [r["zs_5_ohm"] for r in rows]
    assert zs5 == sorted(zs5, reverse=True)


def test_disconnection_bands_sorted_and_tt_stricter():
    bands = tables.load("disconnection_times")["band"]
    assert [b["u0_max_v"] for b in bands] == sorted(b["u0_max_v"] for b in bands)
    for band in bands:
        assert 0 < band["tt_s"] < band["tn_s"]
    assert [b["tn_s"] for b in bands] == sorted((b["tn_s"] for b in bands), reverse=True)


def test_rcd_times_fall_as_current_rises():
    for rcd in ("general", "s"):
        row = tables.load("rcd")[rcd]
        assert row["multiples"] == sorted(row["multiples"])
        assert row["max_time_s"] == sorted(row["max_time_s"], reverse=True)


def test_k_tables_positive():
    for insulation, row in tables.load("k_line").items():
        if isinstance(row, dict):
            assert row["theta_i_c"] < row["theta_f_large_c"] <= row["theta_f_c"], insulation
            assert row["copper"] >= row["copper_large"] > 0
            assert row["aluminium"] >= row["aluminium_large"] > 0


def test_conductor_resistances_sorted_and_falling():
    # IEC 60228 Tables 1 and 2: a larger conductor has the lower resistance.
    for material in ("copper", "aluminium"):
        row = tables.load("conductor_resistance")[material]
        assert row["csa_mm2"] == sorted(row["csa_mm2"])
        assert row["ohm_per_km"] == sorted(row["ohm_per_km"], reverse=True)
        assert len(row["csa_mm2"]) == len(row["ohm_per_km"])


def test_insulation_rows_ordered():
    # IEC 60364-6 Table 6.1 (from memory): test voltage and minimum rise with the circuit's voltage.
    data = tables.load("insulation")
    assert data["memory"] is True
    rows = [r for r in data["row"] if not r["selv"]]
    assert [r["nominal_max_v"] for r in rows] == sorted(r["nominal_max_v"] for r in rows)
    assert [r["test_voltage_v"] for r in data["row"]] == [250, 500, 1000]


def test_type_s_rcd_windows():
    # IEC 61008-1 Table 1: a type S waits at least its minimum and breaks within its maximum.
    row = tables.load("rcd")["s"]
    assert all(lo < hi for lo, hi in zip(row["min_time_s"], row["max_time_s"], strict=True))
