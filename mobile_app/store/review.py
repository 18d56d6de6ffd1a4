"""Review of a job: draft → submitted → approved (a supervisor's signature) or back to draft with a
comment (their PIN); revisions of an approved job."""

from __future__ import annotations

import json
from typing import Any

from mobile_app.signing import sign_approval
from mobile_app.store import chain, pins
from mobile_app.store.concerns import Concern, concerns_of
from mobile_app.store.core import Core, now_iso
from mobile_app.store.documents import Documents
from mobile_app.store.errors import PinError, ReviewError
from mobile_app.store.items import copy_items
from mobile_app.store.people import People

_COPY_SKIP_JOB = {
    "id",
    "status",
    "version",
    "revision",
    "parent_job_id",
    "revision_reason",
    "submitted_by",
    "submitted_at",
    "approved_by",
    "approved_at",
    "review_comment",
    "approval_reasons",
    "deleted_at",
    "created_at",
    "updated_at",
}


class Review:
    """Review, approval with a supervisor's PIN and revisions of a store's jobs (`store.review`)."""

    def __init__(self, core: Core, people: People, documents: Documents) -> None:
        self.core = core
        self.people = people
        self.documents = documents

    def _set_status(
        self, job_id: int, expected: str, status: str, by: int | None, columns: dict[str, Any]
    ) -> None:
        """Move a job from `expected` to `status`, setting review columns, with an audit entry."""
        with self.core.write() as conn:
            job = self.core.row("job", job_id)
            if job["status"] != expected:
                raise ReviewError(job_id, f"is {job['status']}, not {expected}")
            assignments = ", ".join(f"{name} = ?" for name in columns)
            conn.execute(
                f"UPDATE jobs SET status = ?, version = version + 1, updated_at = ?, "
                f"{assignments} WHERE id = ?",
                (status, now_iso(), *columns.values(), job_id),
            )
            self.core.audit(conn, job_id, by, "review", job_id, "status", expected, status)
            comment = columns.get("review_comment")
            if comment:
                self.core.audit(conn, job_id, by, "review", job_id, "comment", None, comment)

    def submit(self, job_id: int, by: int) -> None:
        """Send a draft job for review."""
        self.people.get(by)
        self._set_status(job_id, "draft", "submitted", by, {"submitted_by": by, "submitted_at": now_iso()})

    def return_to_draft(self, job_id: int, reviewer_id: int, comment: str,
                        pin: pins.Secret | None = None) -> None:
        """Send a submitted job back to draft with a supervisor's comment, confirmed by their PIN
        (or an enrolled supervisor's passphrase)."""
        if self.people.get(reviewer_id)["role"] != "supervisor":
            raise ReviewError(job_id, "only a supervisor can return a job with comments")
        if not comment.strip():
            raise ReviewError(job_id, "a comment is needed to return a job to draft")
        status = self.core.row("job", job_id)["status"]
        if status != "submitted":
            raise ReviewError(job_id, f"is {status}, not submitted")
        if pin is None:
            raise PinError("the supervisor's PIN is needed to return a job to draft")
        self.people.confirm(reviewer_id, pin, job_id)
        self._set_status(job_id, "submitted", "draft", reviewer_id, {"review_comment": comment.strip()})

    def concerns(self, job_id: int) -> list[Concern]:
        """What approving the job needs a written reason for: failing circuits, circuits not shown
        to pass, boards with no circuit (`mobile_app.store.concerns`)."""
        return concerns_of(self.core, job_id)

    def approve(self, job_id: int, supervisor_id: int, secret: pins.Secret,
                reasons: dict[str, str] | None = None) -> None:
        """Approve a submitted job: unlock the supervisor's key (an enrolled supervisor's passphrase,
        a device-only supervisor's PIN) and sign the job's canonical hash with it. The job becomes
        read-only and keeps its approval (`jobs.approval`, mobile_app.signing.approval).

        Every item of `concerns` needs a written reason in `reasons` (by its key): ReviewError
        naming those without one, before the secret is tried. The reasons are kept with the job
        (`approval_reasons`), in its audit trail and in what the approval signs.

        PinError for a wrong secret (attempts left in the message); after MAX_WRONG_PINS wrong ones
        the supervisor is locked (LockedOutError), even with the right one.
        """
        person = self.people.get(supervisor_id)
        job = self.core.row("job", job_id)
        if person["role"] != "supervisor":
            raise ReviewError(job_id, f"{person['name']} is not a supervisor")
        if job["status"] != "submitted":
            raise ReviewError(job_id, f"is {job['status']}, not submitted")
        answered = self._answered(job_id, reasons or {})
        pair = self.people.unlock_key(supervisor_id, secret, job_id)
        stamp = now_iso()
        with self.core.write() as conn:
            self._set_status(job_id, "submitted", "approved", supervisor_id,
                             {"approved_by": supervisor_id, "approved_at": stamp})
            if answered:
                conn.execute("UPDATE jobs SET approval_reasons = ? WHERE id = ?",
                             (json.dumps(answered, ensure_ascii=False), job_id))
                for item in answered:
                    self.core.audit(conn, job_id, supervisor_id, "review", job_id, "reason",
                                    item["what"], item["reason"])
            doc = self.documents.export(job_id)
            approval = sign_approval(pair, person["name"], doc, stamp, chain.head(conn))
            signed = json.dumps(approval.to_dict())
            conn.execute("UPDATE jobs SET approval = ? WHERE id = ?", (signed, job_id))

    def _answered(self, job_id: int, reasons: dict[str, str]) -> list[dict[str, str]]:
        """Each concern with its reason (`item`, `what`, `reason`); ReviewError naming the ones
        without a written reason."""
        found = self.concerns(job_id)
        missing = [c.what for c in found if not str(reasons.get(c.key) or "").strip()]
        if missing:
            more = f" and {len(missing) - 3} more" if len(missing) > 3 else ""
            raise ReviewError(job_id, "a written reason is needed to approve with: "
                              + "; ".join(missing[:3]) + more)
        return [{"item": c.key, "what": c.what, "reason": str(reasons[c.key]).strip()} for c in found]

    def open_revision(self, job_id: int, reason: str, by: int | None) -> int:
        """Copy an approved job into a new draft revision; the approved one stays as it was."""
        if not reason.strip():
            raise ReviewError(job_id, "a reason is needed to open a new revision")
        with self.core.write() as conn:
            job = self.core.row("job", job_id)
            if job["status"] != "approved":
                raise ReviewError(job_id, f"is {job['status']}: only an approved job is revised")
            child = self.core.one("SELECT id FROM jobs WHERE parent_job_id = ? AND deleted_at IS NULL",
                                  (job_id,))
            if child is not None:
                raise ReviewError(job_id, f"revision job {child['id']} is already open")
            stamp = now_iso()
            copied = {k: v for k, v in job.items() if k not in _COPY_SKIP_JOB}
            copied.update(
                status="draft",
                version=1,
                revision=job["revision"] + 1,
                parent_job_id=job_id,
                revision_reason=reason.strip(),
                created_at=stamp,
                updated_at=stamp,
                recorded_by=by,
            )
            new_id = self.core.insert(conn, "jobs", copied)
            circuit_ids: dict[int, int] = {}
            for board in self.core.query("SELECT * FROM boards WHERE job_id = ?", (job_id,)):
                board_id = self.core.insert(
                    conn,
                    "boards",
                    dict({k: v for k, v in board.items() if k != "id"}, job_id=new_id, version=1),
                )
                for circuit in self.core.query("SELECT * FROM circuits WHERE board_id = ?", (board["id"],)):
                    circuit_ids[circuit["id"]] = self.core.insert(
                        conn,
                        "circuits",
                        dict(
                            {k: v for k, v in circuit.items() if k != "id"},
                            board_id=board_id,
                            version=1,
                        ),
                    )
            copy_items(self.core, conn, job_id, new_id, circuit_ids)
            self.core.audit(conn, new_id, by, "review", new_id, "revision", f"job {job_id}", reason.strip())
        return new_id
