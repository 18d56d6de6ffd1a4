"""The office side on real files: `office init`, `office enrol`, and `verify` of real bundles."""

from __future__ import annotations

import asyncio
import datetime
import hashlib
import json
import os
import subprocess
import sys
from pathlib import Path
from typing import Any

import pytest
from approving import reasons_for

from mobile_app.export.bundle import MANIFEST_NAME, write_bundle
from mobile_app.signing import generate_key_pair, sealed_from_dict, sign_approval, unlock
from mobile_app.store import Store
from mobile_app.store.demo import DEMO_PIN, create_demo_job

ROOT = Path(__file__).resolve().parents[1]
PASSPHRASE = "copper earth loop ninety"


def run(*args: str) -> subprocess.CompletedProcess[str]:
    return subprocess.run([sys.executable, "-m", "mobile_app", *map(str, args)], cwd=ROOT,
                          capture_output=True, text=True, timeout=120)


@pytest.fixture(scope="module")
def office(tmp_path_factory: pytest.TempPathFactory) -> Path:
    folder = tmp_path_factory.mktemp("office") / "office"
    phrase = folder.parent / "passphrase.txt"
    phrase.write_text(PASSPHRASE + "\n", encoding="utf-8")
    assert run("office", "init", "--dir", folder).returncode == 0
    enrolled = run("office", "enrol", "Ines Okafor", "--dir", folder, "--passphrase-file", phrase)
    assert enrolled.returncode == 0, enrolled.stderr
    assert "enrolled Ines Okafor until" in enrolled.stdout
    return folder


@pytest.fixture(scope="module")
def approved_doc(tmp_path_factory: pytest.TempPathFactory) -> dict[str, Any]:
    store = Store.open(tmp_path_factory.mktemp("device"))
    job_id = create_demo_job(store)
    people = {p["name"]: p["id"] for p in store.people.all()}
    store.review.submit(job_id, people["Tomasz Brill"])
    store.review.approve(job_id, people["Ines Okafor"], DEMO_PIN, reasons_for(store, job_id))
    doc = store.documents.export(job_id)
    store.close()
    return doc


def with_approval(doc: dict[str, Any], office: Path | None, pair=None, name: str = "Ines Okafor") -> dict:
    """The document with an approval signed by the enrolled key (or `pair`) and its roster entry."""
    entry = None
    if pair is None:
        sealed_path = next((office / "keys").glob("Ines-Okafor-*.json"))
        pair = asyncio.run(unlock(sealed_from_dict(json.loads(sealed_path.read_text())), PASSPHRASE))
        entry = json.loads((office / "roster" / sealed_path.name).read_text())
    approval = sign_approval(pair, name, doc, doc["job"]["approved_at"] or "", None)
    return {**doc, "approval": approval.to_dict(), "roster_entry": entry}


def bundle(doc: dict[str, Any], out: Path) -> Path:
    return write_bundle(doc, out).path


def edit_json_and_rehash(bundle_dir: Path, change) -> None:
    """Change the bundle's JSON and write a manifest that matches the change (an attacker's edit)."""
    manifest_path = bundle_dir / MANIFEST_NAME
    manifest = json.loads(manifest_path.read_text())
    json_name = next(name for name in manifest["files"] if name.endswith(".json"))
    path = bundle_dir / json_name
    doc = json.loads(path.read_text())
    change(doc)
    os.chmod(path, 0o644)
    data = (json.dumps(doc, ensure_ascii=False) + "\n").encode()
    path.write_bytes(data)
    manifest["files"][json_name] = {"sha256": hashlib.sha256(data).hexdigest(), "bytes": len(data)}
    os.chmod(manifest_path, 0o644)
    manifest_path.write_text(json.dumps(manifest, indent=2) + "\n")


def test_office_init_makes_a_firm_key_once(office: Path) -> None:
    assert (office / "firm-secret-key.json").stat().st_mode & 0o777 == 0o600
    again = run("office", "init", "--dir", office)
    assert again.returncode == 2 and "already exists" in again.stderr


def test_an_approval_by_the_enrolled_supervisor_verifies(office, approved_doc, tmp_path) -> None:
    result = run("verify", bundle(with_approval(approved_doc, office), tmp_path), "--office", office)
    assert result.returncode == 0, result.stdout + result.stderr
    assert result.stdout == f"approved by Ines Okafor at {approved_doc['job']['approved_at']}, verified\n"


def test_a_changed_reading_with_a_rehashed_manifest_fails_naming_the_circuit(office, approved_doc, tmp_path):
    path = bundle(with_approval(approved_doc, office), tmp_path)
    board = approved_doc["boards"][0]

    def change(doc: dict[str, Any]) -> None:
        doc["boards"][0]["circuits"][1]["fields"]["zs"]["value"] = 0.05

    edit_json_and_rehash(path, change)
    result = run("verify", path, "--office", office)
    assert result.returncode == 3
    number = board["circuits"][1]["number"]
    assert result.stdout == (f"changed reading: board {board['designation']} circuit {number} "
                             "differ from what was approved\n")


