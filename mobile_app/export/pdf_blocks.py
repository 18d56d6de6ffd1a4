"""Blocks the PDF's sections share: outcome colours, headings, label–value rows and the cautions box."""

from __future__ import annotations

from collections.abc import Sequence

from fpdf import FPDF

from mobile_app.export.common import CAUTIONS
from mobile_app.export.pdf_layout import BLACK, BOLD, PLAIN, CellStyle, paragraph, table_row, use_font
from mobile_app.export.schedule import one_line

OUTCOME_COLOURS: dict[str, tuple[int, int, int]] = {
    "pass": (20, 100, 40),
    "satisfactory": (20, 100, 40),
    "fail": (170, 20, 20),
    "unsatisfactory": (170, 20, 20),
    "not-shown": (150, 90, 0),
    "incomplete": (150, 90, 0),
    "check": (150, 90, 0),
}
"""Colours of the outcome words (calc 0.1's "incomplete" and "check" read as not shown)."""


def outcome_style(outcome: str | None) -> CellStyle:
    """Bold, coloured text for an outcome word."""
    return CellStyle(bold=True, colour=OUTCOME_COLOURS.get(outcome or "", BLACK))


def heading(pdf: FPDF, text: str, size: float = 12) -> None:
    """A bold heading on its own line, moved to a new page if it would be left at the foot."""
    if pdf.will_page_break(size + 20):
        pdf.add_page(orientation=pdf.cur_orientation)
    pdf.ln(2)
    use_font(pdf, "B", size)
    paragraph(pdf, size * 0.5, one_line(text))
    use_font(pdf, "", 9)
    pdf.ln(1)


def key_value_rows(pdf: FPDF, rows: Sequence[tuple[str, str]], label_mm: float = 55) -> None:
    """A two-column block of labels and values, across the page's width."""
    widths = (label_mm, pdf.epw - label_mm)
    for label, value in rows:
        table_row(pdf, widths, (label, value or "—"), (BOLD, PLAIN), 4.5, 9)


def cautions_block(pdf: FPDF) -> None:
    """The cautions, boxed under their title."""
    pdf.ln(2)
    table_row(pdf, (pdf.epw,), ("Cautions\n" + "\n".join(f"• {line}" for line in CAUTIONS),),
              (PLAIN,), 4.5, 9)
    pdf.ln(2)
