"""Issue 11 end to end, on real files: the office enrols a supervisor, the device approves with their
key, the office verifies the bundle; and every attack of the issue's "Why", each now refused.

The whole chain runs the command line (`office init`, `office enrol`, `verify`) as a user would.
"""

from __future__ import annotations

import hashlib
import json
import os
import sqlite3
import subprocess
import sys
import threading
from pathlib import Path
from typing import Any

import pytest
from approving import reasons_for
from pypdf import PdfReader

from mobile_app.export import export_bundle
from mobile_app.export.bundle import MANIFEST_NAME
from mobile_app.store import InvalidValueError, LockedOutError, PinError, Store
from mobile_app.store.demo import DEMO_PIN, create_demo_job
from mobile_app.store.pins import MAX_WRONG_PINS

ROOT = Path(__file__).resolve().parents[1]
PASSPHRASE = "copper earth loop ninety"
SUPERVISOR = "Ines Okafor"


def run(*args: object) -> subprocess.CompletedProcess[str]:
    return subprocess.run([sys.executable, "-m", "mobile_app", *map(str, args)], cwd=ROOT,
                          capture_output=True, text=True, timeout=120)


@pytest.fixture(scope="module")
def office(tmp_path_factory: pytest.TempPathFactory) -> Path:
    folder = tmp_path_factory.mktemp("trust") / "office"
    phrase = folder.parent / "passphrase.txt"
    phrase.write_text(PASSPHRASE + "\n", encoding="utf-8")
    assert run("office", "init", "--dir", folder).returncode == 0
    assert run("office", "enrol", SUPERVISOR, "--dir", folder, "--passphrase-file", phrase).returncode == 0
    return folder


def set_up_device(store: Store, office: Path) -> int:
    """Pin the firm key and load the roster from the office folder, install the supervisor's key."""
    assert store.roster.load_folder(office / "roster") == [SUPERVISOR]
    key_file = next((office / "keys").glob("Ines-Okafor-*.json"))
    assert store.roster.install_key(json.loads(key_file.read_text())) == SUPERVISOR
    return next(p["id"] for p in store.people.all() if p["name"] == SUPERVISOR)


def submitted_demo(store: Store) -> int:
    job_id = create_demo_job(store)
    rosa = next(p["id"] for p in store.people.all() if p["name"] == "Rosa Quennell")
    store.review.submit(job_id, rosa)
    return job_id


def rehash_json(bundle_dir: Path, change) -> None:
    """An attacker's edit of the bundle's JSON with a manifest made to match it."""
    manifest_path = bundle_dir / MANIFEST_NAME
    manifest = json.loads(manifest_path.read_text())
    name = next(n for n in manifest["files"] if n.endswith(".json"))
    doc = json.loads((bundle_dir / name).read_text())
    change(doc)
    data = (json.dumps(doc, ensure_ascii=False) + "\n").encode()
    os.chmod(bundle_dir / name, 0o644)
    (bundle_dir / name).write_bytes(data)
    manifest["files"][name] = {"sha256": hashlib.sha256(data).hexdigest(), "bytes": len(data)}
    os.chmod(manifest_path, 0o644)
    manifest_path.write_text(json.dumps(manifest))


def test_the_whole_chain(office: Path, tmp_path: Path) -> None:
    # Acceptance of issue 11: office init, office enrol, approve on the device, export, verify.
    with Store.open(tmp_path / "device") as store:
        ines = set_up_device(store, office)
        job_id = submitted_demo(store)
        with pytest.raises(PinError, match="wrong passphrase"):
            store.review.approve(job_id, ines, PASSPHRASE + "x", reasons_for(store, job_id))
        store.review.approve(job_id, ines, PASSPHRASE, reasons_for(store, job_id))
        approved_at = store.jobs.get(job_id)["approved_at"]
        bundle = export_bundle(store, job_id, tmp_path / "out").path
        assert store.integrity.check().ok
    verified = run("verify", bundle, "--office", office)
    assert verified.returncode == 0
    assert verified.stdout == f"approved by {SUPERVISOR} at {approved_at}, verified\n"

    def change(doc: dict[str, Any]) -> None:
        doc["boards"][0]["circuits"][2]["fields"]["zs"]["value"] = 0.12

    rehash_json(bundle, change)
    changed = run("verify", bundle, "--office", office)
    assert changed.returncode == 3
    assert changed.stdout.startswith("changed reading: board DB-1 circuit 3 differ from what was approved")


def test_a_device_only_supervisor_is_unverified_at_the_office(office: Path, tmp_path: Path) -> None:
    with Store.open(tmp_path / "device") as store:
        job_id = submitted_demo(store)  # the demo's Ines Okafor was added on the device with a PIN
        ines = next(p["id"] for p in store.people.all() if p["name"] == SUPERVISOR)
        store.review.approve(job_id, ines, DEMO_PIN, reasons_for(store, job_id))
        bundle = export_bundle(store, job_id, tmp_path / "out").path
        assert store.integrity.check().unverified == {job_id: f"{SUPERVISOR} is not enrolled by the firm"}
    pdf_text = " ".join(page.extract_text() for page in PdfReader(next(bundle.glob("*.pdf"))).pages)
    assert "Unverified approval" in " ".join(pdf_text.split())
    result = run("verify", bundle, "--office", office)
    assert result.returncode == 3
    assert result.stdout == f"unverified supervisor: {SUPERVISOR}'s key was never enrolled by the firm\n"


