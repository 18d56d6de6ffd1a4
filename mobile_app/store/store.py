"""The job store: `Store.open(data_dir)`, one connection shared by small parts.

Like sqlite-utils' Database handing out Tables, the Store holds one `Core` (the connection, its lock,
write transactions, the audit trail, the clock) and hands out one part per concern, each given the
core and the parts it uses:

    store.people     People     add, set_pin, all, get
    store.settings   Settings   get, set
    store.library    Library    add, all, find, users
    store.curves     Curves     update (a saved curve; its draft circuits reassessed)
    store.jobs       Jobs       create, all, get, set_field, reassess, overall, audit
    store.boards     Boards     add, of_job, get, set_field
    store.circuits   Circuits   add, copy, of_board, get, set_field, calc_input
    store.removals   Removals   circuit, board, curve (each with an audit entry), restore (undo)
    store.roster     Roster     firm_key, pin_firm_key, load, load_folder, install_key, entry_of
    store.instruments  Items    add, of_job, get, set_field, remove
    store.observations Items    add, of_job, get, set_field, set_circuits, remove
    store.review     Review     submit, return_to_draft, approve, open_revision
    store.documents  Documents  export, import_, salvage
    store.integrity  Integrity  check (the audit chain and every approved job)
"""

from __future__ import annotations

import contextlib
import sqlite3
from collections.abc import Iterator
from pathlib import Path
from typing import Literal, Self

import sqlite_utils

from mobile_app.store.boards import Boards
from mobile_app.store.circuits import Circuits
from mobile_app.store.core import STORE_FILE, Core, default_data_dir, save_reason
from mobile_app.store.curves import Curves
from mobile_app.store.documents import Documents
from mobile_app.store.errors import OpenError
from mobile_app.store.integrity import Integrity
from mobile_app.store.items import Items
from mobile_app.store.jobs import Jobs
from mobile_app.store.library import Library
from mobile_app.store.people import People
from mobile_app.store.removals import Removals
from mobile_app.store.review import Review
from mobile_app.store.roster import Roster
from mobile_app.store.schema import MovedAside, connect, migrate, move_aside, problem_with
from mobile_app.store.settings import Settings


class Store:
    """An open job store on the device (see the package docstring for its whole surface)."""

    def __init__(
        self,
        path: Path,
        db: sqlite_utils.Database,
        recovered: MovedAside | None = None,
        backup_path: Path | None = None,
    ) -> None:
        self.path = path
        self.db = db
        self.recovered = recovered
        self.backup_path = backup_path
        self.core = Core(path, db)
        self.people = People(self.core)
        self.settings = Settings(self.core)
        self.library = Library(self.core)
        self.circuits = Circuits(self.core, self.library, self.settings)
        self.boards = Boards(self.core, self.library, self.circuits)
        self.curves = Curves(self.core, self.library, self.circuits)
        self.removals = Removals(self.core, self.library, self.circuits)
        self.jobs = Jobs(self.core, self.library, self.settings, self.circuits)
        self.roster = Roster(self.core, self.people)
        self.instruments = Items(self.core, self.library, "instrument")
        self.observations = Items(self.core, self.library, "observation")
        self.documents = Documents(
            self.core,
            self.people,
            self.library,
            self.jobs,
            self.boards,
            self.circuits,
            self.roster,
            self.instruments,
            self.observations,
        )
        self.review = Review(self.core, self.people, self.documents)
        self.integrity = Integrity(self.core, self.roster, self.documents)

    @classmethod
    def open(cls, data_dir: Path | None = None, journal: Literal["WAL", "DELETE"] = "WAL") -> Self:
        """Open (or create) the store in `data_dir` (None: the user's app-data folder).

        Checks the file (a non-SQLite or damaged file is moved aside and `recovered` says so), turns
        on WAL (or `journal` "DELETE", a rollback journal: the browser build copies one file to
        browser storage, and a store opened in the mode it has is not rewritten at open) and foreign
        keys, runs pending migrations after taking a backup copy, and reassesses the
        circuits of draft jobs last assessed by another calc version (reviewed jobs keep theirs).
        """
        folder = Path(data_dir) if data_dir is not None else default_data_dir()
        try:
            folder.mkdir(parents=True, exist_ok=True)
            path = folder / STORE_FILE
            problem = problem_with(path)
            recovered = move_aside(path, problem) if problem else None
            conn = connect(path, journal)
        except (OSError, sqlite3.Error) as error:
            reason = save_reason(error) if isinstance(error, sqlite3.Error) else str(error)
            raise OpenError(str(folder), reason) from error
        db = sqlite_utils.Database(conn)
        try:
            backup_path = migrate(db, path)
        except BaseException:
            conn.close()
            raise
        store = cls(path, db, recovered, backup_path)
        store.circuits.reassess_stale_drafts()
        return store

    def close(self) -> None:
        """Close the connection (every save is already committed)."""
        self.db.close()

    def __enter__(self) -> Self:
        return self

    def __exit__(self, *exc_info: object) -> None:
        self.close()

    @contextlib.contextmanager
    def batch(self) -> Iterator[None]:
        """Several changes that commit together or not at all (each call inside is a savepoint)."""
        with self.core.write():
            yield


__all__ = ["Store"]
