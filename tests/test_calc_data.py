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
