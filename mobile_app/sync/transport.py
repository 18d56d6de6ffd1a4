"""The seam between the sync and the network: a `Transport` does one WebDAV request at a time.

The runner (`mobile_app.sync.runner`) decides what to send and in which order; a transport only
carries requests to the office folder and back. The server form uses `WebDavTransport` (webdav4 over
httpx, `mobile_app.sync.webdav`); the static build in the browser can give the runner a transport
built on the browser's fetch with the same methods, so no runner code asks which platform it is on.

Paths are relative to the office folder (`""` is the folder itself); a folder's path ends in `/`.
Every method raises only the typed errors of `mobile_app.sync.target` (a SyncError: OfflineError,
SlowServerError, AuthError, ServerError, ...), never its network library's own.

The deadline: `set_deadline(at_s)` takes a time on `time.monotonic()`'s clock; from then on every
request, and every read and write inside it, ends with TimeLimitError (a SlowServerError) once that
time has passed, so a server that trickles a byte every half second cannot hold a request beyond it
(a per-read timeout alone would never fire). `None` removes it.
"""

from __future__ import annotations

import time
from typing import Protocol

from mobile_app.sync.target import SyncTarget, TimeLimitError


class Transport(Protocol):
    """One office folder over WebDAV (RFC 4918): the few requests the sync needs."""

    target: SyncTarget

    def set_deadline(self, at_s: float | None) -> None:
        """End every request at `at_s` (time.monotonic() seconds) with TimeLimitError; None: no end."""

    def kind(self, path: str) -> str | None:
        """PROPFIND Depth 0: "folder", "file", or None when nothing is there (404)."""

    def make_folder(self, path: str) -> bool:
        """MKCOL: True if the folder was made, False if it was already there (405)."""

    def put(self, path: str, data: bytes) -> None:
        """PUT a file's bytes (replacing a file of that name)."""

    def get(self, path: str, max_bytes: int) -> bytes | None:
        """GET a file: at most `max_bytes` + 1 bytes of it (so a longer file shows), None if missing."""

    def move(self, source: str, destination: str, overwrite: bool = False) -> bool:
        """MOVE source to destination: True if moved, False if the destination exists and
        `overwrite` is False (412)."""

    def delete(self, path: str) -> bool:
        """DELETE a file or a folder with its content: True if deleted, False if nothing was there."""

    def close(self) -> None:
        """Close the connections."""


def remaining_s(deadline_s: float | None, timeout_s: float | None = None) -> float | None:
    """Seconds a network wait may take: `timeout_s` cut to what is left before `deadline_s`;
    TimeLimitError once the deadline has passed (the clock is time.monotonic)."""
    if deadline_s is None:
        return timeout_s
    left_s = deadline_s - time.monotonic()
    if left_s <= 0:
        raise TimeLimitError("the office folder was too slow: the sync reached its time limit")
    return left_s if timeout_s is None else min(timeout_s, left_s)
