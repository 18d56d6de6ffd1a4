"""Sealing a short secret (the sync password) with a device key, from HMAC-SHA256 alone.

The browser's Python has no `cryptography` wheel, and the standard library's HMAC and SHA-256 run the
same in both forms, so the seal is a well-known construction built from them:

- key separation: an encryption key and a MAC key are derived from the 32-byte device key with
  HMAC-SHA256 under two different labels (the expand step of HKDF, RFC 5869 section 2.3);
- encryption: a keystream of HMAC-SHA256(enc_key, nonce ‖ counter) blocks XORed with the text, i.e.
  counter mode (NIST SP 800-38A section 6.5) with HMAC as the pseudorandom function in place of a
  block cipher; HMAC is a PRF when SHA-256's compression function is one (Bellare, "New Proofs for
  NMAC and HMAC", CRYPTO 2006), which makes this mode confidential under chosen plaintexts; the nonce
  is 16 random bytes, new for every seal, so a keystream is never reused in practice;
- integrity: HMAC-SHA256(mac_key, version ‖ nonce ‖ ciphertext), checked in constant time before
  anything is decrypted (encrypt-then-MAC, Bellare and Namprempre, ASIACRYPT 2000: authenticated
  encryption from a confidential mode and a strong MAC with independent keys).

Sealed text: `bs1:` + URL-safe base64 of nonce (16 bytes) ‖ ciphertext ‖ tag (32 bytes).
"""

from __future__ import annotations

import base64
import binascii
import hashlib
import hmac
import secrets

from mobile_app.sync.target import SecretError

PREFIX = "bs1:"
KEY_BYTES = 32
NONCE_BYTES = 16
TAG_BYTES = 32


def _subkey(key: bytes, label: bytes) -> bytes:
    """A key for one purpose derived from the device key (HKDF-Expand with one block)."""
    return hmac.new(key, label + b"\x01", hashlib.sha256).digest()


def _keystream(enc_key: bytes, nonce: bytes, length: int) -> bytes:
    """`length` bytes of HMAC-SHA256(enc_key, nonce ‖ counter) blocks."""
    blocks = (hmac.new(enc_key, nonce + i.to_bytes(8, "big"), hashlib.sha256).digest()
              for i in range((length + 31) // 32))
    return b"".join(blocks)[:length]


def _tag(key: bytes, nonce: bytes, ciphertext: bytes) -> bytes:
    return hmac.new(_subkey(key, b"boardside seal mac"), PREFIX.encode() + nonce + ciphertext,
                    hashlib.sha256).digest()


def seal(key: bytes, plaintext: bytes, nonce: bytes | None = None) -> str:
    """`plaintext` sealed with `key` (see the module's docstring); a new random nonce each time."""
    nonce = nonce if nonce is not None else secrets.token_bytes(NONCE_BYTES)
    stream = _keystream(_subkey(key, b"boardside seal enc"), nonce, len(plaintext))
    ciphertext = bytes(a ^ b for a, b in zip(plaintext, stream, strict=True))
    return PREFIX + base64.urlsafe_b64encode(nonce + ciphertext + _tag(key, nonce, ciphertext)).decode()


def unseal(key: bytes, sealed: str) -> bytes:
    """The text sealed in `sealed`; SecretError if it is not one, was changed or needs another key."""
    if not sealed.startswith(PREFIX):
        raise SecretError("it is not in a form this version reads")
    try:
        raw = base64.urlsafe_b64decode(sealed[len(PREFIX):].encode("ascii"))
    except (binascii.Error, ValueError, UnicodeEncodeError) as exc:
        raise SecretError("it is damaged") from exc
    if len(raw) < NONCE_BYTES + TAG_BYTES:
        raise SecretError("it is damaged")
    nonce, ciphertext, tag = raw[:NONCE_BYTES], raw[NONCE_BYTES:-TAG_BYTES], raw[-TAG_BYTES:]
    if not hmac.compare_digest(tag, _tag(key, nonce, ciphertext)):
        raise SecretError("it was sealed with another device key or changed")
    stream = _keystream(_subkey(key, b"boardside seal enc"), nonce, len(ciphertext))
    return bytes(a ^ b for a, b in zip(ciphertext, stream, strict=True))
