"""The schedule of test results, shared by the PDF and the CSV: one row per circuit with the values the
office files (rounded as the instrument shows them), and the job's and boards' details in words.

Columns are grouped as the work is done: the circuit, its protection, its conductors, the tests made
with the supply off (continuity, insulation, polarity), the tests made live (loop impedance, RCD), and
the outcome with its reason in words (the calculation core's primary cause).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from mobile_app.export.common import field_text, verdict_label
from mobile_app.export.figures import local_date, rating, reading


@dataclass(frozen=True)
class Column:
    """One schedule value: its key, its header with unit (CSV) and the group it belongs to."""

    key: str
    header: str
    group: str


COLUMNS: tuple[Column, ...] = (
    Column("ref", "Circuit", "Circuit"),
    Column("description", "Description", "Circuit"),
    Column("form", "Ring or SELV", "Circuit"),
    Column("points", "Points", "Circuit"),
    Column("wiring", "Wiring", "Circuit"),
    Column("method", "Reference method", "Circuit"),
    Column("length", "Length (m)", "Circuit"),
    Column("device", "Device", "Protection"),
    Column("device_curve", "Maker's curve", "Protection"),
    Column("breaking_capacity", "Breaking capacity (kA)", "Protection"),
    Column("rcd_type", "RCD type", "Protection"),
    Column("rcd_idn", "RCD IΔn (mA)", "Protection"),
    Column("line_csa", "Line (mm²)", "Conductors"),
    Column("cpc_csa", "Protective conductor (mm²)", "Conductors"),
    Column("r1r2", "R1+R2 (Ω)", "Tests, supply off"),
    Column("r2", "R2 (Ω)", "Tests, supply off"),
    Column("ring_r1", "Ring r1 (Ω)", "Tests, supply off"),
    Column("ring_rn", "Ring rn (Ω)", "Tests, supply off"),
    Column("ring_r2", "Ring r2 (Ω)", "Tests, supply off"),
    Column("ring_r1r2", "Ring (r1 + r2)/4 (Ω)", "Tests, supply off"),
    Column("ir_voltage", "Insulation test voltage (V)", "Tests, supply off"),
    Column("ir_ll", "Insulation L–L (MΩ)", "Tests, supply off"),
    Column("ir_le", "Insulation L–E (MΩ)", "Tests, supply off"),
    Column("polarity", "Polarity", "Tests, supply off"),
    Column("zs", "Zs (Ω)", "Tests, live"),
    Column("zs_from", "Zs from", "Tests, live"),
    Column("zs_limit", "Zs limit (Ω)", "Tests, live"),
    Column("zs_limit_by", "Zs limit set by", "Tests, live"),
    Column("rcd_1x", "RCD time at IΔn (ms)", "Tests, live"),
    Column("rcd_5x", "RCD time at 5 IΔn (ms)", "Tests, live"),
    Column("rcd_button", "RCD test button", "Tests, live"),
    Column("outcome", "Outcome", "Outcome"),
    Column("reason", "Reason", "Outcome"),
)

PURPOSES = {
    "new-work": "New work (initial verification)",
    "periodic": "Periodic inspection",
    "fault-finding": "Fault finding",
}
SEVERITIES = {
    "serious": "Serious: unsafe now or likely to become so",
    "attention": "Needs attention: to be put right",
    "note": "Note: for information",
}
OVERALL = {"satisfactory": "SATISFACTORY", "unsatisfactory": "UNSATISFACTORY", "not-shown": "NOT SHOWN"}


def value(fields: dict[str, Any], name: str) -> Any:
    """A field's parsed value (None when blank, unusable or absent)."""
    field = fields.get(name)
    return field.get("value") if isinstance(field, dict) else None


def one_line(text: Any) -> str:
    """Text on one line: tabs and line breaks become spaces."""
    return " ".join(str(text).split()) if text is not None else ""


def curve_name(fields: dict[str, Any], library: dict[int, str]) -> str:
    """The name of the maker's curve a curve device uses (blank for other devices)."""
    device_id = value(fields, "library_device_id")
    if value(fields, "device_kind") != "curve" or not isinstance(device_id, int | float):
        return ""
    return one_line(library.get(int(device_id), ""))


