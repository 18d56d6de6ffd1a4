"""The folder staged for `flet build`: its entry module, its settings, and that it runs on its own."""

from __future__ import annotations

import subprocess
import sys
import tomllib
from pathlib import Path

import pytest

from mobile_app.packaging import stage_build

ROOT = Path(__file__).resolve().parents[1]


@pytest.fixture(scope="module")
def staged(tmp_path_factory: pytest.TempPathFactory) -> Path:
    return stage_build(ROOT, tmp_path_factory.mktemp("stage") / "boardside")


def test_layout_is_what_flet_build_looks_for(staged: Path) -> None:
    settings = tomllib.loads((staged / "pyproject.toml").read_text(encoding="utf-8"))
    app = settings["tool"]["flet"]["app"]
    entry = staged / app["path"] / f"{app['module']}.py"
    assert entry.is_file()
    assert (staged / app["path"] / "assets" / "manifest.json").is_file()
    assert settings["tool"]["flet"]["product"] == "Boardside"
    assert not any(d.startswith("flet-web") for d in settings["project"]["dependencies"])
    assert not list(staged.rglob("__pycache__"))


def test_staged_code_imports_and_assesses_on_its_own(staged: Path) -> None:
    src = staged / "src"
    script = (
        "import sys; sys.path.insert(0, sys.argv[1])\n"
        "import calc, mobile_app.main, mobile_app.export.bundle, mobile_app.sync.runner\n"
        "assert calc.__file__.startswith(sys.argv[1]), calc.__file__\n"
        "d = {'supply': {'system': 'TT'}, 'circuit': {'device': {'kind': 'mcb', 'curve': 'B', 'rating': 6},"
        " 'line': {'csa': 1.5}, 'cpc': {'csa': 1.0}}, 'measured': {'zs': 1.0}}\n"
        "print(calc.assess(d).verdict)\n"
    )
    result = subprocess.run(
        [sys.executable, "-c", script, str(src)], capture_output=True, text=True, cwd=staged, timeout=120
    )
    assert result.returncode == 0, result.stderr
    assert result.stdout.strip() in ("pass", "fail", "not-shown")


def test_a_non_empty_folder_is_refused(tmp_path: Path) -> None:
    (tmp_path / "keep.txt").write_text("mine", encoding="utf-8")
    with pytest.raises(FileExistsError):
        stage_build(ROOT, tmp_path)
    assert (tmp_path / "keep.txt").read_text(encoding="utf-8") == "mine"
