"""The results screen at 390×844 for the cases where the judgement above the arithmetic matters: a
parallel earth path, a fuse circuit failing at the earth fault current, a circuit near the board with no
let-through figure, and a D16 whose disconnection fails. Screenshots go to test-artifacts/.

The circuits are invented; the figures each screen must show come from the calculation core and its
sources (see tests/test_calc_verdicts.py for the clauses).
"""

from __future__ import annotations

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
    wait_http,
)

pytestmark = [
    pytest.mark.browser,
    pytest.mark.skipif(not CHROMIUM.exists(), reason="needs Debian chromium at /usr/bin/chromium"),
]

CASES: dict[str, tuple[dict[str, str], dict[str, str]]] = {
    # job supply fields, circuit fields
    "parallel-path": (
        {"pfc": "800 A"},
        {"device_kind": "mcb", "device_curve": "B", "device_rating": "32", "line_csa": "2.5",
         "cpc_csa": "1.5", "zs": "0.4", "ze": "0.35", "r1r2": "1.2"},
    ),
    "fuse-at-if": (
        {"pfc": "2 kA"},
        {"device_kind": "fuse-gg", "device_rating": "50", "line_csa": "2.5", "cpc_csa": "2.5",
         "zs": "0.7", "zsc": "0.42"},
    ),
    "near-board": (
        {"pfc": "1.1 kA"},
        {"device_kind": "mcb", "device_curve": "B", "device_rating": "32", "line_csa": "2.5",
         "cpc_csa": "1.5", "zs": "0.3"},
    ),
    "d16": (
        {"pfc": "1.2 kA"},
        {"device_kind": "mcb", "device_curve": "D", "device_rating": "16", "line_csa": "2.5",
         "cpc_csa": "1.5", "zs": "0.93"},
    ),
}


@pytest.fixture
def cases(tmp_path: Path) -> Iterator[tuple[str, dict[str, str]]]:
    """A running app whose store holds one job per case; yields the base URL and each case's route."""
    from mobile_app.store import Store

    routes: dict[str, str] = {}
    with Store.open(tmp_path) as store:
        for name, (supply, fields) in CASES.items():
            job = store.jobs.create({"client_ref": f"Verdict {name}", "system": "TN-C-S", **supply})
            board = store.boards.add(job, "DB1")
            circuit = store.circuits.add(board, "1", name)
            for field, raw in fields.items():
                store.circuits.set_field(circuit, field, raw)
            routes[name] = f"/job/{job}/circuit/{circuit}/results"
    port = free_port()
    process = start_server(tmp_path, port)
    try:
        wait_http(f"http://127.0.0.1:{port}/")
        yield f"http://127.0.0.1:{port}", routes
    finally:
        stop_server(process)


def test_results_show_the_deciding_check(cases, page) -> None:
    server, routes = cases

    open_app(page, server + routes["parallel-path"])
    see(page, "Circuit's own earth path")
    see(page, "resolve the difference between Zs 0.4 Ω and Ze + (R1+R2) 1.55 Ω")
    page.wait_for_timeout(1500)  # the first page of a fresh server paints a frame later than it reads
    shot(page, "40-verdict-parallel-path")

    open_app(page, server + routes["fuse-at-if"])
    see(page, "FAIL")
    see(page, "Line conductor at the smallest fault current")
    see(page, "earth fault at the circuit's end, 312.1 A")
    shot(page, "41-verdict-fuse-at-if")

    open_app(page, server + routes["near-board"])
    see(page, "NOT SHOWN")
    see(page, "enter the maker's let-through I²t at 1100 A or above")
    shot(page, "42-verdict-near-board")

    open_app(page, server + routes["d16"])
    see(page, "Fails: Disconnection: Zs 0.93 Ω is above the 0.6828 Ω allowed")
    see(page, "add an RCD for fault protection")
    shot(page, "43-verdict-d16")
    scroll(page, 600)
    see(page, "follows from the disconnection failure")
    shot(page, "44-verdict-d16-follows")
