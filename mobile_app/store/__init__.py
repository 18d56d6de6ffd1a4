"""The job store on the device (sqlite-utils): jobs, boards, circuits, instruments, observations,
review, people, settings.

It imports only calc and never Flet; exports live in `mobile_app.export`, the outbox and the sync in
`mobile_app.sync`. One `Store` holds one connection and hands out one small part per concern, each
given the shared core (`store.core`: the connection's lock, write transactions, the audit trail and
the clock) and the parts it uses, so each can be read and tested alone.

Public surface:

    from mobile_app.store import Store
    store = Store.open(data_dir)    # None -> platformdirs user data dir; WAL, foreign keys, integrity
                                    # check, migrations (backup first); a damaged file is moved aside
    store.recovered                 # MovedAside(original, moved_to, reason) or None
    salvage_jobs(store.recovered.moved_to) -> Salvage(documents, problems, tables): the job documents
                                    # read row by row from the file moved aside (left unchanged)
                                    # through a fresh store; tables: {name: TableReport(rows,
                                    # from_pages, partial, missing_ids)}; Salvage.summary()
    store.backup_path               # the copy taken before the last migration, or None
    store.path, store.db, store.close(), `with Store.open(...) as store:`
    with store.batch(): ...         # several changes committed as one (or none)

    store.people     add(name, role, pin=None) -> id ; set_pin(person_id, pin) ; all() ; get(person_id)
    store.settings   get(key, default=None) ; set(key, value)
    store.library    add(name, points, rating_a=None) -> id ; all() ; find(device_id) -> dict | None
                     users(device_id) -> the circuits using a saved curve
    store.curves     update(device_id, name, points, rating_a=None, by=None) -> circuits reassessed
                     (refused with InUseError while a job in review or approved uses the curve)
    store.jobs       create(fields=None, by=None) -> id ; all(search="") ; get(job_id)
                     set_field(job_id, name, raw, by=None, expected_version=None) -> dict
                     reassess(job_id) -> count (after a settings change or a calc update)
                     overall(job_id) -> Overall(outcome, reasons): "satisfactory", "unsatisfactory"
                     (a circuit fails or an observation is serious) or "not-shown"
                     audit(job_id) -> list[dict]
    store.boards     add(job_id, designation, location="", supplied_from="", by=None) -> id
                     of_job(job_id) ; get(board_id)
                     set_field(board_id, name, raw, by=None, expected_version=None)
    store.circuits   add(board_id, number, description="", by=None) -> id ; of_board(board_id)
                     copy(circuit_id, by=None) -> id (next reference, readings blank)
                     get(circuit_id) ; set_field(circuit_id, name, raw, by=None, expected_version=None)
                     calc_input(circuit_id) -> dict
    store.instruments, store.observations   (a job's lists; only a draft's can change)
                     add(job_id, fields=None, by=None) -> id ; of_job(job_id) ; get(item_id)
                     set_field(item_id, name, raw, by=None, expected_version=None) ; remove(item_id)
                     observations.set_circuits(item_id, circuit_ids, by=None) -> ids (its job's)
    store.removals   circuit(id, by=None) / board(id, by=None) / curve(id, by=None) -> Removed ;
                     restore(removed, by=None) -> id   (each an audit entry; undo of a removal)
    store.review     submit(job_id, by) ; return_to_draft(job_id, reviewer_id, comment)
                     approve(job_id, supervisor_id, pin) ; open_revision(job_id, reason, by) -> id
    store.documents  export(job_id) -> dict ; import_(doc) -> id (the job as it was exported: status,
                     revision, review, people, assessments, audit; one transaction)

JOB_FIELDS, BOARD_FIELDS and CIRCUIT_FIELDS name every field (fields.py: INSTRUMENT_FIELDS,
OBSERVATION_FIELDS, SEVERITIES, PURPOSES; yes-or-no fields hold "yes" or "no"; a beyond-range reading
typed ">999" keeps ">999" as its value). A board's system, Ze (or Zdb) and PFC, when filled in, take
the place of the job's supply (a TT outbuilding board, a board at the end of a sub-main), and its RA is
the TT electrode's. A field save returns the field, its
text as typed, parsed value, error and the row's new version (a circuit's also its verdict); a
circuit's `get()["assessment_error"]` says why calc could not assess it (verdict "incomplete").

Errors (all subclass StoreError and a builtin): NotFoundError, UnknownFieldError, ConflictError,
ReadOnlyError, ReviewError, PinError, LockedOutError, SaveError, InUseError (a saved curve in use),
OpenError (the folder cannot be opened), MigrationError, StoreTooNewError, InvalidValueError (a
blank name, a bad role or curve),
DocumentError (an import that is not a boardside-job document, `where` naming the place, e.g.
`boards[0].circuits[3].fields.zs.raw`; `document_check.check_job_document(doc)` is the pure check
run before the import's transaction; the export raises this same class;
`mobile_app.export` adds ExportError, a StoreError, with subclasses of its own).
Only draft jobs can be changed; submitted and approved jobs raise ReadOnlyError.

Settings read by the store: "default_system", "default_u0" (text, "230 V"), "default_cmin"
("0.95") fill a new job's blank supply fields; "final_circuit_max_a" goes to calc as
settings.final_circuit_max_a. Rows: people.all() has id, name, role, has_pin; jobs.all() has
id, client_ref, site_address, date, status, revision, version, parent_job_id, updated_at,
superseded (a newer revision exists), circuits, failing, incomplete; audit rows are id, when, who,
person_id, entity, entity_id, field, what, old, new.

Modules: `store` (Store), `core` (Core, the lock, write transactions), `schema` (migrations, a
damaged file moved aside), `salvage` (rows of a damaged file into a fresh store), `pages` (rows
read from an SQLite file's pages), one module per part (`people`, `settings`, `library`, `jobs`,
`boards`, `circuits`, `curves`, `removals`, `items`, `review`, `documents`), `outcome` (a job's
overall outcome), `doc_versions` (older job documents brought up to date), `rows` (what the parts
share about a row's fields),
`fields` (parsing what was typed), `document_check` (a document's limits and shape before an
import), `assessment` (a circuit's calc input and assessment, pure),
`pins` (PIN verifiers), `errors`, `demo` with `demo_data` (the demo job).
"""

from mobile_app.store.errors import (
    ConflictError,
    DocumentError,
    InUseError,
    InvalidValueError,
    LockedOutError,
    MigrationError,
    NotFoundError,
    OpenError,
    PinError,
    ReadOnlyError,
    ReviewError,
    SaveError,
    StoreError,
    StoreTooNewError,
    UnknownFieldError,
)
from mobile_app.store.fields import BOARD_FIELDS, CIRCUIT_FIELDS, JOB_FIELDS
from mobile_app.store.salvage import Salvage, salvage_jobs
from mobile_app.store.schema import MovedAside
from mobile_app.store.store import Store

__all__ = [
    "BOARD_FIELDS",
    "CIRCUIT_FIELDS",
    "JOB_FIELDS",
    "ConflictError",
    "DocumentError",
    "InUseError",
    "InvalidValueError",
    "LockedOutError",
    "MigrationError",
    "MovedAside",
    "NotFoundError",
    "OpenError",
    "PinError",
    "ReadOnlyError",
    "ReviewError",
    "Salvage",
    "SaveError",
    "Store",
    "StoreError",
    "StoreTooNewError",
    "UnknownFieldError",
    "salvage_jobs",
]
