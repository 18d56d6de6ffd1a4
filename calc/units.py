"""Units at the edge: text as typed ("620 mΩ", "2.5mm2", "1.5 kA") to floats in base units.

One pint registry for the whole core, made here on first use: importing pint and building its registry
takes most of a second (several in the browser build), and a value typed without a unit never needs it.
Conversion factors are cached per unit text, so only the first "mΩ" costs a pint look-up; numbers then
convert with one multiplication.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import cache, lru_cache
from typing import TYPE_CHECKING

from calc.errors import InputError

if TYPE_CHECKING:
    import pint


@cache
def registry() -> pint.UnitRegistry:
    """The core's one unit registry, made on first use."""
    import pint

    return pint.UnitRegistry()


@dataclass(frozen=True)
class Kind:
    """A kind of quantity: the base unit its floats are in and how to name it to a person."""

    label: str
    base: str
    symbol: str


IMPEDANCE = Kind("impedance", "ohm", "Ω")
CURRENT = Kind("current", "ampere", "A")
VOLTAGE = Kind("voltage", "volt", "V")
AREA = Kind("cross-section", "millimeter ** 2", "mm²")
TIME = Kind("time", "second", "s")
ENERGY = Kind("let-through energy", "ampere ** 2 * second", "A²s")
RATIO = Kind("factor", "dimensionless", "")
TEMPERATURE = Kind("temperature", "degC", "°C")
INSULATION = Kind("insulation resistance", "megaohm", "MΩ")
LENGTH = Kind("length", "meter", "m")

_NUMBER = r"[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?"
_SPLIT = re.compile(rf"^\s*({_NUMBER})\s*(.*?)\s*$")
_GROUPED = re.compile(r"^\s*[+-]?(?:[1-9]\d{0,2}(?:,\d{3})+(?!\d)|\d*,\d{3},)")
"""A comma before exactly three digits after a non-zero whole part ("45,000", "1,500 A", "1,500,000")
reads both as a thousands separator and as a decimal comma: refused. "0,845" and "0,84" are decimals."""
_TEMPERATURE_UNITS = frozenset({"", "°c", "ºc", "c", "degc", "deg c", "celsius", "°"})


def _normalise_unit(unit: str, kind: Kind) -> str:
    """Trade spellings to pint syntax: "mm2" and "mm²" to "mm**2", a bare "mm" in a size field."""
    text = unit.replace("²", "**2 ").replace("^2", "**2 ").strip()
    text = re.sub(r"(?<=[a-zA-Zµμ])2(?![\d.])", "**2 ", text).strip()
    if kind is AREA and text in ("mm", "sq mm", "sqmm"):
        return "millimeter ** 2"
    return text


@lru_cache(maxsize=512)
def _factor(unit: str, kind: Kind) -> float:
    """Multiplier from `unit` to the kind's base unit; raises ValueError with a person's message."""
    try:
        quantity = registry().Quantity(1.0, _normalise_unit(unit, kind))
    except Exception as exc:  # pint's parser raises many kinds on arbitrary text; all mean "not a unit"
        raise ValueError(f'"{unit}" is not a unit') from exc
    if not quantity.is_compatible_with(kind.base):
        raise ValueError(f'"{unit}" is not a unit of {kind.label} ({kind.symbol})')
    return float(quantity.to(kind.base).magnitude)


def parse_quantity(field: str, value: object, kind: Kind) -> float:
    """Parse one value (a number in base units, or text with or without a unit) to a finite float.

    Raises InputError naming `field` when the value is missing, not a number, or of another kind.
    """
    if isinstance(value, bool) or value is None:
        raise InputError(field, "must be a number or a value with a unit")
    if isinstance(value, int | float):
        try:
            number = float(value)
        except OverflowError:
            raise InputError(field, "is too large to be a reading") from None
        if not math.isfinite(number):
            raise InputError(field, "must be a finite number")
        return number
    if not isinstance(value, str):
        raise InputError(field, "must be a number or a value with a unit")
    return _parse_text(field, value, kind)


def _parse_text(field: str, text: str, kind: Kind) -> float:
    if not text.strip():
        raise InputError(field, "is empty")
    if _GROUPED.match(text):
        raise InputError(
            field,
            f'"{_shorten(text.strip())}" is ambiguous: a comma before three digits may be a thousands '
            "separator; type the number without separators (e.g. 45000) or with a decimal point",
        )
    match = _SPLIT.match(text)
    if match is None:
        raise InputError(field, f'"{_shorten(text)}" is not a number')
    try:
        number = float(match.group(1).replace(",", "."))
    except OverflowError:
        raise InputError(field, "is too large to be a reading") from None
    if not math.isfinite(number):
        raise InputError(field, "must be a finite number")
    unit = match.group(2)
    if kind is TEMPERATURE:
        if unit.lower() not in _TEMPERATURE_UNITS:
            raise InputError(field, f'"{_shorten(unit)}" is not a unit of temperature (°C)')
        return number
    if not unit:
        return number
    try:
        factor = _factor(unit, kind)
    except ValueError as exc:
        raise InputError(field, str(exc)) from None
    result = number * factor
    if not math.isfinite(result):
        raise InputError(field, "must be a finite number")
    return result


def _shorten(text: str, limit: int = 40) -> str:
    return text if len(text) <= limit else text[: limit - 1] + "…"
