"""Job records on the device: the local store (sqlite-utils), never importing Flet.

Public surface (the store API agreed with the app, export and sync; additions marked *added*):

    from mobile_app.records import Store
    store = Store.open(data_dir)        # None -> platformdirs user data dir; WAL, FKs,
                                        # integrity check, migrations (backup first);
                                        # a bad file is moved aside
    store.recovered                     # *added*: MovedAside(original, moved_to, reason) or None
    salvage_jobs(store.recovered.moved_to) *added*: Salvage(documents, problems), the job
                                        documents still readable from the file moved aside
    store.backup_path                   # *added*: copy taken before the last migration, or None
    store.path, store.db, store.close()

    people:   add_person(name, role, pin=None) -> id ; set_pin(person_id, pin) *added* ; people()
    jobs:     create_job(fields, by=None) -> id ; list_jobs(search="") ; get_job(id)
              reassess_job(job_id) -> count *added* (after a settings change or a calc update)
              set_job_field(job_id, name, raw, by=None, expected_version=None) -> dict
    boards:   add_board(job_id, designation, location="", supplied_from="", by=None) -> id
              boards(job_id)
              set_board_field(board_id, name, raw, by=None, expected_version=None) -> dict
              BOARD_FIELDS *added* system and ze: blank = the job's supply (a TT outbuilding board
              has its own)
    circuits: add_circuit(board_id, number, description="", by=None) -> id ; circuits(board_id)
              get_circuit(id)
              set_circuit_field(circuit_id, name, raw, by=None, expected_version=None)
              calc_input(circuit_id) -> dict ; get_circuit()["assessment_error"] *added*: why calc
              could not assess (verdict "incomplete"), or None
    library:  add_library_device(name, points, rating_a=None) -> id ; library_devices()
    review:   submit_for_review(job_id, by) ; approve(job_id, supervisor_id, pin)
              return_to_draft(job_id, reviewer_id, comment)
              open_revision(job_id, reason, by) -> id
              audit(job_id) -> list[dict]
    settings: get_setting(key, default=None) ; set_setting(key, value)
    batch:    with store.batch(): ...  *added*: several changes committed as one
    documents: job_document(job_id) -> dict ; import_job_document(doc) -> id (the job as it was
              exported: status, revision, review, people, assessments, audit; one transaction)

Export (`mobile_app.records.export`; formats in EXPORT-FORMAT.md):
    export_bundle(store, job_id, out_dir, board_id=None) -> Bundle   # JSON, CSV, PDF + manifest
    read_bundle(path) -> Bundle          # re-checks every SHA-256 (BundleCheckError)
    import_job_json(store, data) -> id   # a JSON export back into the store (DocumentError)
    cli_export(job_id, data_dir, out_dir) -> exit code   # `python -m mobile_app export`

Outbox (`mobile_app.records.outbox`): Outbox(store.db) — enqueue(bundle_dir, job_id, revision)
    -> id, waiting(), sent(), due(), get(id), mark_sent(id), mark_failed(...), last_error();
    it takes the store's lock, so it may share a Store with other threads.

Sync (`mobile_app.records.sync`, WebDAV):
    SyncTarget(url, user, password) ; save_target(store, url, user, password) ;
    load_target(store) -> SyncTarget (NotConfiguredError, InsecureTargetError)
    sync_once(store, target, force=False) -> SyncReport ; sync_store(store, force=False) -> SyncReport
    SyncTask(data_dir, on_report=None).start() / .wake() / .stop()   # background, its own Store
    cli_sync(data_dir) -> exit code      # `python -m mobile_app sync`

Errors (all subclass StoreError and a builtin): NotFoundError, UnknownFieldError, ConflictError,
ReadOnlyError, ReviewError, PinError, LockedOutError, SaveError, OpenError (*added*: the folder
cannot be opened), MigrationError, StoreTooNewError, InvalidValueError (a blank name, a bad role or
curve), DocumentError (an import that is not a boardside-job document; the export raises this
same class). The export adds ExportError (a StoreError) with BundleExistsError and
BundleCheckError; the outbox raises OutboxError and the sync SyncError (neither is a StoreError),
each with subclasses of its own.
Only draft jobs can be changed; submitted and approved jobs raise ReadOnlyError.

Settings read by the store: "default_system", "default_u0" (text, "230 V"), "default_cmin"
("0.95") fill a new job's blank supply fields; "final_circuit_max_a" goes to calc as
settings.final_circuit_max_a. Returned rows carry a little more than agreed: people() has has_pin;
list_jobs() has version, parent_job_id, superseded (a newer revision exists) and updated_at;
audit() rows are id, when, who, person_id, entity, entity_id, field, what, old, new.
"""

from mobile_app.records.errors import (
    ConflictError,
    DocumentError,
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
from mobile_app.records.fields import BOARD_FIELDS, CIRCUIT_FIELDS, JOB_FIELDS
from mobile_app.records.salvage import Salvage, salvage_jobs
from mobile_app.records.schema import MovedAside
from mobile_app.records.store import Store

__all__ = [
    "BOARD_FIELDS",
    "CIRCUIT_FIELDS",
    "JOB_FIELDS",
    "ConflictError",
    "DocumentError",
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
