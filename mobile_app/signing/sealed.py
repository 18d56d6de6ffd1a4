"""A supervisor's secret key under a passphrase.

Construction, with the two primitives both platforms have (PBKDF2-HMAC-SHA256 and SHA-512 inside
Ed25519): a fresh 16-byte salt per sealing; pad = PBKDF2-HMAC-SHA256(passphrase, salt,
KEY_ITERATIONS, 32 bytes) (RFC 8018 5.2); sealed seed = seed XOR pad. The seed is 32 uniformly random
bytes and a pad is never reused (a new salt at every sealing), so the sealed seed says nothing about
the seed without the pad. Unsealing XORs again and derives the public key from the result
(RFC 8032 5.1.5): only the right passphrase gives the stored public key, which is checked, so a wrong
passphrase or an altered file is refused rather than yielding a wrong key. The stored public key is
itself confirmed by the firm's signed roster entry. An offline guess costs one PBKDF2 of
KEY_ITERATIONS plus one scalar multiplication; the README states the measured cost.

The file form (JSON, one object):

    {"schema": "boardside-sealed-key", "schema_version": 1, "name": "...",
     "public_key": "<64 hex>", "kdf": "pbkdf2-sha256$<iterations>$<salt hex>",
     "sealed_seed": "<64 hex>"}
"""

from __future__ import annotations

import unicodedata
from dataclasses import dataclass
from typing import Any

from mobile_app.signing import ed25519, kdf
from mobile_app.signing.canonical import check_form
from mobile_app.signing.errors import KeyFormatError, WeakPassphraseError, WrongPassphraseError

SCHEMA = "boardside-sealed-key"
SCHEMA_VERSION = 1
KEY_ITERATIONS = 2_000_000
MIN_PASSPHRASE_CHARS = 20
MIN_DISTINCT_CHARS = 8


@dataclass(frozen=True)
class SealedKey:
    """A secret key sealed under a passphrase, with its owner's name and public key."""

    name: str
    public_key: bytes
    params: kdf.KdfParams
    sealed_seed: bytes

    def to_dict(self) -> dict[str, Any]:
        """The file form (module docstring)."""
        return {
            "schema": SCHEMA,
            "schema_version": SCHEMA_VERSION,
            "name": self.name,
            "public_key": self.public_key.hex(),
            "kdf": self.params.text(),
            "sealed_seed": self.sealed_seed.hex(),
        }


def check_passphrase(passphrase: str) -> None:
    """Refuse a passphrase under MIN_PASSPHRASE_CHARS characters (after NFC, spaces at the ends
    dropped) or with fewer than MIN_DISTINCT_CHARS different characters ("aaaa…", "abab…").

    Twenty characters estimate at 36 bits for a passphrase a person chooses (NIST SP 800-63-1
    Appendix A: 4 bits for the first character, 2 for each of the next 7, 1.5 for the 9th to 20th).
    """
    text = unicodedata.normalize("NFC", passphrase).strip()
    if len(text) < MIN_PASSPHRASE_CHARS:
        raise WeakPassphraseError(f"at least {MIN_PASSPHRASE_CHARS} characters, e.g. four or five words")
    if len(set(text.casefold())) < MIN_DISTINCT_CHARS:
        raise WeakPassphraseError(f"at least {MIN_DISTINCT_CHARS} different characters")


def new_sealing_params() -> kdf.KdfParams:
    """Fresh parameters (a new salt) for sealing a seed."""
    return kdf.new_params(KEY_ITERATIONS)


def _xor(left: bytes, right: bytes) -> bytes:
    return bytes(a ^ b for a, b in zip(left, right, strict=True))


def seal(name: str, pair: ed25519.KeyPair, params: kdf.KdfParams, pad: bytes) -> SealedKey:
    """Seal a key pair's seed with `pad` = `kdf.derive(passphrase, params)` (module docstring)."""
    return SealedKey(name=name, public_key=pair.public_key, params=params,
                     sealed_seed=_xor(pair.seed, pad))


def unseal(sealed: SealedKey, pad: bytes) -> ed25519.KeyPair:
    """The key pair, given `pad` = `kdf.derive(passphrase, sealed.params)`; WrongPassphraseError if
    the result's public key is not the stored one."""
    pair = ed25519.key_pair_from_seed(_xor(sealed.sealed_seed, pad))
    if pair.public_key != sealed.public_key:
        raise WrongPassphraseError(sealed.name)
    return pair


async def protect(name: str, pair: ed25519.KeyPair, passphrase: str) -> SealedKey:
    """Check the passphrase, then seal the key pair under it with a fresh salt."""
    check_passphrase(passphrase)
    params = new_sealing_params()
    return seal(name, pair, params, await kdf.derive(passphrase, params))


async def unlock(sealed: SealedKey, passphrase: str) -> ed25519.KeyPair:
    """The key pair sealed under `passphrase`; WrongPassphraseError if it is not the one."""
    return unseal(sealed, await kdf.derive(passphrase, sealed.params))


def sealed_from_dict(data: Any) -> SealedKey:
    """Read the file form; KeyFormatError for anything this version does not read."""
    check_form(data, SCHEMA, SCHEMA_VERSION, "sealed key")
    name = data.get("name")
    if not isinstance(name, str) or not name:
        raise KeyFormatError("sealed key", "no name")
    params = kdf.parse_params(data.get("kdf"))
    if params.length != ed25519.SEED_BYTES:
        raise KeyFormatError("sealed key", "the derived pad must be 32 bytes")
    return SealedKey(
        name=name,
        public_key=ed25519.key_from_hex("public key", data.get("public_key"), ed25519.PUBLIC_KEY_BYTES),
        params=params,
        sealed_seed=ed25519.key_from_hex("sealed seed", data.get("sealed_seed"), ed25519.SEED_BYTES),
    )
