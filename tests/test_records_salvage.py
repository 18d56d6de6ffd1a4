"""What is still readable in a damaged store file that was moved aside, without changing that file."""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from damage import overwrite_root_page

from mobile_app.store import Store, salvage_jobs
from mobile_app.store.core import STORE_FILE
from mobile_app.store.demo import create_demo_job


def damage(folder: Path, table: str) -> Path:
    """A store with the demo job twice, its `table` root page overwritten, opened (so moved aside);
    returns where the damaged file was kept."""
    with Store.open(folder) as store:
        create_demo_job(store)
        create_demo_job(store)
    overwrite_root_page(folder / STORE_FILE, table)
    with Store.open(folder) as store:
        assert store.recovered is not None
        return store.recovered.moved_to


def test_a_damaged_audit_trail_still_gives_every_job_with_its_circuits(tmp_path: Path) -> None:
    kept = damage(tmp_path, "audit")
    before = kept.read_bytes()
    salvage = salvage_jobs(kept)
    assert [d["job"]["client_ref"] for d in salvage.documents] == ["TY-2026-118"] * 2
    assert [sum(len(b["circuits"]) for b in d["boards"]) for d in salvage.documents] == [22, 22]
    assert all(d["audit"] == [] for d in salvage.documents)
    assert salvage.problems == [
        "job 1, audit trail: database disk image is malformed",
        "job 2, audit trail: database disk image is malformed",
    ]
    json.dumps(salvage.documents)
    assert kept.read_bytes() == before


@pytest.mark.parametrize("table", ["circuits", "boards"])
def test_damaged_circuits_or_boards_leave_the_job_fields(tmp_path: Path, table: str) -> None:
    salvage = salvage_jobs(damage(tmp_path, table))
    assert [d["job"]["fields"]["site_address"]["raw"] for d in salvage.documents] == [
        "Unit 7, Tannery Yard, Harlow Mill Road, Wexcombe"
    ] * 2
    assert all(sum(len(b["circuits"]) for b in d["boards"]) == 0 for d in salvage.documents)
    assert salvage.problems and all("malformed" in p for p in salvage.problems)


def test_an_unreadable_job_list_or_a_non_sqlite_file_gives_nothing_but_says_why(tmp_path: Path) -> None:
    assert salvage_jobs(damage(tmp_path / "a", "jobs")).problems == [
        "the list of jobs cannot be read: database disk image is malformed"
    ]
    junk = tmp_path / "junk.sqlite"
    junk.write_bytes(b"not a database at all")
    salvage = salvage_jobs(junk)
    assert (salvage.documents, salvage.problems) == ([], ["not an SQLite file: nothing can be read"])
