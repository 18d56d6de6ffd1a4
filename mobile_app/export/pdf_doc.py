"""The PDF export (fpdf2): the printed record of a job, with the working of every circuit.

Order: the job and its supply, the cautions, each board's circuit table with verdicts, the review and
approval block, then the working of each circuit (every step of the walk: formula, the numbers, the
result and its verdict) and the cautions again. Every page's footer carries the cautions and the page
number. DejaVu Sans is embedded (mobile_app/fonts, with its licence) so that Ω, ², √ and Δ print.
"""

from __future__ import annotations

from typing import Any

from fpdf import FPDF

from mobile_app.export.common import (
    CAUTIONS,
    check_line,
    field_text,
    format_value,
    person_label,
    verdict_label,
)
from mobile_app.export.pdf_layout import (
    BLACK,
    BOLD,
    GREY,
    PLAIN,
    CellStyle,
    JobPdf,
    paragraph,
    table_row,
    use_font,
)

_VERDICT_COLOURS: dict[str, tuple[int, int, int]] = {
    "pass": (20, 100, 40),
    "fail": (170, 20, 20),
    "not-shown": (150, 90, 0),
    "incomplete": (150, 90, 0),
    "check": (150, 90, 0),
}
_SUPPLY_ROWS: tuple[tuple[str, str, str], ...] = (
    ("Client reference", "client_ref", ""),
    ("Site address", "site_address", ""),
    ("Description", "description", ""),
    ("Date", "date", ""),
    ("Earthing system", "system", ""),
    ("U0", "u0", "V"),
    ("Cmin", "cmin", ""),
    ("Ze at the origin", "ze", "Ω"),
    ("Prospective fault current", "pfc", "A"),
)
_TABLE_HEADINGS = ("No.", "Description", "Device", "Zs (Ω)", "Zs max (Ω)", "If (A)",
                   "t / t max (s)", "Verdict")
_TABLE_WIDTHS_MM = (10, 44, 28, 15, 17, 16, 26, 24)
_KEY_VALUE_WIDTHS_MM = (50, 130)


def _one_line(text: Any) -> str:
    """Text for a single-line cell: tabs and line breaks become spaces."""
    return " ".join(str(text).split()) if text is not None else ""


def _field_line(fields: dict[str, Any], name: str, unit: str) -> str:
    """A field as printed: the parsed value with its unit, the raw text if it differs, and any error."""
    field = fields.get(name)
    if not isinstance(field, dict):
        return "—"
    raw = _one_line(field.get("raw"))
    value = field.get("value")
    if field.get("error"):
        return f"{raw or '—'} (not usable: {_one_line(field['error'])})"
    if value is None:
        return raw or "—"
    shown = format_value(value, unit)
    return shown if not raw or raw == shown or raw == str(value) else f"{shown} (typed “{raw}”)"


def _first(result: dict[str, Any], *keys: str) -> Any:
    """The first of `keys` that `result` has a value for, else None."""
    return next((result[key] for key in keys if result.get(key) is not None), None)


def _reading_cell(fields: dict[str, Any], name: str) -> str:
    """A reading for a table cell: the parsed value, else the text as typed with a "?" (unusable)."""
    field = fields.get(name)
    if not isinstance(field, dict):
        return "—"
    if field.get("value") is not None:
        return format_value(field["value"])
    raw = _one_line(field.get("raw"))
    return f"{raw} ?" if raw else "—"


def _zs_cell(fields: dict[str, Any], result: dict[str, Any]) -> str:
    """Zs for the circuit table: as measured, else the Zs the assessment worked out, marked "†"."""
    if (fields.get("zs") or {}).get("value") is None and result.get("zs_ohm") is not None:
        return f"{format_value(result['zs_ohm'])} †"
    return _reading_cell(fields, "zs")


