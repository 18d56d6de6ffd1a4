"""Ed25519 key pairs, signatures and verification (RFC 8032 section 5.1), by python-ecdsa.

python-ecdsa is pure Python (a py3-none-any wheel), so the same code runs on the server and in the
browser build. A secret key is its 32-byte seed (RFC 8032 5.1.5); a public key is 32 bytes and a
signature 64 (5.1.6). Signing is deterministic: the same seed and message give the same signature.
Verification refuses an S not below the group order (5.1.7), so signatures are not malleable.
The seed comes from `secrets`, which reads the operating system's (or the browser's) random source.
"""

from __future__ import annotations

import hashlib
import secrets
from dataclasses import dataclass

from mobile_app.signing.errors import BadSignatureError, KeyFormatError

SEED_BYTES = 32
PUBLIC_KEY_BYTES = 32
SIGNATURE_BYTES = 64


@dataclass(frozen=True)
class KeyPair:
    """An Ed25519 key pair: the secret seed and its public key (both raw bytes)."""

    seed: bytes
    public_key: bytes

    def __repr__(self) -> str:
        return f"KeyPair(public_key={self.public_key.hex()!r}, seed=<hidden>)"


def _check_length(what: str, value: bytes, length: int) -> None:
    """KeyFormatError unless `value` is bytes of exactly `length`."""
    if not isinstance(value, bytes) or len(value) != length:
        raise KeyFormatError(what, f"must be {length} bytes")


def _signing_key(seed: bytes):  # -> ecdsa.SigningKey; imported here, only where it is used
    from ecdsa import Ed25519, SigningKey

    _check_length("secret key", seed, SEED_BYTES)
    return SigningKey.from_string(seed, curve=Ed25519)


def public_key_of(seed: bytes) -> bytes:
    """The public key of a 32-byte seed (RFC 8032 5.1.5)."""
    return bytes(_signing_key(seed).verifying_key.to_string())


def key_pair_from_seed(seed: bytes) -> KeyPair:
    """The key pair of a given 32-byte seed."""
    return KeyPair(seed=seed, public_key=public_key_of(seed))


def generate_key_pair() -> KeyPair:
    """A new key pair from 32 random bytes."""
    return key_pair_from_seed(secrets.token_bytes(SEED_BYTES))


def sign(seed: bytes, message: bytes) -> bytes:
    """The 64-byte Ed25519 signature of `message` under the secret seed (RFC 8032 5.1.6)."""
    return bytes(_signing_key(seed).sign(message))


def verify(public_key: bytes, message: bytes, signature: bytes, what: str = "message") -> None:
    """Check an Ed25519 signature (RFC 8032 5.1.7); BadSignatureError naming `what` if it fails.

    A public key that is not a point of the curve is KeyFormatError.
    """
    from ecdsa import BadSignatureError as EcdsaBadSignature
    from ecdsa import Ed25519, MalformedPointError, VerifyingKey

    _check_length("public key", public_key, PUBLIC_KEY_BYTES)
    if not isinstance(signature, bytes) or len(signature) != SIGNATURE_BYTES:
        raise BadSignatureError(what)
    try:
        key = VerifyingKey.from_string(public_key, curve=Ed25519)
    except (MalformedPointError, ValueError) as error:
        raise KeyFormatError("public key", "is not a point of Ed25519") from error
    try:
        key.verify(signature, message)
    except (EcdsaBadSignature, ValueError) as error:
        raise BadSignatureError(what) from error


def key_from_hex(what: str, text: object, length: int) -> bytes:
    """Bytes from lower- or upper-case hex text of exactly `length` bytes; KeyFormatError otherwise."""
    if not isinstance(text, str):
        raise KeyFormatError(what, "must be hex text")
    try:
        value = bytes.fromhex(text)
    except ValueError as error:
        raise KeyFormatError(what, "must be hex text") from error
    _check_length(what, value, length)
    return value


def key_id(public_key: bytes) -> str:
    """A short name for a public key: the first 16 hex digits of its SHA-256 (for file names, logs)."""
    return hashlib.sha256(public_key).hexdigest()[:16]
