"""The outbox screen: exports waiting to be sent to the office, and what was sent."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Any

from mobile_app.store import StoreError
from mobile_app.sync import Outbox, OutboxError


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
        if report.error:
            return f"{len(report.sent)} sent, {report.waiting} waiting: {report.error}"
        return f"{len(report.sent)} sent, {report.waiting} waiting"

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