def device_text(fields: dict[str, Any], library: dict[int, str], short: bool = False) -> str:
    """The protective device in a few words: "MCB C32", "RCBO B32", "gG 63 A", "curve: ACME 250 A"
    (`short`: "curve 250 A", the curve's name left to `curve_name`)."""
    kind = field_text(fields, "device_kind")
    curve = field_text(fields, "device_curve")
    rated = rating(value(fields, "device_rating")) or field_text(fields, "device_rating")
    if value(fields, "device_kind") in ("mcb", "rcbo"):
        return f"{value(fields, 'device_kind').upper()} {curve}{rated}".strip()
    if kind == "fuse-gg":
        return f"gG {rated} A" if rated else "gG"
    if kind == "curve":
        name = "" if short else curve_name(fields, library)
        return " ".join(f"curve{':' if name else ''} {name} {rated} A".split())
    return one_line(f"{kind} {curve}{rated}")


def _yes_no(fields: dict[str, Any], name: str, yes: str, no: str) -> str:
    answer = value(fields, name)
    return yes if answer == "yes" else no if answer == "no" else ""


def _rcd_type(fields: dict[str, Any]) -> str:
    """The RCD's type letter and delay: "A", "AC, type S"; blank when no RCD is recorded."""
    if value(fields, "rcd_idn") is None:
        return ""
    letter = value(fields, "rcd_waveform") or "type letter not recorded"
    return letter + (", type S (delayed)" if value(fields, "rcd_type") == "s" else "")


def _zs(fields: dict[str, Any], result: dict[str, Any]) -> tuple[str, str]:
    """Zs as measured, else as the assessment worked it out (and from what)."""
    if value(fields, "zs") is not None:
        return reading(value(fields, "zs")), "measured"
    if result.get("zs_ohm") is not None:
        return reading(result["zs_ohm"]), str(result.get("zs_source") or "worked out")
    return "", ""


def _zs_limit(result: dict[str, Any]) -> tuple[str, str]:
    """The largest Zs reading the disconnection check allows, at the test temperature where one is
    recorded, and whether the device or the RCD sets it."""
    limit = result.get("zs_limit_at_test_temp_ohm") or result.get("zs_limit_ohm")
    if limit is None:
        return "", ""
    by_rcd = (result.get("zs_limit_ohm") or 0) > (result.get("zs_max_ohm") or 0) * 1.0001
    return reading(limit), "RCD" if by_rcd else "device"


def outcome_reason(circuit: dict[str, Any]) -> tuple[str, str]:
    """The printed outcome word and, unless it passes, the reason in words (the primary cause)."""
    verdict = circuit.get("verdict")
    if verdict == "pass":
        return verdict_label(verdict), ""
    assessment = circuit.get("assessment") or {}
    cause = (assessment.get("primary_cause") or {}).get("text")
    if cause:
        return verdict_label(verdict), one_line(cause)
    reason = circuit.get("assessment_error") or "readings or circuit details are missing"
    return verdict_label(verdict), f"not assessed: {one_line(reason)}"


def circuit_values(circuit: dict[str, Any], library: dict[int, str]) -> dict[str, str]:
    """Every schedule value of one circuit as printed ("" where nothing is recorded); text typed by a
    person (reference, description, wiring, method) as it was typed."""
    fields = circuit.get("fields") or {}
    result = circuit.get("assessment") or {}
    zs, zs_from = _zs(fields, result)
    limit, limit_by = _zs_limit(result)
    outcome, reason = outcome_reason(circuit)
    points = value(fields, "points_served")
    return {
        "ref": str(circuit.get("number") or ""),
        "description": str(circuit.get("description") or ""),
        "form": ", ".join(word for name, word in (("ring", "ring"), ("selv", "SELV"))
                          if value(fields, name) == "yes"),
        "points": "" if points is None else str(points),
        "wiring": field_text(fields, "wiring_type"),
        "method": field_text(fields, "reference_method"),
        "length": rating(value(fields, "length_m")),
        "device": device_text(fields, library, short=True),
        "device_curve": curve_name(fields, library),
        "breaking_capacity": rating(value(fields, "breaking_capacity"), 1e-3),
        "rcd_type": _rcd_type(fields),
        "rcd_idn": rating(value(fields, "rcd_idn"), 1e3),
        "line_csa": rating(value(fields, "line_csa")),
        "cpc_csa": rating(value(fields, "cpc_csa")),
        "r1r2": reading(value(fields, "r1r2")),
        "r2": reading(value(fields, "r2")),
        "ring_r1": reading(value(fields, "ring_r1")),
        "ring_rn": reading(value(fields, "ring_rn")),
        "ring_r2": reading(value(fields, "ring_r2")),
        "ring_r1r2": reading(result.get("ring_expected_r1r2_ohm")),
        "ir_voltage": rating(value(fields, "insulation_test_voltage")),
        "ir_ll": reading(value(fields, "insulation_line_line")),
        "ir_le": reading(value(fields, "insulation_line_earth")),
        "polarity": _yes_no(fields, "polarity", "correct", "wrong"),
        "zs": zs,
        "zs_from": zs_from,
        "zs_limit": limit,
        "zs_limit_by": limit_by,
        "rcd_1x": reading(value(fields, "rcd_time_1x"), 1e3, 0),
        "rcd_5x": reading(value(fields, "rcd_time_5x"), 1e3, 0),
        "rcd_button": _yes_no(fields, "rcd_test_button", "trips", "does not trip"),
        "outcome": outcome,
        "reason": reason,
    }


