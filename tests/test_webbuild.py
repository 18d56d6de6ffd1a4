"""The static browser build without a browser: what the folder holds, what it leaves out, that it asks
no other host, that a rebuild is identical and that a code change touches only the app's cache group.

The browser side (it starts, keeps the store, works offline) is tests/test_e2e_web.py.
"""

from __future__ import annotations

import ast
import dataclasses
import json
import re
import shutil
import subprocess
import sys
import zipfile
from pathlib import Path

import pytest
from web_site import WHEEL_CACHE, build

from mobile_app.webbuild import OutputExistsError, boardside_spec
from mobile_app.webbuild.archive import dependency_lists, export_modules, node, read_archive
from mobile_app.webbuild.client import (
    BUILD_CONFIG,
    SNAPSHOT_RESTORE,
    SNAPSHOT_RESTORE_GROWING,
    ClientError,
    bootstrap,
    font_manifest,
    growing_restore,
    runtime,
    web_dir,
)

ROOT = Path(__file__).resolve().parents[1]
TEXT_FILES = ("index.html", "sw.js", "python.js", "python-worker.js", "boot.js", "flutter_bootstrap.js",
              "guard.js", "manifest.json")


@pytest.fixture(scope="module")
def site(tmp_path_factory: pytest.TempPathFactory):
    """Boardside's site, built once for this module."""
    return build(tmp_path_factory.mktemp("build") / "site")


def archive_names(site, stem: str) -> list[str]:
    with read_archive(next(site.out.glob(f"{stem}-*.zip.gz"))) as archive:
        return archive.namelist()


def test_the_runtime_is_the_browsers_python() -> None:
    found = runtime(web_dir())
    assert found.python_version == "3.14"
    assert re.fullmatch(r"pyemscripten_\d{4}_\d+_wasm32", found.wheel_platform)


def test_bootstrap_keeps_the_loader_and_drops_flutters_service_worker() -> None:
    flet_web = (web_dir() / "flutter_bootstrap.js").read_text(encoding="utf-8")
    # flet-web's start passes serviceWorkerSettings, so the loader registers Flutter's worker; the
    # loader itself (before the build configuration) only registers one when asked.
    assert "serviceWorkerSettings:" in flet_web.split(BUILD_CONFIG)[1]
    ours = bootstrap(flet_web, "START\n")
    assert ours.split(BUILD_CONFIG)[1].endswith("\nSTART\n")
    assert ours.count(BUILD_CONFIG) == 1 and "_flutter.loader" in ours
    with pytest.raises(ClientError, match="found 0"):
        bootstrap("no build configuration here", "START\n")


def test_pyodides_snapshot_restore_grows_the_memory_first() -> None:
    module = (web_dir() / "pyodide" / "pyodide.asm.mjs").read_text(encoding="utf-8")
    patched = growing_restore(module)
    assert patched.count("wasmMemory.grow(") == module.count("wasmMemory.grow(") + 1
    assert len(patched) - len(module) == len(SNAPSHOT_RESTORE_GROWING) - len(SNAPSHOT_RESTORE)
    with pytest.raises(ClientError, match="found it 0 times"):
        growing_restore("no restore here")


def test_warm_imports_every_flet_name_the_screens_use() -> None:
    # The browser entry imports these before its start-up snapshot; a name missing here is imported
    # on first use instead (slower), a name too many costs memory in every snapshot.
    from mobile_app.browser.entry import SCREEN_CONTROLS

    app = ROOT / "mobile_app"
    used: set[str] = set()
    for path in [app / "main.py", *(app / "views").glob("*.py"), *(app / "components").glob("*.py")]:
        for found in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(found, ast.Attribute) and getattr(found.value, "id", None) == "ft":
                used.add(found.attr)
    # type names, and what only the server form uses (ft.run starts the connection: not in a snapshot)
    assert set(SCREEN_CONTROLS) == used - {"Control", "Event", "run", "AppView"}


def test_font_manifest_keeps_material_icons_and_adds_roboto() -> None:
    families = json.loads((web_dir() / "assets" / "FontManifest.json").read_text(encoding="utf-8"))
    assert [f["family"] for f in font_manifest(families)] == ["MaterialIcons", "Roboto"]


