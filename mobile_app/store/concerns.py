"""What a supervisor must answer for before approving a job (pure reads, no writes).

Failing circuits first, then circuits not shown to pass, boards with no circuit, and observations
still open (serious, needing attention, or with no severity given): approving a job with any of them
needs a written reason for each (`Review.approve`), kept with the approval.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from mobile_app.store.core import Core

_WORDS = {"fail": "fails", "not-shown": "not shown to pass"}
OPEN_SEVERITIES = {"serious": "serious", "attention": "needs attention"}  # a note needs no answer
_CAUSE_CHARS = 160


@dataclass(frozen=True)
class Concern:
    """One item needing a reason: `key` (`circuit:12`, `board:3`, `observation:5`), `kind` ("fail",
    "not-shown", "empty-board", "observation") and `what` in words."""

    key: str
    kind: str
    what: str


def _short(text: str) -> str:
    one = " ".join(text.split())
    return one if len(one) <= _CAUSE_CHARS else one[: _CAUSE_CHARS - 1] + "…"


def _circuit(row: dict[str, Any]) -> Concern:
    label = f"{row['board']} circuit {row['number'] or row['id']}"
    if row["description"]:
        label += f" · {row['description']}"
    what = f"{label}: {_WORDS[row['verdict']]}"
    if row["cause"]:
        what += f" ({_short(str(row['cause']))})"
    return Concern(f"circuit:{row['id']}", row["verdict"], what)


def concerns_of(core: Core, job_id: int) -> list[Concern]:
    """The job's failing circuits, circuits not shown to pass, empty boards and open observations,
    in that order."""
    core.row("job", job_id)
    rows = core.query(
        "SELECT c.id, c.number_raw AS number, c.description_raw AS description, c.verdict,"
        " b.designation_raw AS board, json_extract(c.assessment, '$.primary_cause.text') AS cause"
        " FROM circuits c JOIN boards b ON b.id = c.board_id WHERE b.job_id = ?"
        " AND c.verdict IN ('fail', 'not-shown', 'incomplete') ORDER BY b.position, c.position",
        (job_id,),
    )
    for row in rows:
        row["verdict"] = "fail" if row["verdict"] == "fail" else "not-shown"
    found = [_circuit(r) for r in rows if r["verdict"] == "fail"]
    found += [_circuit(r) for r in rows if r["verdict"] == "not-shown"]
    empty = core.query(
        "SELECT b.id, b.designation_raw AS board FROM boards b WHERE b.job_id = ?"
        " AND NOT EXISTS (SELECT 1 FROM circuits c WHERE c.board_id = b.id) ORDER BY b.position",
        (job_id,),
    )
    found += [Concern(f"board:{b['id']}", "empty-board", f"board {b['board'] or b['id']} has no circuit")
              for b in empty]
    observations = core.query(
        "SELECT id, finding_raw AS finding, severity_value AS severity FROM observations WHERE job_id = ?"
        " ORDER BY position", (job_id,))
    for number, row in enumerate(observations, start=1):
        if row["severity"] in OPEN_SEVERITIES or not row["severity"]:
            grade = OPEN_SEVERITIES.get(row["severity"], "no severity given")
            what = f"observation {number} ({grade}): {_short(str(row['finding'] or '(no finding written)'))}"
            found.append(Concern(f"observation:{row['id']}", "observation", what))
    return found
