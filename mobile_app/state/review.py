"""Review: submit a job in the recorder's name; a supervisor checks what fails or is open (each
approved with a written reason) and approves with their PIN or passphrase, or returns the job with a
comment, confirmed by their PIN."""

from __future__ import annotations

import json
from dataclasses import dataclass
from typing import Any

from mobile_app.signing import kdf
from mobile_app.state.recorder import Recorder
from mobile_app.state.text import status_word
from mobile_app.store import LockedOutError, PinError, StoreError

Secret = str | kdf.Derived


def check_first(count: int) -> str:
    """The heading over the items to answer for: `Check first: 1 item fails or is open`,
    `Check first: 3 items fail or are open`."""
    if count == 1:
        return "Check first: 1 item fails or is open"
    return f"Check first: {count} items fail or are open"


@dataclass(frozen=True)
class Outcome:
    """What a review action did: done or not, and the message to show."""

    ok: bool
    message: str


@dataclass(frozen=True)
class ReviewItem:
    """One thing a supervisor must answer for before approving: its key (for its reason), a word
    for its kind and what it is."""

    key: str
    kind: str
    what: str


_KIND_WORDS = {"fail": "Fails", "not-shown": "Not shown", "empty-board": "Empty board",
               "observation": "Observation"}


class ReviewState:
    """The review screen of one job."""

    def __init__(self, store: Any, job_id: int) -> None:
        self.store = store
        self.job_id = job_id

    @property
    def status(self) -> str:
        """draft, in review (as the store spells it), approved."""
        return str(self.store.jobs.get(self.job_id).get("status") or "draft")

    @property
    def status_word(self) -> str:
        """The status as shown."""
        return status_word(self.status)

    def summary(self) -> str:
        """What a reviewer looks at first: `22 circuits · 3 failing · 1 not shown`."""
        for job in self.store.jobs.all():
            if int(job["id"]) == self.job_id:
                circuits, failing, not_shown = (int(job.get(k) or 0) for k in
                                                ("circuits", "failing", "not_shown"))
                parts = [f"{circuits} circuit" + ("" if circuits == 1 else "s"),
                         f"{failing} failing", f"{not_shown} not shown"]
                return " · ".join(parts)
        return ""

    @property
    def comment(self) -> str | None:
        """The reviewer's comment when the job was returned to draft, if any."""
        job = self.store.jobs.get(self.job_id)
        return job.get("review_comment") if job.get("status") == "draft" else None

    @property
    def recorder_name(self) -> str:
        """The name this device records under (given on a new job): the submit field starts with it."""
        return Recorder(self.store).name

    def open_revision(self, reason: str, by_name: str) -> tuple[Outcome, int | None]:
        """Open a new draft revision of an approved job; returns the outcome and the new job id."""
        if not reason.strip():
            return Outcome(False, "Say why the approved job needs a new revision"), None
        try:
            new_id = int(self.store.review.open_revision(self.job_id, reason.strip(), self.recorder(by_name)))
        except StoreError as exc:
            return Outcome(False, f"No new revision: {exc}"), None
        return Outcome(True, "New revision opened as a draft"), new_id

    def supervisors(self) -> list[dict[str, Any]]:
        """People who may approve."""
        return [p for p in self.store.people.all() if p.get("role") == "supervisor"]

    def _person(self, name: str, role: str | None) -> dict[str, Any] | None:
        wanted = name.strip().casefold()
        for person in self.store.people.all():
            if person["name"].strip().casefold() == wanted and (role is None or person["role"] == role):
                return person
        return None

    def recorder(self, name: str) -> int:
        """The id of the person recording (created as qualified the first time)."""
        person = self._person(name, None)
        if person is not None:
            return int(person["id"])
        return int(self.store.people.add(name.strip() or "Electrician", "qualified"))

    def submit(self, recorded_by: str) -> Outcome:
        """Submit the job for review in the name of `recorded_by` (needed: the record keeps it)."""
        if not recorded_by.strip():
            return Outcome(False, "Enter your name: the record keeps who recorded the job")
        try:
            self.store.review.submit(self.job_id, self.recorder(recorded_by))
        except StoreError as exc:
            return Outcome(False, f"Not submitted: {exc}")
        return Outcome(True, "Submitted for review")

    def items(self) -> list[ReviewItem]:
        """What fails or is open, first: failing circuits, circuits not shown to pass, boards with
        no circuit. Approving with any of them needs a written reason for each."""
        return [ReviewItem(c.key, _KIND_WORDS.get(c.kind, c.kind), c.what)
                for c in self.store.review.concerns(self.job_id)]

    def unanswered(self, reasons: dict[str, str]) -> list[ReviewItem]:
        """The items without a written reason in `reasons`."""
        return [item for item in self.items() if not (reasons.get(item.key) or "").strip()]

    def approve(self, supervisor_name: str, secret: Secret, reasons: dict[str, str] | None = None) -> Outcome:
        """Approve as the named supervisor: an enrolled supervisor's passphrase unlocks their key and
        signs; a supervisor added on this device uses their PIN (an unverified approval). Each item
        of `items()` needs its written reason in `reasons` (by key); they go into the record.

        The server form may pass the text; the browser build passes what `approve_async` derives.
        """
        person = self._person(supervisor_name, "supervisor")
        if person is None:
            return Outcome(False, f"No supervisor called {supervisor_name.strip() or '(blank)'}")
        missing = self.unanswered(reasons or {})
        if missing:
            count = len(missing)
            return Outcome(False, f"Write a reason for each item listed above: {count} without one")
        if isinstance(secret, str) and not secret.strip():
            return Outcome(False, "Enter the supervisor's PIN or passphrase")
        try:
            self.store.review.approve(self.job_id, int(person["id"]),
                                      secret.strip() if isinstance(secret, str) else secret,
                                      {k: v.strip() for k, v in (reasons or {}).items()})
        except LockedOutError as exc:
            return Outcome(False, f"Locked: {exc}")
        except PinError as exc:
            return Outcome(False, f"PIN not accepted: {exc}")
        except StoreError as exc:
            return Outcome(False, f"Not approved: {exc}")
        note = "" if person.get("enrolled") else " (unverified: not enrolled by the office)"
        return Outcome(True, f"Approved by {person['name']}{note}")

    async def approve_async(self, supervisor_name: str, secret: str,
                            reasons: dict[str, str] | None = None) -> Outcome:
        """`approve`, deriving the key first without blocking (the browser's WebCrypto)."""
        person = self._person(supervisor_name, "supervisor")
        if person is None or not secret.strip() or self.unanswered(reasons or {}):
            return self.approve(supervisor_name, secret, reasons)
        try:
            params = self.store.people.key_params(int(person["id"]))
        except StoreError as exc:
            return Outcome(False, f"Not approved: {exc}")
        return self.approve(supervisor_name, await kdf.derive_for(secret.strip(), params), reasons)

    def return_to_draft(self, supervisor_name: str, comment: str, pin: Secret = "") -> Outcome:
        """Return the job to its recorder with a comment (required), confirmed by the supervisor's
        PIN (or passphrase)."""
        if not comment.strip():
            return Outcome(False, "Say what needs changing before returning the job")
        person = self._person(supervisor_name, "supervisor")
        if person is None:
            return Outcome(False, f"No supervisor called {supervisor_name.strip() or '(blank)'}")
        if isinstance(pin, str) and not pin.strip():
            return Outcome(False, "Enter the supervisor's PIN (or passphrase) to return the job")
        try:
            self.store.review.return_to_draft(self.job_id, int(person["id"]), comment.strip(),
                                              pin.strip() if isinstance(pin, str) else pin)
        except LockedOutError as exc:
            return Outcome(False, f"Locked: {exc}")
        except PinError as exc:
            return Outcome(False, f"PIN not accepted: {exc}")
        except StoreError as exc:
            return Outcome(False, f"Not returned: {exc}")
        return Outcome(True, "Returned to draft with your comment")

    async def return_to_draft_async(self, supervisor_name: str, comment: str, pin: str) -> Outcome:
        """`return_to_draft`, deriving the PIN (or an enrolled supervisor's passphrase) first without
        blocking (the browser's WebCrypto)."""
        person = self._person(supervisor_name, "supervisor")
        if person is None or not comment.strip() or not pin.strip():
            return self.return_to_draft(supervisor_name, comment, pin)
        people = self.store.people
        try:
            params = (people.pin_params(int(person["id"])) if pin.strip().isdigit()
                      else people.key_params(int(person["id"])))
        except StoreError as exc:
            return Outcome(False, f"Not returned: {exc}")
        return self.return_to_draft(supervisor_name, comment, await kdf.derive_for(pin.strip(), params))

    def add_supervisor(self, name: str, pin: str) -> Outcome:
        """Register a supervisor with a PIN (the store checks the PIN's length)."""
        if not name.strip():
            return Outcome(False, "Enter the supervisor's name")
        try:
            self.store.people.add(name.strip(), "supervisor", pin.strip())
        except StoreError as exc:
            return Outcome(False, f"Not added: {exc}")
        return Outcome(True, f"Supervisor {name.strip()} added")

    def reasons_given(self) -> list[tuple[str, str]]:
        """What the supervisor approved the job with and why: (what, reason) pairs."""
        raw = self.store.jobs.get(self.job_id).get("approval_reasons")
        items = json.loads(raw) if raw else []
        return [(str(i.get("what") or ""), str(i.get("reason") or "")) for i in items if isinstance(i, dict)]

    async def add_supervisor_async(self, name: str, pin: str) -> Outcome:
        """`add_supervisor`, deriving the PIN's verifier and the key sealed under it first without
        blocking (the browser's WebCrypto)."""
        from mobile_app.store import pins as pin_rules

        if not name.strip():
            return Outcome(False, "Enter the supervisor's name")
        try:
            pin_rules.check_pin_format(pin.strip())
        except PinError as exc:
            return Outcome(False, f"Not added: {exc}")
        pin_params, key_params = pin_rules.new_pin_params(), self.store.people.new_key_params()
        derived = (await kdf.derive_for(pin.strip(), pin_params),
                   await kdf.derive_for(pin.strip(), key_params))
        try:
            self.store.people.add(name.strip(), "supervisor", derived, pin_params, key_params)
        except StoreError as exc:
            return Outcome(False, f"Not added: {exc}")
        return Outcome(True, f"Supervisor {name.strip()} added")

    def history(self, limit: int = 12) -> list[str]:
        """The job's review events as lines (`2026-12-02 07:30 · Approved (was In review) · Ann`)."""
        lines = []
        for entry in self.store.jobs.audit(self.job_id):
            if entry.get("entity") == "review" and entry.get("field") == "status":
                what = f"{status_word(entry.get('new'))} (was {status_word(entry.get('old'))})"
            elif entry.get("entity") == "review" and entry.get("field") == "pin":
                what = "PIN refused"
            elif entry.get("entity") == "review" and entry.get("field") == "reason":
                what = f"approved with {entry.get('old')}, because: {entry.get('new')}"
            elif entry.get("entity") == "review":
                what = f"{entry.get('field') or 'review'}: {entry.get('new')}"
            elif entry.get("entity") == "job" and entry.get("new") == "created":
                what = "created"
            else:
                continue
            when = str(entry.get("when") or "")[:16].replace("T", " ")
            lines.append(" · ".join(str(p) for p in (when, what, entry.get("who")) if p))
        return lines[-limit:]
