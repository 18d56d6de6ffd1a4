"""The PDF export (fpdf2): the record the office files.

Order: the job (identity, purpose, supply, the overall outcome in short, the cautions); for each board
its schedule of test results on landscape pages, then the board's details; the observations, the
limitations of the inspection, the instruments used, the overall outcome with its reasons and the
people who recorded, submitted and approved the record, with the time of each act; then the
calculation annex (the working of every circuit at full precision) and the cautions again. A record
not yet approved carries a watermark on every page. Every page's footer carries the cautions and the
page number. DejaVu Sans is embedded (mobile_app/fonts, with its licence) so that Ω, ², √ and Δ print.
"""

from __future__ import annotations

from typing import Any

from fpdf import FPDF

from mobile_app.export.common import CAUTIONS, person_label
from mobile_app.export.figures import local_date, local_time
from mobile_app.export.pdf_annex import working
from mobile_app.export.pdf_blocks import cautions_block, heading, key_value_rows, outcome_style
from mobile_app.export.pdf_layout import BLACK, BOLD, GREY, PLAIN, JobPdf, paragraph, table_row, use_font
from mobile_app.export.pdf_schedule import board_schedule
from mobile_app.export.schedule import (
    OVERALL,
    SEVERITIES,
    job_details,
    one_line,
    supply_details,
    value,
)

WATERMARKS = {"draft": "DRAFT · NOT APPROVED", "submitted": "IN REVIEW · NOT APPROVED"}
_OBSERVATION_WIDTHS_MM = (9, 36, 32, 25, 78)
_INSTRUMENT_WIDTHS_MM = (80, 50, 50)
_SIGNATURE_WIDTHS_MM = (58, 50, 24, 48)


def _overall(doc: dict[str, Any]) -> tuple[str, list[str]]:
    """The overall outcome word as stored ("satisfactory", …) and its reasons."""
    overall = (doc.get("job") or {}).get("overall") or {}
    return str(overall.get("outcome") or ""), [one_line(r) for r in overall.get("reasons") or []]


def _front(pdf: FPDF, doc: dict[str, Any]) -> None:
    """Title, the job's identity and purpose, the overall outcome in short, the supply, the counts
    and the cautions."""
    job = doc.get("job") or {}
    use_font(pdf, "B", 16)
    paragraph(pdf, 8, one_line(f"Test record: {job.get('client_ref') or 'job'}"))
    use_font(pdf, "", 9)
    pdf.set_text_color(*GREY)
    paragraph(pdf, 5, one_line(
        f"Job {job.get('id')} · revision {job.get('revision') or '—'} · status {job.get('status') or '—'} · "
        f"exported {local_time(doc.get('exported_at')) or '—'} · calc {doc.get('calc_version') or '—'}"))
    pdf.set_text_color(*BLACK)
    outcome, reasons = _overall(doc)
    pdf.ln(2)
    table_row(pdf, (55, pdf.epw - 55), ("Overall outcome", OVERALL.get(outcome, "not worked out")),
              (BOLD, outcome_style(outcome)), 6, 12)
    if reasons:
        use_font(pdf, "", 9)
        paragraph(pdf, 4.5, reasons[0] + (" (see the overall outcome)" if len(reasons) > 1 else ""))
    heading(pdf, "Job")
    key_value_rows(pdf, job_details(job))
    heading(pdf, "Supply at the origin")
    key_value_rows(pdf, supply_details(job))
    circuits = [c for board in doc.get("boards") or [] for c in board.get("circuits") or []]
    passed = sum(1 for c in circuits if c.get("verdict") == "pass")
    failed = sum(1 for c in circuits if c.get("verdict") == "fail")
    pdf.ln(1)
    use_font(pdf, "B", 10)
    paragraph(pdf, 6, f"{len(circuits)} circuits: {passed} pass, {failed} fail, "
                      f"{len(circuits) - passed - failed} not shown")
    use_font(pdf, "", 9)
    cautions_block(pdf)


def _observations(pdf: FPDF, doc: dict[str, Any]) -> None:
    """The observations: number, severity in words, location, circuits concerned, finding."""
    heading(pdf, "Observations")
    observations = doc.get("observations") or []
    if not observations:
        paragraph(pdf, 5, "No observations recorded.")
        return
    titles = ("No.", "Severity", "Location", "Circuits", "Finding")
    table_row(pdf, _OBSERVATION_WIDTHS_MM, titles, [BOLD] * 5, 4, 8)
    for item in observations:
        fields = item.get("fields") or {}
        severity = value(fields, "severity")
        texts = (
            str(item.get("number") or ""),
            SEVERITIES.get(severity or "", one_line((fields.get("severity") or {}).get("raw")) or "—"),
            one_line((fields.get("location") or {}).get("raw")) or "—",
            ", ".join(one_line(c) for c in item.get("circuits") or []) or "—",
            one_line((fields.get("finding") or {}).get("raw")) or "—",
        )
        style = outcome_style("fail") if severity == "serious" else PLAIN
        table_row(pdf, _OBSERVATION_WIDTHS_MM, texts, (PLAIN, style, PLAIN, PLAIN, PLAIN), 4, 8,
                  repeat=titles)


def _limitations(pdf: FPDF, job: dict[str, Any]) -> None:
    """What the inspection could not cover, as written."""
    heading(pdf, "Limitations of the inspection")
    text = ((job.get("fields") or {}).get("limitations") or {}).get("raw") or ""
    paragraph(pdf, 4.5, text.strip() or "None recorded.")


