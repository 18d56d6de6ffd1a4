"""The job store on a real SQLite file: opening, fields as typed, reassessment, library, settings,
the demo job and its command line."""

from __future__ import annotations

import subprocess
import sys
from collections.abc import Iterator
from pathlib import Path

import platformdirs
import pytest
import sqlite_utils

from mobile_app.store import (
    CIRCUIT_FIELDS,
    JOB_FIELDS,
    NotFoundError,
    Store,
    UnknownFieldError,
)
from mobile_app.store.core import Core, default_data_dir
from mobile_app.store.demo import BOARDS, DEMO_CURVE_NAME, create_demo_job
from mobile_app.store.errors import InvalidValueError
from mobile_app.store.library import Library
from mobile_app.store.schema import SCHEMA_VERSION, connect, migrate
from mobile_app.store.settings import Settings

ROOT = Path(__file__).resolve().parents[1]

B32_RING = {
    "role": "final",
    "device_kind": "mcb",
    "device_curve": "B",
    "device_rating": "32",
    "line_csa": "2.5",
    "line_material": "copper",
    "line_insulation": "thermoplastic-70",
    "cpc_csa": "1.5",
    "cpc_material": "copper",
    "cpc_arrangement": "in-cable",
}


@pytest.fixture
def store(tmp_path: Path) -> Iterator[Store]:
    """A fresh store in a temporary folder."""
    opened = Store.open(tmp_path)
    yield opened
    opened.close()


def make_circuit(store: Store, zs: str = "0.62") -> int:
    """A TN-C-S job with one board and a B32 ring circuit (2.5/1.5 mm² copper) with Zs typed."""
    job_id = store.jobs.create({"client_ref": "T-1", "system": "TN-C-S", "ze": "0.35"})
    board_id = store.boards.add(job_id, "DB1", "hall", "origin")
    circuit_id = store.circuits.add(board_id, "1", "ring")
    for name, raw in {**B32_RING, "zs": zs}.items():
        store.circuits.set_field(circuit_id, name, raw)
    return circuit_id


def test_open_sets_wal_foreign_keys_and_schema_version(store: Store, tmp_path: Path) -> None:
    conn = store.db.conn
    assert store.path == tmp_path / "boardside.sqlite"
    assert conn.execute("PRAGMA journal_mode").fetchone() == ("wal",)
    assert conn.execute("PRAGMA foreign_keys").fetchone() == (1,)
    assert conn.execute("PRAGMA user_version").fetchone() == (SCHEMA_VERSION,)
    assert store.recovered is None and store.backup_path is None


def test_default_folder_is_the_platformdirs_user_data_dir() -> None:
    assert default_data_dir() == Path(platformdirs.user_data_dir("Boardside", "Boardside"))


def test_foreign_keys_refuse_a_board_without_a_job(store: Store) -> None:
    with pytest.raises(Exception, match="FOREIGN KEY"):
        store.db.conn.execute("INSERT INTO boards (job_id, position) VALUES (999, 1)")


def test_job_fields_keep_raw_value_and_error(store: Store) -> None:
    job_id = store.jobs.create({"client_ref": "  Ref 7 ", "u0": "230 V", "ze": "0,35 Ω"})
    job = store.jobs.get(job_id)
    assert set(job["fields"]) == set(JOB_FIELDS)
    assert job["fields"]["client_ref"] == {"raw": "  Ref 7 ", "value": "Ref 7", "error": None}
    assert job["fields"]["ze"]["value"] == pytest.approx(0.35)
    assert job["fields"]["cmin"] == {"raw": "0.95", "value": 0.95, "error": None}
    saved = store.jobs.set_field(job_id, "pfc", "lots")
    assert saved["raw"] == "lots" and saved["value"] is None and saved["error"]
    assert store.jobs.get(job_id)["fields"]["pfc"]["raw"] == "lots"
    assert store.jobs.set_field(job_id, "system", "tt")["value"] == "TT"
    assert store.jobs.set_field(job_id, "system", "IT")["error"] == "must be one of: TN-C-S, TN-S, TT"
    assert store.jobs.set_field(job_id, "date", "24/11/2026")["value"] == "2026-11-24"
    assert store.jobs.set_field(job_id, "date", "yesterday")["error"]


def test_create_job_uses_default_settings(store: Store) -> None:
    store.settings.set("default_u0", "240 V")
    store.settings.set("default_system", "TN-S")
    fields = store.jobs.get(store.jobs.create({}))["fields"]
    assert fields["u0"]["value"] == 240.0 and fields["system"]["value"] == "TN-S"


