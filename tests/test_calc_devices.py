"""Device models against published maximum Zs tables and the standards' operating points."""

from __future__ import annotations

import pytest

from calc import InputError, device_curve, tables
from calc.cli import limits
from calc.devices import BELOW_CURVE, BEYOND_CURVE, NOT_OPERATING, fuse_gg, make_device, mcb
from calc.inputs import read_device

U0, CMIN = 230.0, 0.95


def zs_max(device: dict, time_s: float) -> float:
    row = next(r for r in limits(device, U0, CMIN) if r["time_s"] == time_s)
    return row["zs_max_ohm"]


@pytest.mark.parametrize(
    ("curve", "rating", "zs"),
    [
        ("B", 6, 7.28),  # BS 7671:2018 Table 41.3 (IEC 60898-1 curve B, 0.4 s, Cmin 0.95)
        ("B", 32, 1.37),  # BS 7671:2018 Table 41.3
        ("C", 32, 0.68),  # BS 7671:2018 Table 41.3
        ("D", 16, 0.68),  # BS 7671:2018 Table 41.3
    ],
)
@pytest.mark.parametrize("time_s", [0.4, 5.0])
def test_mcb_max_zs_matches_published_tables(curve, rating, zs, time_s):
    # BS 7671 gives the same figure at 0.4 s and 5 s for breakers (instantaneous tripping).
    assert zs_max({"kind": "mcb", "curve": curve, "rating": rating}, time_s) == pytest.approx(zs, abs=0.01)


@pytest.mark.parametrize(
    ("rating", "zs"),
    [
        (6, 7.80),
        (10, 4.65),
        (16, 2.43),
        (20, 1.68),
        (25, 1.29),
        (32, 0.99),
        (40, 0.75),
        (50, 0.57),
        (63, 0.44),
    ],
)
def test_gg_max_zs_at_0_4_s(rating, zs):
    # BS 7671:2018 Table 41.2, BS 88-2 gG fuses, 0.4 s, Cmin 0.95
    assert zs_max({"kind": "fuse-gg", "rating": rating}, 0.4) == pytest.approx(zs, abs=0.01)


@pytest.mark.parametrize(
    ("rating", "zs"),
    [
        (6, 12),
        (10, 6.8),
        (16, 4.0),
        (20, 2.8),
        (25, 2.2),
        (32, 1.7),
        (40, 1.3),
        (50, 0.99),
        (63, 0.78),
        (80, 0.55),
        (100, 0.42),
        (125, 0.32),
        (160, 0.27),
        (200, 0.18),
    ],
)
def test_gg_max_zs_at_5_s(rating, zs):
    # BS 7671:2018 Table 41.4, BS 88-2 gG fuses, 5 s, Cmin 0.95
    assert zs_max({"kind": "fuse-gg", "rating": rating}, 5.0) == pytest.approx(zs, abs=0.01)


@pytest.mark.parametrize(
    "row", [r for r in tables.load("fuse_gg")["rating"] if "gates_a" in r], ids=lambda r: f"gG{r['in_a']}"
)
def test_gg_model_lies_inside_the_iec_60269_gates(row):
    # IEC 60269-1 Table 3 gates (from memory): the fuse must operate within 5 s at Imax(5 s) and within
    # 0.1 s at Imax(0.1 s), and must not operate within 10 s below Imin(10 s).
    fuse = fuse_gg(row["in_a"])
    gates = row["gates_a"]
    assert fuse.time_at(gates["imax_5s"]).time_s <= 5.0
    assert fuse.time_at(gates["imax_0_1s"]).time_s <= 0.1 + 1e-12
    assert fuse.current_for_time(10.0) > 0
    assert fuse.current_for_time(5.0) >= gates["imin_10s"]


