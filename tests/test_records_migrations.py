"""Schema versions: migrating files with data from every earlier version, the backup taken first,
a failing migration leaving the file as it was, a newer file refused, and bad files moved aside."""

from __future__ import annotations

import sqlite3
from pathlib import Path

import pytest
import sqlite_utils
from damage import overwrite_root_page

from mobile_app.store import MigrationError, Store, StoreTooNewError
from mobile_app.store.core import STORE_FILE
from mobile_app.store.demo import create_demo_job
from mobile_app.store.fields import parse_field
from mobile_app.store.schema import SCHEMA_VERSION, STEPS, build_migrations, migrate

CIRCUIT_TYPED = {
    "number": "1",
    "description": "Kitchen ring — façade side",
    "role": "final",
    "device_kind": "mcb",
    "device_curve": "B",
    "device_rating": "32",
    "line_csa": "2.5",
    "cpc_csa": "1.5",
    "cpc_arrangement": "in-cable",
    "zs": "0,62 Ω",
}


def triple(kind: str, name: str, raw: str) -> dict[str, object]:
    """The three columns of one typed field, parsed as the store parses it."""
    parsed = parse_field(kind, name, raw)
    return {f"{name}_raw": parsed.raw, f"{name}_value": parsed.value, f"{name}_error": parsed.error}


def old_store(folder: Path, version: int) -> Path:
    """A store file at schema `version` (1 … SCHEMA_VERSION-1) holding a job with one circuit."""
    folder.mkdir(parents=True, exist_ok=True)
    path = folder / STORE_FILE
    db = sqlite_utils.Database(path)
    build_migrations(STEPS[:version]).apply(db)
    db.execute(f"PRAGMA user_version={version}")
    stamp = "2026-01-05T08:00:00.000+00:00"
    db["people"].insert({"id": 1, "name": "Zoë Ålund", "role": "qualified", "created_at": stamp})
    db["jobs"].insert(
        {
            "id": 1,
            "status": "draft",
            "created_at": stamp,
            "updated_at": stamp,
            "recorded_by": 1,
            **triple("job", "client_ref", "OLD-1"),
            **triple("job", "system", "TN-S"),
            **triple("job", "u0", "230"),
            **triple("job", "cmin", "0.95"),
            **triple("job", "ze", "0.8"),
        }
    )
    db["boards"].insert({"id": 1, "job_id": 1, "position": 1, **triple("board", "designation", "DB-Ø")})
    circuit = {"id": 1, "board_id": 1, "position": 1, "updated_at": stamp, "verdict": "pass"}
    for name, raw in CIRCUIT_TYPED.items():
        circuit.update(triple("circuit", name, raw))
    db["circuits"].insert(circuit)
    db["audit"].insert(
        {
            "job_id": 1,
            "at": stamp,
            "person_id": 1,
            "entity": "circuit",
            "entity_id": 1,
            "field": "zs",
            "old": "",
            "new": "0,62 Ω",
        }
    )
    if version >= 2:
        db["library_devices"].insert(
            {
                "name": "old curve",
                "rating_a": 100,
                "points": "[[130, 3000], [600, 0.04]]",
                "created_at": stamp,
            }
        )
    if version >= 3:
        db.execute("UPDATE boards SET system_raw = 'TT', system_value = 'TT'")
    db.close()
    return path


def dump(path: Path) -> list[str]:
    """Every statement needed to rebuild the file, plus its user_version: its whole content."""
    conn = sqlite3.connect(path)
    try:
        return [*conn.iterdump(), str(conn.execute("PRAGMA user_version").fetchone())]
    finally:
        conn.close()


@pytest.mark.parametrize("version", range(1, SCHEMA_VERSION))
def test_every_earlier_version_migrates_with_its_data(tmp_path: Path, version: int) -> None:
    old_store(tmp_path, version)
    with Store.open(tmp_path) as store:
        assert store.db.conn.execute("PRAGMA user_version").fetchone() == (SCHEMA_VERSION,)
        job = store.jobs.get(1)
        assert (job["fields"]["client_ref"]["raw"], job["version"], job["revision"]) == ("OLD-1", 1, 1)
        circuit = store.circuits.get(1)
        assert circuit["fields"]["zs"] == {"raw": "0,62 Ω", "value": 0.62, "error": None}
        assert circuit["fields"]["description"]["raw"] == "Kitchen ring — façade side"
        assert circuit["fields"]["library_device_id"]["raw"] == ""
        assert store.people.all() == [{"id": 1, "name": "Zoë Ålund", "role": "qualified", "has_pin": 0,
                                          "enrolled": 0}]
        assert [a["new"] for a in store.jobs.audit(1)] == ["0,62 Ω"]
        assert len(store.library.all()) == (1 if version >= 2 else 0)
        assert store.boards.of_job(1)[0]["fields"]["system"]["value"] == ("TT" if version >= 3 else None)
        saved = store.circuits.set_field(1, "zs", "1.9", by=1, expected_version=1)
        assert (saved["version"], saved["verdict"]) == (2, "fail")
        backup = store.backup_path
    assert backup is not None and backup.parent == tmp_path / "backups"
    assert f"-v{version}-" in backup.name
    with sqlite_utils.Database(backup) as copy:
        assert copy.execute("PRAGMA user_version").fetchone() == (version,)
        assert copy.execute("SELECT zs_raw FROM circuits").fetchone() == ("0,62 Ω",)


