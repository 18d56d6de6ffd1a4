"""Entry at the board in a real Chromium at 390×844: a typical final circuit counted in taps and
keystrokes, the trade's shorthand, the verdict so far kept in view above the keyboard (also at
390×508, the height left with the keyboard open), device kinds switched back and forth on a new and
an existing circuit with the screen held against the store after each tap and after a reload, and two
tabs saving the same reading.
"""

from __future__ import annotations

import re
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path

import pytest
from test_e2e_walk import (
    ARTIFACTS,
    CHROMIUM,
    CHROMIUM_ARGS,
    free_port,
    open_app,
    see,
    selected_chip,
    shot,
    start_server,
    stop_server,
    wait_http,
)

pytestmark = [
    pytest.mark.browser,
    pytest.mark.skipif(not CHROMIUM.exists(), reason="needs Debian chromium at /usr/bin/chromium"),
]

TARGET_TAPS, TARGET_KEYS = 6, 12


@dataclass
class Site:
    url: str
    data: Path
    job_id: int
    board_id: int
    demo_job: int
    demo_circuit: int


@pytest.fixture(scope="module")
def site(tmp_path_factory: pytest.TempPathFactory) -> Iterator[Site]:
    """A running app whose store holds the demo job and a job with a first B32 circuit on 2.5/1.5."""
    from mobile_app.state import JobScreen, JobsList, Walk
    from mobile_app.store import Store
    from mobile_app.store.demo import create_demo_job

    data = tmp_path_factory.mktemp("entry")
    with Store.open(data) as store:
        demo_job = create_demo_job(store)
        demo_board = store.boards.of_job(demo_job)[0]["id"]
        demo_circuit = store.circuits.of_board(demo_board)[0]["id"]
        job = JobScreen(store, JobsList(store).new_job("ENTRY-1 Quay Street"))
        board_id = job.boards()[0].id
        walk = Walk(store, job.add_circuit(board_id))
        for name, raw in (("device_curve", "B"), ("device_rating", "32"), ("line_csa", "2.5"),
                          ("cpc_csa", "1.5"), ("r1r2", "0.3"), ("zs", "0.6")):
            walk.set_field(name, raw)
    port = free_port()
    process = start_server(data, port)
    try:
        wait_http(f"http://127.0.0.1:{port}/")
        yield Site(f"http://127.0.0.1:{port}", data, job.job_id, board_id, demo_job, demo_circuit)
    finally:
        stop_server(process)
        log = (data / "server.log").read_text(errors="replace")
        assert "Error running app" not in log and not app_errors(log), log[-3000:]


DISCONNECTS = ("WebSocketDisconnect", "ClientDisconnected", "connection is closing", "connection is closed",
               "CancelledError")
"""What the web server logs when a tab closes while a message is on its way: not the app's error."""


def app_errors(log: str) -> list[str]:
    """The server log's tracebacks, each with the lines that follow it, except those of a tab that
    went away mid-message (a closed WebSocket, uvicorn's cancelled task at shutdown)."""
    parts = log.split("Traceback (most recent call last):")[1:]
    chains, current = [], ""
    for part in parts:  # chained exceptions ("During handling…") are one error
        current += part
        if "During handling of the above exception" not in part.rstrip().splitlines()[-1]:
            chains.append(current)
            current = ""
    return [chain for chain in chains if not any(word in chain for word in DISCONNECTS)]


@pytest.fixture(scope="module")
def browser() -> Iterator[object]:
    from playwright.sync_api import sync_playwright

    with sync_playwright() as pw:
        launched = pw.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
        yield launched
        launched.close()


def phone(browser, height: int = 844):
    return browser.new_context(viewport={"width": 390, "height": height}).new_page()


def stored(site: Site, circuit_id: int) -> dict[str, str]:
    from mobile_app.store import Store

    with Store.open(site.data) as store:
        return {k: v["raw"] for k, v in store.circuits.get(circuit_id)["fields"].items()}


def last_circuit(site: Site, board_id: int) -> int:
    from mobile_app.store import Store

    with Store.open(site.data) as store:
        return int(store.circuits.of_board(board_id)[-1]["id"])


