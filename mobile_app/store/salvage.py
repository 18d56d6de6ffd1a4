"""Reading what is still readable from a store file that was moved aside as damaged.

The damaged file is never changed: it is copied (with its -wal, which is then checkpointed into
the copy) to a temporary folder. Every table is read into a fresh store, keeping each row's id:

1. with SQLite, the whole table at once (`SELECT rowid, *`): a table none of whose pages is damaged
   reads whole;
2. where SQLite refuses, row by row from the file's pages (`pages`): the table's tree as far as it
   reads, the leaf pages cut off from it by a damaged interior page (a leaf belongs to the table
   whose columns its rows fit), and the cells of a page whose header is damaged.

Rows whose job, board or person was lost get a stand-in ("Recovered board 7"), so no circuit or
reading is dropped for want of its parent; an assessment whose text was damaged is dropped and the
circuit shown as not assessed. The report says, table by table, how many rows were read, how many
lost columns, and which ids are missing (rows are never deleted in a store, so a gap is a lost row).
The jobs of the fresh store are then read as job documents, in the shape of
`store.documents.export`, which `store.documents.import_` loads into the store in use.
"""

from __future__ import annotations

import json
import shutil
import sqlite3
import tempfile
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from mobile_app.store import pages
from mobile_app.store.core import now_iso
from mobile_app.store.errors import StoreError
from mobile_app.store.schema import SQLITE_HEADER
from mobile_app.store.store import Store

# tables in the order their rows go in (parents first); others found in the file follow
ORDER = ("people", "settings", "library_devices", "jobs", "boards", "circuits", "audit", "outbox")
SKIP = {"_sqlite_migrations", "sync_lease"}
Column = tuple[str, str, bool, Any, bool]  # name, declared type, not null, default, the rowid alias


@dataclass
class TableReport:
    """What was read of one table: rows, rows read from pages, rows with lost columns, missing ids."""

    rows: int = 0
    from_pages: int = 0
    partial: int = 0
    missing_ids: list[int] = field(default_factory=list)
    unreadable_pages: int = 0

    def phrase(self, name: str) -> str:
        """`circuits: 40 read (2 from damaged pages), ids 12, 13 lost`."""
        text = f"{name}: {self.rows} read"
        if self.from_pages:
            text += f" ({self.from_pages} from damaged pages)"
        if self.partial:
            text += f", {self.partial} with parts lost"
        if self.missing_ids:
            shown = ", ".join(map(str, self.missing_ids[:8])) + (" …" if len(self.missing_ids) > 8 else "")
            text += f", ids {shown} lost"
        return text


@dataclass(frozen=True)
class Salvage:
    """Job documents read from a damaged file, what could not be read, and the table-by-table report."""

    documents: list[dict[str, Any]] = field(default_factory=list)
    problems: list[str] = field(default_factory=list)
    tables: dict[str, TableReport] = field(default_factory=dict)

    def summary(self) -> str:
        """One sentence per table that lost something, for the person using the app."""
        losing = [r.phrase(n) for n, r in self.tables.items() if r.missing_ids or r.partial]
        return "; ".join(losing) if losing else "every row that was found could be read"


def salvage_jobs(path: Path) -> Salvage:
    """Every job document that can still be read from the store file at `path` (left unchanged)."""
    with path.open("rb") as handle:
        if handle.read(16) != SQLITE_HEADER:
            return Salvage([], ["not an SQLite file: nothing can be read"])
    with tempfile.TemporaryDirectory() as folder:
        fresh, tables, problems = salvage_store(path, Path(folder) / "fresh")
        with fresh:
            documents = []
            for (job_id,) in fresh.db.conn.execute("SELECT id FROM jobs ORDER BY id").fetchall():
                try:
                    documents.append(fresh.documents.salvage(job_id, problems))
                except (StoreError, sqlite3.DatabaseError) as error:
                    problems.append(f"job {job_id}: {error}")
    return Salvage(documents, problems, tables)


def salvage_store(path: Path, out_dir: Path) -> tuple[Store, dict[str, TableReport], list[str]]:
    """Every readable row of the store file at `path` (left unchanged) in a fresh store in `out_dir`:
    the open fresh store, the report per table and the problems met."""
    problems: list[str] = []
    with tempfile.TemporaryDirectory() as folder:
        copy = Path(folder) / "damaged.sqlite"
        shutil.copyfile(path, copy)
        wal = path.with_name(path.name + "-wal")
        if wal.exists():
            shutil.copyfile(wal, copy.with_name(copy.name + "-wal"))
        _checkpoint(copy, problems)
        fresh = Store.open(out_dir)
        try:
            tables = _copy_rows(copy, fresh, problems)
        except BaseException:
            fresh.close()
            raise
    return fresh, tables, problems


