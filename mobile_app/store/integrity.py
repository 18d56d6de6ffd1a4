"""Tamper evidence on the device (`store.integrity`): does the audit chain hold, and does every
approved job still match its signed approval?

A file edited outside the app (a status set to approved, a reading changed, audit rows deleted)
shows here: the chain breaks at the first changed entry (chain.py), and an approved job whose
approval is missing, does not verify, or commits to an audit head the chain no longer holds is
marked broken (an imported job's approval commits to its own device's chain, which is not here). The
chain is plain SHA-256: someone who rewrites the whole file can rebuild it, but not the signatures.
Jobs approved before approvals were signed (listed by migration 5) are unverified,
not broken. The jobs screen shows `IntegrityReport.message` and marks `broken` jobs.
"""

from __future__ import annotations

import json
from dataclasses import dataclass, field

from mobile_app.store import chain
from mobile_app.store.approvals import BROKEN, UNSIGNED, VERIFIED, check_document
from mobile_app.store.core import Core
from mobile_app.store.documents import Documents
from mobile_app.store.roster import Roster


@dataclass(frozen=True)
class IntegrityReport:
    """What the check found: the first audit entry that breaks the chain (None if it holds), and
    approved jobs that are broken or unverified, each with why."""

    chain_break: int | None = None
    broken: dict[int, str] = field(default_factory=dict)
    unverified: dict[int, str] = field(default_factory=dict)

    @property
    def ok(self) -> bool:
        """Nothing was changed outside the app."""
        return self.chain_break is None and not self.broken

    @property
    def message(self) -> str | None:
        """A sentence for the jobs screen when something was changed outside the app, else None."""
        if self.ok:
            return None
        parts = []
        if self.chain_break is not None:
            parts.append(f"the history was changed outside the app (from entry {self.chain_break})")
        if self.broken:
            jobs = ", ".join(str(job_id) for job_id in sorted(self.broken))
            many = len(self.broken) > 1
            parts.append(f"approved job{'s' if many else ''} {jobs} no longer "
                         + ("match their approvals" if many else "matches its approval"))
        return "This store was altered: " + "; ".join(parts) + "."


class Integrity:
    """Checks a store's audit chain and approved jobs."""

    def __init__(self, core: Core, roster: Roster, documents: Documents) -> None:
        self.core = core
        self.roster = roster
        self.documents = documents

    def check(self) -> IntegrityReport:
        """Check the whole store (reads every approved job: run it at open, not on every screen)."""
        entries = self.core.query(f"SELECT {', '.join(chain.COLUMNS)}, hash FROM audit ORDER BY id")
        heads = {entry["hash"] for entry in entries}
        legacy = self.core.one("SELECT value FROM settings WHERE key = 'unsigned_approvals'")
        unsigned_before = set(json.loads(legacy["value"])) if legacy else set()
        broken: dict[int, str] = {}
        unverified: dict[int, str] = {}
        firm_key = self.roster.firm_key()
        for row in self.core.query("SELECT id FROM jobs WHERE status = 'approved' ORDER BY id"):
            job_id = int(row["id"])
            result = check_document(self.documents.export(job_id), firm_key, self.roster.verified_key)
            if result.state == UNSIGNED and job_id in unsigned_before:
                unverified[job_id] = "approved before approvals were signed"
            elif result.state in (UNSIGNED, BROKEN):
                broken[job_id] = "approved without a signature" if result.state == UNSIGNED else result.reason
            elif result.approval is not None and result.approval.audit_head not in heads \
                    and not self._imported(job_id):
                broken[job_id] = "the history before its approval was changed"
            elif result.state != VERIFIED:
                unverified[job_id] = result.reason
        return IntegrityReport(chain.first_break(entries), broken, unverified)

    def _imported(self, job_id: int) -> bool:
        """An imported job's approval commits to the chain of the device it came from, not this one."""
        return self.core.one("SELECT 1 FROM audit WHERE job_id = ? AND entity = 'job' AND field = 'imported'",
                             (job_id,)) is not None
