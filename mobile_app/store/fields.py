"""The fields of a job, a board and a circuit, and how the text typed into each is parsed.

Every field is stored three ways: the text exactly as typed (`raw`), its parsed value (`value`, a
float in base units for numbers, a canonical word for choices, stripped text otherwise) and the
parse error (`error`, None when the text parsed or is blank). Numbers are parsed by
`calc.parse_value` with the field's dotted calc path, so the store and the calculation core agree on
units and ranges.
"""

from __future__ import annotations

import datetime
from dataclasses import dataclass

import calc

JOB_FIELDS = (
    "client_ref",
    "site_address",
    "description",
    "date",
    "system",
    "u0",
    "cmin",
    "ze",
    "pfc",
)
BOARD_FIELDS = ("designation", "location", "supplied_from", "system", "ze")
CIRCUIT_FIELDS = (
    "number",
    "description",
    "role",
    "device_kind",
    "device_curve",
    "device_rating",
    "library_device_id",
    "let_through_i2t",
    "rcd_idn",
    "rcd_type",
    "line_csa",
    "line_material",
    "line_insulation",
    "cpc_csa",
    "cpc_material",
    "cpc_arrangement",
    "zs",
    "zsc",
    "r1r2",
    "ze",
    "test_temp_c",
)
READING_FIELDS = ("zs", "zsc", "r1r2", "ze", "test_temp_c")
SUPPLY_FIELDS = ("system", "u0", "cmin", "ze", "pfc")

_SYSTEMS = {"tn-s": "TN-S", "tns": "TN-S", "tn-c-s": "TN-C-S", "tncs": "TN-C-S", "tt": "TT"}
_CHOICES: dict[str, dict[str, str]] = {
    "system": _SYSTEMS,
    "role": {"final": "final", "distribution": "distribution", "submain": "distribution"},
    "device_kind": {
        "mcb": "mcb",
        "rcbo": "mcb",
        "fuse-gg": "fuse-gg",
        "gg": "fuse-gg",
        "fuse": "fuse-gg",
        "curve": "curve",
    },
    "device_curve": {"b": "B", "c": "C", "d": "D"},
    "rcd_type": {"general": "general", "s": "s", "time-delayed": "s"},
    "line_material": {
        "copper": "copper",
        "cu": "copper",
        "aluminium": "aluminium",
        "aluminum": "aluminium",
        "al": "aluminium",
    },
    "line_insulation": {
        "thermoplastic-70": "thermoplastic-70",
        "pvc": "thermoplastic-70",
        "thermoplastic-90": "thermoplastic-90",
        "thermosetting-90": "thermosetting-90",
        "xlpe": "thermosetting-90",
    },
    "cpc_material": {
        "copper": "copper",
        "cu": "copper",
        "aluminium": "aluminium",
        "aluminum": "aluminium",
        "al": "aluminium",
        "steel": "steel",
    },
    "cpc_arrangement": {
        "in-cable": "in-cable",
        "separate": "separate",
        "armour": "armour",
        "armor": "armour",
    },
}
_CALC_PATHS = {
    "u0": "supply.u0",
    "cmin": "supply.cmin",
    "pfc": "supply.pfc",
    "device_rating": "circuit.device.rating",
    "let_through_i2t": "circuit.let_through_i2t",
    "rcd_idn": "circuit.rcd.idn",
    "line_csa": "circuit.line.csa",
    "cpc_csa": "circuit.cpc.csa",
    "zs": "measured.zs",
    "zsc": "measured.zsc",
    "r1r2": "measured.r1r2",
    "test_temp_c": "measured.test_temp_c",
}


@dataclass(frozen=True)
class Parsed:
    """One field as typed, parsed: raw text, value (None when blank or invalid) and error."""

    raw: str
    value: float | int | str | None
    error: str | None


def choices(name: str) -> list[str]:
    """The canonical words a choice field accepts, in a stable order (empty for other fields)."""
    return sorted(set(_CHOICES.get(name, {}).values()))


def parse_field(kind: str, name: str, raw: str) -> Parsed:
    """Parse the text typed into field `name` of a `kind` ("job", "board", "circuit").

    Never raises for bad text: the problem goes into `error` and the raw text is kept as typed.
    """
    text = raw.strip()
    if not text:
        return Parsed(raw, None, None)
    if name in _CHOICES:
        word = _CHOICES[name].get(text.lower())
        if word is None:
            return Parsed(raw, None, "must be one of: " + ", ".join(choices(name)))
        return Parsed(raw, word, None)
    if name == "ze":
        return _parse_number(raw, "measured.ze" if kind == "circuit" else "supply.ze")
    if name in _CALC_PATHS:
        return _parse_number(raw, _CALC_PATHS[name])
    if name == "date":
        return _parse_date(raw)
    if name == "library_device_id":
        if not (text.isascii() and text.isdigit()):
            return Parsed(raw, None, "must be the id of a device in the library")
        return Parsed(raw, int(text), None)
    return Parsed(raw, text, None)


def _parse_number(raw: str, path: str) -> Parsed:
    """Parse a number with units through the calculation core."""
    try:
        return Parsed(raw, calc.parse_value(path, raw.strip()), None)
    except calc.InputError as error:
        return Parsed(raw, None, error.problem)


def _parse_date(raw: str) -> Parsed:
    """Parse a calendar date written as YYYY-MM-DD or DD/MM/YYYY into ISO form."""
    text = raw.strip()
    for pattern in ("%Y-%m-%d", "%d/%m/%Y"):
        try:
            return Parsed(raw, datetime.datetime.strptime(text, pattern).date().isoformat(), None)
        except ValueError:
            continue
    return Parsed(raw, None, "must be a date such as 2026-03-14")
