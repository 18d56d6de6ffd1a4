"""Faults on save: a full disk, a read-only store, and two writers editing the same circuit."""

from __future__ import annotations

import contextlib
import os
import subprocess
import sys
import threading
from collections.abc import Iterator
from pathlib import Path

import pytest

from mobile_app.store import ConflictError, OpenError, ReadOnlyError, SaveError, Store


@pytest.fixture
def store(tmp_path: Path) -> Iterator[Store]:
    """A fresh store with one job, board and circuit (zs typed)."""
    opened = Store.open(tmp_path)
    job_id = opened.jobs.create({"client_ref": "F-1", "system": "TN-S", "ze": "0.3"})
    board_id = opened.boards.add(job_id, "DB1")
    circuit_id = opened.circuits.add(board_id, "1", "sockets")
    opened.circuits.set_field(circuit_id, "zs", "0.5")
    yield opened
    opened.close()


def snapshot(store: Store) -> tuple[dict, int]:
    """The circuit as stored and the length of the audit trail."""
    return store.circuits.get(1), len(store.jobs.audit(1))


def test_disk_full_refuses_the_save_and_writes_nothing(store: Store) -> None:
    # Simulated: PRAGMA max_page_count caps this connection's file at its current size, so SQLite
    # answers SQLITE_FULL exactly as it does when the device runs out of space.
    before = snapshot(store)
    conn = store.db.conn
    pages = conn.execute("PRAGMA page_count").fetchone()[0]
    conn.execute(f"PRAGMA max_page_count = {pages}")
    big = "long note " * 5000
    with pytest.raises(SaveError) as caught:
        store.circuits.set_field(1, "description", big)
    assert str(caught.value) == "not saved: the device storage is full; free some space and try again"
    assert isinstance(caught.value, OSError)
    assert snapshot(store) == before
    conn.execute("PRAGMA max_page_count = 1073741823")
    assert store.circuits.set_field(1, "description", big)["raw"] == big
    assert conn.execute("PRAGMA integrity_check").fetchone() == ("ok",)


def test_read_only_store_refuses_the_save_and_writes_nothing(store: Store) -> None:
    # Simulated: PRAGMA query_only makes SQLite refuse writes with SQLITE_READONLY, the code it
    # returns for a read-only file; root ignores chmod, so this works for every user.
    before = snapshot(store)
    store.db.conn.execute("PRAGMA query_only = ON")
    with pytest.raises(SaveError, match="not saved: the store's folder is read-only"):
        store.circuits.set_field(1, "zs", "0.7")
    store.db.conn.execute("PRAGMA query_only = OFF")
    assert snapshot(store) == before


@contextlib.contextmanager
def read_only_folder(folder: Path) -> Iterator[None]:
    """Make `folder` refuse new files: chmod 0o500 for a normal user; as root (who ignores modes)
    the immutable attribute (chattr +i, ext2/3/4 and a few others), or skip when that is refused."""
    if os.geteuid() != 0:
        folder.chmod(0o500)
        undo = ["chmod", "700", str(folder)]
    else:
        done = subprocess.run(["chattr", "+i", str(folder)], capture_output=True, check=False)
        if done.returncode != 0:
            pytest.skip(f"root, and chattr +i refused here: {done.stderr.decode().strip()}")
        undo = ["chattr", "-i", str(folder)]
    try:
        yield
    finally:
        subprocess.run(undo, check=True)


def test_a_read_only_empty_folder_gives_a_clear_error_at_open(tmp_path: Path) -> None:
    folder = tmp_path / "locked"
    folder.mkdir()
    with read_only_folder(folder), pytest.raises(OpenError) as caught:
        Store.open(folder)
    assert str(caught.value) == (
        f"cannot open the store in {folder}: the store's folder cannot be written"
        " (read-only or no permission)"
    )
    assert list(folder.iterdir()) == []


def test_a_store_in_a_read_only_folder_is_refused_not_moved_aside(tmp_path: Path) -> None:
    with Store.open(tmp_path) as store:
        store.jobs.create({"client_ref": "keep me"})
    before = sorted(p.name for p in tmp_path.iterdir())
    content = (tmp_path / "boardside.sqlite").read_bytes()
    with read_only_folder(tmp_path), pytest.raises(OpenError):
        Store.open(tmp_path)
    assert sorted(p.name for p in tmp_path.iterdir()) == before
    assert (tmp_path / "boardside.sqlite").read_bytes() == content
    with Store.open(tmp_path) as store:
        assert [j["client_ref"] for j in store.jobs.all()] == ["keep me"]


