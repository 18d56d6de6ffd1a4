"""The static browser build end to end in a real Chromium at 390×844, with no server-side Python.

Also: the server form (`python -m mobile_app`) asks no other host either.

Builds the site (`build_site`, as `python -m mobile_app build-web` does), serves it with a plain static
server on loopback, and with every request to another host aborted and counted: sees the first start
explained on the loading screen, creates a job, walks a
circuit to its verdict, reloads, stops the server, goes offline, reloads again and finds the job and the
reading (the store is on browser storage, the site in the service worker's cache); still offline, adds a
supervisor, submits the job and has it approved with the supervisor's PIN (PBKDF2 by the browser's
WebCrypto), exports it (the PDF's libraries from the export archive) and downloads its JSON, compared
with the bundle's manifest in browser storage; back online, the outbox syncs by itself (the browser's
`online` event) through fetch to a wsgidav server on loopback with the README's CORS setting, and the
bundle arrives verified. Then a second tab is refused the store until the first one closes.
Screenshots go to test-artifacts/web-*.png.
"""

from __future__ import annotations

import base64
import hashlib
import json
import re
import sqlite3
import time
from collections.abc import Iterator
from datetime import UTC, datetime, timedelta
from pathlib import Path

import pytest
from sync_server import DavServer
from test_e2e_walk import (
    CHROMIUM,
    CHROMIUM_ARGS,
    fill,
    free_port,
    give_reasons,
    new_job,
    open_job,
    see,
    shot,
    start_server,
    stop_server,
    tap,
    type_into,
    wait_http,
)
from web_site import Elsewhere, build, put_store, serve

from mobile_app.export import read_bundle

pytestmark = [
    pytest.mark.browser,
    pytest.mark.skipif(not CHROMIUM.exists(), reason="needs Debian chromium at /usr/bin/chromium"),
]
START_MS = 90000
"""Longest wait for the app to start (Python boots in the page; the first load also downloads it)."""


@pytest.fixture(scope="module")
def site(tmp_path_factory: pytest.TempPathFactory) -> Path:
    """Boardside's static site, built once for this module."""
    out = tmp_path_factory.mktemp("web") / "site"
    build(out)
    return out


def start(page, url: str) -> None:
    """Load `url`, wait until the app has painted and switch Flutter's accessibility tree on."""
    page.goto(url)
    started(page)


def started(page) -> None:
    """Wait for the first frame of a page just loaded and switch the accessibility tree on."""
    page.wait_for_function("!document.getElementById('loading')", timeout=START_MS)
    page.locator("flt-semantics-placeholder").dispatch_event("click")


STORED = """async (path) => {
    const db = await new Promise((resolve, reject) => {
        const request = indexedDB.open("/data");
        request.onsuccess = () => resolve(request.result);
        request.onerror = () => reject(request.error);
    });
    const read = (how) => new Promise((resolve, reject) => {
        const request = how(db.transaction("FILE_DATA").objectStore("FILE_DATA"));
        request.onsuccess = () => resolve(request.result);
        request.onerror = () => reject(request.error);
    });
    const key = (await read((files) => files.getAllKeys())).find((k) => String(k).endsWith(path));
    const entry = key && await read((files) => files.get(key));
    db.close();
    if (!entry) return null;
    let text = "";
    for (let i = 0; i < entry.contents.length; i += 8192) {
        text += String.fromCharCode(...entry.contents.subarray(i, i + 8192));
    }
    return [String(key), btoa(text)];
}"""
"""The file in browser storage (IndexedDB, as the worker's mount keeps it) whose path ends with `path`:
[its path, its bytes in base64], or null."""


def stored(page, path: str) -> tuple[str, bytes] | None:
    """The browser-storage copy of the file whose path ends with `path`: its path and bytes."""
    found = page.evaluate(STORED, path)
    return None if found is None else (found[0], base64.b64decode(found[1]))


STORE_FILE = "/data/boardside.sqlite"
"""The store's file as the browser build mounts it (the browser build keeps no -wal beside it)."""


