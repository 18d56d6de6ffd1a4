"""The time–current picture on log-log axes, as plain numbers a chart widget can draw.

Axes carry log10 values (current in A, time in s) with labelled decade ticks, because the chart widget
has linear axes only. Series: the device's curve (from `calc.device_curve`), If and Isc as vertical
lines, the maximum disconnection time as a horizontal line, and the line and protective conductors'
withstand lines t = k²S²/I² (IEC 60364-4-43 434.5.2), which are straight on log-log axes.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import calc

_SAMPLES = 24


@dataclass(frozen=True)
class ChartSeries:
    """One drawn line: its legend words, role (for colour and dash) and (log10 I, log10 t) points."""

    name: str
    role: str
    points: tuple[tuple[float, float], ...]


@dataclass(frozen=True)
class ChartModel:
    """Everything a log-log chart needs, already in log10 units."""

    x_min: float
    x_max: float
    y_min: float
    y_max: float
    x_ticks: tuple[tuple[float, str], ...]
    y_ticks: tuple[tuple[float, str], ...]
    series: tuple[ChartSeries, ...]
    x_title: str = "Current (A)"
    y_title: str = "Time (s)"


def _current_label(decade: int) -> str:
    amps = 10.0**decade
    if amps >= 1000:
        return f"{amps / 1000:g}k"
    return f"{amps:g}"


def _time_label(decade: int) -> str:
    return f"{10.0**decade:g}"


def withstand_points(
    k: float, csa_mm2: float, x_min: float, x_max: float, y_min: float, y_max: float
) -> tuple[tuple[float, float], ...]:
    """Points of t = (k·S/I)² between the axes' limits, in log10 units."""
    log_ks = math.log10(k * csa_mm2)
    points = []
    for i in range(_SAMPLES + 1):
        x = x_min + (x_max - x_min) * i / _SAMPLES
        y = 2.0 * (log_ks - x)
        if y_min <= y <= y_max:
            points.append((x, y))
    return tuple(points)


def _number(data: dict[str, Any], key: str) -> float | None:
    value = data.get(key)
    return float(value) if isinstance(value, int | float) and value > 0 else None


def _csa(inputs: dict[str, Any], conductor: str) -> float | None:
    value = (inputs.get("circuit") or {}).get(conductor, {}).get("csa")
    return float(value) if isinstance(value, int | float) and value > 0 else None


def chart_for(device: dict[str, Any], assessment: dict[str, Any] | None) -> ChartModel | None:
    """The picture for one circuit; None when the device cannot be drawn."""
    try:
        curve = [(i, t) for i, t in calc.device_curve(device) if i > 0 and t > 0]
    except calc.CalcError:
        return None
    if len(curve) < 2:
        return None
    result = assessment or {}
    fault_a = _number(result, "earth_fault_current_a")
    short_a = _number(result, "short_circuit_current_a")
    max_time_s = _number(result, "max_disconnection_time_s")
    currents = [i for i, _ in curve] + [a for a in (fault_a, short_a) if a]
    times = [t for _, t in curve]
    x_min = math.floor(math.log10(min(currents)))
    x_max = math.ceil(math.log10(max(currents)) + 0.05)
    y_min = max(-3, math.floor(math.log10(min(times))))
    y_max = min(4, math.ceil(math.log10(max(times))))
    series = [
        ChartSeries(
            "Device",
            "device",
            tuple((math.log10(i), math.log10(t)) for i, t in curve if y_min <= math.log10(t) <= y_max),
        )
    ]
    for name, role, current_a in (("If", "fault", fault_a), ("Isc", "short", short_a)):
        if current_a:
            x = math.log10(current_a)
            series.append(ChartSeries(name, role, ((x, y_min), (x, y_max))))
    if max_time_s and y_min <= math.log10(max_time_s) <= y_max:
        y = math.log10(max_time_s)
        series.append(ChartSeries("Max time", "limit", ((x_min, y), (x_max, y))))
    inputs = result.get("inputs") or {}
    for role, name, k_key in (("line", "Line k²S²", "k_line"), ("cpc", "CPC k²S²", "k_cpc")):
        k = _number(result, k_key)
        csa = _csa(inputs, role)
        if k and csa:
            points = withstand_points(k, csa, x_min, x_max, y_min, y_max)
            if len(points) >= 2:
                series.append(ChartSeries(name, role, points))
    return ChartModel(
        x_min=x_min,
        x_max=x_max,
        y_min=y_min,
        y_max=y_max,
        x_ticks=tuple((float(d), _current_label(d)) for d in range(x_min, x_max + 1)),
        y_ticks=tuple((float(d), _time_label(d)) for d in range(y_min, y_max + 1)),
        series=tuple(series),
    )
