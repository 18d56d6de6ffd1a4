"""The static build's Python archives: the app's own packages and every library it imports.

Files are gathered from the installed environment (a distribution's own list of files) and from wheels
built for the browser's Python, staged in a folder, compiled to bytecode with the browser's Python
(`compile_pyc.mjs` under Node), zipped with fixed times and order and gzipped, so the same input
gives the same archive and the same name.
"""

from __future__ import annotations

import gzip
import hashlib
import io
import shutil
import subprocess
import tomllib
import zipfile
from dataclasses import dataclass
from importlib import metadata, resources
from pathlib import Path, PurePosixPath

from mobile_app.webbuild.errors import DependencyError

SKIP_PARTS = frozenset({"__pycache__", "tests", "testsuite", "test"})
"""Folders never packed: bytecode of the build's Python, and test suites of libraries (test_*.py files
are left out too)."""
SKIP_SUFFIXES = frozenset({".pyc", ".pyo", ".so", ".pyd", ".dll", ".dylib", ".pyi", ".exe", ".dart", ".c",
                           ".h", ".pyx", ".pxd"})
SKIP_NAMES = frozenset({"pubspec.yaml", "pubspec.lock"})
"""Files never packed: bytecode and extensions of the build's platform, type stubs, launchers, the
Dart sources some Flet extensions ship for building a client (the site's client is already built), and
the C and Cython sources of compiled speed-ups (fontTools ships them beside their Python versions)."""
KEPT_METADATA = frozenset({"METADATA", "entry_points.txt", "top_level.txt"})
"""Files kept from a distribution's metadata folder (versions and plugin entry points are read from
them at run time); its RECORD and licence files stay out, and of METADATA only the header fields (the
long description after them is the project's read-me)."""
ZIP_TIME = (2020, 1, 1, 0, 0, 0)
ARCHIVE_SUFFIX = ".zip.gz"


@dataclass(frozen=True)
class Entry:
    """One file to pack: where it is now, and its path inside the archive."""

    source: Path
    name: str


def dependency_lists() -> dict[str, dict[str, str]]:
    """The [include], [runtime], [export] and [exclude] tables of dependencies.toml."""
    text = resources.files("mobile_app.webbuild").joinpath("dependencies.toml").read_text(encoding="utf-8")
    return tomllib.loads(text)


def export_modules() -> frozenset[str]:
    """The modules of export-modules.toml: the only fontTools modules the export archive carries."""
    text = resources.files("mobile_app.webbuild").joinpath("export-modules.toml").read_text(encoding="utf-8")
    return frozenset(tomllib.loads(text)["modules"])


def module_name(name: PurePosixPath) -> str | None:
    """The module a packed file holds (`a/b.py` is `a.b`, `a/__init__.py` is `a`), or None."""
    if name.suffix != ".py":
        return None
    parts = name.with_suffix("").parts
    return ".".join(parts[:-1] if parts[-1] == "__init__" else parts)


def _kept(name: PurePosixPath, keep: frozenset[str]) -> bool:
    """Whether `keep` lets a file through: a package with a module in `keep` keeps only those modules
    (its other modules and data stay out); files of other packages are not its concern."""
    if not any(module.split(".")[0] == name.parts[0] for module in keep):
        return True
    return module_name(name) in keep


def _packable(name: PurePosixPath, browser_build: bool = False) -> bool:
    """Whether a file goes into an archive; a wheel built for the browser keeps its extensions."""
    if any(part in SKIP_PARTS for part in name.parts) or name.name.startswith("test_"):
        return False
    if name.suffix in SKIP_SUFFIXES and not (browser_build and name.suffix == ".so"):
        return False
    if name.name in SKIP_NAMES:
        return False
    meta = [part for part in name.parts if part.endswith(".dist-info")]
    return not meta or name.name in KEPT_METADATA


def installed_files(distribution: str, keep: frozenset[str] = frozenset()) -> list[Entry]:
    """The files of an installed distribution to pack (its modules, data and metadata); of a package
    with modules in `keep` (e.g. `fontTools.subset`), only those modules."""
    try:
        dist = metadata.distribution(distribution)
    except metadata.PackageNotFoundError as error:
        raise DependencyError(distribution, "is not installed") from error
    entries = []
    for file in dist.files or ():
        name = PurePosixPath(str(file))
        if ".." in name.parts or not _packable(name) or not _kept(name, keep):
            continue
        source = Path(str(dist.locate_file(file)))
        if source.is_file():
            entries.append(Entry(source, str(name)))
    if not any(entry.name.endswith(".py") for entry in entries):
        raise DependencyError(distribution, "has no Python files in the installed environment")
    return entries


def wheel_files(wheel: Path, into: Path) -> list[Entry]:
    """Unpack a wheel built for the browser into `into` and list its files to pack (extensions too)."""
    with zipfile.ZipFile(wheel) as archive:
        archive.extractall(into)
    return [
        Entry(path, path.relative_to(into).as_posix())
        for path in sorted(into.rglob("*"))
        if path.is_file() and _packable(PurePosixPath(path.relative_to(into).as_posix()), browser_build=True)
    ]


