"""Benchmark of the static browser build in a real Chromium: prints figures, asserts nothing.

Both Boardside and a hello-world Flet app are built by the same `build_site` in this run and served the
same way (a plain static server on loopback), then measured the same way:

- first visit: an empty browser profile, online, from navigation to the app's first screen;
- offline cold start (target ≤ 10 s and ≤ 1.3× the hello-world): a new browser process on the profile
  of that first visit, offline with the server stopped, to the jobs list (Boardside's store holds a
  500-circuit job and a short one) or the hello text;
- open the 500-circuit job (target ≤ 2 s): from the tap on it to its screen (its boards folded), and
  from the tap on a board's "Show circuits" to its 50 circuits;
- last keystroke → verdict on screen (target ≤ 300 ms); baseline: the hello-world echoing a text field;
- site size (target ≤ 45 MB, ≤ 18 MB gzip-compressed) and what an update of Boardside's code downloads
  (target ≤ 5 MB): measured from the static server's log while the new service worker installs.

Medians of RUNS runs; where the start-up time goes comes from the worker's own milestones.
Run: `.venv/bin/python tests/bench_web.py`.
"""

from __future__ import annotations

import dataclasses
import re
import shutil
import statistics
import subprocess
import sys
import tempfile
import textwrap
import time
from pathlib import Path

sys.path[:0] = [str(Path(__file__).resolve().parent), str(Path(__file__).resolve().parent.parent)]

from bench_app import round_trip_ms  # noqa: E402
from bench_records import CIRCUITS_PER_BOARD, build_job  # noqa: E402
from test_e2e_walk import CHROMIUM, CHROMIUM_ARGS, ROOT, free_port, stop_server, wait_http  # noqa: E402
from web_site import Elsewhere, put_store  # noqa: E402

RUNS = 5
START_MS = 120000
HELLO_APP = textwrap.dedent(
    '''
    """A hello-world Flet app: the baseline of the browser-build benchmark."""

    def warm() -> None:
        """Import Flet's page and text controls (kept in the start-up snapshot)."""
        import flet as ft

        for name in ("Page", "Text", "TextField"):
            getattr(ft, name)


    async def prepare() -> None:
        """Import the connection's code, as Boardside does."""
        import flet.app  # noqa: F401
        import flet.messaging.pyodide_connection  # noqa: F401


    def run() -> None:
        import flet as ft

        def main(page: ft.Page) -> None:
            echo = ft.Text("ready")
            field = ft.TextField(label="Echo")

            def changed(_e) -> None:
                echo.value = "echo " + (field.value or "")
                echo.update()

            field.on_change = changed
            page.add(ft.Text("Hello"), field, echo)

        ft.run(main)
    '''
)
WAITING = "navigator.serviceWorker.getRegistration().then((r) => Boolean(r && r.waiting))"
"""Whether an update of the service worker has installed and waits for the old one's pages to close."""
MILESTONE = re.compile(r"boardside: ([\w-]+) at (\d+) ms")


def hello_spec(folder: Path):
    """The hello-world app's build description: its one module, flet and its requirements (no export
    archive)."""
    from mobile_app.webbuild import boardside_spec

    package = folder / "hello_app"
    package.mkdir(parents=True)
    (package / "__init__.py").write_text(HELLO_APP, encoding="utf-8")
    lists = boardside_spec()
    return dataclasses.replace(lists, name="Hello", description="Hello", source_root=folder,
                               packages=("hello_app",), module="hello_app",
                               libraries=("flet", "repath", "six"), leave_out=(),
                               export_libraries=(), export_data=())


def store_file(folder: Path) -> tuple[bytes, int, int, int]:
    """A store file holding the 500-circuit job and a short job with one circuit ready for readings:
    (file bytes, big job id, short job id, its circuit id)."""
    from mobile_app.state import JobScreen, JobsList, Walk
    from mobile_app.store import Store

    with Store.open(folder) as store:
        big = build_job(store)
        short = JobScreen(store, JobsList(store).new_job("Bench walk"))
        circuit = short.add_circuit(short.boards()[0].id)
        walk = Walk(store, circuit)
        for name, raw in (("device_curve", "B"), ("device_rating", "32"), ("line_csa", "2.5"),
                          ("cpc_csa", "1.5")):
            walk.set_field(name, raw)
        store.db.execute("PRAGMA journal_mode=DELETE")
        path = store.path
    return path.read_bytes(), big, short.job_id, circuit


class Server:
    """A plain static server on loopback with its request log, restartable on the same port."""

    def __init__(self, folder: Path, log: Path) -> None:
        self.folder, self.log, self.port = folder, log, free_port()
        self.url = f"http://127.0.0.1:{self.port}/"
        self.process: subprocess.Popen[bytes] | None = None

    def start(self) -> None:
        with self.log.open("ab") as log:
            self.process = subprocess.Popen(
                [sys.executable, "-m", "http.server", "--bind", "127.0.0.1", "--directory", str(self.folder),
                 str(self.port)], stdout=log, stderr=log, start_new_session=True)
        wait_http(self.url)

    def stop(self) -> None:
        if self.process is not None:
            stop_server(self.process)
            self.process = None

    def bytes_served_since(self, offset: int) -> tuple[int, list[str]]:
        """Bytes of the files answered with 200 since log position `offset`, and their paths."""
        text = self.log.read_bytes()[offset:].decode("utf-8", "replace")
        paths = re.findall(r'"GET (/[^ ?]*)[^"]*" 200', text)
        files = [p.lstrip("/") or "index.html" for p in paths]
        return sum((self.folder / f).stat().st_size for f in files if (self.folder / f).is_file()), files


