"""Fast entry at the board: units as chips beside a number (never typed), quick picks that fill a
field (or two), and the trade's shorthand where people type it (`B32` for the device, `2.5/1.5` for a
cable, `>999` for an insulation reading beyond the meter's range).

Pure functions over the text as typed; the store parses what they produce, so a unit chip or a
shorthand never stores anything a person could not have typed themselves.
"""

from __future__ import annotations

import re
from dataclasses import dataclass


@dataclass(frozen=True)
class Units:
    """The unit chips beside a number field: `chips` in the order shown, `bare` the unit a number
    typed without one is read in (stored without a suffix), `default` the chip selected while the
    field is blank."""

    chips: tuple[str, ...]
    bare: str
    default: str


_OHMS = Units(("Ω", "mΩ"), "Ω", "Ω")
_TIMES = Units(("ms", "s"), "s", "ms")
_KILOAMPS = Units(("kA", "A"), "A", "kA")
UNITS: dict[str, Units] = {
    "zs": _OHMS,
    "zsc": _OHMS,
    "ze": _OHMS,
    "r1r2": _OHMS,
    "r2": _OHMS,
    "ring_r1": _OHMS,
    "ring_rn": _OHMS,
    "ring_r2": _OHMS,
    "ra": _OHMS,
    "rcd_time_1x": _TIMES,
    "rcd_time_5x": _TIMES,
    "rcd_idn": Units(("mA", "A"), "A", "mA"),
    "breaking_capacity": _KILOAMPS,
    "let_through_at": _KILOAMPS,
    "pfc": _KILOAMPS,
    "insulation_line_line": Units(("MΩ",), "MΩ", "MΩ"),
    "insulation_line_earth": Units(("MΩ",), "MΩ", "MΩ"),
}
"""Fields that take a number in one of several units (the first chip is the usual one)."""

_ALIASES = {"ohm": "Ω", "ohms": "Ω", "mohm": "mΩ", "mohms": "mΩ", "Ohm": "Ω", "mOhm": "mΩ"}
_NUMBER = re.compile(r"^\s*(>?\s*\d+(?:[.,]\d*)?|>?\s*[.,]\d+)\s*(.*?)\s*$")


def units_for(name: str) -> Units | None:
    """The unit chips of a field, or None for a field whose label names its one unit (or none)."""
    return UNITS.get(name)


def split_unit(raw: str, units: Units) -> tuple[str, str | None]:
    """A stored text as (number as typed, chip): `620 mΩ` → (`620`, `mΩ`), `0.62` → (`0.62`, `Ω`),
    a blank → (``, the default chip). Text whose unit is not one of the chips is left whole, with
    no chip selected: (`0.62 kΩ`, None)."""
    text = raw.strip()
    if not text:
        return "", units.default
    match = _NUMBER.match(text)
    if match is None:
        return raw, None
    number, unit = match.group(1), _ALIASES.get(match.group(2), match.group(2))
    if not unit:
        return number, units.bare
    if unit in units.chips:
        return number, unit
    return raw, None


def join_unit(text: str, unit: str | None, units: Units) -> str:
    """What is stored for a number typed beside a chip: the text as typed when it carries its own
    unit (or no chip is selected), else the number with the chip's unit (none for the bare unit)."""
    stripped = text.strip()
    if not stripped or unit is None:
        return text
    match = _NUMBER.match(stripped)
    if match is None or match.group(2):
        return text
    return stripped if unit == units.bare else f"{stripped} {unit}"


@dataclass(frozen=True)
class QuickPick:
    """One chip that fills fields at a tap: its words and the text it puts in each field."""

    label: str
    fills: tuple[tuple[str, str], ...]


RATINGS_A: tuple[str, ...] = ("6", "10", "16", "20", "32", "40")
"""Common ratings of final circuits' devices (IEC 60898-1 preferred values, common practice)."""
CABLE_PAIRS: tuple[tuple[str, str], ...] = (
    ("1.0", "1.0"), ("1.5", "1.0"), ("2.5", "1.5"), ("4", "1.5"), ("6", "2.5"), ("10", "4"), ("16", "6"),
)
"""Line / protective conductor sizes of common twin-and-earth cables, mm² (common practice)."""
RCD_RATINGS = ("30 mA", "100 mA", "300 mA")
BREAKING_CAPACITIES = ("6 kA", "10 kA")

