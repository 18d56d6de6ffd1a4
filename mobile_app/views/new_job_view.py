"""New job: client reference and site, and who is recording on this device; supply defaults come from
the settings."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.screen import screen
from mobile_app.state.jobs import JobsList
from mobile_app.state.recorder import Recorder


def build(shell: Any) -> ft.View:
    """The new-job form."""
    recorder = Recorder(shell.store)
    reference = ft.TextField(key="new-client-ref", label="Client reference", autofocus=True)
    site = ft.TextField(key="new-site", label="Site address")
    name = ft.TextField(key="new-recorder", label="Your name (kept with each change you save)",
                        value=recorder.name)

    def create(_e: Any) -> None:
        recorder.set(name.value or "")
        job_id = JobsList(shell.store).new_job(reference.value or "", site.value or "",
                                               by=recorder.person_id)
        shell.go(f"/job/{job_id}")

    body: list[ft.Control] = [
        ft.Text("Supply defaults (system, U0, Cmin) come from Settings; change them on the job.",
                size=14),
        reference,
        site,
        name,
        ft.FilledButton("Create job", icon=ft.Icons.CHECK, key="create-job", height=48,
                        on_click=create),
    ]
    return screen("/new", "New job", body, shell.go, back="/")
