"""The device key of the browser build: what opens the sealed sync password, kept apart from the store.

The server form keeps it in the file `device-key` beside the store (`mobile_app.sync.saved`). In the
browser the store's folder is copied whole into one IndexedDB database (the worker's mount), so a file
beside it would travel with it. Instead the page's worker (site/python-worker.js, `deviceKey`) keeps
an HMAC-SHA256 key that WebCrypto made non-extractable, in an IndexedDB database of its own, and
hands Python only its HMAC of a fixed label, at each start. Therefore:

- a copy of the store file (a backup, a store sent for help, the store's IndexedDB database alone)
  holds the sealed password but not the key, so it does not reveal the password;
- no script, and no one reading the site's storage in the browser's tools, can read the key's bits
  (non-extractable, W3C Web Cryptography API section 13); the site's own code can still use it, as it
  must to send the password;
- whoever has the whole browser profile on disk, or the unlocked phone with this site open, can
  recover the password, as in the server form with the whole data folder.

Clearing the site's data removes the key with the jobs; a password sealed under a lost key cannot be
read and must be entered again (SecretError says so).
"""

from __future__ import annotations

from mobile_app.sync.target import SecretError


class BrowserKeyStore:
    """The device key the worker derived at start (see the module's docstring); never made here."""

    def __init__(self, key: bytes | None) -> None:
        self._key = key

    def get(self) -> bytes | None:
        return self._key

    def get_or_make(self) -> bytes:
        if self._key is None:
            raise SecretError("this browser keeps no key for this site (its storage was refused)")
        return self._key
