"""From stored rows to the calculation core and back: a circuit's calc input and its assessment.

Pure functions over plain dicts (rows as read from the store); no SQL here.
"""

from __future__ import annotations

import json
from dataclasses import dataclass
from typing import Any

import calc

NOT_SHOWN = "not-shown"
"""The verdict of a circuit whose evidence decides nothing (calc's third outcome)."""

_LINE = (("csa", "line_csa"), ("material", "line_material"), ("insulation", "line_insulation"))
_CPC = (
    ("csa", "cpc_csa"),
    ("material", "cpc_material"),
    ("arrangement", "cpc_arrangement"),
    ("insulation", "cpc_insulation"),
)
_SEPARATE_CPC = (("bunched", "cpc_bunched"), ("protected", "cpc_protected"))
_MEASURED = ("zs", "zsc", "r1r2", "ze", "test_temp_c", "r2", "rcd_time_1x", "rcd_time_5x")
_MEASURED_FLAGS = ("polarity", "rcd_test_button")
_INSULATION = (
    ("test_voltage", "insulation_test_voltage"),
    ("line_line", "insulation_line_line"),
    ("line_earth", "insulation_line_earth"),
)
_RING = (("r1", "ring_r1"), ("rn", "ring_rn"), ("r2", "ring_r2"))
_BREAKERS = ("mcb", "rcbo")


@dataclass(frozen=True)
class Outcome:
    """A circuit's assessment as stored: verdict, the calc JSON (or None), calc version, why not."""

    verdict: str
    assessment_json: str | None
    calc_version: str | None
    error: str | None


def _value(row: dict[str, Any], name: str) -> Any:
    """The parsed value of field `name` in a row, None when blank or invalid."""
    return row.get(f"{name}_value")


def _flag(row: dict[str, Any], name: str) -> bool | None:
    """A yes-or-no field as a boolean, None when blank or invalid."""
    value = _value(row, name)
    return None if value is None else value == "yes"


def _some(pairs: tuple[tuple[str, str], ...], row: dict[str, Any]) -> dict[str, Any]:
    """A dict of calc keys to the row's parsed values, leaving out blanks."""
    return {key: _value(row, name) for key, name in pairs if _value(row, name) is not None}


def _flags(pairs: tuple[tuple[str, str], ...], row: dict[str, Any]) -> dict[str, bool]:
    """A dict of calc keys to the row's yes-or-no answers, leaving out blanks."""
    return {key: flag for key, name in pairs if (flag := _flag(row, name)) is not None}


def _device(circuit: dict[str, Any], library_device: dict[str, Any] | None) -> dict[str, Any]:
    """The calc device dict from a circuit's device fields (and its library curve, if any)."""
    kind = _value(circuit, "device_kind")
    rating = _value(circuit, "device_rating")
    device: dict[str, Any] = {"kind": kind} if kind else {}
    if kind in _BREAKERS and _value(circuit, "device_curve"):
        device["curve"] = _value(circuit, "device_curve")
    if kind == "curve" and library_device is not None:
        device["points"] = [list(point) for point in library_device["points"]]
        if rating is None:
            rating = library_device.get("rating_a")
    if rating is not None:
        device["rating"] = rating
    if _value(circuit, "breaking_capacity") is not None:
        device["breaking_capacity"] = _value(circuit, "breaking_capacity")
    return device


def _supply(job: dict[str, Any], board: dict[str, Any]) -> dict[str, Any]:
    """The supply at the board: the board's own system, Ze (or Zdb) and PFC where filled in, else the
    job's; U0 and Cmin from the job; RA (TT electrode) from the board."""
    supply: dict[str, Any] = {}
    system = _value(board, "system") or _value(job, "system")
    if system:
        supply["system"] = system
    for name in ("u0", "cmin"):
        if _value(job, name) is not None:
            supply[name] = _value(job, name)
    for name in ("ze", "pfc"):
        value = _value(board, name) if _value(board, name) is not None else _value(job, name)
        if value is not None:
            supply[name] = value
    if _value(board, "ra") is not None:
        supply["ra"] = _value(board, "ra")
    return supply