_QUICK: dict[str, tuple[QuickPick, ...]] = {
    "device_rating": tuple(QuickPick(f"{r} A", (("device_rating", r),)) for r in RATINGS_A),
    "line_csa": tuple(
        QuickPick(f"{line}/{cpc}", (("line_csa", line), ("cpc_csa", cpc))) for line, cpc in CABLE_PAIRS
    ),
    "rcd_idn": tuple(QuickPick(r, (("rcd_idn", r),)) for r in RCD_RATINGS),
    "breaking_capacity": tuple(QuickPick(b, (("breaking_capacity", b),)) for b in BREAKING_CAPACITIES),
}


def quick_picks(name: str) -> tuple[QuickPick, ...]:
    """The chips shown above a field (the cable pairs above the line size fill both sizes)."""
    return _QUICK.get(name, ())


def picked(name: str, raws: dict[str, str]) -> str | None:
    """The label of the quick pick of `name` that the fields' texts match, if any (shown ticked)."""
    for pick in quick_picks(name):
        if all(_same_number(raws.get(field, ""), text) for field, text in pick.fills):
            return pick.label
    return None


_SIZE_UNITS = re.compile(r"\s*(mm²|mm2|mm|A)$")


def _same_number(raw: str, text: str) -> bool:
    a, b = (_SIZE_UNITS.sub("", t.strip()).replace(",", ".") for t in (raw, text))
    if a == b:
        return True
    try:
        return float(a) == float(b)
    except ValueError:
        return False


_DEVICE = re.compile(r"^\s*([BCDbcd])\s*(\d+(?:[.,]\d+)?)\s*[aA]?\s*$")
_FUSE = re.compile(r"^\s*(?:gG\s*(\d+(?:[.,]\d+)?)\s*[aA]?|(\d+(?:[.,]\d+)?)\s*[aA]?\s*gG)\s*$",
                   re.IGNORECASE)
_PAIR = re.compile(r"^\s*(\d+(?:[.,]\d+)?)\s*/\s*(\d+(?:[.,]\d+)?)\s*(?:mm²|mm2|mm)?\s*$")
_BREAKERS = ("mcb", "rcbo")


def shorthand(name: str, text: str, device_kind: str = "") -> dict[str, str] | None:
    """The fields a trade shorthand stands for, or None when `text` is not one:
    `B32` in the rating → curve B, 32 A (a circuit-breaker unless it is an RCBO already);
    `gG 32` or `32 gG` → a gG fuse of 32 A; `2.5/1.5` in either cable size → both sizes."""
    if name == "device_rating":
        match = _DEVICE.match(text)
        if match:
            kind = device_kind if device_kind in _BREAKERS else "mcb"
            return {"device_kind": kind, "device_curve": match.group(1).upper(),
                    "device_rating": match.group(2)}
        match = _FUSE.match(text)
        if match:
            return {"device_kind": "fuse-gg", "device_rating": match.group(1) or match.group(2)}
    if name in ("line_csa", "cpc_csa"):
        match = _PAIR.match(text)
        if match:
            return {"line_csa": match.group(1), "cpc_csa": match.group(2)}
    return None


_WORDS = {"mcb": "circuit-breaker", "rcbo": "RCBO", "fuse-gg": "gG fuse"}


def shorthand_text(fills: dict[str, str]) -> str:
    """What a shorthand will save, in words: `= circuit-breaker, curve B, 32 A`."""
    if "line_csa" in fills:
        return f"= line {fills['line_csa']} mm², CPC {fills['cpc_csa']} mm²"
    parts = [_WORDS.get(fills.get("device_kind", ""), "")]
    if fills.get("device_curve"):
        parts.append(f"curve {fills['device_curve']}")
    parts.append(f"{fills['device_rating']} A")
    return "= " + ", ".join(p for p in parts if p)
