"""The sync password at rest: sealed in the store with a device key kept apart, on real store files.

What a person holding the store file, a backup or a copy can read is in README.md ("Secrets").
"""

from __future__ import annotations

import base64
import hashlib
import hmac
import shutil
import stat
from pathlib import Path
from urllib.parse import quote

import pytest

from mobile_app.store import Store
from mobile_app.sync import SecretError, load_password, load_target, save_password, save_target
from mobile_app.sync.saved import KEY_FILE, PLAIN_FILE, SEALED_SETTING
from mobile_app.sync.seal import PREFIX, seal, unseal

PASSWORD = "Ofis-Şifre-7f3Q ü"
KEY = bytes(range(32))


def forms(password: str, user: str = "office") -> list[bytes]:
    """The ways a password could leak into bytes: as text, URL-quoted, in a Basic auth header."""
    return [password.encode(), quote(password, safe="").encode(),
            base64.b64encode(f"{user}:{password}".encode())]


def test_a_seal_opens_with_its_key_only_and_never_repeats() -> None:
    first, second = seal(KEY, PASSWORD.encode()), seal(KEY, PASSWORD.encode())
    assert first.startswith(PREFIX) and first != second  # a new nonce each time
    assert unseal(KEY, first) == unseal(KEY, second) == PASSWORD.encode()
    with pytest.raises(SecretError, match="another device key or changed"):
        unseal(bytes(32), first)
    raw = bytearray(base64.urlsafe_b64decode(first[len(PREFIX):]))
    raw[20] ^= 1  # one bit of the ciphertext
    with pytest.raises(SecretError, match="another device key or changed"):
        unseal(KEY, PREFIX + base64.urlsafe_b64encode(bytes(raw)).decode())
    for damaged in ("plain text", PREFIX + "%%%", PREFIX + "AAAA"):
        with pytest.raises(SecretError):
            unseal(KEY, damaged)


def test_the_seal_is_counter_mode_over_hmac_sha256_with_encrypt_then_mac() -> None:
    """Rebuilt from the primitives named in the module's docstring: RFC 5869 expand, NIST SP 800-38A
    counter mode with HMAC-SHA256 (RFC 2104) as the function, then a MAC over nonce and ciphertext."""
    nonce = bytes(16)
    sealed = base64.urlsafe_b64decode(seal(KEY, b"x" * 40, nonce)[len(PREFIX):])
    enc = hmac.new(KEY, b"boardside seal enc\x01", hashlib.sha256).digest()
    mac = hmac.new(KEY, b"boardside seal mac\x01", hashlib.sha256).digest()
    stream = b"".join(hmac.new(enc, nonce + i.to_bytes(8, "big"), hashlib.sha256).digest() for i in (0, 1))
    ciphertext = bytes(a ^ b for a, b in zip(b"x" * 40, stream, strict=False))
    tag = hmac.new(mac, PREFIX.encode() + nonce + ciphertext, hashlib.sha256).digest()
    assert sealed == nonce + ciphertext + tag


def test_the_store_file_and_its_copies_hold_no_readable_password(tmp_path: Path) -> None:
    data = tmp_path / "data"
    with Store.open(data) as store:
        save_target(store, "https://dav.example.com/office/", "office", PASSWORD)
        assert load_target(store).password == PASSWORD
        assert store.settings.get(SEALED_SETTING).startswith(PREFIX)
        open_files = {p.name: p.read_bytes() for p in data.rglob("*") if p.is_file()}  # with -wal
    closed_files = {p.name: p.read_bytes() for p in data.rglob("*") if p.is_file()}  # checkpointed
    assert {"boardside.sqlite-wal", KEY_FILE} <= set(open_files)
    assert stat.S_IMODE((data / KEY_FILE).stat().st_mode) == 0o600
    assert not (data / PLAIN_FILE).exists()
    for name, content in [*open_files.items(), *closed_files.items()]:
        assert not any(form in content for form in forms(PASSWORD)), name

    copy = tmp_path / "copy"  # the store file alone, e.g. sent to someone for help
    copy.mkdir()
    shutil.copyfile(data / "boardside.sqlite", copy / "boardside.sqlite")
    with Store.open(copy) as store:
        with pytest.raises(SecretError) as info:
            load_target(store)
    assert str(info.value) == ("the saved sync password cannot be read: this device's key (device-key)"
                               " is missing; enter it again in the sync settings")
    assert PASSWORD not in str(info.value)


def test_a_key_from_another_device_cannot_open_it(tmp_path: Path) -> None:
    with Store.open(tmp_path / "a") as store:
        save_password(store, PASSWORD)
    with Store.open(tmp_path / "b") as other:
        save_password(other, "something else")
    shutil.copyfile(tmp_path / "b" / KEY_FILE, tmp_path / "a" / KEY_FILE)
    with Store.open(tmp_path / "a") as store, pytest.raises(SecretError, match="another device key"):
        load_password(store)


def test_a_plain_password_of_an_earlier_version_is_sealed_and_its_file_removed(tmp_path: Path) -> None:
    data = tmp_path / "data"
    with Store.open(data) as store:
        assert load_password(store) == ""
        (data / PLAIN_FILE).write_text(PASSWORD, encoding="utf-8")
        assert load_password(store) == PASSWORD
        assert not (data / PLAIN_FILE).exists()
        assert unseal(bytes.fromhex((data / KEY_FILE).read_text()),
                      store.settings.get(SEALED_SETTING)) == PASSWORD.encode()
        assert load_password(store) == PASSWORD
