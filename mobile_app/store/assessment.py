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
_CPC = (("csa", "cpc_csa"), ("material", "cpc_material"), ("arrangement", "cpc_arrangement"))
_MEASURED = ("zs", "zsc", "r1r2", "ze", "test_temp_c")
_DEVICE_FIELDS = ("device_kind", "device_curve", "device_rating", "library_device_id")


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


def _some(pairs: tuple[tuple[str, str], ...], row: dict[str, Any]) -> dict[str, Any]:
    """A dict of calc keys to the row's parsed values, leaving out blanks."""
    return {key: _value(row, name) for key, name in pairs if _value(row, name) is not None}


def _device(circuit: dict[str, Any], library_device: dict[str, Any] | None) -> dict[str, Any]:
    """The calc device dict from a circuit's device fields (and its library curve, if any)."""
    kind = _value(circuit, "device_kind")
    rating = _value(circuit, "device_rating")
    device: dict[str, Any] = {"kind": kind} if kind else {}
    if kind == "mcb" and _value(circuit, "device_curve"):
        device["curve"] = _value(circuit, "device_curve")
    if kind == "curve" and library_device is not None:
        device["points"] = [list(point) for point in library_device["points"]]
        if rating is None:
            rating = library_device.get("rating_a")
    if rating is not None:
        device["rating"] = rating
    return device


def build_calc_input(
    job: dict[str, Any],
    board: dict[str, Any],
    circuit: dict[str, Any],
    library_device: dict[str, Any] | None = None,
    final_circuit_max_a: float | None = None,
) -> dict[str, Any]:
    """The dict given to `calc.assess` for one circuit: the job's (or board's) supply, the circuit.

    A board's own system and Ze, when filled in, take the place of the job's (an outbuilding board
    on its own earth electrode). Blank and invalid fields are left out.
    """
    supply: dict[str, Any] = {}
    system = _value(board, "system") or _value(job, "system")
    if system:
        supply["system"] = system
    for name in ("u0", "cmin", "pfc"):
        if _value(job, name) is not None:
            supply[name] = _value(job, name)
    ze = _value(board, "ze") if _value(board, "ze") is not None else _value(job, "ze")
    if ze is not None:
        supply["ze"] = ze
    part: dict[str, Any] = {}
    if _value(circuit, "role"):
        part["role"] = _value(circuit, "role")
    part["device"] = _device(circuit, library_device)
    if _value(circuit, "let_through_i2t") is not None:
        part["let_through_i2t"] = _value(circuit, "let_through_i2t")
    if _value(circuit, "rcd_idn") is not None:
        part["rcd"] = {
            "idn": _value(circuit, "rcd_idn"),
            "type": _value(circuit, "rcd_type") or "general",
        }
    part["line"] = _some(_LINE, circuit)
    part["cpc"] = _some(_CPC, circuit)
    data: dict[str, Any] = {
        "supply": supply,
        "circuit": part,
        "measured": {name: _value(circuit, name) for name in _MEASURED if _value(circuit, name) is not None},
    }
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
