"""What the jobs screen says when the store was altered outside the app (issue 11, item 5).

The check reads every approved job and hashes the whole audit trail, so it runs once per session
(`report` is computed on first use) and again after an import (`refresh`). The browser build shows
its first jobs list before the check (`pending`) and checks right after it is on screen (`check`).
"""

from __future__ import annotations

from typing import Any

from mobile_app.store.integrity import IntegrityReport


class IntegrityNotice:
    """The store's integrity report for the jobs screen: a banner and a mark per affected job."""

    def __init__(self, store: Any) -> None:
        self.store = store
        self._report: IntegrityReport | None = None

    @classmethod
    def pending(cls, store: Any) -> IntegrityNotice:
        """A notice that shows nothing until `check` runs (a first screen not kept waiting by it)."""
        notice = cls(store)
        notice._report = IntegrityReport()
        return notice

    def check(self) -> IntegrityReport:
        """Check the store now; returns what was found."""
        self._report = self.store.integrity.check()
        return self._report

    @property
    def report(self) -> IntegrityReport:
        if self._report is None:
            self._report = self.store.integrity.check()
        return self._report

    def refresh(self) -> None:
        """Check again (after an import or a roster change)."""
        self._report = None

    @property
    def banner(self) -> str | None:
        """A sentence for the top of the jobs list, or None when nothing was altered."""
        return self.report.message

    def mark(self, job_id: int) -> str | None:
        """What to show beside a job: "altered: …", "unverified: …", or None."""
        if job_id in self.report.broken:
            return f"altered: {self.report.broken[job_id]}"
        if job_id in self.report.unverified:
            return f"unverified: {self.report.unverified[job_id]}"
        return None
