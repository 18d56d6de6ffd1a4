"""Export bundles: names, manifest hashes, immutability, one-board exports and the command line."""

from __future__ import annotations

import hashlib
import json
import os
import stat
import subprocess
import sys
from collections.abc import Iterator
from pathlib import Path

import pytest
from approving import reasons_for
from pypdf import PdfReader

import mobile_app.export.bundle as bundle_module
from mobile_app.export import (
    BundleCheckError,
    BundleExistsError,
    export_bundle,
    load_job_json,
    read_bundle,
)
from mobile_app.export.bundle import MANIFEST_NAME, bundle_base_name
from mobile_app.export.names import ascii_words
from mobile_app.store import NotFoundError, Store
from mobile_app.store.demo import DEMO_PIN, create_demo_job
from mobile_app.sync import save_target

ROOT = Path(__file__).resolve().parents[1]


@pytest.fixture(scope="module")
def demo_store(tmp_path_factory: pytest.TempPathFactory) -> Iterator[tuple[Path, Store, int]]:
    """A store folder holding the demo job."""
    data_dir = Path(tmp_path_factory.mktemp("bundle-store"))
    store = Store.open(data_dir)
    job_id = create_demo_job(store)
    yield data_dir, store, job_id
    store.close()


def test_bundle_holds_three_files_and_a_manifest_of_their_hashes(
    demo_store: tuple[Path, Store, int], tmp_path: Path
) -> None:
    _data, store, job_id = demo_store
    bundle = export_bundle(store, job_id, tmp_path / "out")
    assert bundle.path.parent == tmp_path / "out"
    assert [p.suffix for p in bundle.files] == [".json", ".csv", ".pdf"]
    assert sorted(p.name for p in bundle.path.iterdir()) == sorted(
        [p.name for p in bundle.files] + [MANIFEST_NAME])
    manifest = json.loads(bundle.manifest.read_text(encoding="utf-8"))
    assert manifest["schema"] == "boardside-bundle" and manifest["name"] == bundle.name
    assert manifest["job_id"] == job_id and manifest["revision"] == 1
    for path in bundle.files:
        data = path.read_bytes()
        assert manifest["files"][path.name] == {"sha256": hashlib.sha256(data).hexdigest(),
                                                "bytes": len(data)}
        assert bundle.sha256[path.name] == hashlib.sha256(data).hexdigest()
    assert bundle.sha256[MANIFEST_NAME] == hashlib.sha256(bundle.manifest.read_bytes()).hexdigest()
    assert manifest["cautions"] and "competent person" in manifest["cautions"][0]
    assert load_job_json(bundle.files[0].read_bytes())["job"]["id"] == job_id


def test_name_is_job_reference_revision_and_date(
    demo_store: tuple[Path, Store, int], tmp_path: Path
) -> None:
    _data, store, job_id = demo_store
    bundle = export_bundle(store, job_id, tmp_path)
    date = json.loads(bundle.manifest.read_text(encoding="utf-8"))["exported_at"][:10]
    assert bundle.name == f"job{job_id}-TY-2026-118-rev1-{date}"
    assert bundle.files[2].name == f"{bundle.name}.pdf"


@pytest.mark.parametrize(
    ("text", "expected"),
    [("ACME/4471", "ACME-4471"), ("../../etc", "etc"), ("Ω ü", "u"), ("Łódź Straße", "Lodz-Strasse"),
     ("  --x--  ", "x"), ("C:\\jobs\\7", "C-jobs-7"), ("Σπίτι 7", "7")],
)
def test_names_keep_ascii_words_only(text: str, expected: str) -> None:
    assert ascii_words(text) == expected


def test_base_name_without_reference_and_for_one_board() -> None:
    doc = {"exported_at": "2026-01-31T23:59:59+00:00", "job": {"id": 5, "revision": 2}}
    assert bundle_base_name(doc) == "job5-rev2-2026-01-31"
    assert bundle_base_name(doc, "DB 2/a") == "job5-rev2-board-DB-2-a-2026-01-31"


def test_a_second_export_never_overwrites_the_first(
    demo_store: tuple[Path, Store, int], tmp_path: Path
) -> None:
    _data, store, job_id = demo_store
    first = export_bundle(store, job_id, tmp_path)
    before = {p.name: p.read_bytes() for p in first.path.iterdir()}
    second = export_bundle(store, job_id, tmp_path)
    third = export_bundle(store, job_id, tmp_path)
    assert second.name == f"{first.name}-2" and third.name == f"{first.name}-3"
    assert {p.name: p.read_bytes() for p in first.path.iterdir()} == before
    assert sorted(p.name for p in tmp_path.iterdir()) == [first.name, second.name, third.name]
    for path in first.files + (first.manifest,):
        assert not os.stat(path).st_mode & (stat.S_IWUSR | stat.S_IWGRP | stat.S_IWOTH)


def test_when_every_name_is_taken_the_export_is_refused_clearly(
    demo_store: tuple[Path, Store, int], tmp_path: Path, monkeypatch: pytest.MonkeyPatch
) -> None:
    _data, store, job_id = demo_store
    monkeypatch.setattr(bundle_module, "MAX_SAME_NAME", 2)
    first = export_bundle(store, job_id, tmp_path)
    export_bundle(store, job_id, tmp_path)
    with pytest.raises(BundleExistsError) as caught:
        export_bundle(store, job_id, tmp_path)
    assert str(caught.value) == (f"bundle {first.name} and its numbered variants already exist: "
                                 "none was overwritten")
    assert sorted(p.name for p in tmp_path.iterdir()) == [first.name, f"{first.name}-2"]


