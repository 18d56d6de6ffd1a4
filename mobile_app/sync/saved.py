"""The office folder saved on this device: address and user in the store's settings, the password
sealed there with a device key that the store file does not hold.

The password is kept in the settings (`sync_password_sealed`) only as a sealed text (`seal`); the
key that opens it is kept apart, by a `KeyStore`. In the server form that is the file `device-key`
in the app's data folder (mode 0600, owner only), so the store file, its backups, a damaged copy
moved aside or a store file sent to someone for help reveal nothing of the password. The browser
build keeps the same rule with a key store of its own, apart from the store's copy in the browser
(a non-extractable WebCrypto key in an IndexedDB database of its own: `mobile_app.browser.keys`),
which its entry installs with `use_key_store`; `key_store` hands out the installed one.
A password saved by an earlier version in the plain file `sync-password` is sealed on first use and
the file overwritten and removed. The password never reaches a log, an export or an error message
(`target.scrub`).
"""

from __future__ import annotations

import os
import secrets
from pathlib import Path
from typing import Any, Protocol

from mobile_app.sync.seal import KEY_BYTES, seal, unseal
from mobile_app.sync.target import NotConfiguredError, SecretError, SyncTarget, check_url

SEALED_SETTING = "sync_password_sealed"
KEY_FILE = "device-key"
PLAIN_FILE = "sync-password"


class KeyStore(Protocol):
    """Where this device keeps the key that opens its sealed secrets (never in the store file)."""

    def get(self) -> bytes | None:
        """The device key, or None if there is none yet."""

    def get_or_make(self) -> bytes:
        """The device key, made (from the platform's random source) and kept if there is none."""


class FileKeyStore:
    """The device key in a file of its own, readable by its owner only (the server form)."""

    def __init__(self, path: Path) -> None:
        self.path = path

    def get(self) -> bytes | None:
        if not self.path.is_file():
            return None
        try:
            key = bytes.fromhex(self.path.read_text(encoding="ascii").strip())
        except (ValueError, UnicodeDecodeError):
            return None
        return key if len(key) == KEY_BYTES else None

    def get_or_make(self) -> bytes:
        key = self.get()
        if key is not None:
            return key
        key = secrets.token_bytes(KEY_BYTES)
        _write_private(self.path, key.hex())
        return key


_installed: list[KeyStore] = []


def use_key_store(store: KeyStore) -> None:
    """Install the platform's own key store (the browser entry does, before any screen)."""
    _installed.clear()
    _installed.append(store)


def key_store(data_dir: Path) -> KeyStore:
    """The key store of this platform for the store in `data_dir`: the installed one, else the file."""
    if _installed:
        return _installed[-1]
    return FileKeyStore(Path(data_dir) / KEY_FILE)


def _write_private(path: Path, text: str) -> None:
    """Write a file only its owner can read (mode 0600), flushed to the disk."""
    fd = os.open(path, os.O_WRONLY | os.O_CREAT | os.O_TRUNC, 0o600)
    with os.fdopen(fd, "w", encoding="ascii") as handle:
        handle.write(text)
        handle.flush()
        os.fsync(handle.fileno())
    os.chmod(path, 0o600)


def save_password(store: Any, password: str) -> None:
    """Seal the sync password into the store's settings with this device's key (made if missing)."""
    folder = Path(store.path).parent
    key = key_store(folder).get_or_make()
    store.settings.set(SEALED_SETTING, seal(key, password.encode("utf-8")))
    _remove_plain(folder)


def load_password(store: Any) -> str:
    """The sync password saved on this device ("" if none); SecretError if it cannot be opened.

    A password still in the plain file of an earlier version is sealed now and the file removed.
    """
    folder = Path(store.path).parent
    sealed = store.settings.get(SEALED_SETTING)
    if not sealed:
        plain = folder / PLAIN_FILE
        if not plain.is_file():
            return ""
        password = plain.read_text(encoding="utf-8")
        save_password(store, password)
        return password
    key = key_store(folder).get()
    if key is None:
        raise SecretError("this device's key (device-key) is missing")
    try:
        return unseal(key, sealed).decode("utf-8")
    except UnicodeDecodeError as exc:
        raise SecretError("it is damaged") from exc


def _remove_plain(folder: Path) -> None:
    """Overwrite and remove the plain password file of an earlier version, if it is there."""
    plain = folder / PLAIN_FILE
    if plain.is_file():
        _write_private(plain, "0" * plain.stat().st_size)
        plain.unlink()


def save_target(store: Any, url: str, user: str, password: str) -> None:
    """Check and save the office folder: URL and user in the store, the password sealed."""
    store.settings.set("sync_url", check_url(url))
    store.settings.set("sync_user", user)
    save_password(store, password)


def load_target(store: Any) -> SyncTarget:
    """The office folder saved on this device; raises NotConfiguredError (SecretError for a password
    that cannot be opened here) or InsecureTargetError."""
    url = store.settings.get("sync_url") or ""
    if not url:
        raise NotConfiguredError("no office folder is set on this device")
    return SyncTarget(check_url(url), store.settings.get("sync_user") or "", load_password(store),
                      ca_file=store.settings.get("sync_ca_file") or None)
