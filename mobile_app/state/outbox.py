"""The outbox screen: exports waiting to be sent to the office, and what was sent."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Any

from mobile_app.store import StoreError
from mobile_app.sync import Outbox, OutboxError

MEDIA_TYPES = {".pdf": "application/pdf", ".json": "application/json", ".csv": "text/csv"}
"""The documents of a bundle handed to a person, in this order (RFC 8118, RFC 8259, RFC 4180)."""


@dataclass(frozen=True)
class Document:
    """One file of an export as handed over: its name, its bytes and its media type."""

    name: str
    data: bytes
    media_type: str


def _said(report: Any) -> str:
    """A sync run in plain words: `2 sent, 0 waiting`, with its error if it had one."""
    if report.error:
        return f"{len(report.sent)} sent, {report.waiting} waiting: {report.error}"
    return f"{len(report.sent)} sent, {report.waiting} waiting"


@dataclass(frozen=True)
class OutboxRow:
    """One export in the outbox."""

    id: int
    title: str
    detail: str
    sent: bool


def _when(stamp: object) -> str:
    """`2026-12-02T07:22:48.049+00:00` as `2026-12-02 07:22 UTC`."""
    text = str(stamp or "")
    return f"{text[:16].replace('T', ' ')} UTC" if len(text) >= 16 else text


def _row(entry: dict[str, Any], sent: bool) -> OutboxRow:
    name = entry.get("bundle_name") or entry.get("name") or f"Export {entry.get('id')}"
    parts = [f"job {entry.get('job_id')}", f"revision {entry.get('revision')}"]
    if sent and entry.get("sent_at"):
        parts.append(f"sent {_when(entry['sent_at'])}")
    if not sent and entry.get("last_error"):
        parts.append(str(entry["last_error"]))
    if not sent and entry.get("next_try_at"):
        parts.append(f"next try {_when(entry['next_try_at'])}")
    return OutboxRow(int(entry.get("id") or 0), str(name), " · ".join(parts), sent)


class OutboxState:
    """Rows of the outbox, waiting first."""

    def __init__(self, store: Any) -> None:
        self.store = store
        self.outbox = Outbox(store.db)

    def rows(self) -> list[OutboxRow]:
        """Waiting exports, then sent ones."""
        waiting = [_row(e, False) for e in self.outbox.waiting()]
        sent = [_row(e, True) for e in self.outbox.sent()]
        return waiting + sent

    def summary(self) -> str:
        """`2 waiting · 5 sent`."""
        rows = self.rows()
        waiting = sum(1 for r in rows if not r.sent)
        return f"{waiting} waiting · {len(rows) - waiting} sent"

    def send_now(self) -> str:
        """Send every waiting export now; returns what happened in plain words."""
        from mobile_app.sync import SyncError, load_target, sync_once

        try:
            report = sync_once(self.store, load_target(self.store), force=True)
        except SyncError as exc:
            return f"Not sent: {exc}"
        return _said(report)

    async def send_now_async(self) -> str:
        """`send_now` awaited: the platform's own transport (the browser's fetch, or the server's
        with each request in a worker thread), so the screen goes on while it sends."""
        from mobile_app.sync import SyncError, sync_store_async

        try:
            report = await sync_store_async(self.store, force=True)
        except SyncError as exc:
            return f"Not sent: {exc}"
        return _said(report)

    def documents(self, entry_id: int) -> tuple[list[Document], str]:
        """The PDF, JSON and CSV of an export in the outbox, to hand to the person (download or
        share), and "" — or no files and why: the bundle on this device was removed or changed since
        it was queued (its hashes are checked)."""
        from mobile_app.sync.outbox import files_from_row
        from mobile_app.sync.send import read_checked

        try:
            row = self.outbox.get(entry_id)
            folder = Path(row["bundle_dir"])
            kept = [Document(f.name, read_checked(folder, f), MEDIA_TYPES[Path(f.name).suffix.lower()])
                    for f in files_from_row(row) if Path(f.name).suffix.lower() in MEDIA_TYPES]
        except OutboxError as exc:
            return [], f"Not available: {exc}"
        order = list(MEDIA_TYPES)
        return sorted(kept, key=lambda d: order.index(Path(d.name).suffix.lower())), ""

    async def prepare_export(self) -> str:
        """Make the PDF's libraries importable (the browser build loads them on the first export);
        "" when ready, else why not in plain words."""
        from mobile_app.export import ready

        try:
            await ready()
        except StoreError as exc:
            return f"Not exported: {exc}"
        return ""

    def export_job(self, job_id: int) -> str:
        """Export a job's bundle (JSON, CSV, PDF) and queue it for the office."""
        from mobile_app.export import export_bundle

        out_dir = Path(self.store.path).parent / "exports"
        out_dir.mkdir(parents=True, exist_ok=True)
        try:
            bundle = export_bundle(self.store, job_id, out_dir)
            revision = int(self.store.jobs.get(job_id).get("revision") or 1)
            self.outbox.enqueue(Path(bundle.path), job_id, revision)
        except (StoreError, OutboxError, OSError, ValueError) as exc:
            return f"Not exported: {exc}"
        return f"Exported {Path(bundle.path).name} to the outbox"
