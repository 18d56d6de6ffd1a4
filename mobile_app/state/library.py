"""The device library: a manufacturer's curve entered point by point, with a live preview."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import calc
from mobile_app.state.chart import ChartModel, chart_for
from mobile_app.state.devices import plain
from mobile_app.state.text import format_quantity
from mobile_app.store import InUseError, StoreError

MIN_POINTS = 2


@dataclass
class PointRow:
    """One point as typed: current and time text, each with its own message."""

    current: str = ""
    time: str = ""
    current_error: str | None = None
    time_error: str | None = None


@dataclass
class CurveDraft:
    """A curve being entered: its name, rating and point rows, checked on every change."""

    name: str = ""
    rating: str = ""
    rows: list[PointRow] = field(default_factory=lambda: [PointRow(), PointRow(), PointRow()])
    message: str | None = None
    editing: int | None = None  # the saved curve being changed, or None for a new one

    @classmethod
    def from_saved(cls, device: dict[str, Any]) -> CurveDraft:
        """A saved curve opened for changing: its name, rating and points as text."""
        rows = [PointRow(plain(current), plain(time)) for current, time in device.get("points") or []]
        while len(rows) < MIN_POINTS:
            rows.append(PointRow())
        return cls(name=str(device.get("name") or ""), rating=plain(device.get("rating_a")), rows=rows,
                   editing=int(device["id"]))

    def set_cell(self, index: int, column: str, text: str) -> None:
        """Change one cell (`column` is "current" or "time") and check it at once."""
        row = self.rows[index]
        setattr(row, column, text)
        path = f"circuit.device.points.{column}"
        error: str | None = None
        if text.strip():
            try:
                calc.parse_value(path, text)
            except calc.InputError as exc:
                error = f"{column.capitalize()}: {exc.problem}"
        setattr(row, f"{column}_error", error)

    def numbered_rows(self) -> list[tuple[int, str, PointRow]]:
        """(index, number as shown, row) for each point."""
        return [(index, str(index + 1), row) for index, row in enumerate(self.rows)]

    def add_row(self) -> None:
        """One more empty point."""
        self.rows.append(PointRow())

    def remove_row(self, index: int) -> None:
        """Drop a point (at least two rows stay)."""
        if len(self.rows) > MIN_POINTS:
            del self.rows[index]

    def _points(self) -> list[list[str]]:
        return [[r.current, r.time] for r in self.rows if r.current.strip() and r.time.strip()]

    def device(self) -> dict[str, Any]:
        """The device dict for calc: kind "curve", the typed points and the rating if given."""
        device: dict[str, Any] = {"kind": "curve", "points": self._points()}
        if self.rating.strip():
            device["rating"] = self.rating
        return device

    @property
    def started(self) -> bool:
        """Whether any point has been typed (before that, what is missing is a hint, not an error)."""
        return any(r.current.strip() or r.time.strip() for r in self.rows)

    def problem(self) -> str | None:
        """Why the curve cannot be saved yet, in words; None when it can."""
        for index, row in enumerate(self.rows, start=1):
            if row.current_error or row.time_error:
                return f"Point {index}: {row.current_error or row.time_error}"
        if len(self._points()) < MIN_POINTS:
            return "Enter at least two points (current and time)"
        try:
            calc.device_curve(self.device())
        except calc.InputError as exc:
            return _curve_message(exc)
        return None

    def preview(self) -> ChartModel | None:
        """The curve drawn as typed so far; None until it is valid."""
        if self.problem():
            return None
        return chart_for(self.device(), None)

    def save(self, store: Any, as_new: bool = False) -> int | None:
        """Save the curve: its changes when a saved one is open (`editing`, unless `as_new`), else a
        new curve in the library. Returns its id, or None with `message` saying why not."""
        problem = self.problem() or (None if self.name.strip() else "Give the curve a name")
        if problem:
            self.message = problem
            return None
        points = [
            (
                calc.parse_value("circuit.device.points.current", current),
                calc.parse_value("circuit.device.points.time", time),
            )
            for current, time in self._points()
        ]
        rating = calc.parse_value("circuit.device.rating", self.rating) if self.rating.strip() else None
        name = self.name.strip()
        try:
            if self.editing is not None and not as_new:
                reassessed = int(store.curves.update(self.editing, name, points, rating_a=rating))
                self.message = f"Saved the changes to {name}" + (
                    f"; {reassessed} circuit{'s' * (reassessed != 1)} of draft jobs reassessed"
                    if reassessed else "")
                return self.editing
            device_id = int(store.library.add(name, points, rating_a=rating))
        except InUseError as exc:
            self.message = f"Not saved: {exc}. Save it as a new curve instead."
            return None
        except StoreError as exc:
            self.message = f"Not saved: {exc}"
            return None
        self.message = f"Saved {name} to the library"
        return device_id


@dataclass(frozen=True)
class LibraryRow:
    """One saved curve as listed: its name and `6 points · In 100 A`."""

    id: int
    name: str
    detail: str


def library_rows(store: Any) -> list[LibraryRow]:
    """The device library as listed on its screen: `6 points · In 100 A · used by 2 circuits`."""
    rows = []
    for d in store.library.all():
        used = len(store.library.users(int(d["id"])))
        detail = f"{len(d.get('points') or [])} points · In {format_quantity(d.get('rating_a'), 'A')}"
        if used:
            detail += f" · used by {used} circuit{'s' * (used != 1)}"
        rows.append(LibraryRow(id=int(d["id"]), name=str(d["name"]), detail=detail))
    return rows


def _curve_message(exc: calc.InputError) -> str:
    """calc's point errors in the screen's words."""
    problem = exc.problem
    if exc.field.startswith("circuit.device.points[") and "]" in exc.field:
        index = exc.field.split("[", 1)[1].split("]", 1)[0]
        return f"Point {index}: {problem}"
    if "fall" in problem:
        return f"Times must fall as current rises: {problem.split('(', 1)[-1].rstrip(')')}"
    return problem[0].upper() + problem[1:]
