"""Export bundles: a job's JSON, CSV and PDF in one folder with a manifest of SHA-256 hashes.

A bundle is written into a hidden work folder first and only then moved under its name, manifest
written last, so a bundle folder either is complete or does not exist. Bundles are immutable: files are
made read-only and an existing name is never reused (a second export of the same revision gets the next
free name, `-2`, `-3`, ...). The layout is described in EXPORT-FORMAT.md.
"""

from __future__ import annotations

import datetime
import hashlib
import json
import os
import re
import shutil
import tempfile
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from mobile_app.export.common import CAUTIONS, BundleCheckError, BundleExistsError
from mobile_app.export.csv_doc import job_csv_bytes
from mobile_app.export.json_doc import check_document, job_json_bytes
from mobile_app.export.names import ascii_words, fit_name
from mobile_app.export.pdf_doc import job_pdf_bytes
from mobile_app.store.errors import NotFoundError

MANIFEST_NAME = "manifest.json"
MANIFEST_SCHEMA = "boardside-bundle"
MANIFEST_SCHEMA_VERSION = 1
MAX_SAME_NAME = 999
_DATE = re.compile(r"\d{4}-\d{2}-\d{2}")
_WRITERS: tuple[tuple[str, Callable[[dict[str, Any]], bytes]], ...] = (
    ("json", job_json_bytes),
    ("csv", job_csv_bytes),
    ("pdf", job_pdf_bytes),
)


@dataclass(frozen=True)
class Bundle:
    """A written bundle: its folder, its three files (JSON, CSV, PDF), manifest and hashes.

    `sha256` maps each file name in the folder, the manifest included, to its lower-case hex SHA-256.
    """

    path: Path
    files: tuple[Path, Path, Path]
    manifest: Path
    sha256: dict[str, str]

    @property
    def name(self) -> str:
        """The bundle's folder name."""
        return self.path.name


def bundle_base_name(doc: dict[str, Any], board_designation: str | None = None) -> str:
    """"job12-ACME-4471-rev1-2026-12-02": job id, client reference, revision, (board,) export date.

    At most `names.BASE_BUDGET` characters: the client reference and the board's designation are
    shortened to fit; the job id, the revision, `board` and the date are kept whole (see `names`).
    """
    job = doc.get("job") or {}
    exported = str(doc.get("exported_at") or "")[:10]
    if not _DATE.fullmatch(exported):
        exported = datetime.datetime.now(datetime.UTC).date().isoformat()
    parts = [(f"job{int(job.get('id') or 0)}", False), (str(job.get("client_ref") or ""), True),
             (f"rev{int(job.get('revision') or 1)}", False)]
    if board_designation is not None:
        parts += [("board", False), (ascii_words(board_designation) or "unnamed", True)]
    return fit_name([*parts, (exported, False)])


def file_sha256(path: Path) -> str:
    """The lower-case hex SHA-256 of a file's bytes."""
    digest = hashlib.sha256()
    with path.open("rb") as handle:
        for block in iter(lambda: handle.read(1 << 20), b""):
            digest.update(block)
    return digest.hexdigest()


def _write_file(path: Path, data: bytes) -> None:
    """Create `path` (never replacing a file), write `data`, flush it to the disk, make it read-only."""
    with path.open("xb") as handle:
        handle.write(data)
        handle.flush()
        os.fsync(handle.fileno())
    path.chmod(0o444)


def _fsync_folder(path: Path) -> None:
    """Flush a folder's entries (new files, a rename) to the disk."""
    descriptor = os.open(path, os.O_RDONLY)
    try:
        os.fsync(descriptor)
    finally:
        os.close(descriptor)


def _manifest(doc: dict[str, Any], name: str, board_id: int | None,
              contents: dict[str, bytes]) -> bytes:
    """The manifest: what the bundle is and the size and SHA-256 of each file."""
    job = doc.get("job") or {}
    manifest = {
        "schema": MANIFEST_SCHEMA,
        "schema_version": MANIFEST_SCHEMA_VERSION,
        "name": name,
        "job_id": job.get("id"),
        "revision": job.get("revision"),
        "board_id": board_id,
        "exported_at": doc.get("exported_at"),
        "calc_version": doc.get("calc_version"),
        "files": {
            file_name: {"sha256": hashlib.sha256(data).hexdigest(), "bytes": len(data)}
            for file_name, data in contents.items()
        },
        "cautions": list(CAUTIONS),
        "approval_signature": (doc.get("approval") or {}).get("signature"),
    }
    return (json.dumps(manifest, ensure_ascii=False, indent=2) + "\n").encode("utf-8")


