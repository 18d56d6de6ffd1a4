"""People: who records, submits and approves jobs, with supervisors' PINs (only their hashes)."""

from __future__ import annotations

from typing import Any

from mobile_app.store import pins
from mobile_app.store.core import Core, now_iso
from mobile_app.store.errors import InvalidValueError, NotFoundError

ROLES = ("apprentice", "qualified", "supervisor")


class People:
    """The people known to a store (`store.people`)."""

    def __init__(self, core: Core) -> None:
        self.core = core

    def add(self, name: str, role: str, pin: str | None = None) -> int:
        """Add a person (role: apprentice, qualified or supervisor), with a PIN for supervisors."""
        if not name.strip():
            raise InvalidValueError("name", "must not be blank")
        if role not in ROLES:
            raise InvalidValueError("role", "must be one of: " + ", ".join(ROLES))
        pin_hash = pins.hash_pin(pin) if pin is not None else None
        with self.core.write() as conn:
            cursor = conn.execute(
                "INSERT INTO people (name, role, created_at, pin_hash) VALUES (?, ?, ?, ?)",
                (name.strip(), role, now_iso(), pin_hash),
            )
            person_id = int(cursor.lastrowid or 0)
            self.core.audit(conn, None, None, "person", person_id, "role", None, role)
        return person_id

    def set_pin(self, person_id: int, pin: str) -> None:
        """Set or change a person's PIN (stored only as a salted scrypt hash); clears a lock-out."""
        self.get(person_id)
        pin_hash = pins.hash_pin(pin)
        with self.core.write() as conn:
            conn.execute(
                "UPDATE people SET pin_hash = ?, failed_pins = 0, locked_until = NULL WHERE id = ?",
                (pin_hash, person_id),
            )
            self.core.audit(conn, None, person_id, "person", person_id, "pin", None, "changed")

    def all(self) -> list[dict[str, Any]]:
        """Everyone known to the store: id, name, role and whether a PIN is set (never the hash)."""
        return self.core.query(
            "SELECT id, name, role, pin_hash IS NOT NULL AS has_pin FROM people ORDER BY name, id"
        )

    def get(self, person_id: int) -> dict[str, Any]:
        """One person's whole row (PIN hash and lock-out included), or NotFoundError."""
        row = self.core.one("SELECT * FROM people WHERE id = ?", (person_id,))
        if row is None:
            raise NotFoundError("person", person_id)
        return row
