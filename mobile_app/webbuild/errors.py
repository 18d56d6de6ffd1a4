"""Typed errors of the static build; the command line turns them into one-line messages."""

from __future__ import annotations


class BuildError(RuntimeError):
    """The static site could not be built."""


class OutputExistsError(BuildError):
    """The output folder holds files that the build did not write."""

    def __init__(self, folder: str) -> None:
        super().__init__(folder)
        self.folder = folder

    def __str__(self) -> str:
        return f"{self.folder} is not empty and holds no earlier build: choose an empty folder"


class ClientError(BuildError):
    """The installed web client is not the one this build was written for."""

    def __init__(self, where: str, problem: str) -> None:
        super().__init__(where, problem)
        self.where, self.problem = where, problem

    def __str__(self) -> str:
        return f"web client ({self.where}): {self.problem}"


class DependencyError(BuildError):
    """A dependency cannot be packed for the browser."""

    def __init__(self, name: str, problem: str) -> None:
        super().__init__(name, problem)
        self.name, self.problem = name, problem

    def __str__(self) -> str:
        return f"{self.name}: {self.problem}"
