"""Handing an export's files to the person: a download, or the device's share sheet.

Both are the web client's own: `FilePicker.save_file` with the bytes makes the browser download the
file (server form and browser build alike), and `Share.share_files` opens the phone's share sheet
where the browser has one (Web Share API), else downloads the files. The bytes come from the bundle
on the device, checked against the outbox's hashes first (`OutboxState.documents`).
"""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.state.outbox import Document


async def download(document: Document) -> None:
    """The browser downloads one file."""
    await ft.FilePicker().save_file(file_name=document.name, src_bytes=document.data)


async def share(documents: list[Document], title: str) -> Any:
    """The device's share sheet with the files (a download where the browser has no share sheet)."""
    files = [ft.ShareFile.from_bytes(d.data, mime_type=d.media_type, name=d.name) for d in documents]
    return await ft.Share().share_files(files, title=title, subject=title, download_fallback_enabled=True,
                                        mail_to_fallback_enabled=False)
