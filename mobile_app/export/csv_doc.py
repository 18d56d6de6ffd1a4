"""The CSV export: one row per circuit, headers carrying units, safe to open in a spreadsheet.

Numbers are the parsed values in base units; text cells that a spreadsheet would run as a formula are
neutralised with a leading apostrophe (`neutralise_cell`). The file is UTF-8 with a byte-order mark so
that spreadsheets read Ω and ² correctly. The format is described in EXPORT-FORMAT.md.
"""

from __future__ import annotations

import csv
import io
import math
import re
from collections.abc import Callable, Iterator
from typing import Any

from mobile_app.export.common import CAUTIONS, person_label

_FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")
_NUMBER = re.compile(r"[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?")

Row = dict[str, Any]
Circuit = dict[str, Any]

# (header with unit, circuit field whose parsed value fills it; a library device by its name)
_INPUT_COLUMNS: tuple[tuple[str, str], ...] = (
    ("Role", "role"),
    ("Device", "device_kind"),
    ("Curve", "device_curve"),
    ("In (A)", "device_rating"),
    ("Library device", "library_device_id"),
    ("Let-through I²t (A²s)", "let_through_i2t"),
    ("RCD IΔn (A)", "rcd_idn"),
    ("RCD type", "rcd_type"),
    ("Line csa (mm²)", "line_csa"),
    ("Line material", "line_material"),
    ("Line insulation", "line_insulation"),
    ("CPC csa (mm²)", "cpc_csa"),
    ("CPC material", "cpc_material"),
    ("CPC arrangement", "cpc_arrangement"),
    ("Zs measured (Ω)", "zs"),
    ("Zsc measured (Ω)", "zsc"),
    ("R1+R2 (Ω)", "r1r2"),
    ("Ze measured (Ω)", "ze"),
    ("Test temperature (°C)", "test_temp_c"),
)

CHECK_TITLES: tuple[tuple[str, str], ...] = (
    ("disconnection", "Disconnection"),
    ("earth-path", "Own earth path"),
    ("touch-voltage", "Touch voltage"),
    ("breaking-capacity", "Breaking capacity"),
    ("line-withstand-max", "Line at largest fault current"),
    ("line-withstand-min", "Line at smallest fault current"),
    ("cpc", "Protective conductor"),
    ("cpc-minimum-size", "Separate CPC size"),
    ("insulation", "Insulation"),
    ("continuity", "Continuity"),
    ("ring", "Ring"),
    ("polarity", "Polarity"),
    ("rcd-time", "RCD time"),
    ("rcd-button", "RCD button"),
)
"""Every check calc makes, in walk order: three columns each (outcome, deciding figure, margin)."""

# (header with unit, assessment key)
_RESULT_COLUMNS: tuple[tuple[str, str], ...] = (
    ("Zs used (Ω)", "zs_ohm"),
    ("Zs source", "zs_source"),
    ("If (A)", "earth_fault_current_a"),
    ("Isc (A)", "short_circuit_current_a"),
    ("Max disconnection time (s)", "max_disconnection_time_s"),
    ("Device time at If (s)", "device_time_s"),
    ("Device time at Isc (s)", "device_time_at_short_circuit_s"),
    ("RCD time (s)", "rcd_time_s"),
    ("Disconnection time (s)", "disconnection_time_s"),
    ("Zs max (Ω)", "zs_max_ohm"),
    ("Zs limit at test temperature (Ω)", "zs_limit_at_test_temp_ohm"),
    ("0.8 × Zs max (Ω)", "zs_rule_of_thumb_ohm"),
    ("Zs margin OK", "zs_margin_ok"),
    ("Disconnection OK", "disconnection_ok"),
    ("Touch voltage RA·IΔn (V)", "touch_voltage_v"),
    ("Touch voltage OK", "touch_voltage_ok"),
    ("k line (A·s½/mm²)", "k_line"),
    ("k CPC (A·s½/mm²)", "k_cpc"),
    ("Line withstand time (s)", "line_withstand_time_s"),
    ("Line withstand OK", "line_withstand_ok"),
    ("CPC by proportion min csa (mm²)", "cpc_proportional_min_mm2"),
    ("CPC by proportional rule", "cpc_by_proportional_rule"),
    ("CPC adiabatic min csa (mm²)", "cpc_min_csa_mm2"),
    ("CPC adiabatic OK", "cpc_adiabatic_ok"),
    ("CPC OK", "cpc_ok"),
)


def is_number_text(text: str) -> bool:
    """Whether `text` is a plain decimal number (optional sign, digits, point, exponent)."""
    return _NUMBER.fullmatch(text) is not None


def neutralise_cell(text: str) -> str:
    """`text` made inert for a spreadsheet: a leading apostrophe if it starts like a formula.

    A cell starting with `=`, `+`, `-`, `@`, a tab or a carriage return is run as a formula by common
    spreadsheets (OWASP "CSV injection", common practice); a plain number such as `-0.5` is left alone.
    """
    if text.startswith(_FORMULA_STARTS) and not is_number_text(text):
        return "'" + text
    return text