def _candidate_names(base: str) -> list[str]:
    """The names a bundle may take, in order: base, base-2, base-3, ..."""
    return [base] + [f"{base}-{number}" for number in range(2, MAX_SAME_NAME + 1)]


def _write_under(out_dir: Path, name: str, doc: dict[str, Any], board_id: int | None,
                 contents: dict[str, bytes]) -> Path | None:
    """Write the bundle in a hidden work folder, then move it to `out_dir/name`.

    Returns the bundle folder, or None if `name` was taken meanwhile (nothing is left behind).
    """
    named = {f"{name}.{extension}": data for extension, data in contents.items()}
    work = Path(tempfile.mkdtemp(prefix=f".{name}.", suffix=".partial", dir=out_dir))
    work.chmod(0o755)
    target = out_dir / name
    try:
        for file_name, data in named.items():
            _write_file(work / file_name, data)
        _write_file(work / MANIFEST_NAME, _manifest(doc, name, board_id, named))
        _fsync_folder(work)
        if target.exists():
            shutil.rmtree(work)
            return None
        try:
            work.rename(target)
        except OSError:
            if not target.exists():
                raise
            shutil.rmtree(work)
            return None
    except BaseException:
        shutil.rmtree(work, ignore_errors=True)
        raise
    _fsync_folder(out_dir)
    return target


def write_bundle(doc: dict[str, Any], out_dir: Path, board_id: int | None = None) -> Bundle:
    """Write a job document as a new bundle folder in `out_dir` (created if missing).

    Never overwrites: takes the first free name of base, base-2, ... (BundleExistsError past 999).
    """
    check_document(doc)
    designation = None
    if board_id is not None:
        designation = str(doc["boards"][0].get("designation") or "") if doc["boards"] else ""
    base = bundle_base_name(doc, designation)
    contents = {extension: writer(doc) for extension, writer in _WRITERS}
    out_dir.mkdir(parents=True, exist_ok=True)
    for name in _candidate_names(base):
        if (out_dir / name).exists():
            continue
        target = _write_under(out_dir, name, doc, board_id, contents)
        if target is not None:
            return read_bundle(target)
    raise BundleExistsError(base)


def read_bundle(path: Path) -> Bundle:
    """The bundle in folder `path`, after checking every file against its manifest.

    Raises BundleCheckError if the manifest is missing or unreadable, or a file differs from it.
    """
    manifest_path = path / MANIFEST_NAME
    try:
        manifest = json.loads(manifest_path.read_text(encoding="utf-8"))
        listed = {str(name): (str(v["sha256"]), int(v["bytes"]))
                  for name, v in manifest["files"].items()}
    except FileNotFoundError as error:
        raise BundleCheckError(path.name, "no manifest.json: the export is unfinished") from error
    except (OSError, ValueError, KeyError, TypeError, AttributeError) as error:
        raise BundleCheckError(path.name, f"manifest.json is unreadable ({error})") from error
    hashes: dict[str, str] = {}
    for name, (sha256, size) in listed.items():
        file_path = path / name
        if file_path.name != name or not file_path.is_file():
            raise BundleCheckError(path.name, f"{name} is missing")
        hashes[name] = file_sha256(file_path)
        if hashes[name] != sha256 or file_path.stat().st_size != size:
            raise BundleCheckError(path.name, f"{name} differs from its manifest entry")
    by_extension = {Path(name).suffix: path / name for name in listed}
    if set(by_extension) != {".json", ".csv", ".pdf"} or len(listed) != 3:
        raise BundleCheckError(path.name, "the manifest does not list one JSON, CSV and PDF file")
    hashes[MANIFEST_NAME] = file_sha256(manifest_path)
    files = (by_extension[".json"], by_extension[".csv"], by_extension[".pdf"])
    return Bundle(path=path, files=files, manifest=manifest_path, sha256=hashes)


def board_document(doc: dict[str, Any], board_id: int) -> dict[str, Any]:
    """A copy of a job document keeping only one board; NotFoundError if the job has no such board."""
    boards = [board for board in doc["boards"] if board.get("id") == board_id]
    if not boards:
        raise NotFoundError("board", board_id)
    return {**doc, "boards": boards}


def export_bundle(store: Any, job_id: int, out_dir: Path, board_id: int | None = None) -> Bundle:
    """Export a job (or one of its boards) from `store` as a new bundle in `out_dir`.

    Raises the store's NotFoundError for an unknown job or board.
    """
    doc = store.documents.export(job_id)
    if board_id is not None:
        doc = board_document(doc, board_id)
    return write_bundle(doc, out_dir, board_id)
