"""Typed errors of the signing package.

Each class's docstring is its meaning; details are attributes and the message is built in `__str__`.
The command lines and screens turn them into messages; inside they stay typed.
"""

from __future__ import annotations


class SigningError(Exception):
    """Base of every error the signing package raises on purpose."""


class KeyFormatError(SigningError, ValueError):
    """A key, signature, salt or stored record that is not in the form this version reads."""

    def __init__(self, what: str, problem: str) -> None:
        super().__init__(what, problem)
        self.what = what
        self.problem = problem

    def __str__(self) -> str:
        return f"{self.what}: {self.problem}"


class BadSignatureError(SigningError, ValueError):
    """A signature that does not verify against the public key and the signed bytes."""

    def __init__(self, what: str) -> None:
        super().__init__(what)
        self.what = what

    def __str__(self) -> str:
        return f"bad signature on the {self.what}"


class WeakPassphraseError(SigningError, ValueError):
    """A passphrase shorter or plainer than the minimum that protects a secret key."""

    def __init__(self, problem: str) -> None:
        super().__init__(problem)
        self.problem = problem

    def __str__(self) -> str:
        return f"passphrase refused: {self.problem}"


class WrongPassphraseError(SigningError, ValueError):
    """The passphrase does not unlock this secret key (the unlocked key's public key differs)."""

    def __init__(self, name: str) -> None:
        super().__init__(name)
        self.name = name

    def __str__(self) -> str:
        return f"wrong passphrase for {self.name}'s key"


class NameRefusedError(SigningError, ValueError):
    """A person's name that cannot be recorded as typed (blank, invisible or control characters)."""

    def __init__(self, name: str, problem: str) -> None:
        super().__init__(name, problem)
        self.name = name
        self.problem = problem

    def __str__(self) -> str:
        return f"name {self.name!r}: {self.problem}"


class LookalikeNameError(NameRefusedError):
    """A new name that looks the same as a name already recorded."""

    def __init__(self, name: str, existing: str) -> None:
        super().__init__(name, f"looks the same as {existing!r}, who is already recorded")
        self.existing = existing


class RosterError(SigningError, ValueError):
    """A roster entry that does not hold: wrong firm, outside its dates, or for another key."""

    def __init__(self, name: str, problem: str) -> None:
        super().__init__(name, problem)
        self.name = name
        self.problem = problem

    def __str__(self) -> str:
        return f"roster entry for {self.name}: {self.problem}"
