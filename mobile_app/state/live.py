"""The verdict so far, kept in view while a person types: the verdict's mark and its primary cause
(calc's `primary_cause` text), shortened to what a bar above the keyboard can hold."""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Any

from mobile_app.state.text import OLD_WORDS, VerdictMark, verdict_mark

SHORT_CAUSE_CHARS = 90
"""About two lines of the bar at 390 px wide."""
_DECIDE = " — to decide: "


@dataclass(frozen=True)
class LiveVerdict:
    """What the bar shows: the verdict's mark and its cause in a few words (empty on a pass)."""

    verdict: str
    mark: VerdictMark
    cause: str


def shorten(text: str, limit: int = SHORT_CAUSE_CHARS) -> str:
    """A primary cause in a few words: its finding up to the first `;`, without the parenthesis of
    limits, then what would decide it; cut at a word with `…` past `limit` characters.

    `Disconnection: Zs 0.93 Ω is above the 0.6828 Ω allowed; cleared in up to 60 s …` →
    `Disconnection: Zs 0.93 Ω is above the 0.6828 Ω allowed`.
    """
    finding, _sep, needs = text.partition(_DECIDE)
    finding = re.sub(r"\s*\([^)]*\)", "", finding.split("; ")[0]).strip()
    short = f"{finding} — {needs.strip()}" if needs.strip() else finding
    if len(short) <= limit:
        return short
    cut = short[: limit - 1].rsplit(" ", 1)[0].rstrip(" ,;:—")
    return cut + "…"


def live_verdict(verdict: str | None, assessment: dict[str, Any] | None) -> LiveVerdict:
    """The bar's content for a verdict and its assessment (either saved or previewed)."""
    said = str((assessment or {}).get("verdict") or verdict or "not-shown")
    word = OLD_WORDS.get(said, said)
    cause = (assessment or {}).get("primary_cause") or {}
    text = "" if word == "pass" else shorten(str(cause.get("text") or ""))
    if word != "pass" and not text:
        text = "Readings still to come"
    return LiveVerdict(word, verdict_mark(word), text)
