"""Settings: supply defaults for new jobs, the final-circuit scope and the office sync target.

Setting keys in the store: `default_system`, `default_u0`, `default_cmin`, `final_circuit_max_a`
("32" or "63"), `sync_url`, `sync_user`, `sync_run_limit_s` and `sync_bundle_limit_s` (how long one
sync run and one export's upload may take, from their start), `theme` ("light", "dark" or "system").
The sync password is not a setting: it is handed to the sync step, which keeps it sealed.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import calc
from mobile_app.store import StoreError

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
