"""Review of a job: draft → submitted → approved (supervisor PIN) or back to draft with a comment;
revisions of an approved job."""

from __future__ import annotations

from typing import Any

from mobile_app.store import pins
from mobile_app.store.core import Core, now_iso
from mobile_app.store.errors import LockedOutError, PinError, ReviewError
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
    "created_at",
    "updated_at",
}


class Review:
    """Review, approval with a supervisor's PIN and revisions of a store's jobs (`store.review`)."""

    def __init__(self, core: Core, people: People) -> None:
        self.core = core
        self.people = people

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

    def return_to_draft(self, job_id: int, reviewer_id: int, comment: str) -> None:
        """Send a submitted job back to draft with the reviewer's comment (a supervisor's)."""
        if self.people.get(reviewer_id)["role"] != "supervisor":
            raise ReviewError(job_id, "only a supervisor can return a job with comments")
        if not comment.strip():
            raise ReviewError(job_id, "a comment is needed to return a job to draft")
        self._set_status(job_id, "submitted", "draft", reviewer_id, {"review_comment": comment.strip()})

    def approve(self, job_id: int, supervisor_id: int, pin: str) -> None:
        """Approve a submitted job with a supervisor's PIN; it becomes read-only.

        PinError for a wrong PIN (attempts left in the message); after MAX_WRONG_PINS wrong PINs
        in a row the supervisor is locked out for LOCKOUT_S seconds (LockedOutError), even with the
        right PIN.
        """
        person = self.people.get(supervisor_id)
        job = self.core.row("job", job_id)
        if person["role"] != "supervisor":
            raise ReviewError(job_id, f"{person['name']} is not a supervisor")
        if job["status"] != "submitted":
            raise ReviewError(job_id, f"is {job['status']}, not submitted")
        if not person["pin_hash"]:
            raise PinError(f"no PIN is set for {person['name']}")
        now = self.core.clock()
        if person["locked_until"] is not None and person["locked_until"] > now:
            raise LockedOutError(person["locked_until"] - now)
        if not pins.pin_matches(pin, person["pin_hash"]):
            self._wrong_pin(job_id, supervisor_id, now)
        with self.core.write() as conn:
            conn.execute(
                "UPDATE people SET failed_pins = 0, locked_until = NULL WHERE id = ?",
                (supervisor_id,),
            )
            self._set_status(
                job_id,
                "submitted",
                "approved",
                supervisor_id,
                {"approved_by": supervisor_id, "approved_at": now_iso()},
            )

    def _wrong_pin(self, job_id: int, person_id: int, now: float) -> None:
        """Count a wrong PIN (committed), lock the person out after too many, and raise."""
        with self.core.write() as conn:
            failed = (
                conn.execute("SELECT failed_pins FROM people WHERE id = ?", (person_id,)).fetchone()[0] + 1
            )
            locked_until = now + pins.LOCKOUT_S if failed >= pins.MAX_WRONG_PINS else None
            conn.execute(
                "UPDATE people SET failed_pins = ?, locked_until = ? WHERE id = ?",
                (0 if locked_until else failed, locked_until, person_id),
            )
            self.core.audit(conn, job_id, person_id, "review", job_id, "pin", None, "wrong PIN")
        if locked_until is not None:
            raise LockedOutError(pins.LOCKOUT_S)
        raise PinError("wrong PIN", pins.MAX_WRONG_PINS - failed)

    def open_revision(self, job_id: int, reason: str, by: int | None) -> int:
        """Copy an approved job into a new draft revision; the approved one stays as it was."""
        if not reason.strip():
            raise ReviewError(job_id, "a reason is needed to open a new revision")
        with self.core.write() as conn:
            job = self.core.row("job", job_id)
            if job["status"] != "approved":
                raise ReviewError(job_id, f"is {job['status']}: only an approved job is revised")
            child = self.core.one("SELECT id FROM jobs WHERE parent_job_id = ?", (job_id,))
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
            for board in self.core.query("SELECT * FROM boards WHERE job_id = ?", (job_id,)):
                board_id = self.core.insert(
                    conn,
                    "boards",
                    dict({k: v for k, v in board.items() if k != "id"}, job_id=new_id, version=1),
                )
                for circuit in self.core.query("SELECT * FROM circuits WHERE board_id = ?", (board["id"],)):
                    self.core.insert(
                        conn,
                        "circuits",
                        dict(
                            {k: v for k, v in circuit.items() if k != "id"},
                            board_id=board_id,
                            version=1,
                        ),
                    )
            self.core.audit(conn, new_id, by, "review", new_id, "revision", f"job {job_id}", reason.strip())
        return new_id
