"""What the export writers share: the cautions, the typed errors and value formatting.

Every export shows results, so every export carries the calculation core's `CAUTIONS` (the PDF prints
them, the JSON and the bundle manifest hold them under "cautions", the CSV repeats them in its last
column).
"""

from __future__ import annotations

import math
from typing import Any

from calc import CAUTIONS
from mobile_app.store.errors import StoreError

__all__ = [
    "CAUTIONS", "BundleCheckError", "BundleExistsError", "ExportError", "check_line", "field_text",
    "format_number", "format_value", "person_label", "verdict_label",
]

VERDICT_LABELS: dict[str, str] = {
    "pass": "PASS",
    "fail": "FAIL",
    "not-shown": "NOT SHOWN",
    "incomplete": "NOT SHOWN",
    "check": "NOT SHOWN",
    "info": "",
}
"""Printed words of the outcomes (calc 0.1's "incomplete" and "check" read as not shown)."""


class ExportError(StoreError):
    """Base of every error the export raises on purpose."""


class LibrariesError(ExportError, ImportError):
    """The PDF's libraries could not be loaded on this device (the browser build loads them on the
    first export)."""

    def __init__(self, reason: str) -> None:
        super().__init__(reason)
        self.reason = reason

    def __str__(self) -> str:
        return f"the PDF's libraries could not be loaded ({self.reason}); try again with the site reachable"


class BundleExistsError(ExportError, FileExistsError):
    """Every free name for this bundle is taken, and bundles are never overwritten."""

    def __init__(self, folder: str) -> None:
        super().__init__(folder)
        self.folder = folder

    def __str__(self) -> str:
        return f"bundle {self.folder} and its numbered variants already exist: none was overwritten"


class BundleCheckError(ExportError, ValueError):
    """A bundle's files do not match its manifest (changed, missing or unfinished)."""

    def __init__(self, folder: str, problem: str) -> None:
        super().__init__(folder, problem)
        self.folder = folder
        self.problem = problem

    def __str__(self) -> str:
        return f"bundle {self.folder}: {self.problem}"


def verdict_label(verdict: str | None) -> str:
    """The printed word for a verdict ("pass" → "PASS"); no verdict yet reads "NOT ASSESSED"."""
    if not verdict:
        return "NOT ASSESSED"
    return VERDICT_LABELS.get(verdict, str(verdict).upper())


def person_label(person: Any) -> str:
    """A person as printed: a name (with role) from a dict, a name string as is, an id as "person #id"."""
    if person is None or person == "":
        return "—"
    if isinstance(person, dict):
        name = str(person.get("name") or f"person #{person.get('id', '?')}")
        role = person.get("role")
        return f"{name} ({role})" if role else name
    if isinstance(person, bool):
        return str(person)
    if isinstance(person, int):
        return f"person #{person}"
    return str(person)


def format_number(value: float | int) -> str:
    """A number for people: up to 4 significant figures, no exponent between 0.001 and 1e6."""
    if isinstance(value, bool):
        return str(value)
    number = float(value)
    if not math.isfinite(number):
        return "∞" if number > 0 else ("−∞" if number < 0 else "—")
    if number == 0:
        return "0"
    magnitude = abs(number)
    if magnitude >= 1e6 or magnitude < 1e-3:
        return f"{number:.3e}"
    text = f"{number:.4g}"
    if "e" in text:
        text = f"{number:.0f}"
    return text


def format_value(value: Any, unit: str = "") -> str:
    """A value with its unit for people: numbers through `format_number`, None as "—", booleans as yes/no."""
    if value is None or value == "":
        return "—"
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, (int, float)):
        text = format_number(value)
        return f"{text} {unit}".rstrip() if unit else text
    return str(value)


def field_text(fields: dict[str, Any], name: str) -> str:
    """A field as typed: its raw text, or its parsed value when no raw text was kept; empty if absent."""
    field = fields.get(name)
    if not isinstance(field, dict):
        return ""
    raw = field.get("raw")
    if raw not in (None, ""):
        return str(raw)
    value = field.get("value")
    return "" if value is None else str(value)


def check_line(check: dict[str, Any]) -> str:
    """A check as one printed line: mark, title, the deciding figure with its margin, why, and what
    would decide it — the same words the screen shows."""
    parts = [f"{verdict_label(check.get('outcome'))} {check.get('title', '')}"]
    if check.get("deciding"):
        margin = f" ({check['margin']})" if check.get("margin") else ""
        parts.append(f"{check['deciding']}{margin}")
    if check.get("why"):
        parts.append(str(check["why"]))
    if check.get("needs"):
        parts.append(f"to decide: {check['needs']}")
    return " — ".join(parts)
