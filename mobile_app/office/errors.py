"""Typed errors of the office side (firm key, enrolment, verification of bundles)."""

from __future__ import annotations


class OfficeError(Exception):
    """Base of every error the office side raises on purpose."""


class OfficeFolderError(OfficeError, OSError):
    """The office folder cannot be used as asked: no firm key yet, a firm key already there, a file
    that cannot be read or written."""

    def __init__(self, folder: str, problem: str) -> None:
        super().__init__(folder, problem)
        self.folder = folder
        self.problem = problem

    def __str__(self) -> str:
        return f"office folder {self.folder}: {self.problem}"


class NotVerifiedError(OfficeError, ValueError):
    """A bundle whose approval does not verify; `kind` is one of KINDS, `detail` says what exactly."""

    KINDS = ("changed file", "changed reading", "unsigned", "bad signature", "unknown supervisor",
             "unverified supervisor")

    def __init__(self, kind: str, detail: str) -> None:
        super().__init__(kind, detail)
        self.kind = kind
        self.detail = detail

    def __str__(self) -> str:
        return f"{self.kind}: {self.detail}"
