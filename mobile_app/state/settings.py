"""Settings: supply defaults for new jobs, the final-circuit scope and the office sync target.

Setting keys in the store: `default_system`, `default_u0`, `default_cmin`, `final_circuit_max_a`
("32" or "63"), `sync_url`, `sync_user`, `sync_run_limit_s` and `sync_bundle_limit_s` (how long one
sync run and one export's upload may take, from their start), `theme` ("light", "dark" or "system").
The sync password is not a setting: it is handed to the sync step, which keeps it sealed.

The office's roster (the firm's public key, pinned at set-up, and its enrolled supervisors) is
loaded from a folder or a file on the device, or fetched from the office folder (`fetch_roster`, and
after every sync that sends something), and a supervisor's sealed key installed from its file
(`store.roster`, see README "Signed approvals").
"""

from __future__ import annotations

import json
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import calc
from mobile_app.signing import SigningError
from mobile_app.signing.ed25519 import key_id
from mobile_app.signing.roster import firm_key_from_dict
from mobile_app.store import StoreError
from mobile_app.store.errors import TrustError

DEFAULTS: dict[str, str] = {
    "default_system": "TN-C-S",
    "default_u0": "230",
    "default_cmin": "0.95",
    "final_circuit_max_a": "32",
    "sync_url": "",
    "sync_user": "",
    "sync_run_limit_s": "600",
    "sync_bundle_limit_s": "180",
    "theme": "system",
}
LIMIT_RANGE_S = (10.0, 86400.0)
SCOPES: tuple[str, ...] = ("32", "63")
THEMES: tuple[str, ...] = ("system", "light", "dark")


class SettingsError(ValueError):
    """A setting value the app does not accept."""


@dataclass(frozen=True)
class SettingView:
    """One setting as shown: key, current text, message if the last save failed."""

    key: str
    value: str
    message: str | None