def next_try_at(page, folder: Path) -> datetime:
    """When the outbox's SyncLoop will next try by its timer: the earliest `next_try_at` of a waiting
    export, read from the store's copy in browser storage with Python's sqlite3."""
    copy = folder / "store-copy.sqlite"
    found = stored(page, STORE_FILE)
    assert found is not None, "no store in browser storage"
    copy.write_bytes(found[1])
    with sqlite3.connect(copy) as db:
        (due,) = db.execute("select min(next_try_at) from outbox where status = 'waiting'").fetchone()
    return datetime.fromisoformat(due)


def copied_within(page, text: str, seconds: float) -> bool:
    """Whether the browser-storage copy of the store holds `text` within `seconds` of now."""
    deadline = time.monotonic() + seconds
    while time.monotonic() < deadline:
        found = stored(page, STORE_FILE)
        if found is not None and text.encode("utf-8") in found[1]:
            return True
        page.wait_for_timeout(50)
    return False


def walk_one_circuit(page) -> None:
    """A new job with one B32 circuit walked to its verdict (the same walk as the server-form test)."""
    new_job(page)
    type_into(page, "Client reference", "WEB-101 Quarry Road")
    type_into(page, "Site address", "9 Quarry Road")
    tap(page, "Create job")
    see(page, "Status: Draft")
    tap(page, "Add circuit")
    see(page, "Step 1 of 5")
    type_into(page, "Description", "Kitchen sockets")
    tap(page, "B")
    type_into(page, "Rating In", "32 A")
    see(page, "= 32.0 A")
    tap(page, "Next")
    see(page, "Step 2 of 5")
    type_into(page, "Line size", "2.5mm2")
    type_into(page, "CPC size", "1.5")
    see(page, "= 1.50 mm²")
    tap(page, "Next")
    see(page, "Step 3 of 5 · Supply-off tests")
    tap(page, "Next")
    see(page, "Step 4 of 5 · Live tests")
    type_into(page, "Zs", "620 mΩ")
    see(page, "= 0.62 Ω")
    # copied to browser storage right after the save commits, not on a later timer
    assert copied_within(page, "620 mΩ", 1.0)
    shot(page, "web-03-readings")
    tap(page, "Next")
    see(page, "Step 5 of 5")
    # IEC 60898-1 Table 7: a B32 breaker trips instantaneously above 5 × 32 = 160 A, so its maximum
    # Zs is 230 × 0.95 / 160 = 1.366 Ω, and 0.8 × that = 1.093 Ω measured cold (rule of thumb, common
    # practice); 0.62 Ω passes that check, while the checks that need more readings are not shown.
    see(page, "0.62 Ω against ≤ 1.093 Ω")
    see(page, "Not shown yet")
    shot(page, "web-04-verdict")


def find_job_and_reading(page) -> None:
    """The jobs list has the job, its circuit passes, and the readings step shows the Zs as typed."""
    see(page, "WEB-101 Quarry Road", timeout_ms=START_MS)
    open_job(page, "WEB-101 Quarry Road")
    see(page, "Status: Draft")
    page.get_by_role("button", name=re.compile("Kitchen sockets.*NOT SHOWN")).click(timeout=20000)
    see(page, "Step 5 of 5")  # a circuit with readings opens on its results, the walk a tap back
    tap(page, "Back")
    see(page, "Step 4 of 5")
    see(page, "= 0.62 Ω")
    zs = page.get_by_label("Zs", exact=True)
    zs.click()
    from playwright.sync_api import expect

    expect(zs).to_have_value("620", timeout=5000)  # its unit is the chip beside it
    see(page, "mΩ")


@pytest.fixture
def browser_context() -> Iterator[object]:
    """A fresh Chromium profile with a phone-sized viewport."""
    from playwright.sync_api import sync_playwright

    with sync_playwright() as pw:
        browser = pw.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
        yield browser.new_context(viewport={"width": 390, "height": 844})
        browser.close()


def tab_to(page, name: str) -> None:
    """Go up to the jobs list (one level at a time, each screen drawn before the next tap) and open
    one of its tabs."""
    tab = page.get_by_role("tab", name=re.compile(name))
    for _ in range(8):
        if tab.count():
            break
        # the back arrow's tooltip names the node around its button, not the button itself
        up = page.locator('[aria-label="Up one level"] [role="button"]')
        if up.count():
            up.first.click()
        page.wait_for_timeout(600)
    else:
        shot(page, "failed-tab-" + name)
    tab.click()