def device_text(fields: dict[str, Any], library: dict[int, str]) -> str:
    """The protective device in a few words, e.g. "MCB C32", "gG 63 A", "curve: ACME 250 A"."""
    kind = field_text(fields, "device_kind")
    curve = field_text(fields, "device_curve")
    rating = (fields.get("device_rating") or {}).get("value")
    rating_text = format_value(rating) if rating is not None else field_text(fields, "device_rating")
    if kind == "mcb":
        return f"MCB {curve}{rating_text}".strip()
    if kind == "fuse-gg":
        return f"gG {rating_text} A" if rating_text else "gG"
    if kind == "curve":
        device_id = (fields.get("library_device_id") or {}).get("value")
        name = library.get(int(device_id), "") if isinstance(device_id, (int, float)) else ""
        return f"curve: {name} {rating_text} A".replace("  ", " ").strip()
    return _one_line(f"{kind} {curve}{rating_text}") or "—"


def _verdict_style(verdict: str | None) -> CellStyle:
    """Bold, coloured text for a verdict."""
    return CellStyle(bold=True, colour=_VERDICT_COLOURS.get(verdict or "", BLACK))


def _heading(pdf: FPDF, text: str, size: float = 12) -> None:
    """A bold heading on its own line, moved to a new page if it would be left at the foot."""
    if pdf.will_page_break(size + 20):
        pdf.add_page()
    pdf.ln(2)
    use_font(pdf, "B", size)
    paragraph(pdf, size * 0.5, _one_line(text))
    use_font(pdf, "", 9)
    pdf.ln(1)


def _key_value_rows(pdf: FPDF, rows: list[tuple[str, str]]) -> None:
    """A two-column block of labels and values."""
    for label, value in rows:
        table_row(pdf, _KEY_VALUE_WIDTHS_MM, (label, value or "—"), (BOLD, PLAIN), 4.5, 9)


def _cautions_block(pdf: FPDF) -> None:
    """The cautions, boxed under their title."""
    pdf.ln(2)
    table_row(pdf, (pdf.epw,), ("Cautions\n" + "\n".join(f"• {line}" for line in CAUTIONS),),
              (PLAIN,), 4.5, 9)
    pdf.ln(2)


def _job_header(pdf: FPDF, doc: dict[str, Any]) -> None:
    """Title, the job's identity, its supply, the cautions and the count of verdicts."""
    job = doc.get("job") or {}
    fields = job.get("fields") or {}
    use_font(pdf, "B", 16)
    paragraph(pdf, 8, _one_line(f"Verification record: {job.get('client_ref') or 'job'}"))
    use_font(pdf, "", 9)
    pdf.set_text_color(*GREY)
    paragraph(pdf, 5, _one_line(
        f"Job {job.get('id')} · revision {job.get('revision') or '—'} · "
        f"status {job.get('status') or '—'} · exported {doc.get('exported_at') or '—'} · "
        f"calc {doc.get('calc_version') or '—'}"))
    pdf.set_text_color(*BLACK)
    _heading(pdf, "Job and supply")
    _key_value_rows(pdf, [(label, _field_line(fields, name, unit))
                          for label, name, unit in _SUPPLY_ROWS])
    _cautions_block(pdf)
    circuits = [c for board in doc.get("boards") or [] for c in board.get("circuits") or []]
    passed = sum(1 for c in circuits if c.get("verdict") == "pass")
    failed = sum(1 for c in circuits if c.get("verdict") == "fail")
    use_font(pdf, "B", 10)
    paragraph(pdf, 6, f"{len(circuits)} circuits: {passed} pass, {failed} fail, "
                      f"{len(circuits) - passed - failed} not shown")
    use_font(pdf, "", 9)


