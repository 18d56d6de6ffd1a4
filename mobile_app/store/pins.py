"""Supervisor PINs: salted scrypt hashes, compared in constant time.

A stored hash reads `scrypt$n$r$p$salt_hex$key_hex`, so the cost can be raised later without
invalidating existing PINs. Parameters n=2**14, r=8, p=1 are the interactive-login figures of the
scrypt paper (RFC 7914 section 2 discusses the parameters; common practice for interactive use).
"""

from __future__ import annotations

import hashlib
import hmac
import secrets

from mobile_app.store.errors import PinError

MIN_PIN_LENGTH = 4
MAX_WRONG_PINS = 5
LOCKOUT_S = 300.0
_N, _R, _P, _KEY_BYTES = 2**14, 8, 1, 32


def check_pin_format(pin: str) -> None:
    """Refuse a PIN that is not at least MIN_PIN_LENGTH digits."""
    if not (isinstance(pin, str) and pin.isascii() and pin.isdigit() and len(pin) >= MIN_PIN_LENGTH):
        raise PinError(f"a PIN must be at least {MIN_PIN_LENGTH} digits")


def hash_pin(pin: str) -> str:
    """A salted scrypt hash of `pin`, in the self-describing text form stored in the database."""
    check_pin_format(pin)
    salt = secrets.token_bytes(16)
    key = hashlib.scrypt(pin.encode(), salt=salt, n=_N, r=_R, p=_P, dklen=_KEY_BYTES)
    return f"scrypt${_N}${_R}${_P}${salt.hex()}${key.hex()}"


def pin_matches(pin: str, stored: str) -> bool:
    """Whether `pin` hashes to `stored`, compared with hmac.compare_digest (constant time)."""
    scheme, n, r, p, salt_hex, key_hex = stored.split("$")
    if scheme != "scrypt":
        return False
    key = hashlib.scrypt(
        str(pin).encode(),
        salt=bytes.fromhex(salt_hex),
        n=int(n),
        r=int(r),
        p=int(p),
        dklen=len(key_hex) // 2,
    )
    return hmac.compare_digest(key, bytes.fromhex(key_hex))
