"""Benchmark of the field app in a real Chromium: prints figures, asserts nothing.

- first frame: from starting `python -m mobile_app --demo` to the first painted frame (target 5 s);
  baseline: the same for a bare Flet page served the same way.
- verdict: from typing the last character of Zs to the new verdict on screen (target 200 ms);
  baseline: from typing into the jobs search to the list's answer.
- memory: the server's RSS (its whole process group) with the demo job open (target 250 MB);
  baseline: the same server before any browser connects.
- entry: taps and keystrokes to record a typical final circuit after a B32 one (rating, cable pair,
  R1+R2, Zs; target 6 taps and 12 keystrokes), counted as `tests/test_e2e_entry.py` counts them.
Medians of several runs. Run: `.venv/bin/python tests/bench_app.py`.
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import tempfile
import textwrap
import time
from pathlib import Path

sys.path[:0] = [str(Path(__file__).resolve().parent), str(Path(__file__).resolve().parent.parent)]

from test_e2e_entry import TARGET_KEYS, TARGET_TAPS, enter_typical_circuit  # noqa: E402
from test_e2e_walk import (  # noqa: E402
    CHROMIUM,
    CHROMIUM_ARGS,
    ROOT,
    free_port,
    open_app,
    start_server,
    stop_server,
    wait_http,
)

RUNS = 3
BARE_APP = textwrap.dedent(
    """
    import sys
    import flet as ft
    ft.run(lambda page: page.add(ft.Text("ready")), view=ft.AppView.WEB_BROWSER,
           host="127.0.0.1", port=int(sys.argv[1]), no_cdn=True)
    """
)


def group_rss_mb(pid: int) -> float:
    """Resident memory of every process in the group led by `pid`, in MB."""
    out = subprocess.run(["ps", "-o", "rss=", "-g", str(pid)], capture_output=True, text=True)
    return sum(int(v) for v in out.stdout.split()) / 1024


def first_frame_s(browser, command: list[str], port: int) -> float:
    """Seconds from starting a server to its first painted frame."""
    started = time.perf_counter()
    process = subprocess.Popen(command, cwd=ROOT, start_new_session=True, stdout=subprocess.DEVNULL,
                               stderr=subprocess.STDOUT)
    try:
        wait_http(f"http://127.0.0.1:{port}/")
        page = browser.new_context(viewport={"width": 390, "height": 844}).new_page()
        page.goto(f"http://127.0.0.1:{port}/")
        page.wait_for_function("!document.getElementById('loading')", timeout=60000)
        elapsed = time.perf_counter() - started
        page.context.close()
        return elapsed
    finally:
        stop_server(process)


def store_first_circuit(data_dir: Path, job_id: int) -> int:
    """The id of the first circuit of a job's first board."""
    from mobile_app.store import Store

    with Store.open(data_dir) as store:
        board = store.boards.of_job(job_id)[0]["id"]
        return int(store.circuits.of_board(board)[0]["id"])


def round_trip_ms(page, field_label: str, text: str, expect: str) -> float:
    """Milliseconds from typing the last character of `text` to `expect` showing."""
    field = page.get_by_label(field_label, exact=True)
    field.click()
    page.keyboard.press("Control+A")
    page.keyboard.type(text[:-1])
    page.wait_for_timeout(300)
    started = time.perf_counter()
    page.keyboard.type(text[-1])
    page.get_by_text(expect, exact=True).first.wait_for(timeout=10000)
    return (time.perf_counter() - started) * 1000


