"""A supervisor's secret key under a passphrase: round trip, wrong passphrase, altered file, weak phrase."""

from __future__ import annotations

import asyncio
import json

import pytest

from mobile_app.signing import (
    KeyFormatError,
    WeakPassphraseError,
    WrongPassphraseError,
    check_passphrase,
    generate_key_pair,
    protect,
    sealed_from_dict,
    unlock,
)
from mobile_app.signing.sealed import KEY_ITERATIONS, MIN_PASSPHRASE_CHARS

PASSPHRASE = "copper earth loop ninety"


@pytest.fixture(scope="module")
def sealed_pair():
    pair = generate_key_pair()
    return pair, asyncio.run(protect("Ines Okafor", pair, PASSPHRASE))


def test_the_right_passphrase_unlocks_the_same_key_from_the_file_form(sealed_pair):
    pair, sealed = sealed_pair
    stored = json.loads(json.dumps(sealed.to_dict()))
    assert stored["kdf"].startswith(f"pbkdf2-sha256${KEY_ITERATIONS}$")
    assert pair.seed.hex() not in json.dumps(stored)
    assert asyncio.run(unlock(sealed_from_dict(stored), PASSPHRASE)) == pair


def test_a_wrong_passphrase_is_refused(sealed_pair):
    _, sealed = sealed_pair
    with pytest.raises(WrongPassphraseError, match="wrong passphrase for Ines Okafor's key"):
        asyncio.run(unlock(sealed, PASSPHRASE + "!"))


def test_an_altered_sealed_seed_or_public_key_does_not_unlock(sealed_pair):
    _, sealed = sealed_pair
    for field in ("sealed_seed", "public_key"):
        stored = sealed.to_dict()
        stored[field] = ("ff" if stored[field][:2] != "ff" else "00") + stored[field][2:]
        with pytest.raises((WrongPassphraseError, KeyFormatError)):
            asyncio.run(unlock(sealed_from_dict(stored), PASSPHRASE))


def test_each_sealing_has_its_own_salt(sealed_pair):
    pair, sealed = sealed_pair
    again = asyncio.run(protect("Ines Okafor", pair, PASSPHRASE))
    assert again.params.salt != sealed.params.salt and again.sealed_seed != sealed.sealed_seed


@pytest.mark.parametrize(("passphrase", "problem"), [
    ("2468", f"at least {MIN_PASSPHRASE_CHARS} characters"),
    ("  short phrase here  ", f"at least {MIN_PASSPHRASE_CHARS} characters"),
    ("a" * 30, "at least 8 different characters"),
    ("abababababababababababab", "at least 8 different characters"),
])
def test_weak_passphrases_are_refused(passphrase, problem):
    with pytest.raises(WeakPassphraseError, match=problem):
        check_passphrase(passphrase)


@pytest.mark.parametrize("data", [
    {"schema": "boardside-sealed-key", "schema_version": 2},
    {"schema": "something-else"},
    [],
])
def test_records_this_version_does_not_read_are_refused(data):
    with pytest.raises(KeyFormatError):
        sealed_from_dict(data)