class Hands:
    """Taps and keystrokes, counted as a person at the board would make them."""

    def __init__(self, page) -> None:
        self.page = page
        self.taps = 0
        self.keys = 0

    def tap(self, name: str) -> None:
        self.page.get_by_role("button", name=name, exact=True).first.click()
        self.taps += 1

    def type(self, text: str) -> None:
        self.page.keyboard.type(text, delay=40)
        self.keys += len(text)

    def enter(self) -> None:
        self.page.keyboard.press("Enter")
        self.keys += 1


def enter_typical_circuit(page, job_url: str, shots: bool = True) -> Hands:
    """From a job's screen, add a circuit after a B32 one and record it as at the board: rating 32 A,
    cable 2.5/1.5, R1+R2 0.31 Ω, Zs 0.62 Ω, on to the results; returns the hands that did it."""
    open_app(page, job_url)
    see(page, "Boards and circuits")
    hands = Hands(page)
    hands.tap("Add circuit")
    see(page, "Step 1 of 5")
    selected_chip(page, "B").wait_for(timeout=5000)  # the curve carried over from circuit 1
    hands.tap("32 A")
    see(page, "= 32.0 A")
    if shots:
        shot(page, "40-entry-rating-chip")
    hands.tap("Next")
    see(page, "Step 2 of 5")
    hands.tap("2.5/1.5")
    see(page, "= 1.50 mm²")
    if shots:
        shot(page, "41-entry-cable-pair")
    hands.tap("Next")
    see(page, "Step 3 of 5")
    page.wait_for_timeout(500)  # R1+R2 is focused when the step opens
    hands.type("0.31")
    see(page, "= 0.31 Ω")
    if shots:
        shot(page, "42-entry-r1r2")
    hands.enter()  # the keyboard's action key: on to the live tests
    see(page, "Step 4 of 5")
    page.wait_for_timeout(500)  # Zs is focused
    hands.type("0.62")
    see(page, "= 0.62 Ω")
    if shots:
        shot(page, "43-entry-zs")
    hands.enter()
    see(page, "Step 5 of 5")
    return hands


def test_a_typical_circuit_in_few_taps_and_keystrokes(site: Site, browser) -> None:
    page = phone(browser)
    hands = enter_typical_circuit(page, f"{site.url}/job/{site.job_id}")
    shot(page, "44-entry-results")
    circuit = stored(site, last_circuit(site, site.board_id))
    assert {k: circuit[k] for k in ("device_kind", "device_curve", "device_rating", "line_csa", "cpc_csa",
                                    "r1r2", "zs")} == {
        "device_kind": "mcb", "device_curve": "B", "device_rating": "32", "line_csa": "2.5",
        "cpc_csa": "1.5", "r1r2": "0.31", "zs": "0.62"}
    print(f"\ntypical final circuit (B32, 2.5/1.5, R1+R2, Zs): {hands.taps} taps, {hands.keys} keystrokes "
          f"(target ≤ {TARGET_TAPS} taps, ≤ {TARGET_KEYS} keystrokes)")
    assert hands.taps <= TARGET_TAPS and hands.keys <= TARGET_KEYS

    # the trade's shorthand where people type it
    page.get_by_role("button", name="Back", exact=True).click()
    see(page, "Step 4 of 5")
    open_app(page, page.url.rsplit("/", 1)[0] + "/device")
    see(page, "Step 1 of 5")
    rating = page.get_by_label("Rating In", exact=True)
    rating.click()
    page.keyboard.press("Control+A")
    page.keyboard.type("C20")
    see(page, "= circuit-breaker, curve C, 20 A")
    page.get_by_label("Description", exact=True).click()  # leaving the field saves it
    selected_chip(page, "C").wait_for(timeout=5000)
    shot(page, "45-entry-shorthand-c20")
    circuit = stored(site, last_circuit(site, site.board_id))
    assert (circuit["device_curve"], circuit["device_rating"]) == ("C", "20")


