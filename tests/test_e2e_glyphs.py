"""The working's symbols drawn in a real Chromium with the app's theme and fonts (served from assets/
as the app serves them): each must differ from the empty box the client draws for a character no
font has (U+E000, private use, in neither Roboto nor DejaVu Sans), and the picture is kept in
test-artifacts/ to be looked at."""

from __future__ import annotations

import io
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest
from test_e2e_walk import ARTIFACTS, CHROMIUM, CHROMIUM_ARGS, ROOT, free_port, stop_server, wait_http
from test_state_glyphs import WORKING_SYMBOLS

pytestmark = [
    pytest.mark.browser,
    pytest.mark.skipif(not CHROMIUM.exists(), reason="needs Debian chromium at /usr/bin/chromium"),
]

CELL = 64
NO_GLYPH = "\ue000"
APP = textwrap.dedent(
    """
    import sys
    import flet as ft
    from mobile_app.components.palette import FONTS, app_theme
    from mobile_app.main import ASSETS_DIR

    def main(page: ft.Page) -> None:
        page.fonts = FONTS
        page.theme = app_theme()
        page.theme_mode = ft.ThemeMode.LIGHT
        page.padding = 0
        page.spacing = 0
        cells = [ft.Container(ft.Text(ch, size=40), width={cell}, height={cell},
                              alignment=ft.Alignment.CENTER) for ch in sys.argv[2]]
        page.add(ft.Row(cells, spacing=0, wrap=True, run_spacing=0),
                 ft.Text("Zs 0.62 Ω ≤ 0.8 × 1.37 Ω → PASS; S = √(I²t)/k, ΔR at θ, β", size=18))

    ft.run(main, view=ft.AppView.WEB_BROWSER, host="127.0.0.1", port=int(sys.argv[1]), no_cdn=True,
           assets_dir=str(ASSETS_DIR))
    """
).format(cell=CELL)


def test_the_working_symbols_are_drawn_not_boxes(tmp_path: Path) -> None:
    from PIL import Image
    from playwright.sync_api import sync_playwright

    script = tmp_path / "glyphs.py"
    script.write_text(APP)
    port = free_port()
    shown = WORKING_SYMBOLS + NO_GLYPH
    process = subprocess.Popen([sys.executable, str(script), str(port), shown], cwd=ROOT,
                               start_new_session=True, stdout=subprocess.DEVNULL, stderr=subprocess.STDOUT)
    try:
        wait_http(f"http://127.0.0.1:{port}/")
        with sync_playwright() as pw:
            browser = pw.chromium.launch(executable_path=str(CHROMIUM), args=CHROMIUM_ARGS)
            page = browser.new_context(viewport={"width": CELL * 6, "height": CELL * 3 + 60}).new_page()
            page.goto(f"http://127.0.0.1:{port}/")
            page.wait_for_function("!document.getElementById('loading')", timeout=30000)
            page.wait_for_timeout(2500)  # the fallback font arrives after the first frame
            ARTIFACTS.mkdir(exist_ok=True)
            png = page.screenshot(path=str(ARTIFACTS / "50-glyphs-working-symbols.png"))
            browser.close()
    finally:
        stop_server(process)
    picture = Image.open(io.BytesIO(png)).convert("L")
    per_row = CELL * 6 // CELL

    def cell(index: int) -> bytes:
        x, y = (index % per_row) * CELL, (index // per_row) * CELL
        return picture.crop((x, y, x + CELL, y + CELL)).tobytes()

    box = cell(len(shown) - 1)
    assert len(set(box)) > 1  # the empty box is drawn: something to tell glyphs from
    for index, symbol in enumerate(WORKING_SYMBOLS):
        drawn = cell(index)
        assert len(set(drawn)) > 1, f"{symbol!r} drew nothing"
        assert drawn != box, f"{symbol!r} is drawn as an empty box"