def test_circuit_save_reassesses_and_bumps_the_version(store: Store) -> None:
    circuit_id = make_circuit(store)
    circuit = store.circuits.get(circuit_id)
    assert set(circuit["fields"]) == set(CIRCUIT_FIELDS)
    checks = {c["id"]: c["outcome"] for c in circuit["assessment"]["checks"]}
    assert checks["disconnection"] == "pass"
    assert circuit["verdict"] == "not-shown"  # polarity and insulation are not recorded here
    assert circuit["assessment"]["earth_fault_current_a"] == pytest.approx(230 * 0.95 / 0.62)
    assert circuit["calc_version"]
    saved = store.circuits.set_field(circuit_id, "zs", "1.9 Ω", expected_version=circuit["version"])
    assert saved == {
        "field": "zs",
        "raw": "1.9 Ω",
        "value": 1.9,
        "error": None,
        "version": circuit["version"] + 1,
        "verdict": "fail",
    }


def test_an_invalid_reading_is_kept_and_leaves_the_circuit_not_shown(store: Store) -> None:
    circuit_id = make_circuit(store)
    saved = store.circuits.set_field(circuit_id, "zs", "0.6.2")
    assert saved["verdict"] == "not-shown" and saved["error"]
    circuit = store.circuits.get(circuit_id)
    assert circuit["fields"]["zs"] == {"raw": "0.6.2", "value": None, "error": saved["error"]}
    assert circuit["assessment"] is None
    assert circuit["assessment_error"] == "invalid entries: circuit.zs"


def test_saving_the_same_text_again_changes_nothing(store: Store) -> None:
    circuit_id = make_circuit(store)
    before = store.circuits.get(circuit_id)
    audit_before = store.jobs.audit(before["job_id"])
    again = store.circuits.set_field(circuit_id, "zs", "0.62")
    assert again["version"] == before["version"]
    assert store.jobs.audit(before["job_id"]) == audit_before


def test_a_supply_change_reassesses_every_circuit_of_the_job(store: Store) -> None:
    circuit_id = make_circuit(store, zs="")
    store.circuits.set_field(circuit_id, "r1r2", "0.30")
    job_id = store.circuits.get(circuit_id)["job_id"]
    assert store.circuits.get(circuit_id)["assessment"]["zs_ohm"] == pytest.approx(0.65)
    store.jobs.set_field(job_id, "ze", "0.80")
    assert store.circuits.get(circuit_id)["assessment"]["zs_ohm"] == pytest.approx(1.10)


def test_a_board_supply_overrides_the_job_supply(store: Store) -> None:
    circuit_id = make_circuit(store)
    board_id = store.circuits.get(circuit_id)["board_id"]
    store.boards.set_field(board_id, "system", "TT")
    assert store.circuits.calc_input(circuit_id)["supply"]["system"] == "TT"
    assert store.circuits.get(circuit_id)["assessment"]["inputs"]["supply"]["system"] == "TT"
    store.boards.set_field(board_id, "system", "")
    assert store.circuits.calc_input(circuit_id)["supply"]["system"] == "TN-C-S"


def test_calc_input_follows_the_contract_shape(store: Store) -> None:
    circuit_id = make_circuit(store)
    store.circuits.set_field(circuit_id, "rcd_idn", "30 mA")
    store.settings.set("final_circuit_max_a", 63)
    assert store.circuits.calc_input(circuit_id) == {
        "supply": {"system": "TN-C-S", "u0": 230.0, "cmin": 0.95, "ze": 0.35},
        "circuit": {
            "role": "final",
            "device": {"kind": "mcb", "curve": "B", "rating": 32.0},
            "rcd": {"idn": 0.03, "type": "general"},
            "line": {"csa": 2.5, "material": "copper", "insulation": "thermoplastic-70"},
            "cpc": {"csa": 1.5, "material": "copper", "arrangement": "in-cable"},
        },
        "measured": {"zs": 0.62},
        "settings": {"final_circuit_max_a": 63},
    }


def test_a_new_circuit_copies_what_a_board_shares_but_not_rating_sizes_or_readings(store: Store) -> None:
    circuit_id = make_circuit(store)
    board_id = store.circuits.get(circuit_id)["board_id"]
    second = store.circuits.get(store.circuits.add(board_id, "2", "radial"))
    assert (second["fields"]["device_kind"]["raw"], second["fields"]["device_curve"]["raw"]) == ("mcb", "B")
    assert second["fields"]["line_insulation"]["raw"] == "thermoplastic-70"
    for own in ("device_rating", "line_csa", "cpc_csa", "zs"):
        assert second["fields"][own]["raw"] == "", own
    assert second["verdict"] == "not-shown"
    assert [c["number"] for c in store.circuits.of_board(board_id)] == ["1", "2"]


