"""The layer rules of DEVELOPERS.md, read from the source: imports point one way only.

    sync → export → store → calc        (sync may also use the store directly)

None of the three packages imports Flet, the screens, their state or the app's entry points.
"""

from __future__ import annotations

import ast
import importlib
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
APP = "mobile_app"
# package -> the packages of ours it may import besides itself
MAY_IMPORT = {
    "signing": set(),
    "store": {"calc", "mobile_app.signing"},
    "export": {"calc", "mobile_app.store", "mobile_app.signing"},
    "sync": {"calc", "mobile_app.store", "mobile_app.export"},
    "office": {"mobile_app.signing", "mobile_app.export"},
}
NEVER = {"flet", "flet_charts", "flet_web"}


def imported_names(path: Path) -> set[str]:
    """Dotted names a file imports, anywhere in it (`from a import b` gives `a` and `a.b`)."""
    names: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            names.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom):
            assert node.level == 0, f"{path}: relative import"
            assert node.module is not None
            names.add(node.module)
            names.update(f"{node.module}.{alias.name}" for alias in node.names)
    return names


def imported_modules(folder: Path) -> dict[str, set[str]]:
    """Top-level package names each file under `folder` imports."""
    return {
        str(path.relative_to(ROOT)): {name.split(".")[0] for name in imported_names(path)}
        for path in folder.rglob("*.py")
    }


def ours(name: str) -> str | None:
    """`calc` or `mobile_app.<package>` for a name of ours, None for anything else."""
    parts = name.split(".")
    if parts[0] == "calc":
        return "calc"
    if parts[0] == APP and len(parts) > 1:
        return f"{APP}.{parts[1]}"
    return None


def test_calc_imports_only_the_standard_library_and_pint():
    for path, names in imported_modules(ROOT / "calc").items():
        assert not names & {APP, "sqlite_utils", *NEVER}, path


@pytest.mark.parametrize("package", sorted(MAY_IMPORT))
def test_store_export_and_sync_import_only_downwards(package: str) -> None:
    allowed = {f"{APP}.{package}", *MAY_IMPORT[package]}
    for path in (ROOT / APP / package).rglob("*.py"):
        names = imported_names(path)
        assert not {n.split(".")[0] for n in names} & NEVER, path
        upward = {ours(n) for n in names if ours(n) is not None} - allowed
        assert not upward, (str(path), upward)


@pytest.mark.parametrize("package", sorted(MAY_IMPORT))
def test_every_public_name_of_a_package_resolves(package: str) -> None:
    module = importlib.import_module(f"{APP}.{package}")
    for name in module.__all__:
        assert getattr(module, name) is not None, (package, name)
        assert name in module.__doc__, (package, name)


HEAVY = ["fpdf", "httpx", "mobile_app.export.bundle", "mobile_app.sync.runner", "webdav4"]
NETWORK = {"httpx", "httpcore", "webdav4", "socket", "ssl", "urllib3", "requests"}


def test_the_package_faces_load_no_pdf_or_network_library_until_used():
    script = (
        "import sys\n"
        "import mobile_app.store, mobile_app.export, mobile_app.sync\n"
        "from mobile_app.sync import Outbox, OutboxError\n"
        f"print(sorted(m for m in {HEAVY!r} if m in sys.modules))\n"
        "from mobile_app.export import export_bundle\n"
        "from mobile_app.sync import sync_once\n"
        f"print(sorted(m for m in {HEAVY!r} if m in sys.modules))\n"
        "from mobile_app.sync import WebDavTransport\n"
        f"print(sorted(m for m in {HEAVY!r} if m in sys.modules))\n"
    )
    result = subprocess.run(
        [sys.executable, "-c", script], capture_output=True, text=True, cwd=ROOT, timeout=120, check=True
    )
    runner_loaded = ["fpdf", "mobile_app.export.bundle", "mobile_app.sync.runner"]
    assert result.stdout.splitlines() == ["[]", str(runner_loaded), str(HEAVY)]


def test_only_the_webdav_transport_imports_a_network_library():
    """The sync's seam (issue 12): a browser transport on fetch can replace `webdav` alone."""
    for path in (ROOT / APP / "sync").glob("*.py"):
        network = {name.split(".")[0] for name in imported_names(path)} & NETWORK
        assert not network or path.name == "webdav.py", (path.name, network)
