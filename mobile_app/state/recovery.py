"""The notice shown when the store file could not be read and was moved aside, and recovering the
jobs that are still readable in it (issue: nothing saved is ever lost)."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from mobile_app.store import MovedAside, StoreError, salvage_jobs


@dataclass
class Recovery:
    """What happened to the damaged file, and whether the person has dealt with the notice."""

    moved: MovedAside | None
    dismissed: bool = False
    result: str = ""

    @property
    def visible(self) -> bool:
        return self.moved is not None and not self.dismissed

    @property
    def message(self) -> str:
        return self.moved.message if self.moved is not None else ""

    def recover(self, store: Any) -> str:
        """Copy every readable job of the kept file into the new store; sentences saying what was
        recovered and what was not.

        The kept file is never changed. Jobs come back as they were (status, readings, assessments),
        row by row as far as the file reads (`salvage_jobs`).
        """
        if self.moved is None:
            return "Nothing to recover."
        try:
            salvage = salvage_jobs(self.moved.moved_to)
            for document in salvage.documents:
                store.documents.import_(document)
        except StoreError as exc:
            self.result = f"Could not recover the jobs: {exc}"
            return self.result
        jobs = len(salvage.documents)
        circuits = sum(len(b["circuits"]) for d in salvage.documents for b in d["boards"])
        self.result = (f"Recovered {jobs} job{'s' if jobs != 1 else ''} ({circuits} circuits) "
                       f"from {self.moved.moved_to.name}.")
        if any(t.missing_ids or t.partial for t in salvage.tables.values()):
            self.result += f" Not recovered: {salvage.summary()}."
        if salvage.problems:
            self.result += f" {len(salvage.problems)} note(s): " + "; ".join(salvage.problems[:3])
        self.dismissed = True
        return self.result