def test_list_jobs_counts_verdicts_and_searches(store: Store) -> None:
    circuit_id = make_circuit(store)
    board_id = store.circuits.get(circuit_id)["board_id"]
    store.circuits.add(board_id, "2")
    failing = store.circuits.add(board_id, "3")
    for name in ("device_rating", "line_csa", "cpc_csa"):  # not copied from circuit 1
        store.circuits.set_field(failing, name, B32_RING[name])
    store.circuits.set_field(failing, "zs", "5")
    other = store.jobs.create({"client_ref": "100%_sure", "site_address": "Quay"})
    (row,) = store.jobs.all("T-1")
    assert (row["circuits"], row["failing"], row["not_shown"]) == (3, 1, 2)
    assert [j["id"] for j in store.jobs.all("%_")] == [other]
    assert [j["id"] for j in store.jobs.all("quay")] == [other]
    assert len(store.jobs.all()) == 2


def test_unknown_field_and_missing_rows_raise_typed_errors(store: Store) -> None:
    circuit_id = make_circuit(store)
    with pytest.raises(UnknownFieldError, match="circuit has no field 'colour'"):
        store.circuits.set_field(circuit_id, "colour", "red")
    with pytest.raises(NotFoundError, match="no circuit with id 999"):
        store.circuits.get(999)
    with pytest.raises(NotFoundError):
        store.boards.add(999, "DB9")


def test_library_device_is_used_by_a_curve_circuit(store: Store) -> None:
    device_id = store.library.add("Test breaker", [(1000, 0.02), (130, 3000), (450, 30)], rating_a=100)
    assert store.library.all() == [
        {
            "id": device_id,
            "name": "Test breaker",
            "rating_a": 100.0,
            "points": [[130.0, 3000.0], [450.0, 30.0], [1000.0, 0.02]],
        }
    ]
    circuit_id = make_circuit(store)
    store.circuits.set_field(circuit_id, "device_kind", "curve")
    saved = store.circuits.set_field(circuit_id, "library_device_id", str(device_id))
    assert saved["error"] is None
    device = store.circuits.calc_input(circuit_id)["circuit"]["device"]
    assert device == {
        "kind": "curve",
        "points": [[130.0, 3000.0], [450.0, 30.0], [1000.0, 0.02]],
        "rating": 32.0,
    }
    assert store.circuits.set_field(circuit_id, "library_device_id", "77")["error"] == (
        "no device with id 77 in the library"
    )


def test_library_refuses_a_curve_whose_time_rises(store: Store) -> None:
    with pytest.raises(InvalidValueError, match="points: time must fall as current rises"):
        store.library.add("bad", [(100, 1), (200, 2)])
    with pytest.raises(InvalidValueError, match="name: must not be blank"):
        store.library.add("  ", [(100, 2), (200, 1)])


def test_settings_round_trip_json(store: Store) -> None:
    assert store.settings.get("sync_url", "none") == "none"
    store.settings.set("sync_url", "https://example.invalid/dav")
    store.settings.set("thresholds", {"a": [1, 2.5, None]})
    assert store.settings.get("sync_url") == "https://example.invalid/dav"
    assert store.settings.get("thresholds") == {"a": [1, 2.5, None]}


def test_a_part_works_alone_on_the_shared_core(tmp_path: Path) -> None:
    path = tmp_path / "parts.sqlite"
    db = sqlite_utils.Database(connect(path))
    migrate(db, path)
    core = Core(path, db)
    library, settings = Library(core), Settings(core)
    device_id = library.add("Test breaker", [(130, 3000), (1000, 0.02)])
    settings.set("final_circuit_max_a", 63)
    assert library.find(device_id) == library.all()[0] and library.find(device_id + 1) is None
    assert Settings(core).get("final_circuit_max_a") == 63
    assert core.lock is Store(path, db).core.lock
    db.close()


def test_people_never_show_the_pin_hash(store: Store) -> None:
    store.people.add("Ana", "supervisor", "482913")
    (person,) = store.people.all()
    assert person == {"id": 1, "name": "Ana", "role": "supervisor", "has_pin": 1, "enrolled": 0}
    stored = store.db.conn.execute("SELECT pin_hash FROM people").fetchone()[0]
    assert "482913" not in stored and stored.startswith("pbkdf2-sha256$")
    with pytest.raises(InvalidValueError, match="role: must be one of"):
        store.people.add("Bo", "boss")