def main() -> int:
    if not CHROMIUM.exists():
        print("bench_app: skipped, needs /usr/bin/chromium")
        return 0
    from playwright.sync_api import sync_playwright

    from mobile_app.state import JobScreen, JobsList, Walk
    from mobile_app.store import Store

    with tempfile.TemporaryDirectory() as tmp, sync_playwright() as pw:
        browser = pw.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
        bare = Path(tmp) / "bare.py"
        bare.write_text(BARE_APP)
        app_frames, bare_frames = [], []
        for run in range(RUNS):
            port = free_port()
            data = Path(tmp) / f"data{run}"
            data.mkdir()
            app_frames.append(first_frame_s(browser, [sys.executable, "-m", "mobile_app", "--demo",
                                                      "--port", str(port), "--data", str(data)], port))
            port = free_port()
            bare_frames.append(first_frame_s(browser, [sys.executable, str(bare), str(port)], port))

        data = Path(tmp) / "verdict"
        data.mkdir()
        port = free_port()
        process = start_server(data, port, "--demo")
        try:
            wait_http(f"http://127.0.0.1:{port}/")
            time.sleep(1.0)
            idle_mb = group_rss_mb(process.pid)
            with Store.open(data) as store:
                job = store.jobs.all()[0]["id"]
                walk_job = JobScreen(store, JobsList(store).new_job("Bench walk"))
                circuit = walk_job.add_circuit(walk_job.boards()[0].id)
                walk = Walk(store, circuit)
                for name, raw in (("device_curve", "B"), ("device_rating", "32"),
                                  ("line_csa", "2.5"), ("cpc_csa", "1.5")):
                    walk.set_field(name, raw)
                entry_job = JobScreen(store, JobsList(store).new_job("Bench entry"))
                first = Walk(store, entry_job.add_circuit(entry_job.boards()[0].id))
                for name, raw in (("device_curve", "B"), ("device_rating", "32"),
                                  ("line_csa", "2.5"), ("cpc_csa", "1.5")):
                    first.set_field(name, raw)
            page = browser.new_context(viewport={"width": 390, "height": 844}).new_page()
            open_app(page, f"http://127.0.0.1:{port}/job/{job}")
            page.get_by_text("Boards and circuits").first.wait_for(timeout=30000)
            open_app(page, f"http://127.0.0.1:{port}/job/{walk_job.job_id}/circuit/{circuit}/readings")
            page.get_by_text("Verdict so far").first.wait_for(timeout=30000)
            verdicts, echoes = [], []
            for _ in range(RUNS + 2):
                verdicts.append(round_trip_ms(page, "Zs", "13", "FAIL"))
                verdicts.append(round_trip_ms(page, "Zs", "0.62", "NOT SHOWN"))  # other tests not recorded
            demo_circuit = store_first_circuit(data, job)
            open_app(page, f"http://127.0.0.1:{port}/job/{job}/circuit/{demo_circuit}/results")
            page.get_by_text("Working, step by step").first.wait_for(timeout=30000)
            open_app(page, f"http://127.0.0.1:{port}/job/{job}")
            page.get_by_text("Boards and circuits").first.wait_for(timeout=30000)
            open_mb = group_rss_mb(process.pid)
            open_app(page, f"http://127.0.0.1:{port}/")
            for i in range(RUNS + 2):
                echoes.append(round_trip_ms(page, "Search jobs", f"zz{i}q", "No jobs match."))
            hands = enter_typical_circuit(page, f"http://127.0.0.1:{port}/job/{entry_job.job_id}",
                                          shots=False)
        finally:
            stop_server(process)
        browser.close()

    frame, bare_frame = statistics.median(app_frames), statistics.median(bare_frames)
    verdict, echo = statistics.median(verdicts), statistics.median(echoes)
    print(f"first frame      {frame:6.2f} s   (target 5 s; bare Flet page {bare_frame:.2f} s, "
          f"ratio {frame / bare_frame:.2f})")
    print(f"reading→verdict  {verdict:6.0f} ms  (target 200 ms; search echo {echo:.0f} ms, "
          f"ratio {verdict / echo:.2f})")
    print(f"server RSS       {open_mb:6.0f} MB  (target 250 MB; idle before a browser {idle_mb:.0f} MB)")
    print(f"typical circuit  {hands.taps:6d} taps, {hands.keys} keystrokes  (target {TARGET_TAPS} taps, "
          f"{TARGET_KEYS} keystrokes; B32, 2.5/1.5, R1+R2 and Zs after a B32 circuit)")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