def test_the_verdict_so_far_stays_in_view_while_typing(site: Site, browser) -> None:
    from mobile_app.store import Store

    with Store.open(site.data) as store:
        circuit_id = store.circuits.of_board(site.board_id)[0]["id"]
    for height in (844, 508):
        page = phone(browser, height)
        open_app(page, f"{site.url}/job/{site.job_id}/circuit/{circuit_id}/readings")
        see(page, "Step 4 of 5")
        zs = page.get_by_label("Zs", exact=True)
        zs.click()
        page.keyboard.press("Control+A")
        page.keyboard.type("13")
        # IEC 60898-1: a B32 clears at once only from 5 In = 160 A; If = 230 × 0.95 / 13 ≈ 17 A
        see(page, "Disconnection: Zs 13 Ω is above")
        bar = page.get_by_text("Verdict so far").first.bounding_box()
        button = page.get_by_role("button", name="Next", exact=True).bounding_box()
        assert bar is not None and button is not None
        assert 0 <= bar["y"] and bar["y"] + bar["height"] <= button["y"] <= height, (bar, button)
        shot(page, f"46-entry-verdict-bar-390x{height}")
        page.keyboard.press("Control+A")
        page.keyboard.type("0.6")
        page.wait_for_timeout(1500)  # saved after the pause
        page.context.close()
    assert stored(site, circuit_id)["zs"] == "0.6"


def kind_shown(page) -> str:
    labels = {"Circuit-breaker": "mcb", "RCBO": "rcbo", "gG fuse": "fuse-gg", "From library": "curve"}
    shown = [kind for label, kind in labels.items() if selected_chip(page, label).count()]
    assert len(shown) == 1, shown
    return shown[0]


def switch_kinds(site: Site, page, circuit_id: int, name: str) -> None:
    sequence = ("Circuit-breaker", "RCBO", "gG fuse", "From library", "Circuit-breaker", "gG fuse", "RCBO",
                "From library", "gG fuse", "Circuit-breaker")
    for index, label in enumerate(sequence):
        page.get_by_role("button", name=label, exact=True).click()
        page.wait_for_timeout(350)
        selected_chip(page, label).wait_for(timeout=5000)
        assert kind_shown(page) == stored(site, circuit_id)["device_kind"], (index, label)
        curve_row = page.get_by_text("Curve", exact=True).count()
        assert bool(curve_row) == (label in ("Circuit-breaker", "RCBO")), label
        assert bool(page.get_by_text("Library device", exact=True).count()) == (label == "From library")
    shot(page, f"47-entry-kinds-{name}")
    page.reload()
    open_app(page, page.url)
    see(page, "Step 1 of 5")
    page.wait_for_timeout(500)
    assert kind_shown(page) == stored(site, circuit_id)["device_kind"] == "mcb"
    assert page.get_by_text("Error running app").count() == 0


def test_device_kinds_switched_back_and_forth_show_what_is_saved(site: Site, browser) -> None:
    page = phone(browser)
    open_app(page, f"{site.url}/job/{site.demo_job}/circuit/{site.demo_circuit}/device")
    see(page, "Step 1 of 5")
    switch_kinds(site, page, site.demo_circuit, "demo")
    open_app(page, f"{site.url}/job/{site.job_id}")
    see(page, "Boards and circuits")
    page.get_by_role("button", name="Add circuit", exact=True).click()
    see(page, "Step 1 of 5")
    switch_kinds(site, page, last_circuit(site, site.board_id), "new")


def test_two_tabs_saving_the_same_reading_are_asked_which_to_keep(site: Site, browser) -> None:
    from mobile_app.store import Store

    with Store.open(site.data) as store:
        circuit_id = store.circuits.of_board(site.board_id)[0]["id"]
    url = f"{site.url}/job/{site.job_id}/circuit/{circuit_id}/readings"
    first, second = phone(browser), phone(browser)
    for page in (first, second):
        open_app(page, url)
        see(page, "Step 4 of 5")
    for page, text in ((first, "0.71"), (second, "0.58")):
        field = page.get_by_label("Zs", exact=True)
        field.click()
        page.keyboard.press("Control+A")
        page.keyboard.type(text)
        page.wait_for_timeout(1600)  # saved after the pause: the first wins, the second is refused
    see(second, "Changed in another tab or device")
    shot(second, "48-entry-two-tabs-conflict")
    assert stored(site, circuit_id)["zs"] == "0.71"
    second.get_by_role("button", name=re.compile("^Keep mine: 0.58")).click()
    second.wait_for_timeout(800)
    assert stored(site, circuit_id)["zs"] == "0.58"
    assert second.get_by_text("Changed in another tab or device").count() == 0
    shot(second, "49-entry-two-tabs-kept")
    assert (ARTIFACTS / "49-entry-two-tabs-kept.png").exists()
