"""Typed errors of the job store.

Inside the store errors stay typed; the app and the command line turn them into messages at the
edge.
Each class's docstring is its meaning; details are attributes and the message is built in `__str__`.
"""

from __future__ import annotations


class StoreError(Exception):
    """Base of every error the job store raises on purpose."""


class NotFoundError(StoreError, LookupError):
    """A job, board, circuit, person or library device with that id does not exist."""

    def __init__(self, kind: str, item_id: object) -> None:
        super().__init__(kind, item_id)
        self.kind = kind
        self.item_id = item_id

    def __str__(self) -> str:
        return f"no {self.kind} with id {self.item_id}"


class UnknownFieldError(StoreError, ValueError):
    """A field name that the job, board or circuit does not have."""

    def __init__(self, kind: str, name: str) -> None:
        super().__init__(kind, name)
        self.kind = kind
        self.name = name

    def __str__(self) -> str:
        return f"{self.kind} has no field {self.name!r}"


class ConflictError(StoreError, RuntimeError):
    """Someone else saved this row since it was read: reload before saving again."""

    def __init__(self, kind: str, item_id: int, expected_version: int, current_version: int) -> None:
        super().__init__(kind, item_id, expected_version, current_version)
        self.kind = kind
        self.item_id = item_id
        self.expected_version = expected_version
        self.current_version = current_version

    def __str__(self) -> str:
        return (
            f"{self.kind} {self.item_id} was changed elsewhere (version {self.current_version}, "
            f"you had {self.expected_version}): reload it before saving"
        )


class ReadOnlyError(StoreError, PermissionError):
    """The job is submitted or approved and cannot be changed in place."""

    def __init__(self, job_id: int, status: str) -> None:
        super().__init__(job_id, status)
        self.job_id = job_id
        self.status = status

    def __str__(self) -> str:
        if self.status == "approved":
            return f"job {self.job_id} is approved: open a new revision to change it"
        return f"job {self.job_id} is {self.status}: return it to draft to change it"


class ReviewError(StoreError, RuntimeError):
    """A review step that the job's status or the person's role does not allow."""

    def __init__(self, job_id: int, problem: str) -> None:
        super().__init__(job_id, problem)
        self.job_id = job_id
        self.problem = problem

    def __str__(self) -> str:
        return f"job {self.job_id}: {self.problem}"


class PinError(StoreError, ValueError):
    """A supervisor PIN that is wrong, missing or too short."""

    def __init__(self, problem: str, attempts_left: int | None = None) -> None:
        super().__init__(problem, attempts_left)
        self.problem = problem
        self.attempts_left = attempts_left

    def __str__(self) -> str:
        if self.attempts_left is None:
            return self.problem
        return f"{self.problem} ({self.attempts_left} attempts left before a lock-out)"


class LockedOutError(PinError):
    """Too many wrong attempts: this person's PIN and key are refused until unlocked with the
    passphrase (an enrolled supervisor); a device-only supervisor stays locked."""

    def __init__(self, name: str, attempts: int, enrolled: bool) -> None:
        super().__init__("too many wrong attempts")
        self.name = name
        self.attempts = attempts
        self.enrolled = enrolled

    def __str__(self) -> str:
        how = ("unlock with the passphrase" if self.enrolled
               else "a supervisor added on this device stays locked")
        return f"{self.name} is locked after {self.attempts} wrong attempts: {how}"


class SaveError(StoreError, OSError):
    """The change could not be written (disk full, read-only folder): nothing was saved."""

    def __init__(self, reason: str) -> None:
        super().__init__(reason)
        self.reason = reason

    def __str__(self) -> str:
        return f"not saved: {self.reason}"


class OpenError(StoreError, OSError):
    """The store's folder or file cannot be opened (missing rights, read-only folder)."""

    def __init__(self, folder: str, reason: str) -> None:
        super().__init__(folder, reason)
        self.folder = folder
        self.reason = reason

    def __str__(self) -> str:
        return f"cannot open the store in {self.folder}: {self.reason}"


class MigrationError(StoreError, RuntimeError):
    """The store's schema could not be brought up to date; the file was left as it was."""

    def __init__(self, path: str, reason: str) -> None:
        super().__init__(path, reason)
        self.path = path
        self.reason = reason

    def __str__(self) -> str:
        return f"could not update the store {self.path}: {self.reason} (file left unchanged)"


class StoreTooNewError(StoreError, RuntimeError):
    """The store file was written by a newer version of the app than this one."""

    def __init__(self, path: str, unknown: list[str]) -> None:
        super().__init__(path, unknown)
        self.path = path
        self.unknown = unknown

    def __str__(self) -> str:
        return f"the store {self.path} comes from a newer Boardside ({', '.join(self.unknown)})"


class TrustError(StoreError, ValueError):
    """The firm key, a roster entry or a sealed key that this store refuses to take."""

    def __init__(self, problem: str) -> None:
        super().__init__(problem)
        self.problem = problem

    def __str__(self) -> str:
        return self.problem


class InvalidValueError(StoreError, ValueError):
    """A name, role, reason or device curve that the store refuses to record."""

    def __init__(self, what: str, problem: str) -> None:
        super().__init__(what, problem)
        self.what = what
        self.problem = problem

    def __str__(self) -> str:
        return f"{self.what}: {self.problem}"


class DocumentError(StoreError, ValueError):
    """A job document to import is not a Boardside job document this version can read.

    `where` is the place in the document (`boards[1].circuits[0].fields.zs.raw`), or None.
    """

    def __init__(self, problem: str, where: str | None = None) -> None:
        super().__init__(problem, where)
        self.problem = problem
        self.where = where

    def __str__(self) -> str:
        if self.where:
            return f"not a readable job document: {self.where}: {self.problem}"
        return f"not a readable job document: {self.problem}"


class InUseError(StoreError, RuntimeError):
    """A saved curve that circuits use: it cannot be deleted, nor changed under a job in review or
    approved. `users` names them (`job TY-118 circuit 3`)."""

    def __init__(self, kind: str, item_id: int, users: list[str], change: str) -> None:
        super().__init__(kind, item_id, users, change)
        self.kind = kind
        self.item_id = item_id
        self.users = users
        self.change = change

    def __str__(self) -> str:
        more = len(self.users) - 3
        shown = ", ".join(self.users[:3]) + (f" and {more} more" if more > 0 else "")
        return f"{self.kind} {self.item_id} cannot be {self.change}: used by {shown}"
