"""Exporting jobs: the public surface of the export, and `python -m mobile_app export`.

    from mobile_app.records.export import export_bundle, Bundle
    bundle = export_bundle(store, job_id, out_dir)             # or board_id=... for one board
    bundle.path, bundle.files (json, csv, pdf), bundle.manifest, bundle.sha256 {file name: hex}
    read_bundle(path) -> Bundle                                 # re-checks every hash (BundleCheckError)
    job_json_bytes(doc), job_csv_bytes(doc), job_pdf_bytes(doc) # one format from store.job_document()
    load_job_json(data) -> doc ; import_job_json(store, data) -> new job id

Errors: ExportError (a StoreError) with BundleExistsError and BundleCheckError; the store's
NotFoundError for an unknown job or board; the store's DocumentError for an unreadable JSON export.
The formats are described in EXPORT-FORMAT.md (also `mobile_app.records.export_json.__doc__`).
"""

from __future__ import annotations

import sys
from pathlib import Path

from mobile_app.records.bundle import Bundle, export_bundle, read_bundle, write_bundle
from mobile_app.records.errors import StoreError
from mobile_app.records.export_common import (
    CAUTIONS,
    BundleCheckError,
    BundleExistsError,
    ExportError,
)
from mobile_app.records.export_csv import job_csv_bytes, neutralise_cell
from mobile_app.records.export_json import import_job_json, job_json_bytes, load_job_json
from mobile_app.records.export_pdf import job_pdf_bytes
from mobile_app.records.store import Store

__all__ = [
    "CAUTIONS", "Bundle", "BundleCheckError", "BundleExistsError", "ExportError", "cli_export",
    "export_bundle", "import_job_json", "job_csv_bytes", "job_json_bytes", "job_pdf_bytes",
    "load_job_json", "neutralise_cell", "read_bundle", "write_bundle",
]


def cli_export(job_id: int, data_dir: Path | None, out_dir: Path) -> int:
    """Export a job as a bundle in `out_dir` and print its JSON, CSV and PDF paths, one per line.

    An unknown job or any other refusal of the store: one line on stderr, exit 2. A file that cannot be
    written: one line on stderr, exit 1.
    """
    try:
        store = Store.open(data_dir)
    except (StoreError, OSError) as error:
        print(f"export: {error}", file=sys.stderr)
        return 2
    if store.recovered is not None:
        print(f"export: {store.recovered.message}", file=sys.stderr)
    try:
        bundle = export_bundle(store, job_id, out_dir)
    except StoreError as error:
        print(f"export: {error}", file=sys.stderr)
        return 2
    except OSError as error:
        print(f"export: cannot write to {out_dir}: {error.strerror or error}", file=sys.stderr)
        return 1
    finally:
        store.close()
    for path in bundle.files:
        print(path)
    return 0