class SettingsState:
    """Read and save settings, each at once."""

    def __init__(self, store: Any) -> None:
        self.store = store
        self._messages: dict[str, str] = {}
        self._typed: dict[str, str] = {}

    def get(self, key: str) -> str:
        """The saved text of a setting, or its default."""
        if key in self._typed:
            return self._typed[key]
        value = self.store.settings.get(key, None)
        return DEFAULTS.get(key, "") if value is None else str(value)

    def view(self, key: str) -> SettingView:
        """A setting with its message."""
        return SettingView(key, self.get(key), self._messages.get(key))

    def set(self, key: str, value: str) -> SettingView:
        """Save one setting; a rejected or failed save keeps the text and says why."""
        self._typed[key] = value
        try:
            self._check(key, value)
            self.store.settings.set(key, value.strip())
        except (SettingsError, StoreError) as exc:
            self._messages[key] = str(exc)
            return self.view(key)
        self._typed.pop(key, None)
        self._messages.pop(key, None)
        if key == "final_circuit_max_a":
            self._reassess_drafts()
        return self.view(key)

    def _reassess_drafts(self) -> None:
        """The scope changes which disconnection time applies: draft jobs are assessed again; jobs
        submitted or approved keep the assessments they were reviewed with."""
        for job in self.store.jobs.all():
            if job.get("status") == "draft":
                self.store.jobs.reassess(int(job["id"]))

    @staticmethod
    def _check(key: str, value: str) -> None:
        if key not in DEFAULTS:
            raise SettingsError(f"unknown setting {key!r}")
        if key == "final_circuit_max_a" and value.strip() not in SCOPES:
            raise SettingsError("final-circuit scope must be 32 or 63 A")
        if key == "theme" and value.strip() not in THEMES:
            raise SettingsError("theme must be system, light or dark")
        if key in ("sync_run_limit_s", "sync_bundle_limit_s"):
            low, high = LIMIT_RANGE_S
            try:
                seconds = float(value)
            except ValueError:
                seconds = -1.0
            if not low <= seconds <= high:
                raise SettingsError(f"a time limit is a number of seconds from {low:g} to {high:g}")
        if key in ("default_u0", "default_cmin"):
            path = "supply.u0" if key == "default_u0" else "supply.cmin"
            try:
                calc.parse_value(path, value)
            except calc.InputError as exc:
                raise SettingsError(f"{'U0' if key == 'default_u0' else 'Cmin'}: {exc.problem}") from None
        url = value.strip()
        if key == "sync_url" and url and not url.startswith(("https://", "http://")):
            raise SettingsError("the office folder address must start with https://")

    def job_defaults(self) -> dict[str, str]:
        """Supply fields for a new job."""
        return {
            "system": self.get("default_system"),
            "u0": self.get("default_u0"),
            "cmin": self.get("default_cmin"),
        }

    def save_office(self, url: str, user: str, password: str) -> str:
        """Check and save the office folder (the password sealed with a device key kept apart)."""
        from mobile_app.sync import SyncError, save_target

        try:
            save_target(self.store, url.strip(), user.strip(), password)
        except (SyncError, StoreError, OSError) as exc:
            return f"Not saved: {exc}"
        return "Office folder saved"

    async def fetch_roster(self) -> str:
        """Read the office's roster from the saved office folder (`roster/` there) and say what was
        taken; the platform's own transport (a worker thread in the server form, fetch in the browser)."""
        from mobile_app.sync import NotConfiguredError, SyncError, load_target
        from mobile_app.sync.connect import open_async_transport
        from mobile_app.sync.roster_pull import pull_roster

        try:
            transport = open_async_transport(load_target(self.store))
        except NotConfiguredError:
            return "Not fetched: set the office folder first"
        except (SyncError, StoreError, OSError) as exc:
            return f"Not fetched: {exc}"
        try:
            return (await pull_roster(self.store, transport)).message
        except SyncError as exc:
            return f"Not fetched: {exc}"
        finally:
            transport.close()

    def supervisors_text(self) -> str:
        """`Ines Okafor (enrolled by the office), Dana Reeve (this device only)`, or `None yet.`"""
        people = [p for p in self.store.people.all() if p.get("role") == "supervisor"]
        words = {True: " (enrolled by the office)", False: " (this device only)"}
        return ", ".join(p["name"] + words[bool(p.get("enrolled"))] for p in people) or "None yet."

    def firm_key_text(self) -> str:
        """Whether the firm's key is pinned on this device, and which (its short id)."""
        pinned = self.store.roster.firm_key()
        if pinned is None:
            return "No firm key pinned yet: load the office's roster folder (or its firm-key.json) to pin it."
        return f"Firm key pinned: {key_id(pinned)}. A roster signed by another key is refused."

    def load_roster(self, place: str) -> str:
        """Load the office's roster from a folder (`roster/`: pins the firm key in its firm-key.json,
        enrols every supervisor in it) or one file (the firm key, or one roster entry)."""
        path = Path(place.strip()).expanduser()
        if not place.strip():
            return "Not loaded: enter the roster folder or file"
        try:
            if path.is_dir():
                names = self.store.roster.load_folder(path)
            elif path.is_file():
                names = self._load_file(path)
            else:
                return f"Not loaded: {path} is not a folder or file on this device"
        except StoreError as exc:
            return f"Not loaded: {exc}"
        if names is None:
            return "Firm key pinned"
        return "Enrolled by the office: " + (", ".join(names) or "nobody (no roster entries there)")

    def _load_file(self, path: Path) -> list[str] | None:
        """A firm key (pinned: returns None) or one roster entry (returns the name enrolled)."""
        data = _read_json(path)
        try:
            firm_key = firm_key_from_dict(data)
        except SigningError:
            return list(self.store.roster.load([data]))
        self.store.roster.pin_firm_key(firm_key)
        return None

    def install_key(self, place: str) -> str:
        """Install an enrolled supervisor's sealed key from the office's file for their device."""
        path = Path(place.strip()).expanduser()
        if not place.strip() or not path.is_file():
            return "Not installed: enter the key file's place on this device"
        try:
            name = self.store.roster.install_key(_read_json(path))
        except StoreError as exc:
            return f"Not installed: {exc}"
        return f"Key of {name} installed: {name} approves with the passphrase"


def _read_json(path: Path) -> Any:
    """A small JSON file's content; TrustError (a StoreError) if it cannot be read."""
    try:
        if path.stat().st_size > 1 << 20:
            raise TrustError(f"{path.name} is too large for a key or roster file")
        return json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError) as exc:
        raise TrustError(f"{path.name} cannot be read ({exc})") from exc
