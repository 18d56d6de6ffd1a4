"""Every character the app prints has a glyph: the web client draws with Roboto only, so the theme puts
DejaVu Sans (bundled, with its licence) behind every text style; this checks, with fontTools, that
the bundled font covers every string calc and the screens print (and the demo's working as
assessed), and the working's symbols by name. `tests/test_e2e_glyphs.py` draws them in Chromium.
"""

from __future__ import annotations

import ast
import json
import unicodedata
from pathlib import Path

import pytest
from fontTools.ttLib import TTFont

from mobile_app.components.palette import BASE_FONT, FALLBACK_FONT, FONTS, TEXT_STYLES, app_theme

ROOT = Path(__file__).resolve().parents[1]
ASSETS = ROOT / "assets"
WORKING_SYMBOLS = "→≤≥√²ΩΔθβ×"
"""The symbols of the working (issue 10): arrows, bounds, root, square, ohm, delta, theta, beta, times."""
PRINTED = ("calc", "mobile_app/state", "mobile_app/views", "mobile_app/components", "mobile_app/store",
           "mobile_app/export")
"""Where the strings a person reads on a screen (or in an export) are written."""


def covered() -> set[int]:
    font = TTFont(ASSETS / FONTS[FALLBACK_FONT])
    return set(font.getBestCmap())


def literals(path: Path) -> str:
    """Every string constant of a Python file (f-strings' fixed parts included)."""
    tree = ast.parse(path.read_text(encoding="utf-8"))
    return "".join(node.value for node in ast.walk(tree)
                   if isinstance(node, ast.Constant) and isinstance(node.value, str))


def printed_text() -> str:
    parts = [literals(path) for folder in PRINTED for path in sorted((ROOT / folder).rglob("*.py"))]
    parts += [path.read_text(encoding="utf-8") for path in sorted((ROOT / "calc" / "data").glob("*.toml"))]
    return "".join(parts)


def missing(text: str, cmap: set[int]) -> set[str]:
    return {ch for ch in text if ord(ch) not in cmap and unicodedata.category(ch)[0] not in "CZ"}


def test_the_working_symbols_have_glyphs() -> None:
    assert missing(WORKING_SYMBOLS, covered()) == set()


def test_every_string_calc_and_the_screens_print_has_a_glyph() -> None:
    text = printed_text()
    assert len(text) > 50_000  # the collection found the sources
    assert missing(text, covered()) == set()


def test_the_demo_working_as_assessed_has_glyphs(tmp_path: Path) -> None:
    from mobile_app.store import Store
    from mobile_app.store.demo import create_demo_job

    with Store.open(tmp_path) as store:
        job = create_demo_job(store)
        text = json.dumps(store.documents.export(job), ensure_ascii=False)
    assert "≤" in text and "×" in text
    assert missing(text, covered()) == set()


def test_the_fallback_sits_behind_roboto_in_every_text_style() -> None:
    theme = app_theme()
    for themes in (theme.text_theme, theme.primary_text_theme):
        for name in TEXT_STYLES:
            style = getattr(themes, name)
            assert (style.font_family, style.font_family_fallback) == (BASE_FONT, [FALLBACK_FONT]), name


@pytest.mark.parametrize("name", ["DejaVuSans.ttf", "LICENSE-DejaVu.txt"])
def test_the_served_font_is_the_bundled_one_with_its_licence(name: str) -> None:
    assert (ASSETS / "fonts" / name).read_bytes() == (ROOT / "mobile_app" / "fonts" / name).read_bytes()