def launch(pw, profile: Path):
    """A new browser process on the profile folder `profile`, phone-sized."""
    return pw.chromium.launch_persistent_context(str(profile), executable_path=str(CHROMIUM),
                                                 args=CHROMIUM_ARGS, viewport={"width": 390, "height": 844})


def timed_start(context, url: str, text: str, milestones: dict[str, int]) -> tuple[object, float]:
    """Open `url` in a new page and time it until `text` is on screen (seconds)."""
    page = context.new_page()

    def console(message) -> None:
        found = MILESTONE.search(message.text)
        if found:
            milestones[found.group(1)] = int(found.group(2))

    page.on("console", console)
    started = time.perf_counter()
    page.goto(url)
    page.wait_for_function("!document.getElementById('loading')", timeout=START_MS)
    page.locator("flt-semantics-placeholder").dispatch_event("click")
    shown(page, text).first.wait_for(timeout=START_MS)
    return page, time.perf_counter() - started


@dataclasses.dataclass
class App:
    """One app under measurement: its site, browser profile, server, first-screen text and figures."""

    site: Path
    profile: Path
    server: Server
    first_text: str
    store: tuple | None = None
    echo_field: str | None = None
    first_visit_s: float = 0.0
    cold_s: list[float] = dataclasses.field(default_factory=list)
    milestones: list[dict[str, int]] = dataclasses.field(default_factory=list)
    open_job_s: list[float] = dataclasses.field(default_factory=list)
    unfold_s: list[float] = dataclasses.field(default_factory=list)
    keystroke_ms: list[float] = dataclasses.field(default_factory=list)
    elsewhere: list[str] = dataclasses.field(default_factory=list)


def first_visit(pw, app: App) -> None:
    """Online, empty profile: load the app (its store put in first) and let the service worker install."""
    app.server.start()
    try:
        context = launch(pw, app.profile)
        guard = Elsewhere()
        guard.guard(context)
        if app.store is not None:
            put_store(context, app.server.url, app.store[0])
        page, app.first_visit_s = timed_start(context, app.server.url, app.first_text, {})
        page.evaluate("navigator.serviceWorker.ready.then(() => true)")
        page.wait_for_timeout(2000)
        context.close()
        app.elsewhere += guard.urls
    finally:
        app.server.stop()


def shown(page, text: str):
    """`text` on screen as text, or inside a button's name (a job's row is one button whose name holds
    its texts), not the row's delete button."""
    row = page.get_by_role("button", name=re.compile(r"^(?!Delete).*" + re.escape(text)))
    return page.get_by_text(text).or_(row)


def cold_start(pw, app: App) -> None:
    """A new browser process, offline: time to the first screen; then the big job and the keystrokes."""
    context = launch(pw, app.profile)
    guard = Elsewhere()
    guard.guard(context)
    context.set_offline(True)
    milestones: dict[str, int] = {}
    page, seconds = timed_start(context, app.server.url, app.first_text, milestones)
    app.cold_s.append(seconds)
    app.milestones.append(milestones)
    if app.store is not None:
        started = time.perf_counter()
        shown(page, "500 circuits").first.click()
        page.get_by_text("Status: Draft").first.wait_for(timeout=START_MS)
        app.open_job_s.append(time.perf_counter() - started)
        started = time.perf_counter()
        page.get_by_role("button", name="Show circuits").first.click()
        page.get_by_text(f"Circuit {CIRCUITS_PER_BOARD}").first.wait_for(timeout=START_MS)
        app.unfold_s.append(time.perf_counter() - started)
        if not app.keystroke_ms:
            page.goto(f"{app.server.url}#/job/{app.store[2]}/circuit/{app.store[3]}/readings")
            page.get_by_text("Verdict so far").first.wait_for(timeout=START_MS)
            for _ in range(RUNS + 2):
                app.keystroke_ms.append(round_trip_ms(page, "Zs", "13", "FAIL"))
                app.keystroke_ms.append(round_trip_ms(page, "Zs", "620mΩ", "NOT SHOWN"))
    elif app.echo_field and not app.keystroke_ms:
        for i in range(2 * RUNS + 4):
            app.keystroke_ms.append(round_trip_ms(page, app.echo_field, f"zz{i}q", f"echo zz{i}q"))
    context.close()
    app.elsewhere += guard.urls