def approve_export_and_sync(page, context, url: str, dav: DavServer) -> None:
    """Offline: a supervisor added, the job submitted, approved with the PIN and exported, its JSON
    downloaded; online again: the outbox sent to the office folder by itself, verified."""
    tab_to(page, "Settings")
    fill(page, "Supervisor name", "Ines Okafor")
    fill(page, "Supervisor PIN", "2468")
    tap(page, "Add supervisor")
    see(page, "Supervisor Ines Okafor added", timeout_ms=20000)
    fill(page, "Office folder (WebDAV https:// address)", dav.url)
    fill(page, "User", dav.user)
    fill(page, "Password", dav.password)
    tap(page, "Save office folder")
    see(page, "Office folder saved")
    shot(page, "web-10-settings-offline")
    # the password is sealed in the store, its key kept in a database of its own (mobile_app/browser/keys.py)
    assert not copied_within(page, dav.password, 1.0)

    tab_to(page, "Jobs")
    open_job(page, "WEB-101 Quarry Road")
    tap(page, "Review")
    fill(page, "Recorded by (your name)", "Rosa Quennell")
    tap(page, "Submit for review")
    see(page, "Status: In review")
    assert give_reasons(page, "Zsc to be measured at the next visit") == 1  # its circuit is not shown
    fill(page, "Supervisor name", "Ines Okafor")
    fill(page, "PIN or passphrase", "1357")
    tap(page, "Approve")
    see(page, "PIN not accepted", timeout_ms=20000)
    fill(page, "PIN or passphrase", "2468")
    tap(page, "Approve")
    see(page, "Status: Approved", timeout_ms=20000)
    shot(page, "web-11-approved")
    tap(page, "Export to outbox")
    see(page, "to the outbox", timeout_ms=90000)

    tab_to(page, "Outbox")
    see(page, "1 waiting")
    shot(page, "web-12-outbox-offline")
    with page.expect_download(timeout=30000) as caught:
        page.get_by_role("button", name=re.compile("JSON")).first.click()
    download = caught.value
    data = Path(download.path()).read_bytes()
    document = json.loads(data)
    assert document["job"]["client_ref"] == "WEB-101 Quarry Road"
    assert "620 mΩ" in data.decode("utf-8")
    # the same bytes as the export the store keeps: its manifest's SHA-256 for the file
    kept = stored(page, "/manifest.json")
    assert kept is not None and "/exports/" in kept[0]
    manifest = json.loads(kept[1].decode("utf-8"))
    assert manifest["files"][download.suggested_filename]["sha256"] == hashlib.sha256(data).hexdigest()

    # the failed tries while offline set the export's next timed try; one due within 20 s is waited
    # out offline, so that an arrival before it can only come from the `online` event
    due = next_try_at(page, dav.root.parent)
    while due - datetime.now(UTC) < timedelta(seconds=20):
        page.wait_for_timeout(1000)
        due = next_try_at(page, dav.root.parent)
    dav.start()
    context.set_offline(False)  # the browser's `online` event wakes the outbox's sync
    deadline = time.monotonic() + 60
    office = dav.root / "office"
    while time.monotonic() < deadline and not (office.is_dir() and any(
            d.is_dir() and not d.name.startswith(".") for d in office.iterdir())):
        page.wait_for_timeout(250)
    assert datetime.now(UTC) < due, "sent only by the timed retry: the `online` event did not wake the sync"
    bundles = [d for d in office.iterdir() if d.is_dir() and not d.name.startswith(".")]
    assert len(bundles) == 1, dav.requests()
    arrived = read_bundle(bundles[0])  # re-checks every file against the manifest's SHA-256
    assert (bundles[0] / download.suggested_filename).read_bytes() == data
    assert all(arrived.sha256[name] == entry["sha256"] for name, entry in manifest["files"].items())
    see(page, "0 waiting", timeout_ms=20000)
    shot(page, "web-13-outbox-sent")
    context.set_offline(True)