def test_an_up_to_date_store_takes_no_backup(tmp_path: Path) -> None:
    Store.open(tmp_path).close()
    with Store.open(tmp_path) as store:
        assert store.backup_path is None
    assert not (tmp_path / "backups").exists()


def test_a_failing_migration_leaves_the_file_as_it_was(tmp_path: Path) -> None:
    path = old_store(tmp_path, 2)
    before = dump(path)

    def broken(db: sqlite_utils.Database) -> None:
        db.execute("ALTER TABLE jobs ADD COLUMN half_done TEXT")
        db.execute("UPDATE circuits SET zs_raw = 'overwritten'")
        raise RuntimeError("disk said no")

    db = sqlite_utils.Database(sqlite3.connect(path, isolation_level=None))
    with pytest.raises(MigrationError) as caught:
        migrate(db, path, (*STEPS, ("005_broken", broken)))
    db.close()
    assert str(caught.value) == (
        f"could not update the store {path}: RuntimeError: disk said no (file left unchanged)"
    )
    assert dump(path) == before
    assert len(list((tmp_path / "backups").iterdir())) == 1


def test_a_store_from_a_newer_app_is_refused_untouched(tmp_path: Path) -> None:
    path = old_store(tmp_path, SCHEMA_VERSION)
    with sqlite_utils.Database(path) as db:
        db["_sqlite_migrations"].insert(
            {"migration_set": "boardside", "name": "099_future", "applied_at": "2027-01-01"}
        )
    before = dump(path)
    with pytest.raises(StoreTooNewError, match="comes from a newer Boardside \\(099_future\\)"):
        Store.open(tmp_path)
    assert dump(path) == before


def test_a_file_that_is_not_sqlite_is_moved_aside(tmp_path: Path) -> None:
    (tmp_path / STORE_FILE).write_bytes(b"these are not the bytes you are looking for")
    with Store.open(tmp_path) as store:
        moved = store.recovered
        assert moved is not None and moved.reason == "not an SQLite file"
        assert moved.moved_to.read_bytes() == b"these are not the bytes you are looking for"
        assert moved.moved_to.name.startswith("boardside-unusable-")
        assert "kept as boardside-unusable-" in moved.message and "Nothing was deleted" in moved.message
        assert store.jobs.all() == []
        store.jobs.create({"client_ref": "fresh"})


def test_a_damaged_store_is_moved_aside_with_its_bytes(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        create_demo_job(store)
    data = overwrite_root_page(tmp_path / STORE_FILE, "circuits")
    with Store.open(tmp_path) as store:
        moved = store.recovered
        assert moved is not None and moved.reason.startswith("unreadable")
        assert moved.moved_to.read_bytes() == data
        assert store.jobs.all() == []
    with Store.open(tmp_path) as again:
        assert again.recovered is None


def test_moving_aside_twice_in_a_second_keeps_both_files(tmp_path: Path) -> None:
    for text in (b"first", b"second"):
        (tmp_path / STORE_FILE).write_bytes(text)
        Store.open(tmp_path).close()
    kept = sorted(p.read_bytes() for p in tmp_path.glob("boardside-unusable-*.sqlite"))
    assert kept == [b"first", b"second"]


def test_a_truncated_store_is_moved_aside(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        create_demo_job(store)
    path = tmp_path / STORE_FILE
    half = path.read_bytes()[: path.stat().st_size // 2]
    path.write_bytes(half)
    with Store.open(tmp_path) as store:
        assert store.recovered is not None
        assert store.recovered.reason == "unreadable: database disk image is malformed"
        assert store.recovered.moved_to.read_bytes() == half


def test_an_empty_file_is_simply_a_new_store(tmp_path: Path) -> None:
    (tmp_path / STORE_FILE).write_bytes(b"")
    with Store.open(tmp_path) as store:
        assert store.recovered is None
        assert store.db.conn.execute("PRAGMA user_version").fetchone() == (SCHEMA_VERSION,)