def test_an_enrolled_approval_survives_import_and_a_forged_one_does_not(office: Path, tmp_path: Path) -> None:
    with Store.open(tmp_path / "site") as site:
        ines = set_up_device(site, office)
        job_id = submitted_demo(site)
        site.review.approve(job_id, ines, PASSPHRASE, reasons_for(site, job_id))
        genuine = site.documents.export(job_id)
    forged = json.loads(json.dumps(genuine))
    forged["boards"][0]["circuits"][2]["fields"]["zs"]["value"] = 0.12
    with Store.open(tmp_path / "office-store") as other:
        other.roster.load_folder(office / "roster")
        kept = other.jobs.get(other.documents.import_(genuine))
        refused = other.documents.export(other.documents.import_(forged))
        assert other.integrity.check().ok
    assert kept["status"] == "approved"
    assert refused["job"]["status"] == "submitted"
    assert [a["new"] for a in refused["audit"] if a["field"] == "approval not kept"] == [
        "changed since approval: board DB-1 circuit 3"]


def test_a_forged_later_revision_does_not_supersede_the_approved_job(office: Path, tmp_path: Path) -> None:
    with Store.open(tmp_path / "site") as site:
        ines = set_up_device(site, office)
        job_id = submitted_demo(site)
        site.review.approve(job_id, ines, PASSPHRASE, reasons_for(site, job_id))
        genuine = site.documents.export(job_id)
    forged = json.loads(json.dumps(genuine))
    forged["job"].update(revision=2, parent_job_id=forged["job"]["id"], revision_reason="forged")
    with Store.open(tmp_path / "office-store") as other:
        other.roster.load_folder(office / "roster")
        genuine_id = other.documents.import_(genuine)
        forged_id = other.documents.import_(forged)
        listed = {j["id"]: j for j in other.jobs.all()}
    assert listed[genuine_id]["superseded"] == 0
    assert listed[forged_id]["status"] == "submitted" and listed[forged_id]["parent_job_id"] is None


@pytest.mark.parametrize("name", ["Ines\u200bOkafor", "Ines Oka\u200bfor", "Ines 0kafor", "ines okafor",
                                  "Ines Ok\u0430for"])
def test_a_lookalike_supervisor_cannot_be_added(tmp_path: Path, name: str) -> None:
    with Store.open(tmp_path) as store:
        store.people.add(SUPERVISOR, "supervisor", "2468")
        with pytest.raises(InvalidValueError, match="name: "):
            store.people.add(name, "supervisor", "1357")


def test_setting_a_pin_needs_the_old_pin_or_the_passphrase(office: Path, tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        ines = set_up_device(store, office)
        with pytest.raises(PinError, match="PIN or the passphrase"):
            store.people.set_pin(ines, "1111")
        store.people.set_pin(ines, "1111", PASSPHRASE)
        with pytest.raises(PinError, match="wrong PIN"):
            store.people.set_pin(ines, "2222", "9999")
        store.people.set_pin(ines, "2222", "1111")
        sue = store.people.add("Sue Reviewer", "supervisor", "4321")
        with pytest.raises(PinError):
            store.people.set_pin(sue, "1111")


def test_parallel_wrong_attempts_cannot_race_the_counter(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        job_id = submitted_demo(store)
        ines = next(p["id"] for p in store.people.all() if p["name"] == SUPERVISOR)
    outcomes: list[str] = []

    def attempt(pin: str) -> None:
        with Store.open(tmp_path) as own:  # a connection of its own, as another window would have
            try:
                own.review.approve(job_id, ines, pin, reasons_for(own, job_id))
                outcomes.append("approved")
            except LockedOutError:
                outcomes.append("locked")
            except PinError:
                outcomes.append("wrong")

    threads = [threading.Thread(target=attempt, args=("0000",)) for _ in range(11)]
    for thread in threads:
        thread.start()
    for thread in threads:
        thread.join(timeout=120)
    attempt(DEMO_PIN)
    assert outcomes.count("wrong") == MAX_WRONG_PINS - 1
    assert outcomes.count("approved") == 0 and outcomes[-1] == "locked"


def edited(path: Path, sql: str, params: tuple = ()) -> None:
    """Change the store file behind the app's back, as someone with the file would."""
    conn = sqlite3.connect(path)
    conn.execute(sql, params)
    conn.commit()
    conn.close()


def test_edits_to_the_store_file_are_found(office: Path, tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        ines = set_up_device(store, office)
        approved = submitted_demo(store)
        store.review.approve(approved, ines, PASSPHRASE, reasons_for(store, approved))
        other = create_demo_job(store)
        path = store.path
    edited(path, "UPDATE jobs SET status = 'approved' WHERE id = ?", (other,))
    edited(path, "UPDATE circuits SET zs_value = 0.12 WHERE id = (SELECT c.id FROM circuits c"
                 " JOIN boards b ON b.id = c.board_id WHERE b.job_id = ? ORDER BY c.id LIMIT 1)", (approved,))
    with Store.open(tmp_path) as store:
        report = store.integrity.check()
    assert report.broken == {approved: "changed since approval: board DB-1 circuit 1",
                             other: "approved without a signature"}
    assert report.chain_break is None and report.message.startswith("This store was altered")
    edited(path, "DELETE FROM audit WHERE id = 3")
    with Store.open(tmp_path) as store:
        assert store.integrity.check().chain_break == 4