def _board_heading(board: dict[str, Any]) -> str:
    """"Board DB1 (location ..., supplied from ..., system ..., Ze ...)" with what is known."""
    fields = board.get("fields") or {}
    parts = [f"location {board.get('location')}" if board.get("location") else "",
             f"supplied from {board.get('supplied_from')}" if board.get("supplied_from") else "",
             f"system {field_text(fields, 'system')}" if field_text(fields, "system") else "",
             f"Ze {field_text(fields, 'ze')}" if field_text(fields, "ze") else ""]
    details = ", ".join(part for part in parts if part)
    return f"Board {board.get('designation')}" + (f" ({details})" if details else "")


def _board_table(pdf: FPDF, board: dict[str, Any], library: dict[int, str]) -> None:
    """A board's heading and its table of circuits with their verdicts."""
    _heading(pdf, _board_heading(board))
    circuits = board.get("circuits") or []
    if not circuits:
        paragraph(pdf, 5, "No circuits recorded on this board.")
        return
    table_row(pdf, _TABLE_WIDTHS_MM, _TABLE_HEADINGS, [BOLD] * len(_TABLE_HEADINGS))
    for circuit in circuits:
        fields = circuit.get("fields") or {}
        result = circuit.get("assessment") or {}
        texts = (
            _one_line(circuit.get("number")),
            _one_line(circuit.get("description")) or "—",
            device_text(fields, library),
            _zs_cell(fields, result),
            format_value(result.get("zs_max_ohm")),
            format_value(result.get("earth_fault_current_a")),
            f"{format_value(_first(result, 'disconnection_time_s', 'device_time_s'))} / "
            f"{format_value(result.get('max_disconnection_time_s'))}",
            verdict_label(circuit.get("verdict")),
        )
        styles = [PLAIN] * 7 + [_verdict_style(circuit.get("verdict"))]
        table_row(pdf, _TABLE_WIDTHS_MM, texts, styles, repeat=_TABLE_HEADINGS)
    use_font(pdf, "", 8)
    derived = [c for c in circuits if "†" in _zs_cell(c.get("fields") or {}, c.get("assessment") or {})]
    if derived:
        paragraph(pdf, 4, "† Zs not measured: the value the assessment worked out from its readings "
                          f"({_one_line((derived[0].get('assessment') or {}).get('zs_source'))}).")
    use_font(pdf, "", 9)


def _step_lines(pdf: FPDF, step: dict[str, Any]) -> None:
    """One step of the working: title, result and verdict; formula and numbers; note."""
    verdict = step.get("verdict")
    title = _one_line(step.get("title") or step.get("id"))
    value = step.get("value")
    if value is not None and not (isinstance(value, str) and value.lower() == verdict):
        title += f": {format_value(value, step.get('unit') or '')}"
    if verdict and verdict != "info":
        title += f" — {verdict_label(verdict)}"
    use_font(pdf, "B", 8.5)
    pdf.set_text_color(*_VERDICT_COLOURS.get(verdict or "", BLACK))
    paragraph(pdf, 4, title)
    pdf.set_text_color(*BLACK)
    use_font(pdf, "", 8.5)
    working = "  →  ".join(_one_line(step[key]) for key in ("formula", "working") if step.get(key))
    if working:
        paragraph(pdf, 3.8, working, indent_mm=4)
    if step.get("note"):
        pdf.set_text_color(*GREY)
        use_font(pdf, "", 7.5)
        paragraph(pdf, 3.5, _one_line(step["note"]), indent_mm=4)
        pdf.set_text_color(*BLACK)
    pdf.ln(0.6)