def _instruments(pdf: FPDF, doc: dict[str, Any]) -> None:
    """The test instruments used, their serial numbers and calibration dates."""
    heading(pdf, "Test instruments used")
    instruments = doc.get("instruments") or []
    if not instruments:
        paragraph(pdf, 5, "No instruments recorded.")
        return
    titles = ("Instrument", "Serial number", "Calibrated on")
    table_row(pdf, _INSTRUMENT_WIDTHS_MM, titles, [BOLD] * 3, 4.5, 9)
    for item in instruments:
        fields = item.get("fields") or {}
        calibrated = value(fields, "calibration_date")
        texts = (
            one_line((fields.get("name") or {}).get("raw")) or "—",
            one_line((fields.get("serial") or {}).get("raw")) or "—",
            local_date(calibrated) or one_line((fields.get("calibration_date") or {}).get("raw")) or "—",
        )
        table_row(pdf, _INSTRUMENT_WIDTHS_MM, texts, [PLAIN] * 3, 4.5, 9, repeat=titles)


def _overall_block(pdf: FPDF, doc: dict[str, Any]) -> None:
    """The overall outcome and every reason for it."""
    heading(pdf, "Overall outcome")
    outcome, reasons = _overall(doc)
    use_font(pdf, "B", 14)
    pdf.set_text_color(*outcome_style(outcome).colour)
    paragraph(pdf, 7, OVERALL.get(outcome, "not worked out"))
    pdf.set_text_color(*BLACK)
    use_font(pdf, "", 9)
    for reason in reasons:
        paragraph(pdf, 4.5, f"• {reason}", indent_mm=2)
    paragraph(pdf, 4.5, "Unsatisfactory when any circuit fails or any observation is serious; not "
                        "shown while a circuit's outcome or an observation's severity is still open.")


def _signatures(pdf: FPDF, doc: dict[str, Any]) -> None:
    """Who recorded, submitted and approved the record, their roles, and when (local time)."""
    job = doc.get("job") or {}
    roles = {p.get("name"): p.get("role") for p in doc.get("people") or [] if isinstance(p, dict)}
    heading(pdf, "People and signatures")
    titles = ("Act", "Name", "Role", "Date and time")
    table_row(pdf, _SIGNATURE_WIDTHS_MM, titles, [BOLD] * 4, 4.5, 9)
    for act, who, when in (("Recorded by", "recorded_by", "recorded_at"),
                           ("Submitted for review by", "submitted_by", "submitted_at"),
                           ("Reviewed and approved by", "approved_by", "approved_at")):
        name = job.get(who)
        if who == "recorded_by" and not name:
            name = job.get("submitted_by")  # the review screen asks the recorder's name at submission
        texts = (act, person_label(name) if name else "—", roles.get(name) or "—",
                 local_time(job.get(when)) or "—")
        table_row(pdf, _SIGNATURE_WIDTHS_MM, texts, (BOLD, PLAIN, PLAIN, PLAIN), 6, 9)
    pdf.ln(1)
    if job.get("review_comment"):
        paragraph(pdf, 4.5, f"Review comment: {one_line(job['review_comment'])}")
    reasons = [r for r in job.get("approval_reasons") or [] if isinstance(r, dict)]
    if reasons:
        use_font(pdf, "B", 9)
        paragraph(pdf, 5, "Approved with these items open, for the reasons the supervisor gave:")
        use_font(pdf, "", 9)
        for item in reasons:
            paragraph(pdf, 4.5, f"• {one_line(item.get('what') or '')}: {one_line(item.get('reason') or '')}",
                      indent_mm=2)
    if job.get("status") == "approved" and doc.get("roster_entry") is None:
        use_font(pdf, "B", 9)
        paragraph(pdf, 5, "Unverified approval: the supervisor was not enrolled by the office, and the "
                          "office will not accept this approval.")
        use_font(pdf, "", 9)
    elif job.get("status") == "approved":
        paragraph(pdf, 4.5, "Approved and signed with the supervisor's key; the record is locked. A "
                            "later change opens a new revision.")
    else:
        use_font(pdf, "B", 9)
        paragraph(pdf, 5, "Not approved: this record has not been approved by a supervisor.")
        use_font(pdf, "", 9)


def job_pdf_bytes(doc: dict[str, Any]) -> bytes:
    """The PDF file of a job document."""
    job = doc.get("job") or {}
    library = {int(d["id"]): str(d.get("name", "")) for d in doc.get("library_devices") or []
               if isinstance(d, dict) and isinstance(d.get("id"), int)}
    status = str(job.get("status"))
    watermark = "" if status == "approved" else WATERMARKS.get(status, "NOT APPROVED")
    pdf = JobPdf(one_line(f"Job {job.get('id')} {job.get('client_ref') or ''} rev {job.get('revision')}"),
                 " ".join(CAUTIONS), watermark)
    pdf.set_title(one_line(f"Test record {job.get('client_ref') or job.get('id')}"))
    pdf.set_creator("Boardside")
    pdf.add_page()
    _front(pdf, doc)
    boards = doc.get("boards") or []
    for board in boards:
        board_schedule(pdf, board, library)
    pdf.add_page(orientation="P")
    _observations(pdf, doc)
    _limitations(pdf, job)
    _instruments(pdf, doc)
    _overall_block(pdf, doc)
    _signatures(pdf, doc)
    pdf.add_page(orientation="P")
    heading(pdf, "Calculation annex: the working, circuit by circuit", 13)
    for board in boards:
        for circuit in board.get("circuits") or []:
            working(pdf, board, circuit)
    cautions_block(pdf)
    return bytes(pdf.output())
