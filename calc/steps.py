"""A step of the walk: one record with its formula, the working with numbers, value, unit and verdict.

The same record is shown by the app, printed in the PDF and exported in JSON.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from calc.checks import FAIL, NOT_SHOWN, PASS

INFO = "info"
STEP_VERDICTS = (PASS, FAIL, NOT_SHOWN, INFO)
"""A step's mark: a check's outcome, or `info` for a step that only works out a figure."""

CAUTIONS = (
    "These results assist a competent person; they do not replace the rules in force, "
    "their judgement or a full inspection.",
    "Testing live circuits is dangerous: use approved test equipment and safe isolation.",
    "Local codes, the rules in force and manufacturers' data prevail over these figures.",
)
"""Shown wherever results are shown: screen, PDF and export."""


@dataclass(frozen=True)
class Step:
    """One step of the walk, as shown to a person and exported."""

    id: str
    title: str
    formula: str
    working: str
    value: float | str | None
    unit: str
    verdict: str
    note: str = ""

    def to_dict(self) -> dict[str, Any]:
        return {
            "id": self.id,
            "title": self.title,
            "formula": self.formula,
            "working": self.working,
            "value": self.value,
            "unit": self.unit,
            "verdict": self.verdict,
            "note": self.note,
        }


StepThunk = Callable[[], "Step"]
"""A step not yet written out: the walk decides every number and verdict first and writes the working
text only when someone reads the steps (the app, the PDF, the JSON), which keeps bulk checks fast."""


def verdict_of(ok: bool | None) -> str:
    """The step verdict for a check that passed, failed or could not be decided."""
    if ok is None:
        return NOT_SHOWN
    return PASS if ok else FAIL
