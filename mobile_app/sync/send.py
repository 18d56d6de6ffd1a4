"""Sending one bundle so that the office never sees a partial file under a bundle's name.

A bundle is uploaded into a temporary folder beside its final place, `.<remote folder>.partial/`
(hidden: a leading dot, which office sync clients skip by default): MKCOL it, PUT each file (manifest
last), GET each back and compare its size and SHA-256 with what was queued. Only when every file
verifies is the folder moved into place with one WebDAV MOVE (RFC 4918 section 9.9), which the server
does as a rename: the bundle's folder appears complete or not at all. The temporary folder's path is
kept in the outbox row first, so a run that was stopped (killed, offline, time limit) leaves a
leftover the next run deletes. If the final folder is already there (a run moved it and was stopped
before it could record that), it is read back: the same bytes count as delivered, and anything else
is replaced. Works over any `AsyncTransport` (coroutines; see `transport` for the blocking one).
"""

from __future__ import annotations

import hashlib
from pathlib import Path
from typing import Any

from mobile_app.sync.outbox import BundleError, BundleFile, Outbox, files_from_row
from mobile_app.sync.target import ProtocolError, SyncError, VerifyError
from mobile_app.sync.transport import AsyncTransport

STAGING_SUFFIX = ".partial"


def staging_path(remote_path: str) -> str:
    """The temporary folder a bundle is uploaded into before it is moved to `remote_path`."""
    return f".{remote_path}{STAGING_SUFFIX}/"


async def probe(transport: AsyncTransport) -> None:
    """Check the office folder is a folder; make it if missing. Another device making it at the same
    moment (MKCOL answers 405) is as good as making it."""
    kind = await transport.kind("")
    if kind is None and not await transport.make_folder(""):
        kind = await transport.kind("")
    if kind not in (None, "folder"):
        raise ProtocolError("the office address is a file, not a folder")


async def clean_leftovers(outbox: Outbox, transport: AsyncTransport) -> int:
    """Delete the temporary folders that stopped runs left on the server; how many were there."""
    found = 0
    for row in outbox.staged():
        found += await transport.delete(row["staging"])
        outbox.mark_staging(row["id"], None)
    return found


def read_checked(bundle_dir: Path, f: BundleFile) -> bytes:
    """A queued file's bytes; BundleError if it is missing or changed on the device."""
    path = bundle_dir / f.name
    try:
        data = path.read_bytes()
    except OSError as exc:
        raise BundleError(f"{bundle_dir.name}/{f.name} is missing or changed since it was queued") from exc
    if len(data) != f.size_bytes or hashlib.sha256(data).hexdigest() != f.sha256:
        raise BundleError(f"{bundle_dir.name}/{f.name} is missing or changed since it was queued")
    return data


async def verify(transport: AsyncTransport, remote: str, f: BundleFile) -> None:
    """GET a file back; VerifyError unless it has the size and SHA-256 that were queued."""
    back = await transport.get(remote, f.size_bytes)
    if back is None:
        raise VerifyError(f"{remote} is missing on the server after upload")
    if len(back) != f.size_bytes or hashlib.sha256(back).hexdigest() != f.sha256:
        raise VerifyError(f"{remote} arrived different from the one sent "
                          f"({len(back)} of {f.size_bytes} bytes)")


async def already_there(transport: AsyncTransport, folder: str, files: list[BundleFile]) -> bool:
    """True if `folder` on the server holds every file of the bundle byte for byte."""
    try:
        for f in files:
            await verify(transport, f"{folder}{f.remote_name}", f)
    except VerifyError:
        return False
    return True


async def send_bundle(transport: AsyncTransport, outbox: Outbox, row: dict[str, Any]) -> None:
    """Upload one outbox row's bundle into its temporary folder, verify it, move it into place."""
    bundle_dir, files = Path(row["bundle_dir"]), files_from_row(row)
    final, staging = f"{row['remote_path']}/", staging_path(row["remote_path"])
    outbox.mark_staging(row["id"], staging)
    if not await transport.make_folder(staging):
        await transport.delete(staging)
        await transport.make_folder(staging)
    try:
        for f in files:
            remote = f"{staging}{f.remote_name}"
            await transport.put(remote, read_checked(bundle_dir, f))
            await verify(transport, remote, f)
    except (BundleError, VerifyError):
        await _drop(transport, outbox, row["id"], staging)
        raise
    if await transport.move(staging, final):
        return
    if await already_there(transport, final, files):
        await _drop(transport, outbox, row["id"], staging)
        return
    await transport.move(staging, final, overwrite=True)


async def _drop(transport: AsyncTransport, outbox: Outbox, entry_id: int, staging: str) -> None:
    """Delete a temporary folder now if the server lets us (else the next run does)."""
    try:
        await transport.delete(staging)
    except SyncError:
        return
    outbox.mark_staging(entry_id, None)
