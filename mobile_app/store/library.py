"""The device library: manufacturers' time–current curves, entered once and reused by circuits."""

from __future__ import annotations

import json
import math
from typing import Any

import calc
from mobile_app.store.core import Core, now_iso
from mobile_app.store.errors import InvalidValueError


class Library:
    """The device library of a store (`store.library`)."""

    def __init__(self, core: Core) -> None:
        self.core = core

    def add(
        self,
        name: str,
        points: list[tuple[float, float]] | list[list[float]],
        rating_a: float | None = None,
    ) -> int:
        """Save a manufacturer curve: (current_a, time_s) points, times falling as current rises."""
        if not name.strip():
            raise InvalidValueError("name", "must not be blank")
        clean = check_curve_points(points)
        if rating_a is not None and not (math.isfinite(rating_a) and rating_a > 0):
            raise InvalidValueError("rating_a", "must be greater than zero")
        with self.core.write() as conn:
            cursor = conn.execute(
                "INSERT INTO library_devices (name, rating_a, points, created_at) VALUES (?, ?, ?, ?)",
                (name.strip(), rating_a, json.dumps(clean), now_iso()),
            )
            device_id = int(cursor.lastrowid or 0)
            self.core.audit(conn, None, None, "library", device_id, "name", None, name.strip())
        return device_id

    def all(self) -> list[dict[str, Any]]:
        """The device library: id, name, rating_a, points [[current_a, time_s], ...]."""
        return [
            dict(row, points=json.loads(row["points"]))
            for row in self.core.query(
                "SELECT id, name, rating_a, points FROM library_devices ORDER BY name, id"
            )
        ]

    def users(self, device_id: int, every_reference: bool = False) -> list[dict[str, Any]]:
        """The circuits that use a saved curve (their device is "from library" and names it), or
        with `every_reference` also those that name it under another device kind (a job document
        carries the curve of each, so an approval covers it): circuit_id, number, job_id,
        client_ref, status."""
        kind = "" if every_reference else " AND c.device_kind_value = 'curve'"
        return self.core.query(
            "SELECT c.id AS circuit_id, c.number_raw AS number, j.id AS job_id,"
            " j.client_ref_raw AS client_ref, j.status FROM circuits c JOIN boards b ON b.id = c.board_id"
            f" JOIN jobs j ON j.id = b.job_id WHERE c.library_device_id_value = ?{kind} ORDER BY j.id, c.id",
            (device_id,),
        )

    def find(self, device_id: int) -> dict[str, Any] | None:
        """One library device with its points decoded, or None."""
        row = self.core.one(
            "SELECT id, name, rating_a, points FROM library_devices WHERE id = ?", (device_id,)
        )
        return None if row is None else dict(row, points=json.loads(row["points"]))


def check_curve_points(points: Any) -> list[list[float]]:
    """Check curve points with the calculation core: two or more, times falling as current rises.

    Returns [[current_a, time_s], ...] sorted by current; InvalidValueError otherwise.
    """
    try:
        parsed = calc.read_points(list(points))
    except TypeError as error:
        raise InvalidValueError("points", "must be a list of [current, time] pairs") from error
    except calc.InputError as error:
        raise InvalidValueError("points", error.problem) from error
    return [[current_a, time_s] for current_a, time_s in parsed]
