"""Text typed but not saved yet: what each field's box holds, the stored text it was typed over, when
it was last touched, and a save another tab or device made in the meantime.

Typing is saved after a short pause (`PAUSE_S`) or when the field is left, never once per keystroke;
the clock is passed in, so the rule is tested without waiting.
"""

from __future__ import annotations

from dataclasses import dataclass

PAUSE_S = 0.8
"""Seconds without a keystroke after which a field's text is saved (common practice for autosave)."""


@dataclass(frozen=True)
class Conflict:
    """A save refused because the circuit changed elsewhere since it was shown: both texts, who
    changed it and when (local time), for a person to choose between."""

    name: str
    mine: str
    theirs: str
    who: str
    at: str


class Pending:
    """The fields typed and not yet saved, with the stored text each edit began from."""

    def __init__(self) -> None:
        self.text: dict[str, str] = {}
        self.base: dict[str, str] = {}
        self.touched: dict[str, float] = {}
        self.conflicts: dict[str, Conflict] = {}

    def edit(self, name: str, text: str, stored: str, now: float) -> None:
        """Record what the box of `name` holds now; `stored` is the saved text the edit began over
        (kept from the first keystroke on)."""
        self.text[name] = text
        self.base.setdefault(name, stored)
        self.touched[name] = now

    def due(self, now: float, pause_s: float = PAUSE_S) -> list[str]:
        """Fields left alone for at least the pause (and not waiting on a choice after a conflict)."""
        return [n for n, t in self.touched.items() if now - t >= pause_s and n not in self.conflicts]

    def names(self) -> list[str]:
        """Every field with unsaved text."""
        return list(self.text)

    def done(self, name: str) -> None:
        """Forget a field once its text is saved (or given up for the stored one)."""
        for table in (self.text, self.base, self.touched, self.conflicts):
            table.pop(name, None)

    def hold(self, name: str) -> None:
        """Keep the text but stop saving it on a pause (a failed save waits for the next edit)."""
        self.touched.pop(name, None)
