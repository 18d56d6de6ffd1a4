"""Whether a job document's approval holds, on this device: the check an import and the integrity
check share (the office's `verify` makes the same checks against its own roster).

An approval is *verified* when its signature holds over its fields, every part of the document
hashes as approved (mobile_app.signing.content), the document names the same approver, and the key
is enrolled: a roster entry (the document's own, or this store's) signed by the pinned firm key and
valid when the job was approved. A good signature by a key the firm did not enrol is *unverified*;
anything else is *broken* (or *unsigned* when there is no approval at all).
"""

from __future__ import annotations

import datetime
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

from mobile_app.signing import (
    Approval,
    RosterEntry,
    SigningError,
    approval_from_dict,
    changed_parts,
    entry_from_dict,
    verify_approval,
    verify_entry,
)

VERIFIED, UNVERIFIED, BROKEN, UNSIGNED = "verified", "unverified", "broken", "unsigned"


@dataclass(frozen=True)
class ApprovalCheck:
    """The outcome of checking an approval: `state` (VERIFIED, UNVERIFIED, BROKEN, UNSIGNED), why,
    and the approval itself when it could be read."""

    state: str
    reason: str
    approval: Approval | None = None


def check_document(doc: dict[str, Any], firm_key: bytes | None,
                   enrolled: Callable[[bytes, datetime.datetime], RosterEntry | None]) -> ApprovalCheck:
    """Check the approval a job document carries (module docstring). `enrolled(public_key, at)` is
    this store's roster entry for a key, if the pinned firm signed it and it was valid at `at`."""
    if doc.get("approval") is None:
        return ApprovalCheck(UNSIGNED, "no approval")
    try:
        approval = approval_from_dict(doc["approval"])
        verify_approval(approval)
        at = datetime.datetime.fromisoformat(approval.approved_at)
    except (SigningError, ValueError) as error:
        return ApprovalCheck(BROKEN, f"bad signature ({error})")
    changed = changed_parts(doc, approval.parts)
    if changed:
        return ApprovalCheck(BROKEN, "changed since approval: " + ", ".join(changed), approval)
    job = doc.get("job") or {}
    if job.get("approved_by") != approval.supervisor or job.get("approved_at") != approval.approved_at:
        return ApprovalCheck(BROKEN, "the approver or time differ from the signed approval", approval)
    entry = _carried(doc, firm_key, approval, at) or enrolled(approval.public_key, at)
    if entry is None:
        return ApprovalCheck(UNVERIFIED, f"{approval.supervisor} is not enrolled by the firm", approval)
    if entry.name != approval.supervisor:
        return ApprovalCheck(UNVERIFIED, f"the key is enrolled for {entry.name}", approval)
    return ApprovalCheck(VERIFIED, f"approved by {approval.supervisor}", approval)


def _carried(doc: dict[str, Any], firm_key: bytes | None, approval: Approval,
             at: datetime.datetime) -> RosterEntry | None:
    """The document's own roster entry, if the pinned firm signed it for this key, valid at `at`."""
    if firm_key is None or doc.get("roster_entry") is None:
        return None
    try:
        entry = entry_from_dict(doc["roster_entry"])
        verify_entry(entry, firm_key, at)
    except SigningError:
        return None
    return entry if entry.public_key == approval.public_key else None
