"""Settings: supply defaults, final-circuit scope, theme, the office folder, the office's roster
(the firm key pinned at set-up, enrolled supervisors, their key files) and supervisors."""

from __future__ import annotations

from typing import Any

import flet as ft

from mobile_app.components.choice_row import choice_row
from mobile_app.components.screen import screen
from mobile_app.components.text_input import text_input
from mobile_app.state.fields import SYSTEMS, Choice
from mobile_app.state.review import ReviewState
from mobile_app.state.settings import SettingsState


def build(shell: Any) -> ft.View:
    """The settings screen."""
    settings = SettingsState(shell.store)

    def saver(key: str) -> Any:
        def changed(text: str) -> tuple[str, str | None]:
            view = settings.set(key, text)
            return "", view.message

        return changed

    def theme_picked(value: str) -> None:
        settings.set("theme", value)
        shell.apply_theme()
        shell.page.update()

    office_message = ft.Text("", size=14, key="office-message")
    url = ft.TextField(key="sync-url", label="Office folder (WebDAV https:// address)",
                       value=settings.get("sync_url"))
    user = ft.TextField(key="sync-user", label="User", value=settings.get("sync_user"))
    password = ft.TextField(key="sync-password", label="Password", password=True,
                            can_reveal_password=True)

    def save_office(_e: Any) -> None:
        office_message.value = settings.save_office(url.value or "", user.value or "",
                                                    password.value or "")
        office_message.update()

    roster_place = ft.TextField(key="roster-place", label="Roster folder or file on this device")
    key_place = ft.TextField(key="key-place", label="Supervisor's key file on this device")
    roster_message = ft.Text("", size=14, key="roster-message")
    firm = ft.Text(settings.firm_key_text(), size=14, key="firm-key")

    def said(text: str) -> None:
        roster_message.value = text
        roster_message.color = ft.Colors.ERROR if text.startswith(("Not ", "Roster not")) else None
        firm.value = settings.firm_key_text()
        supervisors.value = settings.supervisors_text()
        for control in (roster_message, firm, supervisors):
            control.update()

    async def fetch_roster(_e: Any) -> None:
        roster_message.value = "Reading the roster in the office folder…"
        roster_message.color = None
        roster_message.update()
        said(await settings.fetch_roster())

    supervisors = ft.Text(settings.supervisors_text(), size=14, key="supervisor-list")
    sup_name = ft.TextField(key="new-supervisor-name", label="Supervisor name")
    sup_pin = ft.TextField(key="new-supervisor-pin", label="Supervisor PIN", password=True,
                           keyboard_type=ft.KeyboardType.NUMBER)
    sup_message = ft.Text("", size=14, key="supervisor-message")

    async def add_supervisor(_e: Any) -> None:
        outcome = await ReviewState(shell.store, 0).add_supervisor_async(sup_name.value or "",
                                                                         sup_pin.value or "")
        sup_message.value = outcome.message
        sup_message.color = None if outcome.ok else ft.Colors.ERROR
        supervisors.value = settings.supervisors_text()
        sup_message.update()
        supervisors.update()

    body: list[ft.Control] = [
        ft.Text("Defaults for new jobs", size=20, weight=ft.FontWeight.BOLD),
        choice_row("set-default_system", "Earthing system", SYSTEMS, settings.get("default_system"),
                   lambda v: settings.set("default_system", v)),
        text_input("set-default_u0", "U0 (V)", settings.get("default_u0"), saver("default_u0"),
                   numeric=True),
        text_input("set-default_cmin", "Cmin", settings.get("default_cmin"), saver("default_cmin"),
                   numeric=True),
        choice_row("set-final_circuit_max_a", "Final circuits: table times apply up to",
                   (Choice("32", "32 A"), Choice("63", "63 A")),
                   settings.get("final_circuit_max_a"),
                   lambda v: settings.set("final_circuit_max_a", v)),
        ft.Text("Screen", size=20, weight=ft.FontWeight.BOLD),
        choice_row("set-theme", "Theme",
                   (Choice("system", "As device"), Choice("light", "Light"), Choice("dark", "Dark")),
                   settings.get("theme"), theme_picked),
        ft.Text("Office folder", size=20, weight=ft.FontWeight.BOLD),
        url,
        user,
        password,
        ft.FilledButton("Save office folder", icon=ft.Icons.SAVE, height=48, key="save-office",
                        on_click=save_office),
        office_message,
        text_input("set-sync_run_limit_s", "Longest sync run (s)", settings.get("sync_run_limit_s"),
                   saver("sync_run_limit_s"), numeric=True),
        text_input("set-sync_bundle_limit_s", "Longest upload of one export (s)",
                   settings.get("sync_bundle_limit_s"), saver("sync_bundle_limit_s"), numeric=True),
        ft.Text("Office roster", size=20, weight=ft.FontWeight.BOLD),
        firm,
        ft.Text("Supervisors the office enrolled sign their approvals; the office verifies them. Get "
                "the roster from the office folder (it is read again after each sync that sends), or "
                "load the one the office gave you (its roster folder, or one file of it).", size=14),
        ft.OutlinedButton("Get roster from the office folder", icon=ft.Icons.CLOUD_DOWNLOAD, height=48,
                          key="fetch-roster", on_click=fetch_roster),
        roster_place,
        ft.OutlinedButton("Load roster", icon=ft.Icons.FOLDER_OPEN, height=48, key="load-roster",
                          on_click=lambda _e: said(settings.load_roster(roster_place.value or ""))),
        key_place,
        ft.OutlinedButton("Install supervisor's key", icon=ft.Icons.KEY, height=48, key="install-key",
                          on_click=lambda _e: said(settings.install_key(key_place.value or ""))),
        roster_message,
        ft.Text("Supervisors", size=20, weight=ft.FontWeight.BOLD),
        supervisors,
        sup_name,
        sup_pin,
        ft.OutlinedButton("Add supervisor", icon=ft.Icons.PERSON_ADD, height=48,
                          key="add-supervisor", on_click=add_supervisor),
        sup_message,
    ]
    return screen("/settings", "Settings", body, shell.go, tab=3)
