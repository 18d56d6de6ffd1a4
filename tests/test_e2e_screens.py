"""The other screens in a real Chromium at 390×844: the demo job, a failing circuit, the device
library (a curve whose times rise is refused, then accepted with a preview), outbox, settings and the
dark theme, and a reading refused (text kept) after another tab submits the job. Screenshots go to
test-artifacts/.
"""

from __future__ import annotations

import re
from collections.abc import Iterator
from pathlib import Path

import pytest
from test_e2e_walk import (
    CHROMIUM,
    free_port,
    open_app,
    page_fixture,  # noqa: F401 - the phone-sized page fixture
    scroll,
    see,
    shot,
    start_server,
    stop_server,
    tap,
    type_into,
    wait_http,
)

pytestmark = [
    pytest.mark.browser,
    pytest.mark.skipif(not CHROMIUM.exists(), reason="needs Debian chromium at /usr/bin/chromium"),
]


@pytest.fixture
def demo_server(tmp_path: Path) -> Iterator[str]:
    """A running app started with --demo on an empty store; yields its base URL."""
    port = free_port()
    process = start_server(tmp_path, port, "--demo")
    try:
        wait_http(f"http://127.0.0.1:{port}/")
        yield f"http://127.0.0.1:{port}"
    finally:
        stop_server(process)




def test_demo_library_outbox_settings(demo_server: str, page) -> None:
    open_app(page, demo_server + "/")
    see(page, "TY-2026-118")
    shot(page, "20-jobs-demo")
    type_into(page, "Search jobs", "nothing like this")
    see(page, "No jobs match.")
    type_into(page, "Search jobs", "TY-2026")
    tap(page, "Approved")
    see(page, "No jobs match.")
    tap(page, "All")
    page.get_by_role("button", name=re.compile("TY-2026-118")).first.click()
    see(page, "Boards and circuits")
    shot(page, "21-demo-job")
    failing = page.get_by_role("button", name=re.compile("FAIL")).first
    failing.wait_for(timeout=10000)
    failing.click()
    see(page, "Fails: ")  # a circuit with readings opens on its results
    url = page.url
    assert url.endswith("/results")
    open_app(page, url)
    see(page, "Fails: ")
    shot(page, "22-demo-failing-results")

    open_app(page, demo_server + "/library")
    see(page, "Saved curves")
    type_into(page, "Name (maker, type, rating)", "Test breaker 250 A")
    fields = page.get_by_label("Current", exact=True)
    times = page.get_by_label("Time", exact=True)
    for index, (current, time) in enumerate((("500", "20 s"), ("1 kA", "40 s"), ("3 kA", "20 ms"))):
        fields.nth(index).click()
        page.wait_for_timeout(150)
        page.keyboard.type(current)
        times.nth(index).click()
        page.wait_for_timeout(150)
        page.keyboard.type(time)
    see(page, "Times must fall as current rises")
    shot(page, "23-library-error")
    times.nth(1).click()
    page.wait_for_timeout(150)
    page.keyboard.press("Control+A")
    page.keyboard.type("2 s")
    see(page, "Curve accepted")
    scroll(page, 500)
    shot(page, "24-library-preview")
    tap(page, "Save curve")
    see(page, "Test breaker 250 A")

    open_app(page, demo_server + "/outbox")
    see(page, "waiting")
    shot(page, "25-outbox")

    open_app(page, demo_server + "/settings")
    see(page, "Defaults for new jobs")
    tap(page, "63 A")
    tap(page, "Dark")
    shot(page, "26-settings-dark")
    open_app(page, demo_server + "/settings")
    see(page, "Defaults for new jobs")
    open_app(page, url)
    see(page, "Fails: ")
    shot(page, "27-results-dark")

    page.set_viewport_size({"width": 1024, "height": 768})
    open_app(page, url)
    see(page, "Fails: ")
    shot(page, "28-results-tablet")
    open_app(page, demo_server + "/job/999")
    see(page, "no job with id 999")
    shot(page, "29-not-found")

    page.set_viewport_size({"width": 390, "height": 844})
    readings = url.rsplit("/", 1)[0] + "/readings"
    open_app(page, readings)
    see(page, "Step 4 of 5")
    other = page.context.new_page()
    open_app(other, url.split("/circuit/", 1)[0] + "/review")
    see(other, "Status: Draft")
    type_into(other, "Recorded by (your name)", "Rosa Quennell")
    tap(other, "Submit for review")
    see(other, "Status: In review")
    other.close()
    page.bring_to_front()
    type_into(page, "Zs", "0.5")
    see(page, "Not saved")
    shot(page, "30-save-refused-text-kept")
