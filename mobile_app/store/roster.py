"""The firm's roster on the device (`store.roster`): the pinned firm key, enrolled supervisors, and
their sealed keys.

The firm's public key is pinned once, at set-up, from the office folder or a file (`firm-key.json`);
a different key later is refused. Roster entries (mobile_app.signing.roster) are taken only when the
pinned firm signed them and they are valid now: each makes (or marks) a supervisor of that name
*enrolled* with the entry's public key. A sealed key file is taken only for an enrolled supervisor
whose public key it holds. See mobile_app/office for the office side.
"""

from __future__ import annotations

import datetime
import json
from pathlib import Path
from typing import Any

from mobile_app.signing import (
    RosterEntry,
    SigningError,
    entry_from_dict,
    normalise_name,
    sealed_from_dict,
    verify_entry,
)
from mobile_app.signing.roster import firm_key_from_dict
from mobile_app.store.core import Core, now_iso
from mobile_app.store.errors import TrustError
from mobile_app.store.people import People

FIRM_KEY_SETTING = "firm_key"
FIRM_KEY_FILE = "firm-key.json"


class Roster:
    """The firm key and the enrolled supervisors of a store."""

    def __init__(self, core: Core, people: People) -> None:
        self.core = core
        self.people = people

    def firm_key(self) -> bytes | None:
        """The pinned firm public key, or None before set-up."""
        row = self.core.one("SELECT value FROM settings WHERE key = ?", (FIRM_KEY_SETTING,))
        return None if row is None else bytes.fromhex(row["value"])

    def pin_firm_key(self, public_key: bytes) -> None:
        """Pin the firm's public key; TrustError if another one is already pinned."""
        pinned = self.firm_key()
        if pinned is not None and pinned != public_key:
            raise TrustError("another firm key is already pinned on this device")
        if pinned is None:
            with self.core.write() as conn:
                conn.execute("INSERT INTO settings (key, value) VALUES (?, ?)",
                             (FIRM_KEY_SETTING, public_key.hex()))
                self.core.audit(conn, None, None, "firm", None, "key", None, public_key.hex())

    def has_entry(self, data: Any) -> bool:
        """Whether this roster entry (a dict as the office wrote it) is enrolled here as it is."""
        wanted = json.dumps(data, sort_keys=True)
        rows = self.core.query("SELECT roster_entry FROM people WHERE roster_entry IS NOT NULL")
        return any(json.dumps(json.loads(row["roster_entry"]), sort_keys=True) == wanted for row in rows)

    def take_firm_key(self, data: Any) -> bool:
        """Pin the firm key of a `firm-key.json`'s content: True if pinned now, False if it is the one
        already pinned; TrustError for a malformed file or another firm's key."""
        try:
            public_key = firm_key_from_dict(data)
        except SigningError as error:
            raise TrustError(f"{FIRM_KEY_FILE}: {error}") from error
        if self.firm_key() == public_key:
            return False
        self.pin_firm_key(public_key)
        return True

    def load(self, entries: list[Any], at: datetime.datetime | None = None) -> list[str]:
        """Take the roster entries the pinned firm signed and that are valid at `at` (now); return
        the names enrolled. TrustError before a firm key is pinned or for an entry that fails."""
        firm_key = self._pinned()
        moment = at or datetime.datetime.now(datetime.UTC)
        names = []
        for data in entries:
            try:
                entry = entry_from_dict(data)
                verify_entry(entry, firm_key, moment)
            except SigningError as error:
                raise TrustError(f"roster entry refused: {error}") from error
            self._enrol(entry)
            names.append(entry.name)
        return names

    def load_folder(self, folder: Path) -> list[str]:
        """Pin the firm key in `folder/firm-key.json` (or check it is the pinned one) and load every
        roster entry there (the office's `roster/` folder, copied or synced)."""
        try:
            self.pin_firm_key(firm_key_from_dict(_read(folder / FIRM_KEY_FILE)))
        except SigningError as error:
            raise TrustError(f"{FIRM_KEY_FILE}: {error}") from error
        entries = [_read(path) for path in sorted(folder.glob("*.json")) if path.name != FIRM_KEY_FILE]
        return self.load(entries)

    def install_key(self, data: Any) -> str:
        """Keep a supervisor's sealed key (the office's file for their device); return their name.
        TrustError unless an enrolled supervisor here has that public key."""
        try:
            sealed = sealed_from_dict(data)
        except SigningError as error:
            raise TrustError(f"sealed key refused: {error}") from error
        person = self.core.one(
            "SELECT id, name FROM people WHERE roster_entry IS NOT NULL AND public_key = ?",
            (sealed.public_key.hex(),))
        if person is None:
            raise TrustError("sealed key refused: no enrolled supervisor here has its public key")
        with self.core.write() as conn:
            conn.execute("UPDATE people SET sealed_key = ?, failed_pins = 0 WHERE id = ?",
                         (json.dumps(sealed.to_dict()), person["id"]))
            self.core.audit(conn, None, person["id"], "person", person["id"], "key", None, "installed")
        return str(person["name"])

    def entry_of(self, person_id: int) -> RosterEntry | None:
        """A person's roster entry, or None for someone the office did not enrol."""
        person = self.people.get(person_id)
        return None if person["roster_entry"] is None else entry_from_dict(json.loads(person["roster_entry"]))

    def verified_key(self, public_key: bytes, at: datetime.datetime) -> RosterEntry | None:
        """The roster entry here for `public_key`, if the pinned firm signed it and it was valid at `at`."""
        firm_key = self.firm_key()
        row = self.core.one(
            "SELECT roster_entry FROM people WHERE public_key = ? AND roster_entry IS NOT NULL",
            (public_key.hex(),))
        if firm_key is None or row is None:
            return None
        try:
            entry = entry_from_dict(json.loads(row["roster_entry"]))
            verify_entry(entry, firm_key, at)
        except SigningError:
            return None
        return entry

    def _pinned(self) -> bytes:
        firm_key = self.firm_key()
        if firm_key is None:
            raise TrustError("no firm key is pinned on this device: set it up from the office folder")
        return firm_key

    def _enrol(self, entry: RosterEntry) -> None:
        """Make or mark the supervisor of `entry` enrolled with its key (a device key is dropped)."""
        name = normalise_name(entry.name)
        person = self.core.one("SELECT id, public_key FROM people WHERE name = ?", (name,))
        columns = {"role": "supervisor", "roster_entry": json.dumps(entry.to_dict()),
                   "public_key": entry.public_key.hex()}
        with self.core.write() as conn:
            if person is None:
                person_id = self.core.insert(conn, "people", dict(columns, name=name, created_at=now_iso()))
            else:
                person_id = int(person["id"])
                if person["public_key"] != entry.public_key.hex():
                    columns["sealed_key"] = None
                assignments = ", ".join(f"{k} = ?" for k in columns)
                conn.execute(f"UPDATE people SET {assignments} WHERE id = ?", (*columns.values(), person_id))
            until = entry.valid_to.isoformat()
            self.core.audit(conn, None, None, "person", person_id, "enrolled", None, until)


def _read(path: Path) -> Any:
    try:
        return json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError) as error:
        raise TrustError(f"{path.name} cannot be read ({error})") from error
