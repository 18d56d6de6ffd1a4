"""The CSV export: the schedule of test results, one row per circuit, for a spreadsheet.

The columns are the PDF schedule's values, one value per column, rounded the same way (as the
instrument shows them) with the unit in the header; then every check's outcome, deciding figure and
margin; then the job, the verdict and who changed the circuit last. Text cells that a spreadsheet would
run as a formula are neutralised with a leading apostrophe (`neutralise_cell`). The file is UTF-8 with
a byte-order mark so that spreadsheets read Ω and ² correctly. The format is described in
EXPORT-FORMAT.md.
"""

from __future__ import annotations

import csv
import io
import math
import re
from collections.abc import Callable, Iterator
from typing import Any

from mobile_app.export.common import CAUTIONS, person_label
from mobile_app.export.figures import local_time
from mobile_app.export.schedule import COLUMNS, circuit_values

_FORMULA_STARTS = ("=", "+", "-", "@", "\t", "\r")
_NUMBER = re.compile(r"[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?")

Row = dict[str, Any]
Circuit = dict[str, Any]

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
    """Every column: its header and how a (board context, circuit) pair fills it."""

    def context_key(key: str) -> Callable[[Row, Circuit], Any]:
        return lambda context, _circuit: context[key]

    def scheduled(key: str) -> Callable[[Row, Circuit], Any]:
        return lambda context, _circuit: context["values"][key] or None

    def check_field(check_id: str, key: str) -> Callable[[Row, Circuit], Any]:
        def fill(_context: Row, circuit: Circuit) -> Any:
            for check in (circuit.get("assessment") or {}).get("checks") or ():
                if isinstance(check, dict) and check.get("id") == check_id:
                    return check.get(key) or None
            return None

        return fill

    columns: list[tuple[str, Callable[[Row, Circuit], Any]]] = [("Board", context_key("board"))]
    columns += [(column.header, scheduled(column.key)) for column in COLUMNS]
    for check_id, title in CHECK_TITLES:
        columns += [
            (f"{title}: outcome", check_field(check_id, "outcome")),
            (f"{title}: deciding figure", check_field(check_id, "deciding")),
            (f"{title}: margin", check_field(check_id, "margin")),
        ]
    columns += [
        ("Verdict", lambda _context, circuit: circuit.get("verdict")),
        ("Job", context_key("job_id")),
        ("Client reference", context_key("client_ref")),
        ("Revision", context_key("revision")),
        ("Status", context_key("status")),
        ("Calc version", lambda _context, circuit: circuit.get("calc_version")),
        ("Updated at", lambda _context, circuit: local_time(circuit.get("updated_at")) or None),
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
    library = {int(device["id"]): str(device.get("name") or "") for device in doc.get("library_devices") or []
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
            context["values"] = circuit_values(circuit, library)
            yield [csv_cell(fill(context, circuit)) for _header, fill in columns]


def job_csv_bytes(doc: dict[str, Any]) -> bytes:
    """The CSV file of a job document: UTF-8 with a byte-order mark, CRLF line ends."""
    buffer = io.StringIO(newline="")
    writer = csv.writer(buffer, lineterminator="\r\n")
    writer.writerow(csv_headers())
    writer.writerows(_rows(doc))
    return buffer.getvalue().encode("utf-8-sig")
