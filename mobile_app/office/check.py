"""The office's check of a bundle: is this record what an enrolled supervisor approved?

In order, each failure raising NotVerifiedError with its kind:
1. every file matches the manifest ("changed file"), and after the checks of the JSON below, the
   manifest names the approval and the CSV is the one the JSON gives ("changed file");
2. the job is approved and carries an approval ("unsigned");
3. the approval's signature holds over its fields ("bad signature");
4. every part of the document hashes as approved, and the document names the same approver
   ("changed reading", naming the board and circuit);
5. the approving key is on the office's roster, signed by the firm and valid at the time of approval
   ("unverified supervisor" for a key the firm never enrolled, e.g. a supervisor added on the device
   alone; "unknown supervisor" for a firm-signed entry the office no longer lists, or a name that
   differs from the enrolled one).
"""

from __future__ import annotations

import datetime
import json
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from mobile_app.office.errors import NotVerifiedError
from mobile_app.office.folder import FIRM_KEY, ROSTER, firm_public_key, roster_entries
from mobile_app.signing import (
    Approval,
    BadSignatureError,
    KeyFormatError,
    RosterEntry,
    RosterError,
    SigningError,
    approval_from_dict,
    changed_parts,
    entry_from_dict,
    verify_approval,
    verify_entry,
)


@dataclass(frozen=True)
class Verified:
    """A bundle whose approval verified: who approved it and when."""

    supervisor: str
    approved_at: str

    def line(self) -> str:
        """The one line `verify` prints."""
        return f"approved by {self.supervisor} at {self.approved_at}, verified"


def _document(bundle_dir: Path) -> tuple[dict[str, Any], Any]:
    from mobile_app.export import BundleCheckError, read_bundle

    try:
        bundle = read_bundle(bundle_dir)
        doc = json.loads(bundle.files[0].read_text(encoding="utf-8"))
    except BundleCheckError as error:
        raise NotVerifiedError("changed file", error.problem) from error
    except (OSError, ValueError) as error:
        raise NotVerifiedError("changed file", f"the JSON file is unreadable ({error})") from error
    if not isinstance(doc, dict):
        raise NotVerifiedError("changed file", "the JSON file is not a job document")
    return doc, bundle


def _bound(doc: dict[str, Any], bundle: Any, approval: Approval) -> None:
    """The manifest names this approval, and the CSV is the one the approved JSON gives."""
    from mobile_app.export import job_csv_bytes

    manifest = json.loads(bundle.manifest.read_text(encoding="utf-8"))
    if manifest.get("approval_signature") != approval.signature.hex():
        raise NotVerifiedError("changed file", "the manifest does not name this approval")
    if bundle.files[1].read_bytes() != job_csv_bytes(doc):
        raise NotVerifiedError("changed file", f"{bundle.files[1].name} differs from the approved JSON")


def _approval(doc: dict[str, Any]) -> Approval:
    job = doc.get("job") or {}
    if doc.get("approval") is None:
        raise NotVerifiedError("unsigned", f"the job is {job.get('status') or 'not approved'} and "
                                           "carries no approval")
    try:
        approval = approval_from_dict(doc["approval"])
        verify_approval(approval)
    except (BadSignatureError, KeyFormatError) as error:
        raise NotVerifiedError("bad signature", f"the approval does not verify ({error})") from error
    return approval


def _unchanged(doc: dict[str, Any], approval: Approval) -> None:
    changed = changed_parts(doc, approval.parts)
    if changed:
        raise NotVerifiedError("changed reading", ", ".join(changed) + " differ from what was approved")
    job = doc.get("job") or {}
    if job.get("status") != "approved" or job.get("approved_by") != approval.supervisor:
        raise NotVerifiedError("changed reading", f"the job says {job.get('status')} by "
                                                  f"{job.get('approved_by')}, the approval "
                                                  f"{approval.supervisor}")


def _approved_time(approval: Approval) -> datetime.datetime:
    try:
        moment = datetime.datetime.fromisoformat(approval.approved_at)
    except ValueError as error:
        raise NotVerifiedError("bad signature", "the approval's time is unreadable") from error
    if moment.tzinfo is None:
        raise NotVerifiedError("bad signature", "the approval's time has no UTC offset")
    return moment


def _carried_entry(doc: dict[str, Any], firm_key: bytes) -> RosterEntry | None:
    """The roster entry the bundle carries, if the firm signed it."""
    try:
        entry = entry_from_dict(doc.get("roster_entry"))
        verify_entry(entry, firm_key, entry.valid_from)
    except SigningError:
        return None
    return entry


def _enrolled(doc: dict[str, Any], approval: Approval, office_dir: Path, firm_key: bytes) -> None:
    at = _approved_time(approval)
    listed = [e for e in roster_entries(office_dir / ROSTER, firm_key) if e.public_key == approval.public_key]
    if not listed:
        carried = _carried_entry(doc, firm_key)
        if carried is not None and carried.public_key == approval.public_key:
            raise NotVerifiedError("unknown supervisor", f"{carried.name} is not on the office's roster")
        raise NotVerifiedError("unverified supervisor", f"{approval.supervisor}'s key was never enrolled "
                                                        "by the firm")
    entry = listed[0]
    if entry.name != approval.supervisor:
        raise NotVerifiedError("unknown supervisor", f"the approval names {approval.supervisor}, the key "
                                                     f"is enrolled for {entry.name}")
    try:
        verify_entry(entry, firm_key, at)
    except RosterError as error:
        raise NotVerifiedError("unverified supervisor", f"{error.name}'s enrolment {error.problem} "
                                                        f"(approved {approval.approved_at})") from error


def verify_bundle(bundle_dir: Path, office_dir: Path) -> Verified:
    """Check a bundle against the office folder (module docstring); NotVerifiedError if it fails,
    OfficeFolderError if the office folder has no firm key."""
    firm_key = firm_public_key(office_dir / ROSTER / FIRM_KEY)
    doc, bundle = _document(bundle_dir)
    approval = _approval(doc)
    _unchanged(doc, approval)
    _bound(doc, bundle, approval)
    _enrolled(doc, approval, office_dir, firm_key)
    return Verified(approval.supervisor, approval.approved_at)
