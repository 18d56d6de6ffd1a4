"""Roster entries: the firm's signed word that a supervisor's public key is theirs, between two dates.

An entry (JSON, one object):

    {"schema": "boardside-roster-entry", "schema_version": 1, "name": "Ines Okafor",
     "public_key": "<64 hex>", "valid_from": "<ISO-8601 UTC>", "valid_to": "<ISO-8601 UTC>",
     "firm_key": "<firm public key, 64 hex>", "signature": "<128 hex>"}

`signature` is the firm's Ed25519 signature (RFC 8032) of the canonical JSON (canonical.py) of the
entry without `signature`. An entry verifies when its firm key is the pinned firm key, the signature
holds, and the time asked about lies within [valid_from, valid_to).
"""

from __future__ import annotations

import datetime
from dataclasses import dataclass
from typing import Any

from mobile_app.signing import ed25519
from mobile_app.signing.canonical import canonical_bytes, check_form
from mobile_app.signing.errors import KeyFormatError, NameRefusedError, RosterError
from mobile_app.signing.names import normalise_name

SCHEMA = "boardside-roster-entry"
SCHEMA_VERSION = 1


@dataclass(frozen=True)
class RosterEntry:
    """A supervisor enrolled by the firm: name, public key, validity, the firm key and its signature."""

    name: str
    public_key: bytes
    valid_from: datetime.datetime
    valid_to: datetime.datetime
    firm_key: bytes
    signature: bytes = b""

    def signed_fields(self) -> dict[str, Any]:
        """The fields the firm signs (everything but the signature)."""
        return {
            "schema": SCHEMA,
            "schema_version": SCHEMA_VERSION,
            "name": self.name,
            "public_key": self.public_key.hex(),
            "valid_from": self.valid_from.isoformat(),
            "valid_to": self.valid_to.isoformat(),
            "firm_key": self.firm_key.hex(),
        }

    def to_dict(self) -> dict[str, Any]:
        """The file form (module docstring)."""
        return {**self.signed_fields(), "signature": self.signature.hex()}


def utc(moment: datetime.datetime) -> datetime.datetime:
    """`moment` in UTC to the second; a naive time is refused (KeyFormatError)."""
    if moment.tzinfo is None:
        raise KeyFormatError("time", "must carry its UTC offset")
    return moment.astimezone(datetime.UTC).replace(microsecond=0)


def sign_entry(firm: ed25519.KeyPair, name: str, public_key: bytes,
               valid_from: datetime.datetime, valid_to: datetime.datetime) -> RosterEntry:
    """A roster entry for `name` and `public_key`, signed with the firm's key pair.

    The name is normalised (names.normalise_name); valid_to must be after valid_from (RosterError).
    """
    clean = normalise_name(name)
    start, end = utc(valid_from), utc(valid_to)
    if end <= start:
        raise RosterError(clean, "valid_to must be after valid_from")
    entry = RosterEntry(clean, public_key, start, end, firm.public_key)
    signature = ed25519.sign(firm.seed, canonical_bytes(entry.signed_fields()))
    return RosterEntry(clean, public_key, start, end, firm.public_key, signature)


def verify_entry(entry: RosterEntry, firm_key: bytes, at: datetime.datetime) -> None:
    """Check an entry against the pinned firm public key at time `at`.

    RosterError if it names another firm or `at` is outside its dates; BadSignatureError if the
    firm's signature does not hold.
    """
    if entry.firm_key != firm_key:
        raise RosterError(entry.name, "signed by another firm's key")
    ed25519.verify(firm_key, canonical_bytes(entry.signed_fields()), entry.signature, "roster entry")
    moment = utc(at)
    if moment < entry.valid_from:
        raise RosterError(entry.name, f"not valid before {entry.valid_from.isoformat()}")
    if moment >= entry.valid_to:
        raise RosterError(entry.name, f"expired {entry.valid_to.isoformat()}")


def _time(field: str, value: object) -> datetime.datetime:
    if not isinstance(value, str):
        raise KeyFormatError(f"roster entry {field}", "must be an ISO-8601 time")
    try:
        return utc(datetime.datetime.fromisoformat(value))
    except ValueError as error:
        raise KeyFormatError(f"roster entry {field}", "must be an ISO-8601 time") from error


def entry_from_dict(data: Any) -> RosterEntry:
    """Read the file form; KeyFormatError for anything this version does not read."""
    check_form(data, SCHEMA, SCHEMA_VERSION, "roster entry")
    name = data.get("name")
    try:
        normal = normalise_name(name)
    except NameRefusedError as error:
        raise KeyFormatError("roster entry", f"name is not in normal form ({error.problem})") from error
    if normal != name:
        raise KeyFormatError("roster entry", "name is not in normal form")
    return RosterEntry(
        name=name,
        public_key=ed25519.key_from_hex("public key", data.get("public_key"), ed25519.PUBLIC_KEY_BYTES),
        valid_from=_time("valid_from", data.get("valid_from")),
        valid_to=_time("valid_to", data.get("valid_to")),
        firm_key=ed25519.key_from_hex("firm key", data.get("firm_key"), ed25519.PUBLIC_KEY_BYTES),
        signature=ed25519.key_from_hex("signature", data.get("signature"), ed25519.SIGNATURE_BYTES),
    )


FIRM_KEY_SCHEMA = "boardside-firm-key"


def firm_key_dict(public_key: bytes) -> dict[str, Any]:
    """The firm's public key as the file `firm-key.json` holds it (what a device pins)."""
    return {"schema": FIRM_KEY_SCHEMA, "schema_version": 1, "public_key": public_key.hex(),
            "key_id": ed25519.key_id(public_key)}


def firm_key_from_dict(data: Any) -> bytes:
    """The public key in a `firm-key.json` form; KeyFormatError for anything else."""
    check_form(data, FIRM_KEY_SCHEMA, 1, "firm key")
    return ed25519.key_from_hex("firm key", data.get("public_key"), ed25519.PUBLIC_KEY_BYTES)
