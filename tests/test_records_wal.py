"""The store's -wal file after a crash: what is lost when it is deleted, and what the next start saves.

SQLite's write-ahead log holds the changes committed since the last checkpoint; the main file gets
them only when a checkpoint copies them over (sqlite.org/wal.html, "Checkpointing"). A process killed
between the two leaves them in the -wal alone. README.md ("Reliability") says the same in plain words.
"""

from __future__ import annotations

import signal
import sqlite3
import subprocess
import sys
from pathlib import Path

from mobile_app.store import Store
from mobile_app.store.core import STORE_FILE

ROOT = Path(__file__).resolve().parents[1]
# Saves `count` readings, acknowledging each after it is committed, then waits to be killed.
CHILD = """
import sys, time
from pathlib import Path
from mobile_app.store import Store
store = Store.open(Path(sys.argv[1]))
for n in range(int(sys.argv[2])):
    store.circuits.set_field(1, "description", f"save {n}")
    print("ack", n, flush=True)
print("done", flush=True)
time.sleep(60)
"""


def prepare(folder: Path) -> None:
    with Store.open(folder) as store:
        job_id = store.jobs.create({"client_ref": "WAL", "system": "TN-S"})
        store.circuits.add(store.boards.add(job_id, "DB1"), "1", "before the crash")


def crash_after_saves(folder: Path, count: int) -> None:
    """A child process saves `count` readings and is killed (SIGKILL) before it closes the store."""
    child = subprocess.Popen([sys.executable, "-c", CHILD, str(folder), str(count)], cwd=ROOT,
                             stdout=subprocess.PIPE, text=True)
    assert child.stdout is not None
    lines = [child.stdout.readline().strip() for _ in range(count + 1)]
    assert lines[-1] == "done"
    child.send_signal(signal.SIGKILL)
    child.wait(timeout=30)


def delete_wal(folder: Path) -> None:
    for suffix in ("-wal", "-shm"):
        (folder / (STORE_FILE + suffix)).unlink(missing_ok=True)


def description(folder: Path) -> str:
    with Store.open(folder) as store:
        assert store.recovered is None
        return store.circuits.get(1)["fields"]["description"]["raw"]


def test_deleting_the_wal_after_a_crash_loses_the_saves_not_yet_checkpointed(tmp_path: Path) -> None:
    prepare(tmp_path)  # closed: everything so far is in the store file
    crash_after_saves(tmp_path, 20)
    assert (tmp_path / (STORE_FILE + "-wal")).stat().st_size > 0
    delete_wal(tmp_path)  # e.g. only the .sqlite file copied to a new phone
    conn = sqlite3.connect(tmp_path / STORE_FILE)
    assert conn.execute("PRAGMA integrity_check").fetchall() == [("ok",)]  # intact, but older
    conn.close()
    assert description(tmp_path) == "before the crash"  # the 20 acknowledged saves are gone


def test_the_next_start_puts_what_the_wal_held_into_the_store_file(tmp_path: Path) -> None:
    # Store.open checks the file with a connection of its own and closes it: the last connection to
    # close checkpoints the -wal into the file (sqlite.org/wal.html).
    prepare(tmp_path)
    crash_after_saves(tmp_path, 20)
    crash_after_saves(tmp_path, 0)  # the app starts again, and is killed again before it closes
    delete_wal(tmp_path)
    assert description(tmp_path) == "save 19"  # nothing acknowledged was lost
