"""Our own web manifest and icons under assets/: name, theme colour, and icons that are real PNGs."""

from __future__ import annotations

import json
import struct
from pathlib import Path

ASSETS = Path(__file__).resolve().parents[1] / "assets"


def png_size(path: Path) -> tuple[int, int]:
    """Width and height from a PNG's IHDR chunk."""
    data = path.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n", path
    return struct.unpack(">II", data[16:24])


def test_manifest_is_ours() -> None:
    manifest = json.loads((ASSETS / "manifest.json").read_text(encoding="utf-8"))
    assert manifest["name"] == manifest["short_name"] == "Boardside"
    assert manifest["theme_color"] == "#0E5A6B"
    for icon in manifest["icons"]:
        width, height = png_size(ASSETS / icon["src"])
        assert f"{width}x{height}" == icon["sizes"]


def test_icons_match_their_generator() -> None:
    import importlib.util

    spec = importlib.util.spec_from_file_location("make_icons", Path(__file__).with_name("make_icons.py"))
    assert spec is not None and spec.loader is not None
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    assert (ASSETS / "favicon.png").read_bytes() == module.png_bytes(32)
    assert png_size(ASSETS / "icon.png") == (512, 512)


def test_index_html_is_flet_webs_own_with_our_names() -> None:
    # assets/index.html replaces flet-web's page (same patching by the server): after a flet-web
    # upgrade, run `python tests/make_index.py` again.
    from make_index import flet_web_index, patched_index

    ours = (ASSETS / "index.html").read_text(encoding="utf-8")
    assert ours == patched_index(flet_web_index())
    assert "<title>Boardside</title>" in ours
    assert '<meta name="apple-mobile-web-app-title" content="Boardside">' in ours


def test_index_html_keeps_the_client_on_its_own_host() -> None:
    # The client adds a script from a public CDN on every start (its animation runtime): guard.js, loaded
    # before anything else, points it at a local stand-in (checked in a browser by tests/test_e2e_web.py).
    ours = (ASSETS / "index.html").read_text(encoding="utf-8")
    assert ours.index("<base ") < ours.index("<script") == ours.index('<script src="guard.js"></script>')
    assert "rive-unavailable.js" in (ASSETS / "guard.js").read_text(encoding="utf-8")
    assert "window.RiveNative" in (ASSETS / "rive-unavailable.js").read_text(encoding="utf-8")
