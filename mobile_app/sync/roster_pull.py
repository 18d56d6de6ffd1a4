"""The office's roster fetched from its WebDAV folder: supervisors reach devices without a file copied by
hand.

The office copies its `roster/` folder (`mobile_app.office.folder`: `firm-key.json` and one signed entry
per enrolment) into the office folder the devices sync to. `pull_roster` reads it there: a device with
no firm key pins the one in `roster/firm-key.json` (the first contact with the office, as a file loaded
in the settings would), a device that has one refuses a roster under another key, and every entry the
pinned firm signed and that is valid now enrols its supervisor. Entries already enrolled here as they
are are passed over (nothing is written for them), and one entry that fails is named and the others
still taken. The sync calls it after sending (`runner`), the settings screen on request.
"""

from __future__ import annotations

import json
from dataclasses import dataclass, field
from typing import Any

from mobile_app.store import StoreError
from mobile_app.sync.transport import AsyncTransport

ROSTER_FOLDER = "roster/"
FIRM_KEY_FILE = "firm-key.json"
MAX_FILE_BYTES = 64 * 1024
"""A firm key or a roster entry is well under 2 KB; anything larger is not one."""


@dataclass
class RosterPull:
    """What a pull did: whether it pinned the firm key, the supervisors enrolled now, the
    entries refused (file name: why), and why nothing was taken at all (None when it ran)."""

    pinned: bool = False
    enrolled: list[str] = field(default_factory=list)
    refused: dict[str, str] = field(default_factory=dict)
    problem: str | None = None

    @property
    def message(self) -> str:
        """One sentence for the screen."""
        if self.problem:
            return f"Roster not taken: {self.problem}"
        parts = ["Firm key pinned from the office folder"] if self.pinned else []
        if self.enrolled:
            parts.append("Enrolled by the office: " + ", ".join(self.enrolled))
        if self.refused:
            parts.append("refused: " + "; ".join(f"{name} ({why})" for name, why in self.refused.items()))
        return ". ".join(parts) if parts else "The roster in the office folder is already on this device"


def _json(data: bytes | None, name: str) -> Any:
    if data is None:
        raise ValueError(f"{name} is missing")
    if len(data) > MAX_FILE_BYTES:
        raise ValueError(f"{name} is too large to be a roster file")
    try:
        return json.loads(data.decode("utf-8"))
    except (UnicodeDecodeError, ValueError) as error:
        raise ValueError(f"{name} is not JSON") from error


async def pull_roster(store: Any, transport: AsyncTransport) -> RosterPull:
    """Read `roster/` in the office folder and take what the pinned firm signed (module docstring).

    Network failures are raised as the transport's typed errors (SyncError); what the folder holds
    is judged here and reported, never raised.
    """
    names = await transport.files(ROSTER_FOLDER)
    if FIRM_KEY_FILE not in names:
        return RosterPull(problem="the office folder has no roster/firm-key.json")
    report = RosterPull()
    try:
        report.pinned = store.roster.take_firm_key(
            _json(await transport.get(ROSTER_FOLDER + FIRM_KEY_FILE, MAX_FILE_BYTES), FIRM_KEY_FILE))
    except ValueError as error:  # a TrustError too: another firm's key, or not a firm key
        return RosterPull(problem=str(error))
    for name in names:
        if name == FIRM_KEY_FILE or not name.endswith(".json"):
            continue
        try:
            entry = _json(await transport.get(ROSTER_FOLDER + name, MAX_FILE_BYTES), name)
            if store.roster.has_entry(entry):
                continue
            report.enrolled += store.roster.load([entry])
        except (ValueError, StoreError) as error:
            report.refused[name] = str(error)
    return report