def test_a_second_writer_with_a_stale_version_is_told(store: Store) -> None:
    other = Store.open(store.path.parent)
    try:
        seen_here = store.circuits.get(1)["version"]
        seen_there = other.circuits.get(1)["version"]
        store.circuits.set_field(1, "zs", "0.61", expected_version=seen_here)
        with pytest.raises(ConflictError) as caught:
            other.circuits.set_field(1, "zs", "0.72", expected_version=seen_there)
        assert str(caught.value) == (
            f"circuit 1 was changed elsewhere (version {seen_there + 1}, you had {seen_there}):"
            " reload it before saving"
        )
        assert other.circuits.get(1)["fields"]["zs"]["raw"] == "0.61"
        fresh = other.circuits.get(1)["version"]
        assert other.circuits.set_field(1, "zs", "0.72", expected_version=fresh)["version"] == (fresh + 1)
    finally:
        other.close()


def test_job_and_board_rows_have_versions_too(store: Store) -> None:
    job_version = store.jobs.get(1)["version"]
    store.jobs.set_field(1, "ze", "0.31", expected_version=job_version)
    with pytest.raises(ConflictError, match="job 1 was changed elsewhere"):
        store.jobs.set_field(1, "ze", "0.32", expected_version=job_version)
    board_version = store.boards.of_job(1)[0]["version"]
    store.boards.set_field(1, "location", "cellar", expected_version=board_version)
    with pytest.raises(ConflictError, match="board 1 was changed elsewhere"):
        store.boards.set_field(1, "location", "loft", expected_version=board_version)


def test_a_writer_waits_for_the_other_rather_than_failing(store: Store) -> None:
    other = Store.open(store.path.parent)
    try:
        other.db.conn.execute("BEGIN IMMEDIATE")
        other.db.conn.execute("INSERT INTO settings (key, value) VALUES ('held', '1')")
        release = threading.Timer(0.3, lambda: other.db.conn.execute("COMMIT"))
        release.start()
        assert store.circuits.set_field(1, "zs", "0.55")["raw"] == "0.55"
        release.join()
        assert store.settings.get("held") == 1
        assert other.circuits.get(1)["fields"]["zs"]["raw"] == "0.55"
    finally:
        other.close()


def test_threads_sharing_one_store_do_not_interleave_transactions(store: Store) -> None:
    errors: list[BaseException] = []

    def save_many(worker: int) -> None:
        try:
            for n in range(25):
                store.circuits.set_field(1, "description", f"thread {worker} save {n}")
        except BaseException as error:  # collected and asserted below
            errors.append(error)

    threads = [threading.Thread(target=save_many, args=(worker,)) for worker in range(4)]
    for thread in threads:
        thread.start()
    for thread in threads:
        thread.join()
    assert errors == []
    saved = [a["new"] for a in store.jobs.audit(1) if a["field"] == "description"]
    assert len(saved) == 4 * 25
    assert store.db.conn.execute("PRAGMA integrity_check").fetchone() == ("ok",)


def test_opening_a_second_store_keeps_the_first_ones_locks(store: Store) -> None:
    # POSIX: closing any descriptor of a file drops every lock this process holds on it, so opening
    # the store file with open() beside a live connection let another process's change be lost.
    store.circuits.get(1)
    second = Store.open(store.path.parent)
    second.close()
    person = store.people.add("Ada Reviewer", "qualified")
    submit = (
        "import sys\n"
        "from pathlib import Path\n"
        "from mobile_app.store import Store\n"
        "s = Store.open(Path(sys.argv[1]))\n"
        "s.review.submit(1, int(sys.argv[2]))\n"
        "s.close()\n"
    )
    root = Path(__file__).resolve().parents[1]
    subprocess.run(
        [sys.executable, "-c", submit, str(store.path.parent), str(person)],
        check=True,
        cwd=root,
        timeout=60,
    )
    with pytest.raises(ReadOnlyError):
        store.circuits.set_field(1, "zs", "0.9")
    assert store.jobs.get(1)["status"] == "submitted"