def _rcd(circuit: dict[str, Any]) -> dict[str, Any] | None:
    """The RCD (or an RCBO's residual current part) when its IΔn is recorded."""
    if _value(circuit, "rcd_idn") is None:
        return None
    rcd: dict[str, Any] = {
        "idn": _value(circuit, "rcd_idn"),
        "type": _value(circuit, "rcd_type") or "general",
    }
    if _value(circuit, "rcd_waveform") is not None:
        rcd["waveform"] = _value(circuit, "rcd_waveform")
    if _flag(circuit, "rcd_additional") is not None:
        rcd["additional"] = _flag(circuit, "rcd_additional")
    return rcd


def _measured(circuit: dict[str, Any]) -> dict[str, Any]:
    """The circuit's readings and tests in calc's `measured` shape (blanks left out)."""
    measured: dict[str, Any] = {
        name: _value(circuit, name) for name in _MEASURED if _value(circuit, name) is not None
    }
    for name in _MEASURED_FLAGS:
        if _flag(circuit, name) is not None:
            measured[name] = _flag(circuit, name)
    for key, pairs in (("insulation", _INSULATION), ("ring", _RING)):
        part = _some(pairs, circuit)
        if part:
            measured[key] = part
    return measured


def build_calc_input(
    job: dict[str, Any],
    board: dict[str, Any],
    circuit: dict[str, Any],
    library_device: dict[str, Any] | None = None,
    final_circuit_max_a: float | None = None,
) -> dict[str, Any]:
    """The dict given to `calc.assess` for one circuit: the supply at its board and the circuit.

    A board's own system, Ze (Zdb) and PFC, when filled in, take the place of the job's (an
    outbuilding board on its own earth electrode, a board fed by a sub-main). Blank and invalid
    fields are left out; a separate protective conductor's bunching and protection are given only
    when it is separate.
    """
    part: dict[str, Any] = {}
    if _value(circuit, "role"):
        part["role"] = _value(circuit, "role")
    part["device"] = _device(circuit, library_device)
    for name in ("let_through_i2t", "let_through_at", "length_m"):
        if _value(circuit, name) is not None:
            part[name] = _value(circuit, name)
    rcd = _rcd(circuit)
    if rcd is not None:
        part["rcd"] = rcd
    part["line"] = _some(_LINE, circuit)
    part["cpc"] = _some(_CPC, circuit)
    if _value(circuit, "cpc_arrangement") == "separate":
        part["cpc"].update(_flags(_SEPARATE_CPC, circuit))
    for name in ("selv", "ring"):
        if _flag(circuit, name):
            part[name] = True
    data: dict[str, Any] = {"supply": _supply(job, board), "circuit": part, "measured": _measured(circuit)}
    if final_circuit_max_a is not None:
        data["settings"] = {"final_circuit_max_a": final_circuit_max_a}
    return data


def invalid_fields(rows: dict[str, dict[str, Any]], names: dict[str, tuple[str, ...]]) -> list[str]:
    """Names ("circuit.zs", "job.u0") of fields holding a parse error, among those named per row."""
    return [
        f"{kind}.{name}"
        for kind, fields in names.items()
        for name in fields
        if rows[kind].get(f"{name}_error")
    ]


def assess(data: dict[str, Any], invalid: list[str]) -> Outcome:
    """Run `calc.assess` on `data`; an invalid entry or a calc input error leaves the circuit "not-shown"
    (the evidence decides nothing), with the reason kept."""
    if invalid:
        return Outcome(NOT_SHOWN, None, None, "invalid entries: " + ", ".join(invalid))
    try:
        result = calc.assess(data).to_dict()
    except calc.CalcError as error:
        return Outcome(NOT_SHOWN, None, calc.__version__, str(error))
    return Outcome(
        result["verdict"],
        json.dumps(result, ensure_ascii=False, separators=(",", ":")),
        str(result.get("calc_version", calc.__version__)),
        None,
    )
