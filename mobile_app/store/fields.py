"""The fields of a job, a board, a circuit, an instrument and an observation, and how the text typed
into each is parsed.

Every field is stored three ways: the text exactly as typed (`raw`), its parsed value (`value`, a
float in base units for numbers, a canonical word for choices — `yes` / `no` for a yes-or-no
field —, stripped text otherwise) and the parse error (`error`, None when the text parsed or is
blank). Numbers are parsed by `calc.parse_value` with the field's dotted calc path, so the store and
the calculation core agree on units and ranges. A reading beyond an instrument's range is typed
`>999` (insulation) or `>300 ms` (an RCD's time); its value is kept as text in base units (`">999"`,
`">0.3"`), which the calculation core reads as a lower bound.
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
    "client_name",
    "client_address",
    "purpose",
    "next_inspection",
    "limitations",
)
BOARD_FIELDS = (
    "designation",
    "location",
    "supplied_from",
    "system",
    "ze",
    "pfc",
    "main_device",
    "main_rating",
    "origin",
    "earthing_csa",
    "bonding_csa",
    "ra",
)
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
    "points_served",
    "wiring_type",
    "reference_method",
    "length_m",
    "ring",
    "selv",
    "breaking_capacity",
    "let_through_at",
    "rcd_waveform",
    "rcd_additional",
    "cpc_insulation",
    "cpc_bunched",
    "cpc_protected",
    "r2",
    "ring_r1",
    "ring_rn",
    "ring_r2",
    "insulation_test_voltage",
    "insulation_line_line",
    "insulation_line_earth",
    "polarity",
    "rcd_time_1x",
    "rcd_time_5x",
    "rcd_test_button",
)
TEST_FIELDS = (
    "r2",
    "ring_r1",
    "ring_rn",
    "ring_r2",
    "insulation_test_voltage",
    "insulation_line_line",
    "insulation_line_earth",
    "polarity",
    "rcd_time_1x",
    "rcd_time_5x",
    "rcd_test_button",
)
"""The circuit's tests beyond its loop readings (continuity, insulation, polarity, the RCD's)."""
READING_FIELDS = ("zs", "zsc", "r1r2", "ze", "test_temp_c", *TEST_FIELDS)
"""What is measured on each circuit: never copied to the next circuit added."""
SHARED_CIRCUIT_FIELDS = (
    "role",
    "device_kind",
    "device_curve",
    "breaking_capacity",
    "rcd_idn",
    "rcd_type",
    "rcd_waveform",
    "rcd_additional",
    "line_material",
    "line_insulation",
    "cpc_material",
    "cpc_arrangement",
    "cpc_insulation",
    "cpc_bunched",
    "cpc_protected",
    "wiring_type",
    "reference_method",
    "selv",
)
"""What a board's circuits usually share (the kind and curve of device, its breaking capacity and RCD,
the cables' materials, insulation and wiring): copied to the next circuit added. The rating, the
sizes, a library device and its let-through figure differ from circuit to circuit and are not."""
RECORD_ONLY_CIRCUIT_FIELDS = ("number", "description", "points_served", "wiring_type", "reference_method")
"""Circuit fields that are recorded and printed but not used by the calculation."""
SUPPLY_FIELDS = ("system", "u0", "cmin", "ze", "pfc")
BOARD_SUPPLY_FIELDS = ("system", "ze", "pfc", "ra")
"""A board's fields that take the place of the job's supply (or add to it) for its circuits."""
INSTRUMENT_FIELDS = ("name", "serial", "calibration_date")
OBSERVATION_FIELDS = ("finding", "severity", "location")
SEVERITIES = ("serious", "attention", "note")
"""How much an observation matters, in our own plain words: `serious` (unsafe now or likely to
become so: the record is unsatisfactory), `attention` (to be put right, not unsafe now), `note`
(for the client's information)."""
PURPOSES = ("new-work", "periodic", "fault-finding")
WIRING_TYPES = ("flat twin and earth", "singles in conduit", "singles in trunking", "armoured (SWA)",
                "mineral insulated", "flexible cord", "data or control cable")
"""Common wiring types offered as quick choices; any short text is accepted."""
REFERENCE_METHODS = ("A1", "A2", "B1", "B2", "C", "D1", "D2", "E", "F", "G")
"""Installation reference methods of IEC 60364-5-52 Table B.52.1, offered as quick choices; any
short text is accepted (national tables number their methods differently)."""
MAIN_DEVICES = ("switch-disconnector", "moulded-case breaker", "fuse-switch", "RCD", "MCB")
"""Common main switches or devices of a board, offered as quick choices; any short text is accepted."""

_SYSTEMS = {"tn-s": "TN-S", "tns": "TN-S", "tn-c-s": "TN-C-S", "tncs": "TN-C-S", "tt": "TT"}
_CHOICES: dict[str, dict[str, str]] = {
    "system": _SYSTEMS,
    "role": {"final": "final", "distribution": "distribution", "submain": "distribution"},
    "device_kind": {
        "mcb": "mcb",
        "rcbo": "rcbo",
        "fuse-gg": "fuse-gg",
        "gg": "fuse-gg",
        "fuse": "fuse-gg",
        "curve": "curve",
    },
    "device_curve": {"b": "B", "c": "C", "d": "D"},
    "rcd_type": {"general": "general", "s": "s", "time-delayed": "s"},
    "rcd_waveform": {"ac": "AC", "a": "A", "f": "F", "b": "B"},
    "purpose": {
        "new-work": "new-work",
        "new work": "new-work",
        "new": "new-work",
        "initial": "new-work",
        "periodic": "periodic",
        "periodic inspection": "periodic",
        "fault-finding": "fault-finding",
        "fault finding": "fault-finding",
        "fault": "fault-finding",
    },
    "severity": {word: word for word in SEVERITIES},
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
        "rubber-60": "rubber-60",
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
_CHOICES["cpc_insulation"] = _CHOICES["line_insulation"]
_YES_NO = {"yes": "yes", "y": "yes", "true": "yes", "no": "no", "n": "no", "false": "no"}
YES_NO_FIELDS = ("origin", "ring", "selv", "rcd_additional", "cpc_bunched", "cpc_protected", "polarity",
                 "rcd_test_button")
"""Fields answered yes or no (for polarity and the test button: yes means confirmed correct)."""
for _name in YES_NO_FIELDS:
    _CHOICES[_name] = _YES_NO
_CALC_PATHS = {
    "u0": "supply.u0",
    "cmin": "supply.cmin",
    "pfc": "supply.pfc",
    "ra": "supply.ra",
    "main_rating": "circuit.device.rating",
    "earthing_csa": "circuit.cpc.csa",
    "bonding_csa": "circuit.cpc.csa",
    "length_m": "circuit.length_m",
    "breaking_capacity": "circuit.device.breaking_capacity",
    "let_through_at": "circuit.let_through_at",
    "r2": "measured.r2",
    "ring_r1": "measured.ring.r1",
    "ring_rn": "measured.ring.rn",
    "ring_r2": "measured.ring.r2",
    "insulation_test_voltage": "measured.insulation.test_voltage",
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
_BOUNDED_PATHS = {
    "insulation_line_line": "measured.insulation.line_line",
    "insulation_line_earth": "measured.insulation.line_earth",
    "rcd_time_1x": "measured.rcd_time_1x",
    "rcd_time_5x": "measured.rcd_time_5x",
}
"""Readings an instrument may show as beyond its range (`>999`): a lower bound."""
DATE_FIELDS = ("date", "next_inspection", "calibration_date")


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
    if name in _BOUNDED_PATHS:
        return _parse_bounded(raw, _BOUNDED_PATHS[name])
    if name in _CALC_PATHS:
        return _parse_number(raw, _CALC_PATHS[name])
    if name in DATE_FIELDS:
        return _parse_date(raw)
    if name == "library_device_id":
        if not (text.isascii() and text.isdigit()):
            return Parsed(raw, None, "must be the id of a device in the library")
        return Parsed(raw, int(text), None)
    if name == "points_served":
        if not (text.isascii() and text.isdigit()) or int(text) > 10_000:
            return Parsed(raw, None, "must be a whole number of points, such as 8")
        return Parsed(raw, int(text), None)
    return Parsed(raw, text, None)


def _parse_bounded(raw: str, path: str) -> Parsed:
    """A reading that may be shown beyond the instrument's range: `>999` keeps `">999"` (base units)."""
    text = raw.strip()
    if not text.startswith(">"):
        return _parse_number(raw, path)
    if not text[1:].strip():
        return Parsed(raw, None, "needs a number after >, such as >999")
    bound = _parse_number(text[1:], path)
    if bound.value is None:
        return Parsed(raw, None, bound.error)
    return Parsed(raw, f">{float(bound.value):g}", None)


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
