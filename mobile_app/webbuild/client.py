"""The Flet web client and the Python runtime of the static build, taken from the installed flet-web.

flet-web ships 75 MB of client; a page needs about half, and one browser only one of the engine's two
builds. Only the files below are copied: the engine's JavaScript build with the full CanvasKit renderer,
which every browser runs (forced in site/flutter-start.js; the WebAssembly build with its skwasm
renderer, which only Chromium browsers pick, would add 12 MB to every phone's download), the fonts
Boardside draws with, and the Pyodide runtime without its package installer.
"""

from __future__ import annotations

import json
import shutil
from dataclasses import dataclass
from pathlib import Path

from mobile_app.webbuild.errors import ClientError

CLIENT_FILES: tuple[str, ...] = (
    # the engine (dart2js) and its renderer, the full CanvasKit
    "main.dart.js",
    "canvaskit/canvaskit.js",
    "canvaskit/canvaskit.wasm",
    # assets the engine reads at start, and the fonts Boardside uses
    "assets/AssetManifest.bin",
    "assets/AssetManifest.bin.json",
    "assets/fonts/MaterialIcons-Regular.otf",
    "assets/fonts/roboto.woff2",
    "assets/shaders/ink_sparkle.frag",
    "assets/shaders/stretch_effect.frag",
    "assets/NOTICES",
    # Python in the browser
    "pyodide/pyodide.mjs",
    "pyodide/pyodide.asm.mjs",
    "pyodide/pyodide.asm.wasm",
    "pyodide/python_stdlib.zip",
    "pyodide/pyodide-lock.json",
)
"""Files of flet-web's `web` folder the static build serves as they are."""

FONT_FAMILIES = ("MaterialIcons",)
"""Font families kept from the client's font manifest (the engine loads every listed family at start;
Boardside draws no KaTeX formula and no Cupertino icon)."""
ROBOTO = {"family": "Roboto", "fonts": [{"asset": "fonts/roboto.woff2"}]}
"""The text font, added the way flet-web adds it when it serves with no CDN."""

PYODIDE_MODULE = "pyodide/pyodide.asm.mjs"
SNAPSHOT_RESTORE = "return Module.HEAP8.set(t),l}"
SNAPSHOT_RESTORE_GROWING = (
    "return t.length>Module.HEAP8.length&&(wasmMemory.grow(Math.ceil((t.length-Module.HEAP8.length)/65536)),"
    "updateMemoryViews()),Module.HEAP8.set(t),l}"
)
"""Pyodide restores a memory snapshot into the memory it starts with and fails ("offset is out of
bounds") when the snapshot's memory had grown: the build makes the restore grow the memory first."""
BOOTSTRAP = "flutter_bootstrap.js"
BUILD_CONFIG = "_flutter.buildConfig = "


@dataclass(frozen=True)
class Runtime:
    """What the build needs to know about the installed Pyodide."""

    python_version: str
    wheel_platform: str


def web_dir() -> Path:
    """flet-web's web client folder in the installed environment."""
    import flet_web

    return Path(flet_web.__file__).resolve().parent / "web"


def copy_client(source: Path, out: Path) -> list[str]:
    """Copy the client files the page needs from `source` into `out`; return their site paths."""
    missing = [name for name in CLIENT_FILES if not (source / name).is_file()]
    if missing:
        raise ClientError(str(source), "missing " + ", ".join(missing))
    for name in CLIENT_FILES:
        target = out / name
        target.parent.mkdir(parents=True, exist_ok=True)
        shutil.copyfile(source / name, target)
    module = out / PYODIDE_MODULE
    module.write_text(growing_restore(module.read_text(encoding="utf-8")), encoding="utf-8")
    return [*CLIENT_FILES, *write_font_manifest(source, out), write_bootstrap(source, out)]


def growing_restore(pyodide_module: str) -> str:
    """Pyodide's module with a snapshot restore that first grows the memory to the snapshot's size.

    ClientError when the restore is not found exactly once (another Pyodide: check the patch).
    """
    found = pyodide_module.count(SNAPSHOT_RESTORE)
    if found != 1:
        raise ClientError(PYODIDE_MODULE, f"expected the snapshot restore once, found it {found} times")
    return pyodide_module.replace(SNAPSHOT_RESTORE, SNAPSHOT_RESTORE_GROWING)


def font_manifest(families: list[dict]) -> list[dict]:
    """The client's font manifest with only FONT_FAMILIES kept, and Roboto added."""
    kept = [family for family in families if family.get("family") in FONT_FAMILIES]
    return [*kept, ROBOTO]


def write_font_manifest(source: Path, out: Path) -> list[str]:
    """Write assets/FontManifest.json with the families Boardside draws with."""
    name = "assets/FontManifest.json"
    families = json.loads((source / name).read_text(encoding="utf-8"))
    (out / name).write_text(json.dumps(font_manifest(families), indent=1), encoding="utf-8")
    return [name]


def bootstrap(flet_bootstrap: str, start: str) -> str:
    """flet-web's engine loader and build configuration, followed by Boardside's start (`start`).

    Everything after the build configuration line (flet-web's start, which registers Flutter's own
    service worker) is replaced; ClientError if that line is not found exactly once.
    """
    lines = flet_bootstrap.splitlines(keepends=True)
    marks = [i for i, line in enumerate(lines) if line.startswith(BUILD_CONFIG)]
    if len(marks) != 1:
        raise ClientError(BOOTSTRAP, f"expected one line starting {BUILD_CONFIG!r}, found {len(marks)}")
    return "".join(lines[: marks[0] + 1]) + "\n" + start


def write_bootstrap(source: Path, out: Path) -> str:
    """Write flutter_bootstrap.js: flet-web's loader with Boardside's start (site/flutter-start.js)."""
    start = (Path(__file__).parent / "site" / "flutter-start.js").read_text(encoding="utf-8")
    text = bootstrap((source / BOOTSTRAP).read_text(encoding="utf-8"), start)
    (out / BOOTSTRAP).write_text(text, encoding="utf-8")
    return BOOTSTRAP


def runtime(source: Path) -> Runtime:
    """The Python version and wheel platform tag of the Pyodide shipped in `source`."""
    lock = json.loads((source / "pyodide" / "pyodide-lock.json").read_text(encoding="utf-8"))
    info = lock["info"]
    return Runtime(
        python_version=".".join(info["python"].split(".")[:2]),
        wheel_platform=f"pyemscripten_{info['abi_version']}_{info['arch']}",
    )