def test_mcb_time_bands_iec_60898_1_table_7():
    # IEC 60898-1 Table 7: instantaneous above 5 In (B), within 60 s from 2.55 In (In ≤ 32 A), within 1 h
    # from 1.45 In, no guaranteed trip below.
    b32 = mcb("B", 32)
    assert b32.time_at(5 * 32).time_s == 0.1
    assert b32.time_at(4.9 * 32).time_s == 60
    assert b32.time_at(2.55 * 32).time_s == 60
    assert b32.time_at(2.0 * 32).time_s == 3600
    assert b32.time_at(1.4 * 32).status == NOT_OPERATING
    assert mcb("C", 40).time_at(3 * 40).time_s == 120  # In > 32 A: 120 s (IEC 60898-1 Table 7)
    assert mcb("D", 80).time_at(2 * 80).time_s == 7200  # In > 63 A: 2 h (IEC 60898-1 Table 7)


def test_curve_device_interpolates_on_log_log_axes():
    # A straight line between (100 A, 10 s) and (1000 A, 0.1 s) on log-log axes passes (316.2 A, 1 s)
    # (geometric mean): plain logarithm arithmetic, common practice for reading charts.
    device = make_device(read_device({"kind": "curve", "points": [[100, 10], [1000, 0.1]]}))
    assert device.time_at(316.227766).time_s == pytest.approx(1.0, rel=1e-6)
    assert device.current_for_time(1.0) == pytest.approx(316.227766, rel=1e-6)


def test_curve_device_is_never_extrapolated():
    # A maker's chart says nothing outside its points, at either end.
    device = make_device(read_device({"kind": "curve", "points": [[100, 10], [1000, 0.1]]}))
    assert device.time_at(99).status == BELOW_CURVE
    assert device.time_at(99).time_s is None
    assert device.time_at(1001).status == BEYOND_CURVE
    assert device.time_at(1001).time_s is None
    assert device.current_for_time(0.05) is None


@pytest.mark.parametrize(
    "points",
    [
        [[100, 1], [200, 5]],
        [[100, 5], [200, 5]],
        [[100, 5], [100, 1]],
        [[100, 5]],
        [],
        "x",
        [[100, 5], [200, -1]],
        [[100, 5], ["200 V", 1]],
    ],
)
def test_curve_points_that_do_not_fall_are_refused(points):
    with pytest.raises(InputError) as info:
        read_device({"kind": "curve", "points": points})
    assert info.value.field.startswith("circuit.device.points")


def test_curve_points_accept_units_and_any_order():
    device = read_device({"kind": "curve", "points": [["2 kA", "20 ms"], ["100 A", "10 s"]]})
    assert device.points == ((100.0, 10.0), (2000.0, 0.02))


def _all_devices():
    for curve in ("B", "C", "D"):
        for rating in tables.load("mcb")["ratings_a"]:
            yield {"kind": "mcb", "curve": curve, "rating": rating}
    for row in tables.load("fuse_gg")["rating"]:
        yield {"kind": "fuse-gg", "rating": row["in_a"]}


@pytest.mark.parametrize(
    "device", list(_all_devices()), ids=lambda d: str(d.get("curve", "gG")) + str(d["rating"])
)
def test_every_device_curve_in_the_data_is_monotonic(device):
    points = device_curve(device)
    assert all(i > 0 and t > 0 for i, t in points)
    for (i0, t0), (i1, t1) in zip(points, points[1:], strict=False):
        assert i1 >= i0 and t1 <= t0
        assert i1 > i0 or t1 < t0
    model = make_device(read_device(device))
    currents = [points[0][0] * 0.9 * 1.07**n for n in range(120)]
    times = [model.time_at(i).time_s for i in currents]
    known = [t for t in times if t is not None]
    assert known == sorted(known, reverse=True)


def test_gg_fuse_below_its_conventional_fusing_current_does_not_operate():
    # IEC 60269-1 Table 2 (from memory): a 32 A gG fuse need not operate below 1.6 In = 51.2 A.
    assert fuse_gg(32).time_at(50).status == NOT_OPERATING


def test_rcbo_has_the_breaker_model():
    # An RCBO's overcurrent part follows IEC 60898-1 (IEC 61009-1 refers to the same characteristics).
    spec = read_device({"kind": "rcbo", "curve": "B", "rating": 32})
    assert make_device(spec) == mcb("B", 32)