def test_dependency_lists_cover_every_requirement_in_the_browser() -> None:
    # Walk the requirements of boardside's dependencies as the browser's Python would see them
    # (Python 3.14 on Emscripten, no extras): each must be included, a browser wheel, or left out
    # on purpose (PEP 508 markers, evaluated by `packaging`).
    from importlib import metadata

    from packaging.markers import default_environment
    from packaging.requirements import Requirement
    from packaging.utils import canonicalize_name

    lists = dependency_lists()
    known = {canonicalize_name(n) for table in ("include", "runtime", "export", "exclude")
             for n in lists[table]}
    carried = {canonicalize_name(n) for table in ("include", "export") for n in lists[table]}
    environment = {**default_environment(), "python_version": "3.14", "python_full_version": "3.14.2",
                   "sys_platform": "emscripten", "platform_system": "Emscripten", "extra": ""}
    seen: set[str] = set()
    todo = ["boardside"]
    while todo:
        name = todo.pop()
        for text in metadata.requires(name) or []:
            requirement = Requirement(text)
            if requirement.marker and not requirement.marker.evaluate(environment):
                continue
            wanted = canonicalize_name(requirement.name)
            assert wanted in known, f"{name} requires {wanted}: add it to dependencies.toml"
            if wanted not in seen and wanted in carried:
                seen.add(wanted)
                todo.append(wanted)
    assert seen == carried


def test_the_site_holds_what_the_page_needs(site) -> None:
    out = site.out
    for name in ("index.html", "sw.js", "manifest.json", "flutter_bootstrap.js",
                 "main.dart.js", "canvaskit/canvaskit.wasm",
                 "pyodide/pyodide.asm.wasm", "pyodide/python_stdlib.zip", "rive-unavailable.js"):
        assert (out / name).is_file(), name
    for left_out in ("flutter_service_worker.js", "pyodide/python.exe", "canvaskit/wimp.wasm",
                     "main.dart.wasm", "canvaskit/skwasm.wasm",
                     "canvaskit/chromium/canvaskit.wasm", "assets/packages"):
        assert not (out / left_out).exists(), left_out
    cached = set(site.files())
    on_disk = {p.relative_to(out).as_posix() for p in out.rglob("*") if p.is_file()}
    assert on_disk - cached == {"sw.js", "boardside-site.json"}
    assert cached <= on_disk


def test_the_page_asks_no_other_host_and_registers_only_our_worker(site) -> None:
    for name in TEXT_FILES:
        text = (site.out / name).read_text(encoding="utf-8")
        if name in ("guard.js", "flutter_bootstrap.js"):
            continue  # guard.js names the host it keeps away; the loader's CDN default is never used
        assert not re.search(r"https?://", text), name
    start = (site.out / "flutter_bootstrap.js").read_text(encoding="utf-8").split(BUILD_CONFIG)[1]
    assert "serviceWorker" not in start and 'canvasKitVariant: "full"' in start
    index = (site.out / "index.html").read_text(encoding="utf-8")
    assert "<title>Boardside</title>" in index and "<base" not in index
    assert re.findall(r'(?:src|href)="([^"]+)"', index) == [
        "icons/apple-touch-icon-192.png", "favicon.png", "manifest.json", "guard.js", "python.js", "boot.js",
        "icons/loading-animation.png", "decimal-keys.js", "flutter_bootstrap.js"]
    assert 'from "./pyodide/pyodide.mjs"' in (site.out / "python-worker.js").read_text(encoding="utf-8")


