"""Lay out a folder that `flet build apk|ipa|web` can package.

`flet build` packages one folder whose root holds the entry module (`main.py`) and `assets/`. The
repository keeps its own layout (calc/, mobile_app/, assets/ at the top), so a build machine first runs
`python -m mobile_app package OUT` and then `flet build apk OUT` (or ipa, web). No Flet import here.
"""

from __future__ import annotations

import shutil
import sys
import tomllib
from pathlib import Path

ENTRY_MODULE = '''"""Entry point of the packaged Boardside app (written by `python -m mobile_app package`)."""

from mobile_app.main import run_packaged

if __name__ == "__main__":
    run_packaged()
'''
WEB_ONLY = ("flet-web",)
"""Runtime dependencies a phone build does not need: the web server for web mode."""
_IGNORE = shutil.ignore_patterns("__pycache__", "*.pyc")


def _toml_value(value: object) -> str:
    if isinstance(value, str):
        return '"' + value.replace("\\", "\\\\").replace('"', '\\"') + '"'
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, list):
        return "[" + ", ".join(_toml_value(item) for item in value) + "]"
    return str(value)


def _table_lines(name: str, table: dict[str, object]) -> list[str]:
    lines = [f"[{name}]"]
    subtables = []
    for key, value in table.items():
        if isinstance(value, dict):
            subtables.append((f"{name}.{key}", value))
        else:
            lines.append(f"{key} = {_toml_value(value)}")
    for sub_name, sub in subtables:
        lines += ["", *_table_lines(sub_name, sub)]
    return lines


def build_pyproject(root_pyproject: dict) -> str:
    """The staged folder's pyproject.toml: the project's name, version and phone dependencies, its
    `[tool.flet]` settings, and the entry point `src/main.py`."""
    project = root_pyproject["project"]
    dependencies = [d for d in project["dependencies"] if d.split("=")[0].split(">")[0] not in WEB_ONLY]
    flet = dict(root_pyproject.get("tool", {}).get("flet", {}))
    flet["app"] = {"path": "src", "module": "main"}
    head = {
        "name": project["name"],
        "version": project["version"],
        "description": project.get("description", ""),
        "requires-python": project.get("requires-python", ">=3.11"),
        "dependencies": dependencies,
    }
    return "\n".join([*_table_lines("project", head), "", *_table_lines("tool.flet", flet)]) + "\n"


def stage_build(root: Path, out: Path) -> Path:
    """Copy calc/, mobile_app/ and assets/ under `out/src`, write the entry module and pyproject.toml.

    Refuses a non-empty `out` (FileExistsError) so nothing of a person's is overwritten.
    """
    if out.exists() and any(out.iterdir()):
        raise FileExistsError(f"{out} is not empty")
    src = out / "src"
    src.mkdir(parents=True)
    for package in ("calc", "mobile_app"):
        shutil.copytree(root / package, src / package, ignore=_IGNORE)
    shutil.copytree(root / "assets", src / "assets", ignore=_IGNORE)
    (src / "main.py").write_text(ENTRY_MODULE, encoding="utf-8")
    pyproject = tomllib.loads((root / "pyproject.toml").read_text(encoding="utf-8"))
    (out / "pyproject.toml").write_text(build_pyproject(pyproject), encoding="utf-8")
    return out


def cli_package(out: Path) -> int:
    """`python -m mobile_app package OUT`: stage the build folder and say what to run next."""
    root = Path(__file__).resolve().parents[1]
    try:
        stage_build(root, out)
    except OSError as exc:
        print(f"package: {exc}", file=sys.stderr)
        return 2
    print(f"staged in {out}: now run `flet build apk {out}` (or ipa, web) on a build machine")
    return 0