def _working(pdf: FPDF, board: dict[str, Any], circuit: dict[str, Any]) -> None:
    """The working of one circuit: its heading, its verdict and every step of the walk."""
    verdict = circuit.get("verdict")
    if pdf.will_page_break(30):
        pdf.add_page()
    pdf.ln(1.5)
    use_font(pdf, "B", 9.5)
    description = f" · {circuit.get('description')}" if circuit.get("description") else ""
    paragraph(pdf, 5, _one_line(f"Board {board.get('designation')} · circuit "
                                f"{circuit.get('number')}{description}"))
    pdf.set_text_color(*_VERDICT_COLOURS.get(verdict or "", BLACK))
    assessment = circuit.get("assessment") or {}
    cause = assessment.get("primary_cause") or {}
    paragraph(pdf, 5, f"Verdict: {verdict_label(verdict)}"
              + (f" — {_one_line(cause.get('text'))}" if cause.get("text") else ""))
    pdf.set_text_color(*BLACK)
    use_font(pdf, "", 8.5)
    for remedy in cause.get("remedies") or ():
        paragraph(pdf, 4, f"Remedy: {_one_line(remedy)}", indent_mm=4)
    for check in assessment.get("checks") or ():
        pdf.set_text_color(*_VERDICT_COLOURS.get(check.get("outcome") or "", BLACK))
        paragraph(pdf, 4, _one_line(check_line(check)), indent_mm=4)
    pdf.set_text_color(*BLACK)
    steps = assessment.get("steps") or []
    use_font(pdf, "", 8.5)
    if not steps:
        reason = _one_line(circuit.get("assessment_error")) or "readings or circuit details are missing"
        paragraph(pdf, 4, f"Not assessed: {reason}.")
    for step in steps:
        _step_lines(pdf, step)
    problems = [f"{name} “{_one_line(f.get('raw'))}”: {_one_line(f['error'])}"
                for name, f in (circuit.get("fields") or {}).items()
                if isinstance(f, dict) and f.get("error")]
    if problems:
        paragraph(pdf, 4, "Readings not usable: " + "; ".join(problems))


def _review_block(pdf: FPDF, job: dict[str, Any], doc: dict[str, Any]) -> None:
    """Who recorded, submitted and approved the job, when, and the reviewer's comment; an approval
    by a supervisor the office did not enrol is marked unverified."""
    _heading(pdf, "Review and approval")
    _key_value_rows(pdf, [
        ("Status", _one_line(job.get("status")) or "—"),
        ("Revision", _one_line(job.get("revision"))),
        ("Recorded by", person_label(job.get("recorded_by"))),
        ("Submitted for review by", person_label(job.get("submitted_by"))),
        ("Approved by", person_label(job.get("approved_by"))),
        ("Approved at", _one_line(job.get("approved_at")) or "—"),
    ])
    pdf.ln(1)
    paragraph(pdf, 4.5, f"Review comment: {job.get('review_comment') or '—'}")
    if job.get("status") != "approved":
        use_font(pdf, "B", 9)
        paragraph(pdf, 5, "Not approved: this record has not been approved by a supervisor.")
        use_font(pdf, "", 9)
    elif doc.get("roster_entry") is None:
        use_font(pdf, "B", 9)
        paragraph(pdf, 5, "Unverified approval: the supervisor was not enrolled by the office, and the "
                          "office will not accept this approval.")
        use_font(pdf, "", 9)


def job_pdf_bytes(doc: dict[str, Any]) -> bytes:
    """The PDF file of a job document."""
    job = doc.get("job") or {}
    library = {int(d["id"]): str(d.get("name", "")) for d in doc.get("library_devices") or []
               if isinstance(d, dict) and isinstance(d.get("id"), int)}
    pdf = JobPdf(_one_line(f"Job {job.get('id')} {job.get('client_ref') or ''} "
                           f"rev {job.get('revision')}"), " ".join(CAUTIONS))
    pdf.set_title(_one_line(f"Verification record {job.get('client_ref') or job.get('id')}"))
    pdf.set_creator("Boardside")
    pdf.add_page()
    _job_header(pdf, doc)
    boards = doc.get("boards") or []
    for board in boards:
        _board_table(pdf, board, library)
    _review_block(pdf, job, doc)
    pdf.add_page()
    _heading(pdf, "Working, circuit by circuit", 13)
    for board in boards:
        for circuit in board.get("circuits") or []:
            _working(pdf, board, circuit)
    _cautions_block(pdf)
    return bytes(pdf.output())
