"""Key derivation from a passphrase or PIN: PBKDF2-HMAC-SHA256 (RFC 8018 section 5.2).

One stored, self-describing text form, read the same in the server and in the browser build:

    pbkdf2-sha256$<iterations>$<salt, hex>$<derived key, hex>       (a verifier: `Derived`)
    pbkdf2-sha256$<iterations>$<salt, hex>                          (the parameters alone: `KdfParams`)

`derive` is the one platform seam of the package: it uses Python's `hashlib.pbkdf2_hmac` where the
interpreter has it (the server form) and the browser's WebCrypto (`crypto.subtle.deriveBits`,
reached through Pyodide's `js` module) where it does not (Python in the browser has no
`pbkdf2_hmac`). WebCrypto is asynchronous, so `derive` is a coroutine; everything else here is
synchronous, so a store hands out parameters and compares results while its caller awaits `derive`
(`derive_for` gives a `Derived` that the store's `resolve` accepts). Where Python has PBKDF2 the store
may also be handed the text itself (`resolve` derives it then with `derive_now`).

Text secrets are normalised to NFC and encoded as UTF-8 before derivation (RFC 8265 section 4.2,
the OpaqueString profile's normalisation), so a passphrase typed on another device derives the same.
"""

from __future__ import annotations

import hashlib
import hmac
import secrets
import unicodedata
from dataclasses import dataclass

from mobile_app.signing.errors import KeyFormatError

ALGORITHM = "pbkdf2-sha256"
SALT_BYTES = 16
KEY_BYTES = 32
MIN_ITERATIONS = 100_000
MAX_ITERATIONS = 100_000_000


@dataclass(frozen=True)
class KdfParams:
    """What a derivation needs besides the secret: algorithm, iteration count, salt, output length."""

    iterations: int
    salt: bytes
    length: int = KEY_BYTES
    algorithm: str = ALGORITHM

    def text(self) -> str:
        """The stored form `pbkdf2-sha256$<iterations>$<salt hex>`."""
        return f"{self.algorithm}${self.iterations}${self.salt.hex()}"


@dataclass(frozen=True)
class Derived:
    """A derived key with the parameters that made it: what a store keeps to check a PIN later."""

    params: KdfParams
    key: bytes

    def text(self) -> str:
        """The stored form `pbkdf2-sha256$<iterations>$<salt hex>$<key hex>`."""
        return f"{self.params.text()}${self.key.hex()}"

    def __repr__(self) -> str:
        return f"Derived({self.params.text()!r}, key=<hidden>)"


def new_params(iterations: int, length: int = KEY_BYTES) -> KdfParams:
    """Parameters with a fresh random salt of SALT_BYTES."""
    _check_iterations(iterations)
    return KdfParams(iterations=iterations, salt=secrets.token_bytes(SALT_BYTES), length=length)


def _check_iterations(iterations: object) -> None:
    if not isinstance(iterations, int) or not MIN_ITERATIONS <= iterations <= MAX_ITERATIONS:
        raise KeyFormatError("key derivation", f"iterations must be {MIN_ITERATIONS}–{MAX_ITERATIONS}")


def parse_params(text: str) -> KdfParams:
    """Read `pbkdf2-sha256$<iterations>$<salt hex>`; KeyFormatError for anything else."""
    parts = text.split("$") if isinstance(text, str) else []
    if len(parts) != 3:
        raise KeyFormatError("key derivation", "expected pbkdf2-sha256$iterations$salt")
    return _params(parts, KEY_BYTES)


def parse_derived(text: str) -> Derived:
    """Read `pbkdf2-sha256$<iterations>$<salt hex>$<key hex>`; KeyFormatError for anything else."""
    parts = text.split("$") if isinstance(text, str) else []
    if len(parts) != 4:
        raise KeyFormatError("key derivation", "expected pbkdf2-sha256$iterations$salt$key")
    key = _hex("derived key", parts[3])
    return Derived(params=_params(parts[:3], len(key)), key=key)


