"""The key-derivation seam: PBKDF2-HMAC-SHA256 and its one stored form."""

from __future__ import annotations

import asyncio

import pytest

from mobile_app.signing import (
    KdfParams,
    KeyFormatError,
    derive,
    matches,
    new_params,
    parse_derived,
    parse_params,
)
from mobile_app.signing.kdf import Derived, backend_name

# RFC 7914 section 11, the PBKDF2-HMAC-SHA256 test vectors (password, salt, iterations, 64-byte output).
RFC7914_11 = [
    ("passwd", b"salt", 1,
     "55ac046e56e3089fec1691c22544b605f94185216dde0465e68b9d57c20dacbc49ca9cccf179b645991664b39d77ef31"
     "7c71b845b1e30bd509112041d3a19783"),
    ("Password", b"NaCl", 80000,
     "4ddcd8f60b98be21830cee5ef22701f9641a4418d04c0414aeff08876b34ab56a1d425a1225833549adb841b51c9b317"
     "6a272bdebba1d078478f62b397f33c8d"),
]


@pytest.mark.parametrize(("password", "salt", "iterations", "expected"), RFC7914_11)
def test_derive_matches_rfc7914(password, salt, iterations, expected):
    params = KdfParams(iterations=iterations, salt=salt, length=64)
    assert asyncio.run(derive(password, params)).hex() == expected  # RFC 7914 section 11


def test_the_server_form_uses_pythons_own_pbkdf2():
    assert backend_name() == "hashlib"


def test_stored_forms_read_back_and_compare():
    params = new_params(100_000)
    key = asyncio.run(derive("2468", params))
    stored = Derived(params, key).text()
    algorithm, iterations, salt, key_hex = stored.split("$")
    assert (algorithm, iterations, len(salt), key_hex) == ("pbkdf2-sha256", "100000", 32, key.hex())
    again = parse_derived(stored)
    assert again.params == params and matches(again, asyncio.run(derive("2468", again.params)))
    assert not matches(again, asyncio.run(derive("2469", again.params)))
    assert parse_params(params.text()) == params
    assert "key=<hidden>" in repr(again) and key.hex() not in repr(again)


def test_a_fresh_salt_each_time():
    assert new_params(100_000).salt != new_params(100_000).salt


def test_text_is_normalised_to_nfc_before_derivation():
    # RFC 8265 4.2: "é" typed as one code point or as e + combining acute derives the same key.
    params = new_params(100_000)
    composed, decomposed = "caf\u00e9 au lait", "cafe\u0301 au lait"
    assert asyncio.run(derive(composed, params)) == asyncio.run(derive(decomposed, params))


@pytest.mark.parametrize("text", [
    "scrypt$16384$8$1$00$00",
    "pbkdf2-sha256$1000$" + "00" * 16,
    "pbkdf2-sha256$many$" + "00" * 16,
    "pbkdf2-sha256$600000$00",
    "pbkdf2-sha256$600000$zz" + "00" * 15,
    "pbkdf2-sha1$600000$" + "00" * 16,
])
def test_forms_this_version_does_not_read_are_refused(text):
    with pytest.raises(KeyFormatError):
        parse_params(text)
