"""Page layout for the PDF export: the A4 page set with its embedded font, footer and (for a record
not yet approved) watermark, word wrapping, paragraphs and table rows.

fpdf2's `multi_cell`, `table` and `cell` re-measure and re-style text on every call and take many seconds
for a job of a few hundred circuits. These helpers measure each word once per font (cached), wrap each
distinct text once (cached), manage page breaks themselves and place lines with `FPDF.text`; see
tests/bench_export.py for the figures.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass
from importlib import resources

from fpdf import FPDF

FONT = "DejaVu"
MARGIN_MM = 15.0
BLACK = (0, 0, 0)
GREY = (90, 90, 90)
WATERMARK = (236, 200, 200)
_CELL_PAD_MM = 0.8


@dataclass(frozen=True)
class CellStyle:
    """How one table cell's text is drawn."""

    bold: bool = False
    colour: tuple[int, int, int] = BLACK


PLAIN = CellStyle()
BOLD = CellStyle(bold=True)


class JobPdf(FPDF):
    """A4 pages (portrait, or landscape for wide tables) with DejaVu Sans embedded, a footer (the
    cautions and "page n of N") and, when `watermark` is given, that text across every page."""

    def __init__(self, footer_title: str, footer_note: str, watermark: str = "") -> None:
        super().__init__(orientation="portrait", unit="mm", format="A4")
        fonts = resources.files("mobile_app") / "fonts"
        with resources.as_file(fonts / "DejaVuSans.ttf") as regular:
            self.add_font(FONT, "", str(regular))
        with resources.as_file(fonts / "DejaVuSans-Bold.ttf") as bold:
            self.add_font(FONT, "B", str(bold))
        self.set_margins(MARGIN_MM, MARGIN_MM, MARGIN_MM)
        self.set_auto_page_break(auto=True, margin=24)
        self.alias_nb_pages()
        self.footer_title = footer_title
        self.watermark = watermark
        self.set_font(FONT, "", 6.5)
        self.footer_lines = wrap_text(self, footer_note, self.epw - 2 * self.c_margin)

    def header(self) -> None:
        """The watermark, drawn first so the page's content lies over it (fpdf2 restores the font
        and colours after the header)."""
        if not self.watermark:
            return
        use_font(self, "B", 44)
        self.set_text_color(*WATERMARK)
        width_mm = text_width_mm(self, self.watermark)
        with self.rotation(30, self.w / 2, self.h / 2):
            self.text(self.w / 2 - width_mm / 2, self.h / 2 + 6, self.watermark)

    def footer(self) -> None:
        """The cautions, then the job and the page number, at the foot of every page."""
        self.set_text_color(*GREY)
        use_font(self, "", 6.5)
        top_mm = self.h - 21
        for line in self.footer_lines:
            left_mm = self.l_margin + (self.epw - text_width_mm(self, line)) / 2
            self.text(left_mm, _baseline_mm(self, top_mm, 3), line)
            top_mm += 3
        self.set_y(top_mm)
        self.set_font(FONT, "", 8)
        self.cell(0, 5, f"{self.footer_title} · page {self.page_no()} of {{nb}}", align="C")
        self.set_text_color(*BLACK)


_WORD_WIDTHS: dict[tuple[str, str], float] = {}


def text_width_mm(pdf: FPDF, text: str) -> float:
    """Width of `text` in the current font and size (glyph widths, no shaping), cached per word."""
    key = (pdf.current_font.fontkey, text)
    units = _WORD_WIDTHS.get(key)
    if units is None:
        units = float(pdf.current_font.get_text_width(text, 1000.0, None)[1])
        if len(_WORD_WIDTHS) < 200_000:
            _WORD_WIDTHS[key] = units
    return units * pdf.font_size_pt / 1000.0 / pdf.k


_WRAPPED: dict[tuple[str, float, float, str], list[str]] = {}


def wrap_text(pdf: FPDF, text: str, width_mm: float) -> list[str]:
    """`text` broken into lines no wider than `width_mm` in the current font (greedy, by words).

    Line breaks in `text` are kept; a word wider than the line is cut between characters. Results
    are cached: the same formula or note recurs on many circuits.
    """
    key = (pdf.current_font.fontkey, pdf.font_size_pt, round(width_mm, 3), text)
    lines = _WRAPPED.get(key)
    if lines is None:
        lines = _wrap_words(pdf, text, width_mm)
        if len(_WRAPPED) < 50_000:
            _WRAPPED[key] = lines
    return lines


def use_font(pdf: FPDF, style: str, size_pt: float) -> None:
    """Select DejaVu in `style` ("" or "B") and `size_pt`, skipping the call when already selected."""
    if pdf.font_family != FONT.lower() or pdf.font_style != style or pdf.font_size_pt != size_pt:
        pdf.set_font(FONT, style, size_pt)


