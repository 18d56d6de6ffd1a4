"""The outbox screen: exports waiting to be sent to the office, and what was sent, when and where.

It says what is true: with no office folder set nothing can be tried, so it says that (with the
way to set one) and names no next try; an export of a job's revision replaces that revision's
export still waiting instead of queuing a second copy; a sent export shows when it went and to
which folder.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Any

from mobile_app.export.figures import local_time
from mobile_app.store import StoreError
from mobile_app.sync import Outbox, OutboxError
from mobile_app.sync.outbox import iso, utc_now

NO_FOLDER = "No office folder set"
NO_FOLDER_DETAIL = ("Exports wait on this device until an office folder is set in Settings; "
                    "nothing is tried before then.")

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
    """One export in the outbox: its name, the job and revision, and what happened to it.

    `state` is "waiting" or "sent"; `when` says when it was queued or sent, `where` the folder it
    went to (sent only), `problem` the last failure in plain words (waiting only).
    """

    id: int
    title: str
    detail: str
    state: str
    when: str
    where: str = ""
    problem: str = ""

    @property
    def sent(self) -> bool:
        """True once the office folder holds it, verified."""
        return self.state == "sent"

    @property
    def lines(self) -> list[str]:
        """What the row says under its title, one line each."""
        lines = [self.detail, self.when]
        if self.where:
            lines.append(f"to {self.where}")
        if self.problem:
            lines.append(self.problem)
        return [line for line in lines if line]


class OutboxState:
    """Rows of the outbox, waiting first, and what the screen says about the office folder."""

    def __init__(self, store: Any) -> None:
        self.store = store
        self.outbox = Outbox(store.db)

    @property
    def configured(self) -> bool:
        """True when an office folder is set on this device."""
        return bool(str(self.store.settings.get("sync_url", "") or "").strip())

    @property
    def notice(self) -> str | None:
        """`No office folder set` when none is, else None."""
        return None if self.configured else NO_FOLDER

    def _waiting(self, entry: dict[str, Any]) -> OutboxRow:
        when = f"queued {local_time(entry.get('queued_at'))}"
        problem = ""
        if self.configured and entry.get("last_error"):
            tried = local_time(entry.get("last_try_at"))
            problem = f"last try {tried} failed: {entry['last_error']}"
            upcoming = entry.get("next_try_at")
            if upcoming and str(upcoming) > iso(utc_now()):
                problem += f"; next try after {local_time(upcoming)}"
        elif not self.configured:
            problem = "waits for an office folder"
        return OutboxRow(int(entry["id"]), _title(entry), _detail(entry), "waiting", when, problem=problem)

    @staticmethod
    def _sent(entry: dict[str, Any]) -> OutboxRow:
        where = str(entry.get("sent_to") or "")
        return OutboxRow(int(entry["id"]), _title(entry), _detail(entry), "sent",
                         f"sent {local_time(entry.get('sent_at'))}",
                         where=where or f"the office folder, as {entry.get('remote_path')}")

    def rows(self) -> list[OutboxRow]:
        """Waiting exports, then sent ones (most recent first)."""
        return [self._waiting(e) for e in self.outbox.waiting()] + [self._sent(e) for e in self.outbox.sent()]

    def summary(self) -> str:
        """`2 waiting · 5 sent`."""
        rows = self.rows()
        waiting = sum(1 for r in rows if not r.sent)
        return f"{waiting} waiting · {len(rows) - waiting} sent"

    def send_now(self) -> str:
        """Send every waiting export now; returns what happened in plain words."""
        from mobile_app.sync import NotConfiguredError, SyncError, load_target, sync_once

        if not self.outbox.waiting():
            return "Nothing waits to be sent"
        try:
            report = sync_once(self.store, load_target(self.store), force=True)
        except NotConfiguredError as exc:
            if self.configured:
                return f"Not sent: {exc}"
            return f"Not sent: {NO_FOLDER.lower()}. Set the office folder in Settings first."
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
        """Export a job's bundle (JSON, CSV, PDF) and queue it for the office; an export of the same
        revision still waiting is replaced by it."""
        from mobile_app.export import export_bundle

        out_dir = Path(self.store.path).parent / "exports"
        out_dir.mkdir(parents=True, exist_ok=True)
        try:
            bundle = export_bundle(self.store, job_id, out_dir)
            revision = int(self.store.jobs.get(job_id).get("revision") or 1)
            queued = self.outbox.queue_export(Path(bundle.path), job_id, revision)
        except (StoreError, OutboxError, OSError, ValueError) as exc:
            return f"Not exported: {exc}"
        name = Path(bundle.path).name
        if queued.replaced:
            return f"Exported {name}: it replaces this revision's export that was waiting"
        return f"Exported {name} to the outbox"


def _title(entry: dict[str, Any]) -> str:
    return str(entry.get("bundle_name") or f"Export {entry.get('id')}")


def _detail(entry: dict[str, Any]) -> str:
    return f"job {entry.get('job_id')} · revision {entry.get('revision')}"
