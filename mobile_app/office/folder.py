"""The office folder: the firm's key pair, the roster of enrolled supervisors, their sealed keys.

    OFFICE_DIR/
      firm-secret-key.json              the firm's secret key (mode 600; never leaves the office)
      roster/firm-key.json              the firm's public key: devices pin it at set-up
      roster/<name>-<key id>.json       one signed roster entry per enrolment: devices load these
      keys/<name>-<key id>.json         the supervisor's secret key sealed under their passphrase:
                                        hand it to the supervisor's device (a file)

`roster/` is what devices need and may be copied to the office's WebDAV folder; `firm-secret-key.json`
and `keys/` are not. Files are written once and never replaced.
"""

from __future__ import annotations

import asyncio
import datetime
import json
import os
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from mobile_app.office.errors import OfficeFolderError
from mobile_app.signing import (
    KeyFormatError,
    KeyPair,
    RosterEntry,
    SigningError,
    check_new_name,
    check_passphrase,
    entry_from_dict,
    generate_key_pair,
    key_pair_from_seed,
    normalise_name,
    protect,
    sign_entry,
    verify_entry,
)
from mobile_app.signing.canonical import check_form
from mobile_app.signing.ed25519 import SEED_BYTES, key_from_hex, key_id
from mobile_app.signing.roster import firm_key_dict, firm_key_from_dict

FIRM_SECRET = "firm-secret-key.json"
ROSTER = "roster"
FIRM_KEY = "firm-key.json"
KEYS = "keys"
FIRM_SECRET_SCHEMA = "boardside-firm-secret-key"
DEFAULT_VALID_DAYS = 365


@dataclass(frozen=True)
class Enrolment:
    """What `enrol` wrote: the roster entry and the sealed key file, and where."""

    entry: RosterEntry
    entry_path: Path
    sealed_key_path: Path


def _write_new(path: Path, data: dict[str, Any], secret: bool = False) -> None:
    """Write JSON to a new file (never replacing one), readable by the owner alone if `secret`."""
    path.parent.mkdir(parents=True, exist_ok=True)
    mode = 0o600 if secret else 0o644
    try:
        descriptor = os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL, mode)
    except FileExistsError as error:
        raise OfficeFolderError(str(path.parent), f"{path.name} already exists") from error
    with os.fdopen(descriptor, "w", encoding="utf-8") as handle:
        handle.write(json.dumps(data, ensure_ascii=False, indent=2) + "\n")
        handle.flush()
        os.fsync(handle.fileno())


def read_json(path: Path) -> Any:
    """A JSON file's content; OfficeFolderError if it is missing or unreadable."""
    try:
        return json.loads(path.read_text(encoding="utf-8"))
    except FileNotFoundError as error:
        raise OfficeFolderError(str(path.parent), f"no {path.name}") from error
    except (OSError, ValueError) as error:
        raise OfficeFolderError(str(path.parent), f"{path.name} is unreadable ({error})") from error


def file_name(name: str, public_key: bytes) -> str:
    """`<name as ASCII letters, digits and ->-<key id>.json` for a person's files."""
    safe = "".join(c if c.isascii() and c.isalnum() else "-" for c in name).strip("-")
    return f"{'-'.join(part for part in safe.split('-') if part) or 'person'}-{key_id(public_key)}.json"


def init_office(folder: Path) -> bytes:
    """Make the firm's key pair in `folder`; return its public key. Refuses a folder that has one."""
    if (folder / FIRM_SECRET).exists():
        raise OfficeFolderError(str(folder), f"{FIRM_SECRET} already exists: the firm has a key")
    firm = generate_key_pair()
    public = firm_key_dict(firm.public_key)
    _write_new(folder / FIRM_SECRET, {**public, "schema": FIRM_SECRET_SCHEMA, "seed": firm.seed.hex()},
               secret=True)
    _write_new(folder / ROSTER / FIRM_KEY, public)
    return firm.public_key


def firm_key_pair(folder: Path) -> KeyPair:
    """The firm's key pair from `folder`; OfficeFolderError if missing or not matching its public key."""
    data = read_json(folder / FIRM_SECRET)
    try:
        check_form(data, FIRM_SECRET_SCHEMA, 1, FIRM_SECRET)
        pair = key_pair_from_seed(key_from_hex("firm seed", data.get("seed"), SEED_BYTES))
    except SigningError as error:
        raise OfficeFolderError(str(folder), str(error)) from error
    if pair.public_key.hex() != data.get("public_key"):
        raise OfficeFolderError(str(folder), f"{FIRM_SECRET} does not match its public key")
    return pair


def firm_public_key(path: Path) -> bytes:
    """The firm's public key from a `firm-key.json` (what a device pins)."""
    try:
        return firm_key_from_dict(read_json(path))
    except SigningError as error:
        raise OfficeFolderError(str(path.parent), str(error)) from error


def roster_entries(roster_dir: Path, firm_key: bytes) -> list[RosterEntry]:
    """Every entry file in a roster folder that the firm signed (dates not checked here); files that
    are not entries, or not the firm's, are passed over."""
    entries = []
    for path in sorted(roster_dir.glob("*.json")):
        if path.name == FIRM_KEY:
            continue
        try:
            entry = entry_from_dict(read_json(path))
            verify_entry(entry, firm_key, entry.valid_from)
        except (OfficeFolderError, SigningError):
            continue
        entries.append(entry)
    return entries


def enrol(folder: Path, name: str, passphrase: str, valid_days: int = DEFAULT_VALID_DAYS,
          now: datetime.datetime | None = None) -> Enrolment:
    """Enrol a supervisor: a key pair, its secret sealed under `passphrase`, a roster entry signed by
    the firm, valid from `now` for `valid_days`.

    The name is normalised; a name that looks like another enrolled name is refused
    (LookalikeNameError), the same name again is a new enrolment (a new device or a renewal).
    """
    firm = firm_key_pair(folder)
    check_passphrase(passphrase)
    if valid_days < 1:
        raise KeyFormatError("valid days", "must be at least 1")
    clean = normalise_name(name)
    check_new_name(clean, {e.name for e in roster_entries(folder / ROSTER, firm.public_key)} - {clean})
    start = (now or datetime.datetime.now(datetime.UTC)).replace(microsecond=0)
    pair = generate_key_pair()
    entry = sign_entry(firm, clean, pair.public_key, start, start + datetime.timedelta(days=valid_days))
    sealed = asyncio.run(protect(clean, pair, passphrase))
    names = file_name(clean, pair.public_key)
    _write_new(folder / KEYS / names, sealed.to_dict(), secret=True)
    _write_new(folder / ROSTER / names, entry.to_dict())
    return Enrolment(entry, folder / ROSTER / names, folder / KEYS / names)