def test_archives_carry_compiled_libraries_and_our_code(site) -> None:
    libraries = archive_names(site, "libraries")
    app = archive_names(site, "app")
    assert "msgpack/_cmsgpack.cpython-314-wasm32-emscripten.so" in libraries  # the browser wheel
    # gzipped whole, a zip of stored entries inside (the page's worker copies them as they are)
    assert next(site.out.glob("libraries-*.zip.gz")).read_bytes()[:2] == b"\x1f\x8b"
    with read_archive(next(site.out.glob("libraries-*.zip.gz"))) as archive:
        assert {i.compress_type for i in archive.infolist()} == {zipfile.ZIP_STORED}
    assert "pint/default_en.txt" in libraries and "flet/controls/material/icons.json" in libraries
    assert not any(n.startswith(("webdav4/", "httpx/", "fpdf/", "flet_web/", "pip/")) for n in libraries)
    assert not any("/tests/" in n or "/testsuite/" in n or n.endswith(".dart") for n in libraries)
    assert "calc/data/mcb.toml" in app and "mobile_app/browser/entry.py" in app
    assert not any(n.startswith(("mobile_app/webbuild/", "mobile_app/fonts/")) for n in app)
    export = archive_names(site, "export")
    # the regular font is the site's own fonts/DejaVuSans.ttf, fetched beside the archive, not packed twice
    assert "mobile_app/fonts/DejaVuSans-Bold.ttf" in export
    assert "mobile_app/fonts/DejaVuSans.ttf" not in export
    index = (site.out / "index.html").read_text(encoding="utf-8")
    config = json.loads(re.search(r"var boardside = (\{.*?\n\});", index, re.S).group(1))
    shared = config["python"]["extras"]["export"]["files"]
    assert shared["mobile_app/fonts/DejaVuSans.ttf"] == "fonts/DejaVuSans.ttf"
    assert (site.out / shared["mobile_app/fonts/DejaVuSans.ttf"]).read_bytes() == \
        (ROOT / "mobile_app" / "fonts" / "DejaVuSans.ttf").read_bytes()
    assert any(n.startswith(("fontTools/subset/__init__.py", "fpdf/fpdf.py")) for n in export)
    # fontTools: the modules of export-modules.toml only (tests/test_webbuild_export.py)
    packed = {n.removesuffix("/__init__.pyc").removesuffix(".pyc").replace("/", ".")
              for n in export if n.startswith("fontTools/") and n.endswith(".pyc")}
    assert packed == export_modules() or node() is None
    assert not any(n.startswith(("fpdf/", "fontTools/", "PIL/")) for n in libraries + app)
    assert not any(n.endswith(".so") for n in export)
    if node() is None:
        pytest.skip("Node.js missing: the archives carry sources only")
    assert "flet/__init__.pyc" in libraries and "flet/__init__.py" not in libraries
    assert "calc/__pycache__/units.cpython-314.pyc" in app and "calc/units.py" in app


def test_a_rebuild_is_identical_and_a_code_change_touches_only_the_app_group(site, tmp_path: Path) -> None:
    same = build(tmp_path / "same")
    assert [(g.name, g.version) for g in same.groups] == [(g.name, g.version) for g in site.groups]

    source = tmp_path / "source"
    for package in ("calc", "mobile_app"):
        shutil.copytree(ROOT / package, source / package, ignore=shutil.ignore_patterns("__pycache__"))
    with (source / "calc" / "version.py").open("a", encoding="utf-8") as file:
        file.write("# an update\n")
    changed = build(tmp_path / "changed", dataclasses.replace(boardside_spec(), source_root=source))
    versions = {g.name: g.version for g in changed.groups}
    before = {g.name: g.version for g in same.groups}
    assert list(versions) == ["runtime", "libraries", "export", "fonts", "app"]
    assert versions["runtime"] == before["runtime"]
    assert versions["fonts"] == before["fonts"]
    assert versions["libraries"] == before["libraries"]
    assert versions["export"] == before["export"]
    assert versions["app"] != before["app"]


def test_an_earlier_build_is_replaced_but_other_files_are_not(site, tmp_path: Path) -> None:
    foreign = tmp_path / "mine"
    foreign.mkdir()
    (foreign / "notes.txt").write_text("mine", encoding="utf-8")
    with pytest.raises(OutputExistsError, match="not empty"):
        build(foreign)
    assert (foreign / "notes.txt").read_text(encoding="utf-8") == "mine"


def test_command_line_builds_and_says_how_to_serve(tmp_path: Path) -> None:
    out = tmp_path / "site"
    command = [sys.executable, "-m", "mobile_app", "build-web", str(out), "--cache", str(WHEEL_CACHE)]
    done = subprocess.run(command, capture_output=True, text=True, cwd=ROOT, timeout=600)
    assert done.returncode == 0, done.stderr
    assert "python -m http.server" in done.stdout and (out / "index.html").is_file()
    again = subprocess.run([sys.executable, "-m", "mobile_app", "build-web", str(tmp_path)],
                           capture_output=True, text=True, cwd=ROOT, timeout=60)
    assert again.returncode == 2 and again.stderr.startswith("build-web: ") and again.stdout == ""

