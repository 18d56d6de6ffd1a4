"""`python -m mobile_app export JOB_ID --data DIR --out OUTDIR`: a job's bundle, its paths printed."""

from __future__ import annotations

import sys
from pathlib import Path

from mobile_app.export.bundle import export_bundle
from mobile_app.store import Store, StoreError


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