def _with(text: str, unit: str) -> str:
    return f"{text} {unit}" if text else ""


def board_details(board: dict[str, Any]) -> list[tuple[str, str]]:
    """A board's details in words, as (label, text) rows; what is not recorded is left out (the
    supply then is the job's)."""
    fields = board.get("fields") or {}
    main = ", ".join(p for p in (one_line(field_text(fields, "main_device")),
                                 _with(rating(value(fields, "main_rating")), "A")) if p)
    rows = [
        ("Location", one_line(board.get("location"))),
        ("Fed from", one_line(board.get("supplied_from"))),
        ("Earthing system", value(fields, "system") or field_text(fields, "system")),
        ("Ze or Zdb at this board", _with(reading(value(fields, "ze")), "Ω")),
        ("Prospective fault current here", _with(rating(value(fields, "pfc"), 1e-3), "kA")),
        ("Earth electrode resistance RA", _with(reading(value(fields, "ra")), "Ω")),
        ("Main switch or device", main),
    ]
    if value(fields, "origin") == "yes":
        rows += [
            ("At the origin", "yes"),
            ("Earthing conductor", _with(rating(value(fields, "earthing_csa")), "mm²")),
            ("Main protective bonding conductors", _with(rating(value(fields, "bonding_csa")), "mm²")),
        ]
    return [(label, text) for label, text in rows if text]


def job_details(job: dict[str, Any]) -> list[tuple[str, str]]:
    """The job's identity and purpose in words, as (label, text) rows."""
    fields = job.get("fields") or {}
    purpose = value(fields, "purpose")
    rows = [
        ("Job reference", field_text(fields, "client_ref") or one_line(job.get("client_ref"))),
        ("Client", field_text(fields, "client_name")),
        ("Client's address", field_text(fields, "client_address")),
        ("Site", field_text(fields, "site_address") or one_line(job.get("site_address"))),
        ("Purpose", PURPOSES.get(purpose or "", field_text(fields, "purpose"))),
        ("Work described", field_text(fields, "description")),
        ("Date of the inspection", local_date(value(fields, "date")) or field_text(fields, "date")),
    ]
    if purpose == "periodic" or field_text(fields, "next_inspection"):
        rows.append(("Next inspection recommended by",
                     local_date(value(fields, "next_inspection")) or field_text(fields, "next_inspection")))
    return [(label, one_line(text)) for label, text in rows if text]


def supply_details(job: dict[str, Any]) -> list[tuple[str, str]]:
    """The supply at the origin in words, as (label, text) rows."""
    fields = job.get("fields") or {}
    rows = [
        ("Earthing system", value(fields, "system") or field_text(fields, "system")),
        ("U0", _with(rating(value(fields, "u0")), "V")),
        ("Cmin (voltage factor)", rating(value(fields, "cmin"))),
        ("Ze at the origin", _with(reading(value(fields, "ze")), "Ω")),
        ("Prospective fault current at the origin", _with(rating(value(fields, "pfc"), 1e-3), "kA")),
    ]
    return [(label, text) for label, text in rows if text]