def _params(parts: list[str], length: int) -> KdfParams:
    algorithm, iterations_text, salt_hex = parts
    if algorithm != ALGORITHM:
        raise KeyFormatError("key derivation", f"unknown algorithm {algorithm!r}")
    if not iterations_text.isascii() or not iterations_text.isdigit():
        raise KeyFormatError("key derivation", "iterations must be a whole number")
    iterations = int(iterations_text)
    _check_iterations(iterations)
    salt = _hex("salt", salt_hex)
    if len(salt) < SALT_BYTES or not 16 <= length <= 64:
        raise KeyFormatError("key derivation", "salt or key too short")
    return KdfParams(iterations=iterations, salt=salt, length=length)


def _hex(what: str, text: str) -> bytes:
    try:
        return bytes.fromhex(text)
    except ValueError as error:
        raise KeyFormatError(what, "must be hex text") from error


def secret_bytes(secret: str | bytes) -> bytes:
    """A text secret as NFC-normalised UTF-8 (RFC 8265 4.2); bytes pass unchanged."""
    if isinstance(secret, bytes):
        return secret
    return unicodedata.normalize("NFC", secret).encode("utf-8")


def matches(derived: Derived, key: bytes) -> bool:
    """Whether a freshly derived `key` equals the stored one, compared in constant time."""
    return hmac.compare_digest(derived.key, key)


def backend_name() -> str:
    """Which implementation `derive` uses here: "hashlib" or "webcrypto"."""
    return "hashlib" if hasattr(hashlib, "pbkdf2_hmac") else "webcrypto"


def derive_now(secret: str | bytes, params: KdfParams) -> bytes:
    """The same derivation without waiting, where Python has PBKDF2 (the server form); in the browser
    KeyFormatError: there the caller awaits `derive` and hands over a `Derived`."""
    if backend_name() != "hashlib":
        raise KeyFormatError("key derivation", "await derive() here and pass the derived key")
    return hashlib.pbkdf2_hmac("sha256", secret_bytes(secret), params.salt, params.iterations, params.length)


def resolve(secret: str | Derived | tuple[Derived, ...], params: KdfParams) -> bytes:
    """The derived key for `params`: a `Derived` made with these very parameters, or the one of a
    tuple of them that was (KeyFormatError if none was), or a text secret derived now (`derive_now`).
    A tuple serves a store that derives one secret twice, e.g. a PIN's verifier and its sealed key."""
    if isinstance(secret, tuple):
        for one in secret:
            if one.params == params:
                return one.key
        raise KeyFormatError("key derivation", "derived with other parameters than asked")
    if isinstance(secret, Derived):
        if secret.params != params:
            raise KeyFormatError("key derivation", "derived with other parameters than asked")
        return secret.key
    return derive_now(secret, params)


async def derive_for(secret: str, params: KdfParams) -> Derived:
    """`derive` wrapped with its parameters, as the store's `resolve` takes it."""
    return Derived(params, await derive(secret, params))


async def derive(secret: str | bytes, params: KdfParams) -> bytes:
    """PBKDF2-HMAC-SHA256 of `secret` with `params` (RFC 8018 5.2): Python's where it exists,
    else the browser's WebCrypto. The one place that asks which platform this is."""
    if backend_name() == "hashlib":
        return derive_now(secret, params)
    return await _webcrypto_pbkdf2(secret_bytes(secret), params)


async def _webcrypto_pbkdf2(data: bytes, params: KdfParams) -> bytes:
    """PBKDF2 by the browser's `crypto.subtle` (W3C Web Cryptography API, PBKDF2 and deriveBits)."""
    import js  # type: ignore[import-not-found]  # Pyodide's bridge to the page's JavaScript
    from pyodide.ffi import to_js  # type: ignore[import-not-found]

    subtle = js.crypto.subtle
    base = await subtle.importKey("raw", to_js(data), "PBKDF2", False, to_js(["deriveBits"]))
    algorithm = to_js(
        {"name": "PBKDF2", "hash": "SHA-256", "salt": to_js(params.salt), "iterations": params.iterations},
        dict_converter=js.Object.fromEntries,
    )
    bits = await subtle.deriveBits(algorithm, base, params.length * 8)
    return bytes(js.Uint8Array.new(bits).to_py())
