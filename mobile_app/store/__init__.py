"""The job store on the device (sqlite-utils): jobs, boards, circuits, review, people, settings.

It imports only calc; exports live in `mobile_app.export`, the outbox and sync in `mobile_app.sync`.

Public surface (the store API agreed with the app, export and sync; additions marked *added*):

    from mobile_app.store import Store
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
              has its own); JOB_FIELDS, BOARD_FIELDS, CIRCUIT_FIELDS name every field
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

Errors (all subclass StoreError and a builtin): NotFoundError, UnknownFieldError, ConflictError,
ReadOnlyError, ReviewError, PinError, LockedOutError, SaveError, OpenError (*added*: the folder
cannot be opened), MigrationError, StoreTooNewError, InvalidValueError (a blank name, a bad role or
curve), DocumentError (an import that is not a boardside-job document; the export raises this
same class; `mobile_app.export` adds ExportError, a StoreError, with subclasses of its own).
Only draft jobs can be changed; submitted and approved jobs raise ReadOnlyError.

Settings read by the store: "default_system", "default_u0" (text, "230 V"), "default_cmin"
("0.95") fill a new job's blank supply fields; "final_circuit_max_a" goes to calc as
settings.final_circuit_max_a. Returned rows carry a little more than agreed: people() has has_pin;
list_jobs() has version, parent_job_id, superseded (a newer revision exists) and updated_at;
audit() rows are id, when, who, person_id, entity, entity_id, field, what, old, new.
"""

from mobile_app.store.errors import (
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