def package_files(root: Path, package: str, leave_out: tuple[str, ...] = ()) -> list[Entry]:
    """The files of a source package under `root` (e.g. calc/), without the sub-folders in `leave_out`."""
    base = root / package
    entries = []
    for path in sorted(base.rglob("*")):
        name = PurePosixPath(path.relative_to(root).as_posix())
        if path.is_file() and _packable(name) and not any(name.is_relative_to(f"{package}/{sub}")
                                                         for sub in leave_out):
            entries.append(Entry(path, str(name)))
    return entries


def folder_files(root: Path, folder: str) -> list[Entry]:
    """The files of one folder under `root` (e.g. mobile_app/fonts), at the same path in the archive."""
    base = root / folder
    if not base.is_dir():
        raise DependencyError(folder, "is not a folder of the sources")
    return [Entry(path, path.relative_to(root).as_posix()) for path in sorted(base.rglob("*"))
            if path.is_file() and _packable(PurePosixPath(path.relative_to(root).as_posix()))]


def stage(entries: list[Entry], folder: Path) -> None:
    """Copy the entries into `folder` at their archive paths (a path given twice is an error)."""
    seen: set[str] = set()
    for entry in entries:
        if entry.name in seen:
            raise DependencyError(entry.name, "is provided twice")
        seen.add(entry.name)
        target = folder / entry.name
        target.parent.mkdir(parents=True, exist_ok=True)
        if target.name == "METADATA" and target.parent.name.endswith(".dist-info"):
            target.write_bytes(metadata_fields(entry.source.read_bytes()))
        else:
            shutil.copyfile(entry.source, target)


def metadata_fields(text: bytes) -> bytes:
    """A METADATA file's header fields without its description (core metadata: the body after the
    first empty line)."""
    return text.replace(b"\r\n", b"\n").split(b"\n\n", 1)[0] + b"\n"


def node() -> str | None:
    """The Node.js program, or None when it is not installed."""
    return shutil.which("node") or shutil.which("nodejs")


def compile_bytecode(pyodide_dir: Path, sourceless: Path, cached: Path) -> None:
    """Compile both staged folders with the browser's Python; in `sourceless` the sources are dropped.

    Raises DependencyError when Node is missing or the compilation fails.
    """
    program = node()
    if program is None:
        raise DependencyError("bytecode", "Node.js is not installed")
    script = Path(__file__).with_name("compile_pyc.mjs")
    done = subprocess.run([program, str(script), str(pyodide_dir), str(sourceless), str(cached)],
                          capture_output=True, text=True, timeout=600)
    if done.returncode != 0:
        tail = (done.stderr or done.stdout).strip().splitlines()[-1:] or ["no output"]
        raise DependencyError("bytecode", f"compilation failed: {tail[0]}")
    for source in sourceless.rglob("*.py"):
        if source.with_suffix(".pyc").is_file():
            source.unlink()


def write_archive(folder: Path, target: Path) -> Path:
    """Zip `folder`'s files stored, in sorted order with fixed times, then gzip the whole zip (level 9,
    no name or time in its header); write it to `target` and return its path.

    One gzip stream over a stored zip, rather than each entry deflated: the page's worker unpacks it
    with one call of the browser's own decompression and copies the entries straight into Python's
    file system (python-worker.js), and small bytecode files compress far better together than one by
    one (measured on the libraries, app and export archives: 6.5 MB gzipped whole; entries deflated one
    by one 7.3 MB, and still 7.2 MB gzipped again as the size budget counts; 18.2 MB stored).
    """
    buffer = io.BytesIO()
    with zipfile.ZipFile(buffer, "w", compression=zipfile.ZIP_STORED) as archive:
        for path in sorted(p for p in folder.rglob("*") if p.is_file()):
            info = zipfile.ZipInfo(path.relative_to(folder).as_posix(), date_time=ZIP_TIME)
            info.compress_type = zipfile.ZIP_STORED
            info.external_attr = 0o644 << 16
            archive.writestr(info, path.read_bytes())
    target.write_bytes(gzip.compress(buffer.getvalue(), 9, mtime=0))
    return target


def read_archive(path: Path) -> zipfile.ZipFile:
    """An archive written by write_archive, opened as the zip it holds."""
    return zipfile.ZipFile(io.BytesIO(gzip.decompress(path.read_bytes())))


def content_name(path: Path, stem: str) -> Path:
    """Rename an archive to `stem-HASH.zip.gz` (the first 12 hex digits of its SHA-256)."""
    digest = hashlib.sha256(path.read_bytes()).hexdigest()[:12]
    named = path.with_name(f"{stem}-{digest}{ARCHIVE_SUFFIX}")
    path.replace(named)
    return named
