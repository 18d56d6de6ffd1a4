"""Typed errors of the calculation core.

Inside the core errors stay typed; the command line (and the app) turn them into messages at the edge.
"""

from __future__ import annotations


class CalcError(Exception):
    """Base of every error the calculation core raises on purpose."""


class InputError(CalcError, ValueError):
    """One input field is missing, of the wrong kind or out of range."""

    def __init__(self, field: str, problem: str) -> None:
        super().__init__(field, problem)
        self.field = field
        self.problem = problem

    def __str__(self) -> str:
        return f"{self.field}: {self.problem}"
