"""Changing a saved curve of the device library (`store.curves`).

A curve is part of every job whose circuits name it (the export carries its points, and an approval
signs them), so a change is refused while a job in review or approved names it; the circuits of draft
jobs that use it are reassessed in the same transaction. Each change is one audit entry.
"""

from __future__ import annotations

import json
import math
from typing import Any

from mobile_app.store.circuits import Circuits
from mobile_app.store.core import Core
from mobile_app.store.errors import InUseError, InvalidValueError, NotFoundError
from mobile_app.store.library import Library, check_curve_points


def user_names(users: list[dict[str, Any]]) -> list[str]:
    """`job TY-118 circuit 3` for each circuit using a curve."""
    return [f"job {u['client_ref'] or u['job_id']} circuit {u['number'] or u['circuit_id']}" for u in users]


class Curves:
    """Changes to the saved curves of a store."""

    def __init__(self, core: Core, library: Library, circuits: Circuits) -> None:
        self.core = core
        self.library = library
        self.circuits = circuits

    def update(
        self,
        device_id: int,
        name: str,
        points: list[tuple[float, float]] | list[list[float]],
        rating_a: float | None = None,
        by: int | None = None,
    ) -> int:
        """Change a saved curve's name, points and rating; return how many circuits of draft jobs
        were reassessed with it. InUseError while a job in review or approved uses it."""
        if not name.strip():
            raise InvalidValueError("name", "must not be blank")
        clean = check_curve_points(points)
        if rating_a is not None and not (math.isfinite(rating_a) and rating_a > 0):
            raise InvalidValueError("rating_a", "must be greater than zero")
        with self.core.write() as conn:
            before = self.library.find(device_id)
            if before is None:
                raise NotFoundError("library device", device_id)
            users = self.library.users(device_id)
            named = self.library.users(device_id, every_reference=True)
            locked = [u for u in named if u["status"] != "draft"]
            if locked:
                raise InUseError("curve", device_id, user_names(locked), "changed")
            conn.execute("UPDATE library_devices SET name = ?, rating_a = ?, points = ? WHERE id = ?",
                         (name.strip(), rating_a, json.dumps(clean), device_id))
            old = json.dumps({k: before[k] for k in ("name", "rating_a", "points")})
            new = json.dumps({"name": name.strip(), "rating_a": rating_a, "points": clean})
            self.core.audit(conn, None, by, "library", device_id, "curve", old, new)
            for user in users:
                self.circuits.reassess_one(conn, int(user["circuit_id"]))
            for job_id in sorted({int(u["job_id"]) for u in users}):
                self.core.audit(conn, job_id, by, "job", job_id, "assessment", None,
                                f"reassessed: saved curve {device_id} changed")
                self.core.touch_job(conn, job_id)
        return len(users)