def test_a_changed_approval_reason_with_a_rehashed_manifest_fails(office, approved_doc, tmp_path):
    assert approved_doc["job"]["approval_reasons"]  # the demo is approved with failing circuits
    path = bundle(with_approval(approved_doc, office), tmp_path)

    def change(doc: dict[str, Any]) -> None:
        doc["job"]["approval_reasons"][0]["reason"] = "no reason at all"

    edit_json_and_rehash(path, change)
    result = run("verify", path, "--office", office)
    assert result.returncode == 3
    assert result.stdout == "changed reading: the job differ from what was approved\n"


def test_a_file_changed_without_rehashing_fails(office, approved_doc, tmp_path) -> None:
    path = bundle(with_approval(approved_doc, office), tmp_path)
    csv = next(path.glob("*.csv"))
    os.chmod(csv, 0o644)
    csv.write_bytes(csv.read_bytes().replace(b"pass", b"PASS", 1))
    result = run("verify", path, "--office", office)
    assert result.returncode == 3 and result.stdout.startswith("changed file: ")


def test_an_unsigned_job_fails(office, approved_doc, tmp_path) -> None:
    result = run("verify", bundle({**approved_doc, "approval": None}, tmp_path), "--office", office)
    assert result.returncode == 3 and result.stdout.startswith("unsigned: ")


def test_an_approval_edited_to_match_the_change_has_a_bad_signature(office, approved_doc, tmp_path):
    from mobile_app.signing import approved_parts, document_hash

    path = bundle(with_approval(approved_doc, office), tmp_path)

    def change(doc: dict[str, Any]) -> None:
        doc["boards"][0]["circuits"][1]["fields"]["zs"]["value"] = 0.05
        doc["approval"]["parts"] = approved_parts(doc)
        doc["approval"]["document_sha256"] = document_hash(doc["approval"]["parts"])

    edit_json_and_rehash(path, change)
    result = run("verify", path, "--office", office)
    assert result.returncode == 3 and result.stdout.startswith("bad signature: ")


def test_a_device_only_supervisor_is_unverified(office, approved_doc, tmp_path) -> None:
    doc = with_approval(approved_doc, None, pair=generate_key_pair())
    result = run("verify", bundle(doc, tmp_path), "--office", office)
    assert result.returncode == 3
    assert result.stdout == "unverified supervisor: Ines Okafor's key was never enrolled by the firm\n"


def test_a_roster_entry_the_office_removed_is_an_unknown_supervisor(office, approved_doc, tmp_path):
    path = bundle(with_approval(approved_doc, office), tmp_path)
    copy = tmp_path / "office-copy"
    subprocess.run(["cp", "-a", str(office), str(copy)], check=True)
    for entry in (copy / "roster").glob("Ines-Okafor-*.json"):
        entry.unlink()
    result = run("verify", path, "--office", copy)
    assert result.returncode == 3
    assert result.stdout == "unknown supervisor: Ines Okafor is not on the office's roster\n"


def test_an_approval_after_the_enrolment_expired_is_unverified(office, approved_doc, tmp_path):
    late = dict(approved_doc, job=dict(approved_doc["job"]))
    later = datetime.datetime.now(datetime.UTC) + datetime.timedelta(days=400)
    late["job"]["approved_at"] = later.isoformat(timespec="seconds")
    result = run("verify", bundle(with_approval(late, office), tmp_path), "--office", office)
    assert result.returncode == 3
    assert result.stdout.startswith("unverified supervisor: Ines Okafor's enrolment expired")


def test_enrol_refuses_a_lookalike_name_and_a_weak_passphrase(office, tmp_path) -> None:
    phrase = tmp_path / "p.txt"
    phrase.write_text(PASSPHRASE, encoding="utf-8")
    lookalike = run("office", "enrol", "Ines 0kafor", "--dir", office, "--passphrase-file", phrase)
    assert lookalike.returncode == 2 and "looks the same as 'Ines Okafor'" in lookalike.stderr
    phrase.write_text("2468", encoding="utf-8")
    weak = run("office", "enrol", "Rosa Quennell", "--dir", office, "--passphrase-file", phrase)
    assert weak.returncode == 2 and "passphrase refused: at least 20 characters" in weak.stderr


def test_verify_without_a_firm_key_is_a_usage_error(approved_doc, tmp_path) -> None:
    result = run("verify", bundle(approved_doc, tmp_path / "b"), "--office", tmp_path / "nowhere")
    assert result.returncode == 2 and "no firm-key.json" in result.stderr
