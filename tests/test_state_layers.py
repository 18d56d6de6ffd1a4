"""The app's own layer rules, read from the source: state is plain Python, screens stay thin."""

from __future__ import annotations

import ast
from pathlib import Path

APP = Path(__file__).resolve().parents[1] / "mobile_app"


def top_imports(path: Path) -> set[str]:
    """Dotted module names a file imports (absolute imports only)."""
    names: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            names.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            names.add(node.module)
    return names


def test_state_never_imports_flet() -> None:
    for path in (APP / "state").rglob("*.py"):
        assert not {n.split(".")[0] for n in top_imports(path)} & {"flet", "flet_charts"}, path


def test_screens_never_touch_storage_directly() -> None:
    below_state = ("mobile_app.store", "mobile_app.export", "mobile_app.sync")
    for folder in ("views", "components"):
        for path in (APP / folder).rglob("*.py"):
            names = top_imports(path)
            assert not {n.split(".")[0] for n in names} & {"sqlite3", "sqlite_utils"}, path
            assert not any(n.startswith(below_state) for n in names), path
            assert "calc" not in {n.split(".")[0] for n in names}, path


def test_one_build_function_per_view_module() -> None:
    for path in (APP / "views").glob("*_view.py"):
        tree = ast.parse(path.read_text(encoding="utf-8"))
        public = [n.name for n in tree.body if isinstance(n, ast.FunctionDef) and not n.name.startswith("_")]
        assert public in (["build"], ["controls"]), (path, public)


def test_main_runs_nothing_at_import_and_serves_only_from_its_entry_points() -> None:
    import inspect

    from mobile_app import main

    assert list(inspect.signature(main.serve).parameters) == ["port", "data_dir", "demo"]
    tree = ast.parse((APP / "main.py").read_text(encoding="utf-8"))
    callers = [
        fn.name
        for fn in ast.walk(tree)
        if isinstance(fn, ast.FunctionDef)
        for call in ast.walk(fn)
        if isinstance(call, ast.Call) and ast.unparse(call.func) == "ft.run"
    ]
    assert sorted(callers) == ["run_packaged", "serve"]  # web mode, and a `flet build` package
    assert (main.ASSETS_DIR / "manifest.json").is_file()


def test_serve_refuses_an_unusable_folder(tmp_path: Path, capsys) -> None:
    from mobile_app.main import serve

    blocker = tmp_path / "a-file"
    blocker.write_text("not a folder")
    assert serve(port=0, data_dir=blocker / "store", demo=False) == 2
    assert capsys.readouterr().err.startswith("python -m mobile_app: cannot open the store")
