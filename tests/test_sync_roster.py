"""The office's roster reaching a device through the office's WebDAV folder (a real wsgidav server on
loopback): the first sync that sends something pins the firm key from `roster/firm-key.json` and
enrols every supervisor the firm signed; a later sync writes nothing for entries already there; a
roster under another firm's key is refused; one bad entry is named and the others still taken; the
same over the browser build's fetch transport and from the settings screen's button."""

from __future__ import annotations

import asyncio
import shutil
from pathlib import Path

import pytest
from sync_server import DavServer, make_bundle
from test_sync_edges import T0, queue, target_for
from test_sync_fetch import ORIGIN, urllib_fetch

from mobile_app.office.folder import enrol, init_office
from mobile_app.signing.ed25519 import key_id
from mobile_app.state.settings import SettingsState
from mobile_app.store import Store
from mobile_app.sync import FetchTransport, save_target, sync_once, sync_once_async
from mobile_app.sync.outbox import Outbox
from mobile_app.sync.roster_pull import pull_roster

PASSPHRASE = "copper earth loop ninety"


@pytest.fixture
def dav(tmp_path):
    server = DavServer(tmp_path / "server", tmp_path / "requests.log", cors=ORIGIN)
    yield server
    server.stop()


def office_with(folder: Path, *names: str) -> bytes:
    """An office folder with `names` enrolled; returns the firm's public key."""
    firm_key = init_office(folder)
    for name in names:
        enrol(folder, name, PASSPHRASE)
    return firm_key


def publish(office: Path, dav: DavServer) -> Path:
    """Copy the office's roster/ into the office folder the devices sync to, as the README says."""
    published = dav.root / "office" / "roster"
    shutil.rmtree(published, ignore_errors=True)
    shutil.copytree(office / "roster", published)
    return published


def enrolled_entries(store: Store) -> int:
    return store.db.execute("SELECT count(*) FROM audit WHERE field = 'enrolled'").fetchone()[0]


def test_the_first_sync_pins_the_firm_key_and_enrols_the_office_supervisors(tmp_path, dav, store):
    firm_key = office_with(tmp_path / "office", "Ines Okafor", "Dana Reeve")
    dav.start()
    queue(store, tmp_path / "exports", count=1)
    publish(tmp_path / "office", dav)
    report = sync_once(store, target_for(dav), now=T0)
    assert report.error is None and len(report.sent) == 1
    assert report.roster is not None and report.roster.pinned
    assert sorted(report.roster.enrolled) == ["Dana Reeve", "Ines Okafor"]
    assert store.roster.firm_key() == firm_key
    assert report.roster.message.startswith("Firm key pinned from the office folder. Enrolled by the office:")
    audited = enrolled_entries(store)

    name = "job7-rev1-2026-12-02"
    Outbox(store.db).enqueue(make_bundle(tmp_path / "more", name, {f"{name}.json": b'{"job": 7}'}),
                             job_id=7, revision=1, now=T0)
    again = sync_once(store, target_for(dav), now=T0)
    assert again.roster is not None and again.roster.enrolled == [] and not again.roster.pinned
    assert again.roster.message == "The roster in the office folder is already on this device"
    assert enrolled_entries(store) == audited  # nothing written for entries already enrolled


def test_a_roster_under_another_firms_key_is_refused(tmp_path, dav, store):
    office_with(tmp_path / "ours", "Ines Okafor")
    office_with(tmp_path / "theirs", "Someone Else")
    dav.start()
    store.roster.load_folder(tmp_path / "ours" / "roster")
    publish(tmp_path / "theirs", dav)
    report = asyncio.run(pull_roster(store, FetchTransport(target_for(dav), urllib_fetch)))
    assert report.problem == "another firm key is already pinned on this device"
    assert report.message == "Roster not taken: another firm key is already pinned on this device"
    assert [p["name"] for p in store.people.all() if p.get("enrolled")] == ["Ines Okafor"]


def test_a_bad_entry_is_named_and_the_others_still_taken_over_fetch(tmp_path, dav, store):
    office_with(tmp_path / "office", "Ines Okafor")
    dav.start()
    published = publish(tmp_path / "office", dav)
    (published / "Broken-entry.json").write_text('{"schema": "not a roster entry"}', encoding="utf-8")
    (published / "notes.txt").write_text("not for devices", encoding="utf-8")
    report = asyncio.run(pull_roster(store, FetchTransport(target_for(dav), urllib_fetch)))
    assert report.pinned and report.enrolled == ["Ines Okafor"]
    assert list(report.refused) == ["Broken-entry.json"]
    methods = [line.split()[0] for line in dav.requests()]
    assert "PROPFIND" in methods and "PUT" not in methods  # read only


def test_an_office_folder_without_a_roster_says_so_and_pins_nothing(tmp_path, dav, store):
    dav.start()
    queue(store, tmp_path / "exports", count=1)
    report = asyncio.run(sync_once_async(store, FetchTransport(target_for(dav), urllib_fetch), now=T0))
    assert len(report.sent) == 1
    assert report.roster is not None
    assert report.roster.problem == "the office folder has no roster/firm-key.json"
    assert store.roster.firm_key() is None


def test_the_settings_button_fetches_the_roster_from_the_saved_office_folder(tmp_path, dav, store):
    firm_key = office_with(tmp_path / "office", "Ines Okafor")
    dav.start()
    publish(tmp_path / "office", dav)
    save_target(store, dav.url, dav.user, dav.password)
    message = asyncio.run(SettingsState(store).fetch_roster())
    assert message == "Firm key pinned from the office folder. Enrolled by the office: Ines Okafor"
    assert SettingsState(store).firm_key_text() == (
        f"Firm key pinned: {key_id(firm_key)}. A roster signed by another key is refused.")
