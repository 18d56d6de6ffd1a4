"""Time-current models of protective devices, all reporting upper bounds of the operating time.

A verification must never assume a device is faster than it is guaranteed to be, so every model
answers "within how long is this device certain to have operated at this current?".
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property, lru_cache
from typing import NamedTuple, Protocol

from calc import tables
from calc.inputs import DeviceSpec

INSTANTANEOUS = "instantaneous"
UPPER_BOUND = "upper-bound"
INTERPOLATED = "interpolated"
NOT_OPERATING = "not-operating"
BEYOND_CURVE = "beyond-curve"
BELOW_CURVE = "below-curve"
OUTSIDE_DATA = (BEYOND_CURVE, BELOW_CURVE)
"""A maker's chart says nothing outside its points: a current there is not decided either way."""


class OperatingTime(NamedTuple):
    """A device's operating time at one current.

    `time_s` is an upper bound of the operating time, or None when the device is not known to operate
    (`status` NOT_OPERATING) or the current lies outside the data entered (BEYOND_CURVE, BELOW_CURVE).
    """

    time_s: float | None
    status: str
    note: str


class Device(Protocol):
    """What the walk needs of a protective device."""

    label: str
    rating_a: float | None

    def time_at(self, current_a: float) -> OperatingTime: ...

    def current_for_time(self, time_s: float) -> float | None: ...

    def curve(self) -> list[tuple[float, float]]: ...


def loglog_time(points: tuple[tuple[float, float], ...], current_a: float) -> float:
    """Time at `current_a` by straight-line interpolation on log-log axes between sorted points.

    The current must lie within the points' range. Usual reading of a log-log time-current chart.
    """
    for (i0, t0), (i1, t1) in zip(points, points[1:], strict=False):
        if i0 <= current_a <= i1:
            fraction = math.log(current_a / i0) / math.log(i1 / i0)
            return math.exp(math.log(t0) + fraction * math.log(t1 / t0))
    raise ValueError("current outside the points")


def loglog_current(points: tuple[tuple[float, float], ...], time_s: float) -> float:
    """Inverse of `loglog_time`: the current at which the interpolated curve reaches `time_s`."""
    for (i0, t0), (i1, t1) in zip(points, points[1:], strict=False):
        if t1 <= time_s <= t0:
            fraction = math.log(time_s / t0) / math.log(t1 / t0)
            return math.exp(math.log(i0) + fraction * math.log(i1 / i0))
    raise ValueError("time outside the points")


_BELOW_CONVENTIONAL = OperatingTime(
    None, NOT_OPERATING, "below 1.45 In the breaker is not required to trip (IEC 60898-1 Table 7)"
)


@dataclass(frozen=True)
class Mcb:
    """Miniature circuit-breaker or RCBO, curve B, C or D, as guaranteed by IEC 60898-1 Table 7."""

    curve_letter: str
    rating_a: float
    instantaneous_multiple: float
    c_test_time_s: float
    conventional_time_s: float

    @cached_property
    def label(self) -> str:
        return f"{self.curve_letter}{self.rating_a:g}"

    def _table(self) -> dict:
        return tables.load("mcb")

    @cached_property
    def _bands(self) -> tuple[tuple[float, OperatingTime], ...]:
        """(lowest multiple of In, operating time) per band, fastest band first (IEC 60898-1 Table 7)."""
        t = self._table()
        return (
            (
                self.instantaneous_multiple,
                OperatingTime(
                    t["instantaneous_time_s"],
                    INSTANTANEOUS,
                    f"at or above {self.instantaneous_multiple:g} In curve {self.curve_letter} trips in "
                    "under 0.1 s (IEC 60898-1 Table 7); 0.1 s is an upper bound",
                ),
            ),
            (
                t["c_test_multiple"],
                OperatingTime(
                    self.c_test_time_s,
                    UPPER_BOUND,
                    f"below {self.instantaneous_multiple:g} In the standard only guarantees tripping within "
                    f"{self.c_test_time_s:g} s (from 2.55 In, IEC 60898-1 Table 7); the maker's curve may be "
                    "faster: enter it as a curve device to use it",
                ),
            ),
            (
                t["conventional_tripping_multiple"],
                OperatingTime(
                    self.conventional_time_s,
                    UPPER_BOUND,
                    f"overload region: tripping guaranteed only within {self.conventional_time_s:g} s "
                    "(1.45 In, IEC 60898-1 Table 7)",
                ),
            ),
        )

    def time_at(self, current_a: float) -> OperatingTime:
        """Upper bound of the tripping time at `current_a` (IEC 60898-1 Table 7, 8.6.2)."""
        multiple = current_a / self.rating_a
        for lowest_multiple, operating in self._bands:
            if multiple >= lowest_multiple:
                return operating
        return _BELOW_CONVENTIONAL

    def current_for_time(self, time_s: float) -> float | None:
        """Smallest current at which tripping within `time_s` is guaranteed, or None if none is."""
        t = self._table()
        if time_s >= self.conventional_time_s:
            return t["conventional_tripping_multiple"] * self.rating_a
        if time_s >= self.c_test_time_s:
            return t["c_test_multiple"] * self.rating_a
        if time_s >= t["instantaneous_time_s"]:
            return self.instantaneous_multiple * self.rating_a
        return None

    def curve(self) -> list[tuple[float, float]]:
        """Corner points of the guaranteed (upper-bound) characteristic, for plotting."""
        t = self._table()
        i_conv = t["conventional_tripping_multiple"] * self.rating_a
        i_c = t["c_test_multiple"] * self.rating_a
        i_inst = self.instantaneous_multiple * self.rating_a
        t_inst = t["instantaneous_time_s"]
        return [
            (i_conv, self.conventional_time_s),
            (i_c, self.conventional_time_s),
            (i_c, self.c_test_time_s),
            (i_inst, self.c_test_time_s),
            (i_inst, t_inst),
            (i_inst * 4, t_inst),
        ]