def _checkpoint(copy: Path, problems: list[str]) -> None:
    """Bring the copy's -wal into it, so its pages hold the last committed changes."""
    if not copy.with_name(copy.name + "-wal").exists():
        return
    try:
        conn = sqlite3.connect(str(copy), isolation_level=None)
        try:
            conn.execute("PRAGMA wal_checkpoint(TRUNCATE)")
        finally:
            conn.close()
    except sqlite3.DatabaseError as error:
        problems.append(f"the changes in the -wal file could not be read: {error}")


def _columns(conn: sqlite3.Connection, table: str) -> list[Column]:
    """A table's columns as PRAGMA table_info gives them."""
    rows = conn.execute(f'PRAGMA table_info("{table}")').fetchall()
    aliased = [r for r in rows if r[5] == 1]
    alias = aliased[0][1] if len(aliased) == 1 and aliased[0][2].upper() == "INTEGER" else None
    return [(r[1], r[2].upper(), bool(r[3]), r[4], r[1] == alias) for r in rows]


def _schema(copy: Path, fresh: Store, problems: list[str]) -> dict[str, tuple[int | None, list[Column]]]:
    """Each table's root page and columns in the damaged file, or the fresh store's columns with no
    root when the file's list of tables cannot be read."""
    try:
        conn = sqlite3.connect(f"file:{copy}?mode=ro", uri=True)
        try:
            roots = conn.execute("SELECT name, rootpage FROM sqlite_master WHERE type = 'table'").fetchall()
            return {name: (root, _columns(conn, name)) for name, root in roots
                    if not name.startswith("sqlite_") and name not in SKIP}
        finally:
            conn.close()
    except sqlite3.DatabaseError as error:
        problems.append(f"the list of tables cannot be read ({error}): rows are told apart by their columns")
    names = [n for (n,) in fresh.db.conn.execute("SELECT name FROM sqlite_master WHERE type = 'table'")]
    return {n: (None, _columns(fresh.db.conn, n)) for n in names if not n.startswith("sqlite_")
            and n not in SKIP}


def _fits(columns: list[Column]) -> Any:
    """A test that a record has this table's columns: their number, and each value of its column's
    kind (the rowid alias is stored as null; a NOT NULL column holds a value)."""
    def fits(values: tuple[object, ...]) -> bool:
        if len(values) != len(columns):
            return False
        for value, (_name, kind, not_null, _default, alias) in zip(values, columns, strict=True):
            if value is pages.MISSING:
                continue
            if alias:
                if value is not None:
                    return False
            elif value is None:
                if not_null:
                    return False
            elif not _kind_ok(value, kind):
                return False
        return True
    return fits


def _kind_ok(value: object, kind: str) -> bool:
    """A value fits a declared column type (SQLite's affinity names)."""
    if "INT" in kind:
        return isinstance(value, int)
    if "CHAR" in kind or "CLOB" in kind or "TEXT" in kind:
        return isinstance(value, str)
    if "REAL" in kind or "FLOA" in kind or "DOUB" in kind:
        return isinstance(value, int | float)
    return True


def _copy_rows(copy: Path, fresh: Store, problems: list[str]) -> dict[str, TableReport]:
    """Read every table of the copy and write its rows into the fresh store (ids kept)."""
    schema = _schema(copy, fresh, problems)
    data = copy.read_bytes()
    layout = pages.layout_of(data)
    read: dict[str, dict[int, pages.Row | tuple[object, ...]]] = {}
    reports = {name: TableReport() for name in schema}
    failed: dict[str, pages.Tree] = {}
    for name, (root, _columns_of) in schema.items():
        rows = _read_with_sqlite(copy, name)
        if rows is not None:
            read[name] = rows
            continue
        failed[name] = pages.walk_table(data, layout, root) if root else pages.Tree()
    _read_pages(data, layout, schema, failed, read, reports)
    conn = fresh.db.conn
    conn.execute("PRAGMA foreign_keys = OFF")
    conn.execute("BEGIN IMMEDIATE")
    try:
        for name in sorted(schema, key=lambda n: ORDER.index(n) if n in ORDER else len(ORDER)):
            _insert(conn, name, schema[name][1], read.get(name, {}), reports[name], problems)
        _stand_ins(conn, problems)
        _drop_broken_assessments(conn, problems)
        conn.execute("COMMIT")
    except BaseException:
        conn.execute("ROLLBACK")
        raise
    finally:
        conn.execute("PRAGMA foreign_keys = ON")
    for name, ids in _known_ids(conn, read).items():
        reports[name].missing_ids = sorted(ids - set(read.get(name, {})))
    return reports


