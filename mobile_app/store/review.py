"""Review of a job: draft → submitted → approved (supervisor PIN) or back to draft with a comment;
revisions of an approved job; the audit trail."""

from __future__ import annotations

from typing import Any

from mobile_app.store import pins
from mobile_app.store.circuits import CircuitStore
from mobile_app.store.core import now_iso
from mobile_app.store.errors import LockedOutError, PinError, ReviewError

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


class ReviewStore(CircuitStore):
    """Review, approval with a supervisor's PIN, revisions and the audit trail."""

    def _set_status(
        self, job_id: int, expected: str, status: str, by: int | None, columns: dict[str, Any]
    ) -> None:
        """Move a job from `expected` to `status`, setting review columns, with an audit entry."""
        with self._write() as conn:
            job = self._row("job", job_id)
            if job["status"] != expected:
                raise ReviewError(job_id, f"is {job['status']}, not {expected}")
            assignments = ", ".join(f"{name} = ?" for name in columns)
            conn.execute(
                f"UPDATE jobs SET status = ?, version = version + 1, updated_at = ?, "
                f"{assignments} WHERE id = ?",
                (status, now_iso(), *columns.values(), job_id),
            )
            self._audit(conn, job_id, by, "review", job_id, "status", expected, status)
            if columns.get("review_comment"):
                self._audit(conn, job_id, by, "review", job_id, "comment", None, columns["review_comment"])

    def submit_for_review(self, job_id: int, by: int) -> None:
        """Send a draft job for review."""
        self._person(by)
        self._set_status(job_id, "draft", "submitted", by, {"submitted_by": by, "submitted_at": now_iso()})

    def return_to_draft(self, job_id: int, reviewer_id: int, comment: str) -> None:
        """Send a submitted job back to draft with the reviewer's comment (a supervisor's)."""
        if self._person(reviewer_id)["role"] != "supervisor":
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
        person = self._person(supervisor_id)
        job = self._row("job", job_id)
        if person["role"] != "supervisor":
            raise ReviewError(job_id, f"{person['name']} is not a supervisor")
        if job["status"] != "submitted":
            raise ReviewError(job_id, f"is {job['status']}, not submitted")
        if not person["pin_hash"]:
            raise PinError(f"no PIN is set for {person['name']}")
        now = self.clock()
        if person["locked_until"] is not None and person["locked_until"] > now:
            raise LockedOutError(person["locked_until"] - now)
        if not pins.pin_matches(pin, person["pin_hash"]):
            self._wrong_pin(job_id, supervisor_id, now)
        with self._write() as conn:
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
        with self._write() as conn:
            failed = (
                conn.execute("SELECT failed_pins FROM people WHERE id = ?", (person_id,)).fetchone()[0] + 1
            )
            locked_until = now + pins.LOCKOUT_S if failed >= pins.MAX_WRONG_PINS else None
            conn.execute(
                "UPDATE people SET failed_pins = ?, locked_until = ? WHERE id = ?",
                (0 if locked_until else failed, locked_until, person_id),
            )
            self._audit(conn, job_id, person_id, "review", job_id, "pin", None, "wrong PIN")
        if locked_until is not None:
            raise LockedOutError(pins.LOCKOUT_S)
        raise PinError("wrong PIN", pins.MAX_WRONG_PINS - failed)

    def open_revision(self, job_id: int, reason: str, by: int | None) -> int:
        """Copy an approved job into a new draft revision; the approved one stays as it was."""
        if not reason.strip():
            raise ReviewError(job_id, "a reason is needed to open a new revision")
        with self._write() as conn:
            job = self._row("job", job_id)
            if job["status"] != "approved":
                raise ReviewError(job_id, f"is {job['status']}: only an approved job is revised")
            child = self._one("SELECT id FROM jobs WHERE parent_job_id = ?", (job_id,))
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
            new_id = self._insert(conn, "jobs", copied)
            for board in self._query("SELECT * FROM boards WHERE job_id = ?", (job_id,)):
                board_id = self._insert(
                    conn,
                    "boards",
                    dict({k: v for k, v in board.items() if k != "id"}, job_id=new_id, version=1),
                )
                for circuit in self._query("SELECT * FROM circuits WHERE board_id = ?", (board["id"],)):
                    self._insert(
                        conn,
                        "circuits",
                        dict(
                            {k: v for k, v in circuit.items() if k != "id"},
                            board_id=board_id,
                            version=1,
                        ),
                    )
            self._audit(conn, new_id, by, "review", new_id, "revision", f"job {job_id}", reason.strip())
        return new_id

    @staticmethod
    def _insert(conn: Any, table: str, row: dict[str, Any]) -> int:
        """Insert a row given as a dict; return its id."""
        names = ", ".join(row)
        marks = ", ".join("?" for _ in row)
        return int(
            conn.execute(f"INSERT INTO {table} ({names}) VALUES ({marks})", tuple(row.values())).lastrowid
            or 0
        )

    def audit(self, job_id: int) -> list[dict[str, Any]]:
        """A job's audit trail, oldest first: id, when, who, what, entity, field, old, new."""
        self._row("job", job_id)
        rows = self._query(
            'SELECT a.id, a.at AS "when", a.person_id, p.name AS who, a.entity, a.entity_id,'
            " a.field, a.old, a.new, COALESCE(c.number_raw, b.designation_raw) AS label"
            " FROM audit a LEFT JOIN people p ON p.id = a.person_id"
            " LEFT JOIN circuits c ON a.entity = 'circuit' AND c.id = a.entity_id"
            " LEFT JOIN boards b ON a.entity = 'board' AND b.id = a.entity_id"
            " WHERE a.job_id = ? ORDER BY a.id",
            (job_id,),
        )
        return [
            dict(
                row,
                what=" ".join(str(part) for part in (row["entity"], row["label"], row["field"]) if part),
            )
            for row in rows
        ]