@dataclass(frozen=True)
class PointsDevice:
    """A device described by points on log-log axes: a gG fuse from published data, or a maker's chart.

    `standard` is True for a gG fuse: above its last point the operating time is bounded by that
    point's time (a fuse only gets faster as current rises). A maker's chart is never extrapolated.
    """

    label: str
    rating_a: float | None
    points: tuple[tuple[float, float], ...]
    standard: bool
    source: str

    def time_at(self, current_a: float) -> OperatingTime:
        """Upper bound of the operating time at `current_a` by log-log interpolation."""
        first_i, first_t = self.points[0]
        last_i, last_t = self.points[-1]
        if current_a < first_i:
            if self.standard:
                return OperatingTime(
                    None,
                    NOT_OPERATING,
                    f"below {first_i:.3g} A the {self.source} does not show the device operating",
                )
            return OperatingTime(
                None,
                BELOW_CURVE,
                f"below the first point entered ({first_i:.4g} A); add points at lower currents from "
                "the maker's chart (never extrapolated)",
            )
        if current_a > last_i:
            if self.standard:
                return OperatingTime(
                    last_t,
                    UPPER_BOUND,
                    f"above {last_i:.4g} A the fuse clears within {last_t:g} s; the "
                    f"model holds no faster point, so {last_t:g} s is an upper bound",
                )
            return OperatingTime(
                None,
                BEYOND_CURVE,
                f"above the last point entered ({last_i:.4g} A); add points at higher "
                f"currents from the maker's chart (never extrapolated)",
            )
        return OperatingTime(
            loglog_time(self.points, current_a),
            INTERPOLATED,
            f"log-log interpolation between the points of the {self.source}",
        )

    def current_for_time(self, time_s: float) -> float | None:
        """Smallest current at which operation within `time_s` is shown, or None if none is."""
        first_i, first_t = self.points[0]
        if time_s >= first_t:
            return first_i
        if time_s < self.points[-1][1]:
            return None
        return loglog_current(self.points, time_s)

    def curve(self) -> list[tuple[float, float]]:
        """The points themselves (straight lines between them on log-log axes)."""
        return list(self.points)


@lru_cache(maxsize=256)
def mcb(curve_letter: str, rating_a: float) -> Mcb:
    """The IEC 60898-1 model of one breaker (curve letter and rating checked by the caller)."""
    t = tables.load("mcb")
    large = rating_a > t["c_test_large_above_a"]
    return Mcb(
        curve_letter,
        rating_a,
        float(t["curve"][curve_letter]["instantaneous_trip"]),
        float(t["c_test_time_large_s"] if large else t["c_test_time_s"]),
        float(t["conventional_time_large_s"] if rating_a > t["large_above_a"] else t["conventional_time_s"]),
    )


@lru_cache(maxsize=64)
def fuse_gg(rating_a: float) -> PointsDevice:
    """The gG fuse model for one rating, from the published points in `data/fuse_gg.toml`."""
    data = tables.load("fuse_gg")
    row = next(r for r in data["rating"] if r["in_a"] == rating_a)
    basis_v = data["table_u0_v"] * data["table_cmin"]
    points = [
        (row["fusing_multiple"] * rating_a, float(row["conventional_time_s"])),
        (basis_v / row["zs_5_ohm"], 5.0),
    ]
    if "zs_0_4_ohm" in row:
        points.append((basis_v / row["zs_0_4_ohm"], 0.4))
    if "gates_a" in row:
        points.append((float(row["gates_a"]["imax_0_1s"]), 0.1))
    return PointsDevice(f"gG {rating_a:g} A", rating_a, tuple(points), True, "gG fuse data")


def make_device(spec: DeviceSpec) -> Device:
    """The time-current model for a checked device description."""
    if spec.kind in ("mcb", "rcbo") and spec.curve is not None and spec.rating_a is not None:
        return mcb(spec.curve, spec.rating_a)
    if spec.kind == "fuse-gg" and spec.rating_a is not None:
        return fuse_gg(spec.rating_a)
    points = spec.points or ()
    label = f"curve device {spec.rating_a:g} A" if spec.rating_a else "curve device"
    return PointsDevice(label, spec.rating_a, points, False, "maker's chart")