def test_a_folder_in_the_way_is_left_alone(
    demo_store: tuple[Path, Store, int], tmp_path: Path
) -> None:
    _data, store, job_id = demo_store
    first = export_bundle(store, job_id, tmp_path / "a")
    squatter = tmp_path / "b" / first.name
    squatter.mkdir(parents=True)
    (squatter / "notes.txt").write_text("mine", encoding="utf-8")
    bundle = export_bundle(store, job_id, tmp_path / "b")
    assert bundle.name == f"{first.name}-2"
    assert (squatter / "notes.txt").read_text(encoding="utf-8") == "mine"


def test_read_bundle_detects_a_changed_or_unfinished_bundle(
    demo_store: tuple[Path, Store, int], tmp_path: Path
) -> None:
    _data, store, job_id = demo_store
    bundle = export_bundle(store, job_id, tmp_path)
    assert read_bundle(bundle.path) == bundle
    csv_path = bundle.files[1]
    csv_path.chmod(0o644)
    csv_path.write_bytes(csv_path.read_bytes().replace(b"pass", b"PASS", 1))
    with pytest.raises(BundleCheckError, match="differs from its manifest entry"):
        read_bundle(bundle.path)
    bundle.manifest.chmod(0o644)
    bundle.manifest.unlink()
    with pytest.raises(BundleCheckError, match="no manifest.json: the export is unfinished"):
        read_bundle(bundle.path)


def test_no_secret_reaches_a_bundle(tmp_path: Path) -> None:
    store = Store.open(tmp_path / "store")
    try:
        job_id = create_demo_job(store)
        people = {person["name"]: person["id"] for person in store.people.all()}
        store.review.submit(job_id, people["Rosa Quennell"])
        store.review.approve(job_id, people["Ines Okafor"], DEMO_PIN, reasons_for(store, job_id))
        password = "Office-Secret-7f3Q"
        save_target(store, "https://office.example/dav/boardside/", "field-tablet", password)
        bundle = export_bundle(store, job_id, tmp_path / "out")
    finally:
        store.close()
    for path in bundle.files + (bundle.manifest,):
        data = path.read_bytes()
        assert password.encode() not in data and b"field-tablet" not in data
        assert b"office.example" not in data
    pdf_text = "".join(page.extract_text() for page in PdfReader(bundle.files[2]).pages)
    assert password not in pdf_text and "field-tablet" not in pdf_text
    assert "Ines Okafor" in pdf_text  # the text was readable: the check above means something
    doc = load_job_json(bundle.files[0].read_bytes())
    keys: set[str] = set()
    stack: list[object] = [doc]
    while stack:
        item = stack.pop()
        if isinstance(item, dict):
            keys |= set(item)
            stack.extend(item.values())
        elif isinstance(item, list):
            stack.extend(item)
    assert not [key for key in keys if "pin" in key.lower() or "password" in key.lower()]


def test_one_board_export(demo_store: tuple[Path, Store, int], tmp_path: Path) -> None:
    _data, store, job_id = demo_store
    board = store.boards.of_job(job_id)[2]
    bundle = export_bundle(store, job_id, tmp_path, board_id=board["id"])
    assert "-board-DB-3-" in bundle.name
    doc = load_job_json(bundle.files[0].read_bytes())
    assert [b["designation"] for b in doc["boards"]] == ["DB-3"]
    assert json.loads(bundle.manifest.read_text(encoding="utf-8"))["board_id"] == board["id"]
    with pytest.raises(NotFoundError):
        export_bundle(store, job_id, tmp_path, board_id=99_999)


def test_unknown_job_writes_nothing(demo_store: tuple[Path, Store, int], tmp_path: Path) -> None:
    _data, store, _job_id = demo_store
    with pytest.raises(NotFoundError):
        export_bundle(store, 99_999, tmp_path / "out")
    assert not (tmp_path / "out").exists()


def _run_cli(*args: str) -> subprocess.CompletedProcess[str]:
    """`python -m mobile_app export ...` in a fresh interpreter."""
    return subprocess.run([sys.executable, "-m", "mobile_app", "export", *args], cwd=ROOT,
                          capture_output=True, text=True, timeout=120, check=False)


def test_cli_prints_the_three_paths(demo_store: tuple[Path, Store, int], tmp_path: Path) -> None:
    data_dir, _store, job_id = demo_store
    result = _run_cli(str(job_id), "--data", str(data_dir), "--out", str(tmp_path))
    assert result.returncode == 0, result.stderr
    paths = [Path(line) for line in result.stdout.splitlines()]
    assert [p.suffix for p in paths] == [".json", ".csv", ".pdf"]
    assert all(p.is_file() and p.parent.parent == tmp_path for p in paths)
    assert read_bundle(paths[0].parent).files == tuple(paths)


def test_cli_unknown_job_is_one_line_and_exit_2(
    demo_store: tuple[Path, Store, int], tmp_path: Path
) -> None:
    data_dir, _store, _job_id = demo_store
    result = _run_cli("4242", "--data", str(data_dir), "--out", str(tmp_path / "out"))
    assert result.returncode == 2
    assert result.stdout == ""
    assert result.stderr.splitlines() == ["export: no job with id 4242"]
    assert not (tmp_path / "out").exists()


def test_cli_bad_job_id_is_a_usage_error(tmp_path: Path) -> None:
    result = _run_cli("seven", "--data", str(tmp_path), "--out", str(tmp_path))
    assert result.returncode == 2 and result.stdout == ""
    assert len(result.stderr.splitlines()) == 1 and "invalid int value" in result.stderr
