"""Reading one field of a circuit's input: its kind of quantity, its range, and the readers that
name the dotted field path (`measured.zs`, `circuit.line.csa`) in every error they raise."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

from calc.errors import InputError
from calc.units import (
    AREA,
    CURRENT,
    ENERGY,
    IMPEDANCE,
    INSULATION,
    LENGTH,
    RATIO,
    TEMPERATURE,
    TIME,
    VOLTAGE,
    Kind,
    parse_quantity,
)


@dataclass(frozen=True)
class FieldSpec:
    """How one numeric field is read: its kind of quantity and its allowed range (base units)."""

    kind: Kind
    low: float
    high: float
    low_inclusive: bool = False
    positive: bool = True
    hint: str = ""


_Z = (1e-4, 1e5)
"""Credible loop impedances: from 0.1 mΩ to 100 kΩ (an RA in TT can be hundreds of ohms)."""
FIELDS: dict[str, FieldSpec] = {
    "supply.u0": FieldSpec(VOLTAGE, 50.0, 1000.0),
    "supply.cmin": FieldSpec(
        RATIO, 0.5, 1.0, low_inclusive=True, hint="a factor above 1 is a Cmax; Cmin is 0.95 at 230/400 V"
    ),
    "supply.ze": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "supply.pfc": FieldSpec(CURRENT, 1e-3, 1e6, low_inclusive=True),
    "supply.ra": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "circuit.device.rating": FieldSpec(CURRENT, 0.0, 10000.0),
    "circuit.device.breaking_capacity": FieldSpec(
        CURRENT, 500.0, 500e3, low_inclusive=True, hint="a bare number is in amperes: write 6 kA"
    ),
    "circuit.device.points.current": FieldSpec(CURRENT, 1e-3, 1e7, low_inclusive=True),
    "circuit.device.points.time": FieldSpec(TIME, 1e-4, 1e6, low_inclusive=True),
    "circuit.let_through_i2t": FieldSpec(ENERGY, 1e-3, 1e12, low_inclusive=True),
    "circuit.let_through_at": FieldSpec(CURRENT, 1.0, 1e6, low_inclusive=True),
    "circuit.rcd.idn": FieldSpec(CURRENT, 1e-3, 10.0, low_inclusive=True),
    "circuit.line.csa": FieldSpec(AREA, 0.1, 5000.0, low_inclusive=True),
    "circuit.cpc.csa": FieldSpec(AREA, 0.1, 5000.0, low_inclusive=True),
    "measured.zs": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.zsc": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.r1r2": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.ze": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.test_temp_c": FieldSpec(TEMPERATURE, -40.0, 80.0, low_inclusive=True, positive=False),
    "measured.r2": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.ring.r1": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.ring.rn": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.ring.r2": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.insulation.test_voltage": FieldSpec(VOLTAGE, 50.0, 5000.0, low_inclusive=True),
    "measured.insulation.line_line": FieldSpec(INSULATION, 0.0, 1e6, low_inclusive=True, positive=False),
    "measured.insulation.line_earth": FieldSpec(INSULATION, 0.0, 1e6, low_inclusive=True, positive=False),
    "measured.rcd_time_1x": FieldSpec(
        TIME, 1e-3, 10.0, low_inclusive=True, hint="a bare number is in seconds: write 28 ms"
    ),
    "measured.rcd_time_5x": FieldSpec(
        TIME, 1e-3, 10.0, low_inclusive=True, hint="a bare number is in seconds: write 18 ms"
    ),
    "circuit.length_m": FieldSpec(LENGTH, 0.1, 100e3, low_inclusive=True),
    "settings.final_circuit_max_a": FieldSpec(CURRENT, 0.0, 10000.0),
}


def parse_value(field: str, value: object) -> float:
    """Parse one numeric field by its dotted path into a float in base units (Ω, A, V, s, mm², °C).

    Raises InputError naming the field when the value is not a number, has a unit of another kind, or
    lies outside the field's range (impedances, currents and sizes must be greater than zero).
    """
    spec = FIELDS.get(field)
    if spec is None:
        raise InputError(field, "is not a numeric field")
    if type(value) is float or type(value) is int:  # the common case, checked in one comparison
        inside_low = spec.low <= value if spec.low_inclusive else spec.low < value
        if inside_low and value <= spec.high and (value > 0 or not spec.positive):
            return float(value)
    number = parse_quantity(field, value, spec.kind)
    if spec.positive and number <= 0:
        raise InputError(field, "must be greater than zero")
    below = number < spec.low if spec.low_inclusive else number <= spec.low
    if below:
        bound = "at least" if spec.low_inclusive else "greater than"
        raise InputError(field, _with_hint(f"must be {bound} {spec.low:g} {spec.kind.symbol}".rstrip(), spec))
    if number > spec.high:
        raise InputError(
            field, _with_hint(f"must be at most {spec.high:g} {spec.kind.symbol}".rstrip(), spec)
        )
    return number


def _with_hint(problem: str, spec: FieldSpec) -> str:
    return f"{problem} ({spec.hint})" if spec.hint else problem


def read_section(data: Mapping[str, Any], name: str, path: str, required: bool) -> Mapping[str, Any]:
    """The object `data[name]` (empty when absent and optional); InputError at `path + name` otherwise."""
    value = data.get(name)
    if type(value) is dict:
        return value
    if value is None:
        if required:
            raise InputError(f"{path}{name}", "is required")
        return {}
    if not isinstance(value, dict):
        raise InputError(f"{path}{name}", "must be an object")
    return value


def check_known(data: Mapping[str, Any], path: str, allowed: frozenset[str]) -> None:
    """InputError for the first key of `data` that is not one of `allowed`."""
    if data.keys() <= allowed:
        return
    for key in data:
        if key not in allowed:
            raise InputError(f"{path}.{key}" if path else str(key), "is not a known field")


def read_number(
    data: Mapping[str, Any], path: str, name: str, default: float | None = None, required: bool = False
) -> float | None:
    """A numeric field in base units; `default` when absent or blank (and not required)."""
    value = data.get(name)
    if value is None or (isinstance(value, str) and not value.strip() and not required):
        if required:
            raise InputError(f"{path}.{name}", "is required")
        return default
    return parse_value(f"{path}.{name}", value)


def read_required(data: Mapping[str, Any], path: str, name: str) -> float:
    """A numeric field that must be present."""
    value = read_number(data, path, name, required=True)
    if value is None:
        raise InputError(f"{path}.{name}", "is required")
    return value


def read_choice(
    data: Mapping[str, Any], path: str, name: str, choices: tuple[str, ...], default: str | None = None
) -> str:
    """One of `choices` (case-insensitive); `default` when absent, InputError when none is given."""
    value = data.get(name)
    if value is None:
        if default is None:
            raise InputError(f"{path}.{name}", f"is required (one of {', '.join(choices)})")
        return default
    if value in choices:
        return value
    field = f"{path}.{name}"
    if not isinstance(value, str):
        raise InputError(field, f"must be one of {', '.join(choices)}")
    for option in choices:
        if value.strip().lower() == option.lower():
            return option
    shown = value if len(value) <= 20 else value[:19] + "…"
    raise InputError(field, f'"{shown}" is not one of {", ".join(choices)}')


def read_flag(data: Mapping[str, Any], path: str, name: str) -> bool | None:
    """An optional yes/no field: true or false (JSON booleans), or None when absent."""
    value = data.get(name)
    if value is None or isinstance(value, bool):
        return value
    raise InputError(f"{path}.{name}", "must be true or false")
