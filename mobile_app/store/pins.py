"""Supervisor PINs: PBKDF2-HMAC-SHA256 verifiers (mobile_app.signing.kdf), compared in constant time,
and the attempt counter that locks a supervisor out.

A stored PIN reads `pbkdf2-sha256$<iterations>$<salt hex>$<key hex>`, the one form the server and the
browser build both read. PIN_ITERATIONS is the figure OWASP's Password Storage Cheat Sheet (2023)
gives for PBKDF2-HMAC-SHA256. A short PIN cannot resist guessing from a copy of the store file (the
README gives the measured cost): it only gates acts on the device, which the audit chain records;
what the office trusts is the approval's signature, whose key is sealed under a passphrase.

The store never waits for a derivation: a caller that must (the browser) awaits
`kdf.derive_for(pin, params)` and hands the result over; the server may hand over the text.
"""

from __future__ import annotations

from mobile_app.signing import kdf
from mobile_app.signing.errors import KeyFormatError
from mobile_app.store.errors import PinError

MIN_PIN_LENGTH = 4
MAX_WRONG_PINS = 5
PIN_ITERATIONS = 600_000

Secret = str | kdf.Derived | tuple[kdf.Derived, ...]


def check_pin_format(pin: str) -> None:
    """Refuse a PIN that is not at least MIN_PIN_LENGTH digits."""
    if not (isinstance(pin, str) and pin.isascii() and pin.isdigit() and len(pin) >= MIN_PIN_LENGTH):
        raise PinError(f"a PIN must be at least {MIN_PIN_LENGTH} digits")


def new_pin_params() -> kdf.KdfParams:
    """Fresh parameters (a new salt) for storing a PIN."""
    return kdf.new_params(PIN_ITERATIONS)


def pin_record(pin: Secret, params: kdf.KdfParams) -> str:
    """The stored form of a PIN derived with `params` (the text is checked for its format first)."""
    if isinstance(pin, str):
        check_pin_format(pin)
    return kdf.Derived(params, derive(pin, params)).text()


def hash_pin(pin: str) -> str:
    """The stored form of a PIN typed as text, with a fresh salt (server form)."""
    return pin_record(pin, new_pin_params())


def stored_params(stored: str) -> kdf.KdfParams:
    """The parameters a stored PIN was made with (what a caller derives with to check one)."""
    try:
        return kdf.parse_derived(stored).params
    except KeyFormatError as error:
        raise PinError("the stored PIN is in a form this version does not read: set it again") from error


def derive(secret: Secret, params: kdf.KdfParams) -> bytes:
    """The key of `secret` for `params` (kdf.resolve), with a refusal as PinError."""
    try:
        return kdf.resolve(secret, params)
    except KeyFormatError as error:
        raise PinError(str(error)) from error


def pin_matches(pin: Secret, stored: str) -> bool:
    """Whether `pin` derives to the stored key (constant-time comparison)."""
    record = kdf.parse_derived(stored)
    return kdf.matches(record, derive(pin, record.params))
