"""The seam between the sync and the network: a transport does one WebDAV request at a time.

The runner (`mobile_app.sync.runner`) decides what to send and in which order; a transport only
carries requests to the office folder and back. The runner is written once, as coroutines over an
`AsyncTransport`, and never asks which platform it is on:

- the server form's `WebDavTransport` (webdav4 over httpx, `mobile_app.sync.webdav`) is a blocking
  `Transport`; `Immediate` hands it to the runner as an `AsyncTransport` whose awaits never wait, so
  `finish` runs the whole sync to its end in the caller's thread (the command line, `SyncTask`, tests),
  and `Threaded` lets a screen await it while each request runs in a worker thread (server form only);
- the static build in the browser has no threads and a network that only answers later: its
  `FetchTransport` (`mobile_app.sync.fetch`, the browser's fetch) is an `AsyncTransport` proper, and
  the screens await the runner on the page's event loop.

Paths are relative to the office folder (`""` is the folder itself); a folder's path ends in `/`.
Every method raises only the typed errors of `mobile_app.sync.target` (a SyncError: OfflineError,
SlowServerError, AuthError, ServerError, ...), never its network library's own.

The deadline: `set_deadline(at_s)` takes a time on `time.monotonic()`'s clock; from then on every
request, and every read and write inside it, ends with TimeLimitError (a SlowServerError) once that
time has passed, so a server that trickles a byte every half second cannot hold a request beyond it
(a per-read timeout alone would never fire). `None` removes it.
"""

from __future__ import annotations

import asyncio
import time
from collections.abc import Coroutine
from typing import Any, Protocol, TypeVar

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

    def files(self, path: str) -> list[str]:
        """PROPFIND Depth 1 on a folder: the names of the files directly in it ([] if it is missing)."""

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


class AsyncTransport(Protocol):
    """`Transport`'s requests as coroutines (same meaning, same errors); `set_deadline` and `close`
    stay plain calls."""

    target: SyncTarget

    def set_deadline(self, at_s: float | None) -> None:
        """As `Transport.set_deadline`."""

    async def kind(self, path: str) -> str | None:
        """As `Transport.kind`."""

    async def make_folder(self, path: str) -> bool:
        """As `Transport.make_folder`."""

    async def files(self, path: str) -> list[str]:
        """As `Transport.files`."""

    async def put(self, path: str, data: bytes) -> None:
        """As `Transport.put`."""

    async def get(self, path: str, max_bytes: int) -> bytes | None:
        """As `Transport.get`."""

    async def move(self, source: str, destination: str, overwrite: bool = False) -> bool:
        """As `Transport.move`."""

    async def delete(self, path: str) -> bool:
        """As `Transport.delete`."""

    def close(self) -> None:
        """As `Transport.close`."""


class Immediate:
    """A blocking `Transport` as an `AsyncTransport` whose coroutines finish without waiting."""

    def __init__(self, inner: Transport) -> None:
        self.inner = inner
        self.target = inner.target

    def set_deadline(self, at_s: float | None) -> None:
        self.inner.set_deadline(at_s)

    async def kind(self, path: str) -> str | None:
        return self.inner.kind(path)

    async def make_folder(self, path: str) -> bool:
        return self.inner.make_folder(path)

    async def files(self, path: str) -> list[str]:
        return self.inner.files(path)

    async def put(self, path: str, data: bytes) -> None:
        self.inner.put(path, data)

    async def get(self, path: str, max_bytes: int) -> bytes | None:
        return self.inner.get(path, max_bytes)

    async def move(self, source: str, destination: str, overwrite: bool = False) -> bool:
        return self.inner.move(source, destination, overwrite)

    async def delete(self, path: str) -> bool:
        return self.inner.delete(path)

    def close(self) -> None:
        self.inner.close()


class Threaded(Immediate):
    """A blocking `Transport` whose requests run in a worker thread while the event loop goes on
    (the server form's screens; never used in the browser, which cannot start threads)."""

    async def kind(self, path: str) -> str | None:
        return await asyncio.to_thread(self.inner.kind, path)

    async def make_folder(self, path: str) -> bool:
        return await asyncio.to_thread(self.inner.make_folder, path)

    async def files(self, path: str) -> list[str]:
        return await asyncio.to_thread(self.inner.files, path)

    async def put(self, path: str, data: bytes) -> None:
        await asyncio.to_thread(self.inner.put, path, data)

    async def get(self, path: str, max_bytes: int) -> bytes | None:
        return await asyncio.to_thread(self.inner.get, path, max_bytes)

    async def move(self, source: str, destination: str, overwrite: bool = False) -> bool:
        return await asyncio.to_thread(self.inner.move, source, destination, overwrite)

    async def delete(self, path: str) -> bool:
        return await asyncio.to_thread(self.inner.delete, path)


T = TypeVar("T")


class WaitedError(RuntimeError):
    """A coroutine given to `finish` waited for something: it needs an event loop."""


def finish(coroutine: Coroutine[Any, Any, T]) -> T:
    """Run a coroutine whose awaits never wait (over an `Immediate` transport) to its end, here and
    now; WaitedError if it waits after all."""
    try:
        coroutine.send(None)
    except StopIteration as done:
        return done.value
    coroutine.close()
    raise WaitedError("the sync waited for its transport: await it on an event loop instead")


def remaining_s(deadline_s: float | None, timeout_s: float | None = None) -> float | None:
    """Seconds a network wait may take: `timeout_s` cut to what is left before `deadline_s`;
    TimeLimitError once the deadline has passed (the clock is time.monotonic)."""
    if deadline_s is None:
        return timeout_s
    left_s = deadline_s - time.monotonic()
    if left_s <= 0:
        raise TimeLimitError("the office folder was too slow: the sync reached its time limit")
    return left_s if timeout_s is None else min(timeout_s, left_s)
