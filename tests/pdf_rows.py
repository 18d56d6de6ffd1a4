"""Reading the schedule of test results back out of a PDF with pypdf: each circuit's row as text."""

from __future__ import annotations

import io

from pypdf import PdfReader

WATERMARKS = ("DRAFT · NOT APPROVED", "IN REVIEW · NOT APPROVED")
FOOTER_START = "These results assist a competent person"
LEGEND_START = "Figures are rounded as the instrument shows them"


def squash(text: str) -> str:
    """Runs of white space made one space (a PDF wraps lines anywhere)."""
    return " ".join(text.split())


def body(page_text: str) -> str:
    """A page's text without its watermark and footer."""
    for mark in WATERMARKS:
        page_text = page_text.removeprefix(mark)
    footer = page_text.rfind(FOOTER_START)
    return page_text[:footer] if footer >= 0 else page_text


def schedule_text(data: bytes) -> str:
    """The text of every schedule page (landscape pages holding the schedule's headings), in order."""
    reader = PdfReader(io.BytesIO(data))
    pages = [page for page in reader.pages if page.mediabox.width > page.mediabox.height]
    return squash(" ".join(body(page.extract_text()) for page in pages))


def rows(data: bytes, circuits: list[tuple[str, str]]) -> dict[str, str]:
    """Each circuit's row text, keyed by reference: from its reference and description to the next
    row's (the board's rows in order; `circuits` as (reference, description) pairs)."""
    text = schedule_text(data)
    found: dict[str, str] = {}
    position = 0
    starts = []
    for ref, description in circuits:
        start = text.index(squash(f"{ref} {description}"), position)
        starts.append(start)
        position = start + 1
    for index, (ref, _description) in enumerate(circuits):
        end = starts[index + 1] if index + 1 < len(starts) else len(text)
        legend = text.find(LEGEND_START, starts[index])
        found[ref] = text[starts[index]:end if legend < 0 else min(end, legend)]
    return found