def test_walk_reload_offline_and_second_tab(site: Path, browser_context, tmp_path: Path) -> None:
    elsewhere = Elsewhere()
    elsewhere.guard(browser_context)
    server, url = serve(site)
    try:
        page = browser_context.new_page()
        milestones: list[str] = []
        page.on("console", lambda message: milestones.append(message.text))
        page.goto(url)
        # the first start on a device says on the loading screen why it takes longer
        page.wait_for_function("(document.getElementById('loading-words')?.textContent ?? '')"
                               ".startsWith('First start on this device')", timeout=START_MS)
        started(page)
        see(page, "No jobs yet", timeout_ms=START_MS)
        shot(page, "web-01-jobs-empty")
        walk_one_circuit(page)
        assert page.evaluate("navigator.serviceWorker.ready.then((r) => Boolean(r.active))")

        assert any("boardside: snapshot-kept" in text for text in milestones)
        page.reload()
        started(page)
        see(page, "Step 5 of 5", timeout_ms=START_MS)
        see(page, "0.62 Ω against ≤ 1.093 Ω")
        shot(page, "web-05-after-reload")
        # the reload started Python from the snapshot kept at the first start
        assert any("boardside: pyodide-restored" in text for text in milestones)
    finally:
        stop_server(server)

    browser_context.set_offline(True)
    page.goto(url)
    started(page)
    see(page, "WEB-101 Quarry Road", timeout_ms=START_MS)
    shot(page, "web-06-offline-jobs")
    find_job_and_reading(page)
    shot(page, "web-07-offline-reading")

    dav = DavServer(tmp_path / "office", tmp_path / "office.log", cors=url.rstrip("/"))
    try:
        approve_export_and_sync(page, browser_context, url, dav)
    finally:
        dav.stop()

    second = browser_context.new_page()
    start(second, url)
    see(second, "Open in another tab", timeout_ms=START_MS)
    shot(second, "web-08-second-tab")
    page.close()
    tap(second, "Try again")
    see(second, "WEB-101 Quarry Road", timeout_ms=30000)
    shot(second, "web-09-second-tab-after-close")

    assert elsewhere.urls == []


def test_server_form_asks_no_other_host(tmp_path: Path, browser_context) -> None:
    # The web client asks a public CDN for its animation runtime on every start; assets/guard.js
    # points that script at the local stand-in, which the server serves from assets/.
    elsewhere = Elsewhere()
    elsewhere.guard(browser_context)
    port = free_port()
    server = start_server(tmp_path, port)
    try:
        wait_http(f"http://127.0.0.1:{port}/")
        page = browser_context.new_page()
        asked: list[str] = []
        page.on("request", lambda request: asked.append(request.url))
        start(page, f"http://127.0.0.1:{port}/")
        see(page, "No jobs yet", timeout_ms=30000)
        page.wait_for_timeout(1500)
    finally:
        stop_server(server)
    assert f"http://127.0.0.1:{port}/rive-unavailable.js" in asked
    assert elsewhere.urls == []


def altered_store(folder: Path) -> bytes:
    """A store file (rollback journal, as the browser keeps it) holding a job approved with the
    supervisor's PIN and then changed in the file, outside the app."""
    from mobile_app.store import Store

    with Store.open(folder, journal="DELETE") as store:
        supervisor = store.people.add("Dana Reeve", "supervisor", "482913")
        recorder = store.people.add("Sam Hale", "qualified")
        job = store.jobs.create({"client_ref": "WEB-300 Mill Lane"})
        store.review.submit(job, recorder)
        store.review.approve(job, supervisor, "482913")
        path = store.path
    with sqlite3.connect(path) as db:
        db.execute("UPDATE jobs SET site_address_raw = 'changed in the file' WHERE id = ?", (job,))
    return path.read_bytes()


def test_altered_store_noticed_after_the_first_screen(site: Path, browser_context, tmp_path: Path) -> None:
    """The browser build sends its first jobs list before the store's integrity check (it takes a
    noticeable part of start-up there) and shows the notice as soon as the check has run."""
    server, url = serve(site)
    try:
        put_store(browser_context, url, altered_store(tmp_path / "store"))
        page = browser_context.new_page()
        start(page, url)
        see(page, "This store was altered", timeout_ms=START_MS)
        see(page, "altered: ")
        shot(page, "web-10-altered-store")
    finally:
        stop_server(server)