def test_demo_job_has_mixed_devices_and_failures(store: Store) -> None:
    job_id = create_demo_job(store)
    (row,) = store.jobs.all()
    assert row["id"] == job_id and row["circuits"] >= 20
    assert row["failing"] >= 3 and row["not_shown"] >= 1
    circuits = [
        store.circuits.get(c["id"])
        for b in store.boards.of_job(job_id)
        for c in store.circuits.of_board(b["id"])
    ]
    kinds = {(c["fields"]["device_kind"]["value"], c["fields"]["device_curve"]["value"]) for c in circuits}
    assert {("mcb", "B"), ("mcb", "C"), ("mcb", "D"), ("fuse-gg", None), ("curve", None)} <= kinds
    assert [d["name"] for d in store.library.all()] == [DEMO_CURVE_NAME]
    tt_board = next(b for b in store.boards.of_job(job_id) if b["fields"]["system"]["value"] == "TT")
    assert all(
        store.circuits.get(c["id"])["fields"]["rcd_idn"]["value"] == 0.03
        for c in store.circuits.of_board(tt_board["id"])
    )
    assert all(c["assessment_error"] is None for c in circuits)
    assert len(circuits) == sum(len(board[4]) for board in BOARDS)


def test_demo_command_prints_the_job_id_last(tmp_path: Path) -> None:
    result = subprocess.run(
        [sys.executable, "-m", "mobile_app", "demo", "--data", str(tmp_path)],
        cwd=ROOT,
        capture_output=True,
        text=True,
        timeout=120,
        check=True,
    )
    job_id = int(result.stdout.strip().splitlines()[-1])
    with Store.open(tmp_path) as store:
        assert store.jobs.get(job_id)["fields"]["client_ref"]["raw"] == "TY-2026-118"


def test_the_demo_made_twice_reuses_its_people_and_curve(store: Store) -> None:
    first, second = create_demo_job(store), create_demo_job(store)
    assert first != second and len(store.jobs.all()) == 2
    assert len(store.people.all()) == 3 and len(store.library.all()) == 1


def test_a_batch_commits_together_or_not_at_all(store: Store) -> None:
    with pytest.raises(NotFoundError), store.batch():
        store.jobs.create({"client_ref": "half"})
        store.boards.add(999, "nowhere")
    assert store.jobs.all() == []
    with store.batch():
        job_id = store.jobs.create({"client_ref": "whole"})
        store.boards.add(job_id, "DB1")
    assert [j["client_ref"] for j in store.jobs.all()] == ["whole"]


def test_reassess_job_applies_a_changed_setting_to_a_draft_job(store: Store) -> None:
    circuit_id = make_circuit(store)
    job_id = store.circuits.get(circuit_id)["job_id"]
    assert store.circuits.get(circuit_id)["assessment"]["inputs"]["settings"] == {"final_circuit_max_a": 32.0}
    store.settings.set("final_circuit_max_a", 63)
    assert store.jobs.reassess(job_id) == 1
    assessed = store.circuits.get(circuit_id)["assessment"]["inputs"]
    assert assessed["settings"] == {"final_circuit_max_a": 63.0}


def test_the_after_commit_hook_runs_once_per_committed_write(store: Store) -> None:
    # The browser build copies the store file to browser storage from this hook, so every save that
    # commits must call it once, after the commit; a write that rolls back must not.
    from mobile_app.store.core import after_commit

    calls: list[int] = []

    def copied() -> None:
        calls.append(store.db.conn.in_transaction)

    after_commit(store.db, copied)
    job_id = store.jobs.create({"client_ref": "Hook"})
    assert calls == [False]
    with store.batch():
        store.jobs.set_field(job_id, "site_address", "1 Lane")
        store.jobs.set_field(job_id, "description", "two fields, one commit")
    assert calls == [False, False]
    with pytest.raises(ZeroDivisionError), store.batch():
        store.jobs.set_field(job_id, "site_address", "2 Lane")
        raise ZeroDivisionError
    assert len(calls) == 2 and store.jobs.get(job_id)["fields"]["site_address"]["raw"] == "1 Lane"
    after_commit(store.db, None)
    store.jobs.set_field(job_id, "site_address", "3 Lane")
    assert len(calls) == 2


def test_preview_assesses_typed_text_and_writes_nothing(store: Store) -> None:
    circuit_id = make_circuit(store)
    before = store.circuits.get(circuit_id)
    # B32 on IEC 60898-1: instantaneous at 5 In = 160 A, so Zs 13 Ω (If ≈ 17 A) does not clear in 0.4 s
    preview = store.circuits.preview(circuit_id, {"zs": "13"})
    assert preview["verdict"] == "fail"
    assert preview["fields"]["zs"] == {"raw": "13", "value": 13.0, "error": None}
    typo = store.circuits.preview(circuit_id, {"zsc": "0,4x"})
    assert typo["fields"]["zsc"]["value"] is None and typo["fields"]["zsc"]["error"]
    assert typo["verdict"] == "not-shown"  # a reading that does not parse leaves the verdict open
    assert store.circuits.get(circuit_id) == before