def _known_ids(conn: sqlite3.Connection, read: dict[str, dict[int, Any]]) -> dict[str, set[int]]:
    """The ids each table must have held: every id up to the largest read (rows are never deleted)
    and every id the audit trail names."""
    named = {"jobs": "SELECT DISTINCT job_id FROM audit",
             "boards": "SELECT DISTINCT entity_id FROM audit WHERE entity = 'board'",
             "circuits": "SELECT DISTINCT entity_id FROM audit WHERE entity = 'circuit'",
             "people": "SELECT DISTINCT person_id FROM audit"}
    known: dict[str, set[int]] = {}
    for name in ("people", "library_devices", "jobs", "boards", "circuits"):
        ids = set(read.get(name, {}))
        if name in named:
            ids |= {r[0] for r in conn.execute(named[name]) if isinstance(r[0], int)}
        if ids:
            known[name] = set(range(1, max(ids) + 1))
    return known


def _read_with_sqlite(copy: Path, table: str) -> dict[int, tuple[object, ...]] | None:
    """Every row of a table by rowid, read by SQLite; None if SQLite refuses."""
    try:
        conn = sqlite3.connect(f"file:{copy}?mode=ro", uri=True)
        try:
            return {row[0]: tuple(row[1:]) for row in conn.execute(f'SELECT rowid, * FROM "{table}"')}
        finally:
            conn.close()
    except sqlite3.DatabaseError:
        return None


def _read_pages(data: bytes, layout: pages.Layout, schema: dict[str, tuple[int | None, list[Column]]],
                failed: dict[str, pages.Tree], read: dict[str, dict[int, Any]],
                reports: dict[str, TableReport]) -> None:
    """The rows of the tables SQLite refused, from the pages: their trees as far as they read,
    leaves cut off from every tree (matched to a table by its columns), and carved damaged pages."""
    if not failed:
        return
    owned = set(pages.freelist(data, layout))
    for name, (root, _cols) in schema.items():
        if name not in failed and root:
            owned |= pages.walk_table(data, layout, root).pages
    found: dict[str, list[pages.Row]] = {name: [] for name in failed}
    for name, tree in failed.items():
        owned |= tree.pages
        for leaf in tree.leaves:
            rows, broken = pages.leaf_rows(data, layout, leaf)
            found[name] += rows
            reports[name].unreadable_pages += bool(broken)
        fits = _fits(schema[name][1])
        for number in tree.damaged:
            found[name] += list(pages.carve(data, layout, number, len(schema[name][1]), fits))
            reports[name].unreadable_pages += 1
    tests = {name: _fits(schema[name][1]) for name in failed}
    for leaf in pages.table_leaves(data, layout):
        if leaf in owned:
            continue
        for row in pages.leaf_rows(data, layout, leaf)[0]:
            owners = [name for name, fits in tests.items() if fits(row.values)]
            if len(owners) == 1:
                found[owners[0]].append(row)
    for name, rows in found.items():
        kept: dict[int, pages.Row] = {}
        for row in rows:
            if row.rowid not in kept or (row.whole and not kept[row.rowid].whole):
                kept[row.rowid] = row
        read[name] = kept
        reports[name].from_pages = len(kept)


def _insert(conn: sqlite3.Connection, table: str, columns: list[Column], rows: dict[int, Any],
            report: TableReport, problems: list[str]) -> None:
    """Write one table's rows into the fresh store, by column name, ids kept (a row the fresh store
    made itself, such as a setting written at its creation, gives way to the file's); a lost value
    takes the column's default, or a blank where the column needs one."""
    here = {c[0]: c for c in _columns(conn, table)} if _exists(conn, table) else {}
    if not here:
        problems.append(f"{table}: this version has no such table; its {len(rows)} rows were not kept")
        return
    for rowid, row in sorted(rows.items()):
        values = row.values if isinstance(row, pages.Row) else row
        record: dict[str, Any] = {}
        lost = False
        for (name, _kind, _nn, _default, alias), value in zip(columns, values, strict=False):
            if name not in here:
                continue
            if alias:
                record[name] = rowid
            elif value is pages.MISSING:
                lost = True
                if here[name][2] and here[name][3] is None:
                    record[name] = _blank(here[name][1], name)
            else:
                record[name] = value
        names = ", ".join(f'"{n}"' for n in record)
        marks = ", ".join("?" for _ in record)
        try:
            conn.execute(f'INSERT OR REPLACE INTO "{table}" ({names}) VALUES ({marks})',
                         tuple(record.values()))
        except sqlite3.DatabaseError as error:
            problems.append(f"{table} row {rowid} could not be kept: {error}")
            continue
        report.rows += 1
        report.partial += lost


def _exists(conn: sqlite3.Connection, table: str) -> bool:
    return conn.execute("SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = ?",
                        (table,)).fetchone() is not None


