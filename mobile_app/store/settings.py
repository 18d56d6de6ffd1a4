"""Settings kept in the store: JSON values under text keys (never passwords)."""

from __future__ import annotations

import json
from typing import Any

from mobile_app.store.core import Core


class Settings:
    """The store's settings (`store.settings`)."""

    def __init__(self, core: Core) -> None:
        self.core = core

    def get(self, key: str, default: Any = None) -> Any:
        """A setting's value (JSON-decoded), or `default` when it was never set."""
        row = self.core.one("SELECT value FROM settings WHERE key = ?", (key,))
        return default if row is None else json.loads(row["value"])

    def set(self, key: str, value: Any) -> None:
        """Store a JSON-able setting (passwords do not belong here)."""
        with self.core.write() as conn:
            conn.execute(
                "INSERT INTO settings (key, value) VALUES (?, ?) ON CONFLICT(key)"
                " DO UPDATE SET value = excluded.value",
                (key, json.dumps(value)),
            )