def update_download(pw, work: Path) -> tuple[int, list[str]]:
    """Bytes the static server sends while a browser that has Boardside installs an update of its code."""
    from web_site import build

    live = work / "live"
    build(live)
    server = Server(live, work / "update.log")
    server.start()
    try:
        context = launch(pw, work / "update-profile")
        page = context.new_page()
        page.goto(server.url)
        page.wait_for_function("!document.getElementById('loading')", timeout=START_MS)
        page.evaluate("navigator.serviceWorker.ready.then(() => true)")
        page.wait_for_timeout(2000)
        context.close()
        source = work / "source"
        for package in ("calc", "mobile_app"):
            shutil.copytree(ROOT / package, source / package, ignore=shutil.ignore_patterns("__pycache__"))
        with (source / "calc" / "version.py").open("a", encoding="utf-8") as file:
            file.write("# an update\n")
        from mobile_app.webbuild import boardside_spec

        build(live, dataclasses.replace(boardside_spec(), source_root=source))
        offset = server.log.stat().st_size
        context = launch(pw, work / "update-profile")
        page = context.new_page()
        page.goto(server.url)
        deadline = time.monotonic() + START_MS / 1000
        while not page.evaluate(WAITING) and time.monotonic() < deadline:
            page.wait_for_timeout(500)
        context.close()
        return server.bytes_served_since(offset)
    finally:
        server.stop()


def median(values: list[float]) -> float:
    return statistics.median(values) if values else float("nan")


def where_time_goes(milestones: list[dict[str, int]]) -> str:
    names = ["pyodide-restored", "pyodide-loaded", "archives-unpacked", "storage-open", "prepared",
             "connect-asked", "connected", "session-started", "first-screen-sent"]
    parts = [f"{name} {median([m[name] for m in milestones if name in m]) / 1000:.1f}"
             for name in names if any(name in m for m in milestones)]
    return ", ".join(parts)


def report(site, hello, build_s: float, ours: App, base: App, update: tuple[int, list[str]]) -> None:
    """Print the figures (sizes are read from the built folders, which must still exist)."""
    mb = 1e6
    cold, base_cold = median(ours.cold_s), median(base.cold_s)
    verdict, echo = median(ours.keystroke_ms), median(base.keystroke_ms)
    print(f"static build benchmark (medians of {RUNS}; headless Chromium at 390×844; Boardside's store "
          f"holds a 500-circuit job)")
    print(f"build                  {build_s:6.1f} s")
    print(f"first visit (online)   {ours.first_visit_s:6.1f} s   (hello-world {base.first_visit_s:.1f} s)")
    print(f"offline cold start     {cold:6.1f} s   (target 10 s; hello-world {base_cold:.1f} s, "
          f"ratio {cold / base_cold:.2f}, target 1.3)")
    print(f"  where it goes (s from the worker's start): {where_time_goes(ours.milestones)}")
    print(f"  hello-world:                               {where_time_goes(base.milestones)}")
    print(f"open 500-circuit job   {median(ours.open_job_s):6.2f} s   (target 2 s; its boards folded)")
    print(f"  show one board's {CIRCUITS_PER_BOARD} circuits {median(ours.unfold_s):.2f} s")
    print(f"keystroke → verdict    {verdict:6.0f} ms  (target 300 ms; hello-world echo {echo:.0f} ms, "
          f"ratio {verdict / echo:.2f})")
    print(f"site size              {site.size_bytes() / mb:6.1f} MB  (target 45 MB; hello-world "
          f"{hello.size_bytes() / mb:.1f} MB)")
    print(f"  gzip-compressed      {site.compressed_bytes() / mb:6.1f} MB  (target 18 MB; hello-world "
          f"{hello.compressed_bytes() / mb:.1f} MB)")
    print("  cache groups         " + ", ".join(f"{g.name} {site.group_bytes(g.name) / mb:.1f} MB"
                                                 for g in site.groups))
    print(f"update of our code     {update[0] / mb:6.2f} MB downloaded (target 5 MB): "
          f"{', '.join(sorted(set(update[1])))}")
    print(f"requests to other hosts: {len(ours.elsewhere) + len(base.elsewhere)}")


def main() -> int:
    if not CHROMIUM.exists():
        print("bench_web: skipped, needs /usr/bin/chromium")
        return 0
    from playwright.sync_api import sync_playwright
    from web_site import build

    with tempfile.TemporaryDirectory(prefix="bench-web-") as tmp:
        work = Path(tmp)
        started = time.perf_counter()
        site = build(work / "boardside")
        build_s = time.perf_counter() - started
        hello = build(work / "hello", hello_spec(work / "hello-source"))
        store = store_file(work / "store")
        with sync_playwright() as pw:
            ours = App(site.out, work / "profile-boardside", Server(site.out, work / "boardside.log"),
                       "500 circuits", store)
            base = App(hello.out, work / "profile-hello", Server(hello.out, work / "hello.log"), "ready",
                       echo_field="Echo")
            for app in (ours, base):
                first_visit(pw, app)
            for _ in range(RUNS):
                for app in (ours, base):
                    cold_start(pw, app)
            update = update_download(pw, work / "update")
        report(site, hello, build_s, ours, base, update)
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