def _blank(kind: str, name: str) -> Any:
    """A stand-in for a lost value a column cannot do without: a time is now, a number 0, text ''."""
    if name.endswith("_at"):
        return now_iso()
    return 0 if "INT" in kind or "REAL" in kind else ""


def _stand_ins(conn: sqlite3.Connection, problems: list[str]) -> None:
    """Rows standing in for lost parents: jobs of boards and audit entries, boards of circuits (their
    job taken from the audit trail where it says), people named by jobs, circuits and the trail."""
    stamp = now_iso()
    boards_job = dict(conn.execute(
        "SELECT entity_id, job_id FROM audit WHERE entity = 'board' AND job_id IS NOT NULL").fetchall())
    orphans = "SELECT DISTINCT board_id FROM circuits WHERE board_id NOT IN (SELECT id FROM boards)"
    for (board_id,) in conn.execute(orphans).fetchall():
        job_id = boards_job.get(board_id) or _lost_job_for_boards(conn, stamp)
        conn.execute("INSERT INTO boards (id, job_id, position, designation_raw) VALUES (?, ?, ?, ?)",
                     (board_id, job_id, board_id, f"Recovered board {board_id}"))
        _fields_from_audit(conn, "boards", "board", board_id)
        problems.append(f"board {board_id} was lost: its circuits are kept under "
                        f"'Recovered board {board_id}'")
    for (job_id,) in conn.execute(
            "SELECT job_id FROM boards WHERE job_id NOT IN (SELECT id FROM jobs) UNION "
            "SELECT job_id FROM audit WHERE job_id IS NOT NULL AND job_id NOT IN (SELECT id FROM jobs)"
    ).fetchall():
        conn.execute("INSERT INTO jobs (id, created_at, updated_at, client_ref_raw) VALUES (?, ?, ?, ?)",
                     (job_id, stamp, stamp, f"Recovered job {job_id}"))
        _fields_from_audit(conn, "jobs", "job", job_id)
        problems.append(f"job {job_id} was lost: its boards are kept under 'Recovered job {job_id}'")
    named = ("SELECT recorded_by FROM jobs UNION SELECT submitted_by FROM jobs UNION "
             "SELECT approved_by FROM jobs UNION SELECT updated_by FROM circuits UNION "
             "SELECT person_id FROM audit")
    approvers = {r[0] for r in conn.execute("SELECT approved_by FROM jobs")}
    people = {r[0] for r in conn.execute("SELECT id FROM people")}
    for person_id in sorted({r[0] for r in conn.execute(named) if r[0] is not None} - people):
        role = "supervisor" if person_id in approvers else "apprentice"
        conn.execute("INSERT INTO people (id, name, role, created_at) VALUES (?, ?, ?, ?)",
                     (person_id, f"Person {person_id} (name lost)", role, stamp))
        problems.append(f"person {person_id} was lost: shown as 'Person {person_id} (name lost)'")


def _fields_from_audit(conn: sqlite3.Connection, table: str, entity: str, item_id: int) -> None:
    """Put back into a stand-in row the text typed in each field as the audit trail last recorded
    it (a board's designation is recorded when the board is added)."""
    columns = {c[0] for c in _columns(conn, table)}
    entries = conn.execute("SELECT field, new FROM audit WHERE entity = ? AND entity_id = ? ORDER BY id",
                           (entity, item_id)).fetchall()
    latest: dict[str, str] = {}
    for name, new in entries:
        name = name or ("designation" if entity == "board" else None)
        if name and f"{name}_raw" in columns and new is not None:
            latest[name] = new
    for name, text in latest.items():
        conn.execute(f'UPDATE "{table}" SET "{name}_raw" = ? WHERE id = ?', (text, item_id))


def _lost_job_for_boards(conn: sqlite3.Connection, stamp: str) -> int:
    """A job to hold boards whose job is not known at all."""
    row = conn.execute("SELECT id FROM jobs WHERE client_ref_raw = 'Recovered boards'").fetchone()
    if row:
        return int(row[0])
    return int(conn.execute("INSERT INTO jobs (created_at, updated_at, client_ref_raw) VALUES (?, ?, ?)",
                            (stamp, stamp, "Recovered boards")).lastrowid or 0)


def _drop_broken_assessments(conn: sqlite3.Connection, problems: list[str]) -> None:
    """An assessment whose text does not read as JSON is dropped: the circuit is not assessed."""
    for circuit_id, text in conn.execute(
            "SELECT id, assessment FROM circuits WHERE assessment IS NOT NULL").fetchall():
        try:
            json.loads(text)
        except (TypeError, ValueError):
            conn.execute("UPDATE circuits SET assessment = NULL, verdict = 'incomplete',"
                         " calc_version = NULL WHERE id = ?", (circuit_id,))
            problems.append(f"circuit {circuit_id}: its assessment was damaged; it shows as not assessed")
