"""New job: client reference and site; supply defaults come from the settings."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.screen import screen
from mobile_app.state.jobs import JobsList


def build(shell: Any) -> ft.View:
    """The new-job form."""
    reference = ft.TextField(key="new-client-ref", label="Client reference", autofocus=True)
    site = ft.TextField(key="new-site", label="Site address")

    def create(_e: Any) -> None:
        job_id = JobsList(shell.store).new_job(reference.value or "", site.value or "")
        shell.go(f"/job/{job_id}")

    body: list[ft.Control] = [
        ft.Text("Supply defaults (system, U0, Cmin) come from Settings; change them on the job.",
                size=14),
        reference,
        site,
        ft.FilledButton("Create job", icon=ft.Icons.CHECK, key="create-job", height=48,
                        on_click=create),
    ]
    return screen("/new", "New job", body, shell.go, back="/")
