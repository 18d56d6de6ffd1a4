"""The calculation annex of the PDF: the working of every circuit, at full precision — its verdict
and primary cause, each check with the figure that decided it, and every step of the walk (formula,
the numbers, the result and its verdict)."""

from __future__ import annotations

from typing import Any

from fpdf import FPDF

from mobile_app.export.common import check_line, format_value, verdict_label
from mobile_app.export.pdf_blocks import OUTCOME_COLOURS
from mobile_app.export.pdf_layout import BLACK, GREY, paragraph, use_font
from mobile_app.export.schedule import one_line


def _step_lines(pdf: FPDF, step: dict[str, Any]) -> None:
    """One step of the working: title, result and verdict; formula and numbers; note."""
    verdict = step.get("verdict")
    title = one_line(step.get("title") or step.get("id"))
    value = step.get("value")
    if value is not None and not (isinstance(value, str) and value.lower() == verdict):
        title += f": {format_value(value, step.get('unit') or '')}"
    if verdict and verdict != "info":
        title += f" — {verdict_label(verdict)}"
    use_font(pdf, "B", 8.5)
    pdf.set_text_color(*OUTCOME_COLOURS.get(verdict or "", BLACK))
    paragraph(pdf, 4, title)
    pdf.set_text_color(*BLACK)
    use_font(pdf, "", 8.5)
    working = "  →  ".join(one_line(step[key]) for key in ("formula", "working") if step.get(key))
    if working:
        paragraph(pdf, 3.8, working, indent_mm=4)
    if step.get("note"):
        pdf.set_text_color(*GREY)
        use_font(pdf, "", 7.5)
        paragraph(pdf, 3.5, one_line(step["note"]), indent_mm=4)
        pdf.set_text_color(*BLACK)
    pdf.ln(0.6)


def working(pdf: FPDF, board: dict[str, Any], circuit: dict[str, Any]) -> None:
    """The working of one circuit: its heading, its verdict and every step of the walk."""
    verdict = circuit.get("verdict")
    if pdf.will_page_break(30):
        pdf.add_page()
    pdf.ln(1.5)
    use_font(pdf, "B", 9.5)
    description = f" · {circuit.get('description')}" if circuit.get("description") else ""
    paragraph(pdf, 5, one_line(f"Board {board.get('designation')} · circuit "
                               f"{circuit.get('number')}{description}"))
    pdf.set_text_color(*OUTCOME_COLOURS.get(verdict or "", BLACK))
    assessment = circuit.get("assessment") or {}
    cause = assessment.get("primary_cause") or {}
    paragraph(pdf, 5, f"Verdict: {verdict_label(verdict)}"
              + (f" — {one_line(cause.get('text'))}" if cause.get("text") else ""))
    pdf.set_text_color(*BLACK)
    use_font(pdf, "", 8.5)
    for remedy in cause.get("remedies") or ():
        paragraph(pdf, 4, f"Remedy: {one_line(remedy)}", indent_mm=4)
    for check in assessment.get("checks") or ():
        pdf.set_text_color(*OUTCOME_COLOURS.get(check.get("outcome") or "", BLACK))
        paragraph(pdf, 4, one_line(check_line(check)), indent_mm=4)
    pdf.set_text_color(*BLACK)
    steps = assessment.get("steps") or []
    use_font(pdf, "", 8.5)
    if not steps:
        reason = one_line(circuit.get("assessment_error")) or "readings or circuit details are missing"
        paragraph(pdf, 4, f"Not assessed: {reason}.")
    for step in steps:
        _step_lines(pdf, step)
    problems = [f"{name} “{one_line(f.get('raw'))}”: {one_line(f['error'])}"
                for name, f in (circuit.get("fields") or {}).items()
                if isinstance(f, dict) and f.get("error")]
    if problems:
        paragraph(pdf, 4, "Readings not usable: " + "; ".join(problems))
