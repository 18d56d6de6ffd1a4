"""One sync at a time per store: a lease row in the store's database, not a thread lock.

Before a run sends anything it takes the lease (table `sync_lease`, one row): it writes its own
holder token and an expiry time in one write transaction, and only if no other holder's lease is
still running. Another run, in this process, another process (the command line beside the app) or
the browser build (which has no threads), finds the lease taken and says a sync is running. The
lease is given back when the run ends; a run that was killed leaves a lease that simply expires. A run
ends at its own deadline (see `runner`), so the expiry is that deadline plus a margin: a live run's
lease never runs out under it.

Times are wall-clock seconds (`time.time()`), since holders may be different processes.
"""

from __future__ import annotations

import secrets
import time
from collections.abc import Callable
from dataclasses import dataclass

from sqlite_utils import Database

from mobile_app.store.core import db_lock, write_transaction

TABLE = "sync_lease"
MARGIN_S = 60.0


@dataclass(frozen=True)
class Lease:
    """A lease held by one run: its token and when it runs out (time.time() seconds)."""

    holder: str
    expires_at_s: float


def ensure_table(db: Database) -> None:
    """Create the one-row lease table if it is missing."""
    with db_lock(db):
        if TABLE in db.table_names():
            return
        with write_transaction(db) as conn:
            conn.execute(f"CREATE TABLE IF NOT EXISTS {TABLE} (id INTEGER PRIMARY KEY CHECK (id = 1),"
                         " holder TEXT NOT NULL, expires_at REAL NOT NULL)")


def take(db: Database, hold_s: float, clock: Callable[[], float] = time.time) -> Lease | None:
    """The lease for `hold_s` seconds (plus the margin), or None while another run holds it."""
    ensure_table(db)
    lease = Lease(secrets.token_hex(8), clock() + hold_s + MARGIN_S)
    with write_transaction(db) as conn:
        row = conn.execute(f"SELECT holder, expires_at FROM {TABLE} WHERE id = 1").fetchone()
        if row is not None and row[1] > clock():
            return None
        conn.execute(f"INSERT OR REPLACE INTO {TABLE} (id, holder, expires_at) VALUES (1, ?, ?)",
                     (lease.holder, lease.expires_at_s))
    return lease


def give_back(db: Database, lease: Lease) -> None:
    """End a lease this run holds (a lease taken over after it expired is left alone)."""
    with write_transaction(db) as conn:
        conn.execute(f"DELETE FROM {TABLE} WHERE id = 1 AND holder = ?", (lease.holder,))


def holder_until(db: Database, clock: Callable[[], float] = time.time) -> float | None:
    """When the running sync's lease runs out (time.time() seconds), or None if no sync runs."""
    ensure_table(db)
    with db_lock(db):
        row = db.conn.execute(f"SELECT expires_at FROM {TABLE} WHERE id = 1").fetchone()
    return row[0] if row is not None and row[0] > clock() else None