def printable(pdf: FPDF, text: str) -> str:
    """`text` with every character the current font cannot draw (emoji, control characters, scripts
    DejaVu Sans lacks) shown as U+FFFD, so that nothing disappears from the record unseen."""
    cmap = pdf.current_font.cmap
    return "".join(char if char in "\n " or (char.isprintable() and ord(char) in cmap) else "\ufffd"
                   for char in text)


def _wrap_words(pdf: FPDF, text: str, width_mm: float) -> list[str]:
    """The uncached work of `wrap_text`."""
    lines: list[str] = []
    space_mm = text_width_mm(pdf, " ")
    for paragraph_text in printable(pdf, str(text)).split("\n"):
        current: list[str] = []
        current_mm = 0.0
        for word in paragraph_text.split():
            word_mm = text_width_mm(pdf, word)
            while word_mm > width_mm and len(word) > 1:
                if current:
                    lines.append(" ".join(current))
                    current, current_mm = [], 0.0
                cut = _fitting_prefix(pdf, word, width_mm)
                lines.append(word[:cut])
                word = word[cut:]
                word_mm = text_width_mm(pdf, word)
            if current and current_mm + space_mm + word_mm > width_mm:
                lines.append(" ".join(current))
                current, current_mm = [], 0.0
            current_mm += (space_mm if current else 0.0) + word_mm
            current.append(word)
        lines.append(" ".join(current))
    return lines


def _fitting_prefix(pdf: FPDF, word: str, width_mm: float) -> int:
    """How many leading characters of `word` fit in `width_mm` (at least one)."""
    used_mm = 0.0
    for index, char in enumerate(word):
        used_mm += text_width_mm(pdf, char)
        if used_mm > width_mm:
            return max(1, index)
    return len(word)


def _baseline_mm(pdf: FPDF, top_mm: float, line_height_mm: float) -> float:
    """Where the baseline of a line of text sits, centred in a line of `line_height_mm`."""
    return top_mm + line_height_mm / 2 + 0.3 * pdf.font_size


def paragraph(pdf: FPDF, line_height_mm: float, text: str, indent_mm: float = 0.0) -> None:
    """A paragraph from the left margin (plus `indent_mm`) to the right margin, wrapped by words."""
    left_mm = pdf.l_margin + indent_mm
    for line in wrap_text(pdf, text, pdf.epw - indent_mm - 2 * pdf.c_margin):
        if pdf.get_y() + line_height_mm > pdf.page_break_trigger:
            pdf.add_page(orientation=pdf.cur_orientation)
        top_mm = pdf.get_y()
        if line:
            pdf.text(left_mm + pdf.c_margin, _baseline_mm(pdf, top_mm, line_height_mm), line)
        pdf.set_y(top_mm + line_height_mm)


def table_row(
    pdf: FPDF,
    widths_mm: Sequence[float],
    texts: Sequence[str],
    styles: Sequence[CellStyle] | None = None,
    line_height_mm: float = 4.0,
    font_size: float = 8.0,
    repeat: Sequence[str] = (),
    on_new_page: Callable[[], None] | None = None,
) -> None:
    """One bordered table row at the left margin; each cell wraps, the row is as tall as its tallest.

    If the row does not fit on the page, a new page starts (in the same orientation) and `repeat` (the
    heading texts), if given, is drawn again in bold first, or `on_new_page` draws the headings.
    """
    cell_styles = list(styles or [PLAIN] * len(texts))
    wrapped: list[list[str]] = []
    for text, width_mm, style in zip(texts, widths_mm, cell_styles, strict=True):
        use_font(pdf, "B" if style.bold else "", font_size)
        wrapped.append(wrap_text(pdf, text, width_mm - 2 * pdf.c_margin))
    height_mm = max(len(lines) for lines in wrapped) * line_height_mm + 2 * _CELL_PAD_MM
    if pdf.will_page_break(height_mm):
        pdf.add_page(orientation=pdf.cur_orientation)
        if on_new_page is not None:
            on_new_page()
        elif repeat:
            table_row(pdf, widths_mm, repeat, [BOLD] * len(repeat), line_height_mm, font_size)
    top_mm = pdf.get_y()
    left_mm = pdf.l_margin
    for lines, width_mm, style in zip(wrapped, widths_mm, cell_styles, strict=True):
        pdf.rect(left_mm, top_mm, width_mm, height_mm)
        use_font(pdf, "B" if style.bold else "", font_size)
        pdf.set_text_color(*style.colour)
        for index, line in enumerate(lines):
            if line:
                line_top_mm = top_mm + _CELL_PAD_MM + index * line_height_mm
                pdf.text(left_mm + pdf.c_margin, _baseline_mm(pdf, line_top_mm, line_height_mm),
                         line)
        left_mm += width_mm
    pdf.set_text_color(*BLACK)
    pdf.set_xy(pdf.l_margin, top_mm + height_mm)