def csv_cell(value: Any) -> str:
    """One cell's text: numbers plainly (shortest exact form), booleans yes/no, text neutralised."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, float):
        return repr(value) if math.isfinite(value) else ""
    return neutralise_cell(str(value))


def _field_value(fields: dict[str, Any], name: str) -> Any:
    """A circuit field's parsed value (None when blank or unusable: see the input problems column)."""
    field = fields.get(name)
    return field.get("value") if isinstance(field, dict) else None


def _input_problems(fields: dict[str, Any]) -> str:
    """Every field whose text could not be used, as `name "raw": error`, joined with "; "."""
    problems = [
        f'{name} "{field.get("raw", "")}": {field["error"]}'
        for name, field in fields.items()
        if isinstance(field, dict) and field.get("error")
    ]
    return "; ".join(problems)


def people_names(doc: dict[str, Any]) -> dict[int, str]:
    """Person id → name, from the document's audit entries (`person_id`, `who`)."""
    return {
        int(entry["person_id"]): str(entry["who"])
        for entry in doc.get("audit") or []
        if isinstance(entry, dict) and isinstance(entry.get("person_id"), int) and entry.get("who")
    }


def _person(person: Any, names: dict[int, str]) -> str | None:
    """A person for a cell: a name (looked up if an id), or an empty cell when nobody is known."""
    if person in (None, ""):
        return None
    if isinstance(person, int) and not isinstance(person, bool) and person in names:
        return names[person]
    return person_label(person)


def _columns(names: dict[int, str]) -> list[tuple[str, Callable[[Row, Circuit], Any]]]:
    """Every column: its header and how a (job context, circuit) pair fills it."""

    def job_key(key: str) -> Callable[[Row, Circuit], Any]:
        return lambda context, _circuit: context[key]

    def input_field(name: str) -> Callable[[Row, Circuit], Any]:
        if name == "library_device_id":
            return lambda context, circuit: context["library"].get(
                _field_value(circuit.get("fields") or {}, name))
        return lambda _context, circuit: _field_value(circuit.get("fields") or {}, name)

    def result(key: str) -> Callable[[Row, Circuit], Any]:
        return lambda _context, circuit: (circuit.get("assessment") or {}).get(key)

    def check_field(check_id: str, key: str) -> Callable[[Row, Circuit], Any]:
        def fill(_context: Row, circuit: Circuit) -> Any:
            for check in (circuit.get("assessment") or {}).get("checks") or ():
                if isinstance(check, dict) and check.get("id") == check_id:
                    return check.get(key) or None
            return None

        return fill

    columns: list[tuple[str, Callable[[Row, Circuit], Any]]] = [
        ("Job", job_key("job_id")),
        ("Client reference", job_key("client_ref")),
        ("Revision", job_key("revision")),
        ("Status", job_key("status")),
        ("Board", job_key("board")),
        ("Circuit", lambda _context, circuit: circuit.get("number")),
        ("Description", lambda _context, circuit: circuit.get("description")),
    ]
    columns += [(header, input_field(name)) for header, name in _INPUT_COLUMNS]
    columns += [(header, result(key)) for header, key in _RESULT_COLUMNS]
    for check_id, title in CHECK_TITLES:
        columns += [
            (f"{title}: outcome", check_field(check_id, "outcome")),
            (f"{title}: deciding figure", check_field(check_id, "deciding")),
            (f"{title}: margin", check_field(check_id, "margin")),
        ]
    columns += [
        ("Primary cause", lambda _context, circuit: ((circuit.get("assessment") or {}).get("primary_cause")
                                                     or {}).get("text")),
        ("Verdict", lambda _context, circuit: circuit.get("verdict")),
        ("Calc version", lambda _context, circuit: circuit.get("calc_version")),
        ("Updated at", lambda _context, circuit: circuit.get("updated_at")),
        ("Updated by", lambda _context, circuit: _person(circuit.get("updated_by"), names)),
        ("Input problems", lambda _context, circuit: _input_problems(circuit.get("fields") or {})),
        ("Cautions", lambda _context, _circuit: " ".join(CAUTIONS)),
    ]
    return columns


def csv_headers() -> list[str]:
    """The header row, in column order."""
    return [header for header, _fill in _columns({})]


def _rows(doc: dict[str, Any]) -> Iterator[list[str]]:
    """Every circuit of the document as a row of cell texts, board by board."""
    job = doc.get("job") or {}
    columns = _columns(people_names(doc))
    library = {float(device["id"]): device.get("name") for device in doc.get("library_devices") or []
               if isinstance(device, dict) and isinstance(device.get("id"), int)}
    for board in doc.get("boards") or []:
        context: Row = {
            "job_id": job.get("id"),
            "client_ref": job.get("client_ref"),
            "revision": job.get("revision"),
            "status": job.get("status"),
            "board": board.get("designation"),
            "library": library,
        }
        for circuit in board.get("circuits") or []:
            yield [csv_cell(fill(context, circuit)) for _header, fill in columns]


def job_csv_bytes(doc: dict[str, Any]) -> bytes:
    """The CSV file of a job document: UTF-8 with a byte-order mark, CRLF line ends."""
    buffer = io.StringIO(newline="")
    writer = csv.writer(buffer, lineterminator="\r\n")
    writer.writerow(csv_headers())
    writer.writerows(_rows(doc))
    return buffer.getvalue().encode("utf-8-sig")
