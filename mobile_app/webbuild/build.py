"""`python -m mobile_app build-web OUT`: Boardside as a static site that runs Python in the browser.

The folder holds the Flet web client and Pyodide (from the installed flet-web), the libraries archive
(every dependency, unpacked from installed distributions or browser wheels, compiled), the app archive
(calc and mobile_app, compiled), the export archive (the PDF library and fonts, which the page loads on
the first export only; the regular font, which the page serves for the screen too, is fetched from the
site beside it rather than packed twice), our page, manifest, icons and service worker. Any static
host can serve it; after one visit it starts with no network. The service worker caches four groups
under names made from their contents (runtime, libraries, export, app), so an update of Boardside's code
downloads only the app group.
"""

from __future__ import annotations

import gzip
import hashlib
import json
import shutil
import sys
import tempfile
from dataclasses import dataclass, field
from pathlib import Path

from mobile_app.webbuild import archive, client
from mobile_app.webbuild.errors import BuildError, DependencyError, OutputExistsError

ROOT = Path(__file__).resolve().parents[2]
SITE_TEMPLATES = Path(__file__).resolve().parent / "site"
MARKER = "boardside-site.json"
"""Written last into a finished site: lists its groups and files; an earlier build may be replaced."""
OWN_SCRIPTS = ("python.js", "python-worker.js", "boot.js")
SNAPSHOT_CACHE = "boardside-snapshot-"
"""Name prefix of the cache where the page's Python worker keeps its start-up snapshot (python-worker.js),
versioned by the runtime and both archives; the service worker keeps the current one only."""
ASSET_FILES = ("manifest.json", "favicon.png", "guard.js", "rive-unavailable.js", "decimal-keys.js",
               "fonts/DejaVuSans.ttf", "fonts/LICENSE-DejaVu.txt")
OFFICE_CACHE = "boardside-office-folder"
"""Cache where the page's Python names the office folder's origin (mobile_app.browser.network): the only
other host the service worker lets the page reach."""


@dataclass(frozen=True)
class AppSpec:
    """What goes into a site: the app's packages and entry module, its libraries, its page text."""

    name: str
    description: str
    theme_color: str
    source_root: Path
    packages: tuple[str, ...]
    module: str
    libraries: tuple[str, ...]
    runtime_wheels: tuple[str, ...]
    leave_out: tuple[str, ...] = ()
    export_libraries: tuple[str, ...] = ()
    export_data: tuple[str, ...] = ()
    export_modules: frozenset[str] = frozenset()
    """Distributions and package folders (e.g. `mobile_app/fonts`) of the export archive; of a package
    with modules in `export_modules`, only those modules."""
    assets: Path = ROOT / "assets"


def boardside_spec() -> AppSpec:
    """Boardside itself: calc and mobile_app (without the build and the PDF fonts), entry
    `mobile_app.browser.entry`, the libraries of dependencies.toml; fpdf2 and the PDF fonts in the
    export archive."""
    lists = archive.dependency_lists()
    manifest = json.loads((ROOT / "assets" / "manifest.json").read_text(encoding="utf-8"))
    return AppSpec(
        name=manifest["name"],
        description=manifest["description"],
        theme_color=manifest["theme_color"],
        source_root=ROOT,
        packages=("calc", "mobile_app"),
        module="mobile_app.browser.entry",
        libraries=tuple(lists["include"]),
        runtime_wheels=tuple(lists["runtime"]),
        leave_out=("webbuild", "fonts"),
        export_libraries=tuple(lists["export"]),
        export_data=("mobile_app/fonts",),
        export_modules=archive.export_modules(),
    )


@dataclass(frozen=True)
class Group:
    """Files the service worker caches together, under a name that changes with their contents."""

    name: str
    files: tuple[str, ...]
    version: str


@dataclass(frozen=True)
class Site:
    """A finished site: its folder and its cache groups, with sizes for the report."""

    out: Path
    groups: tuple[Group, ...]
    notes: tuple[str, ...] = field(default=())

    def files(self) -> list[str]:
        """Every file the service worker caches, as site paths."""
        return [name for group in self.groups for name in group.files]

    def size_bytes(self) -> int:
        """Bytes of all files in the folder."""
        return sum(path.stat().st_size for path in self.out.rglob("*") if path.is_file())

    def compressed_bytes(self) -> int:
        """Bytes of all files in the folder, each gzip-compressed (level 9)."""
        return sum(len(gzip.compress(path.read_bytes(), 9)) for path in self.out.rglob("*") if path.is_file())

    def group_bytes(self, name: str) -> int:
        """Bytes of one cache group's files."""
        group = next(g for g in self.groups if g.name == name)
        return sum((self.out / file).stat().st_size for file in group.files)


def prepare_output(out: Path) -> None:
    """Make `out` an empty folder; an earlier build there (it has MARKER) is removed first."""
    if out.exists() and any(out.iterdir()):
        if not (out / MARKER).is_file():
            raise OutputExistsError(str(out))
        shutil.rmtree(out)
    out.mkdir(parents=True, exist_ok=True)


def group_version(out: Path, files: list[str]) -> str:
    """A cache group's version: 12 hex digits of a SHA-256 over its files' paths and contents."""
    digest = hashlib.sha256()
    for name in sorted(files):
        digest.update(name.encode() + b"\0" + hashlib.sha256((out / name).read_bytes()).digest())
    return digest.hexdigest()[:12]


@dataclass(frozen=True)
class Archives:
    """The site paths of the archives: libraries, app, and export (None when the app has none)."""

    libraries: str
    app: str
    export: str | None
    export_files: dict[str, str] = field(default_factory=dict)
    """Files of the export that the site already serves byte for byte (archive path -> site path): left
    out of the export archive, the page's worker fetches them from the site beside it."""


def shared_with_site(entries: list[archive.Entry],
                     assets: Path) -> tuple[list[archive.Entry], dict[str, str]]:
    """Split `entries` into those to pack and those identical to one of the site's asset files (e.g. the
    PDF's regular font, which the page also serves for the screen): (to pack, archive path -> site path)."""
    def digest(path: Path) -> str:
        return hashlib.sha256(path.read_bytes()).hexdigest()

    served = {digest(assets / name): name for name in ASSET_FILES if (assets / name).is_file()}
    packed, shared = [], {}
    for entry in entries:
        site_path = served.get(digest(entry.source))
        if site_path is None:
            packed.append(entry)
        else:
            shared[entry.name] = site_path
    return packed, shared


def build_archives(spec: AppSpec, out: Path, runtime: client.Runtime, cache: Path, work: Path,
                   notes: list[str]) -> Archives:
    """Write the libraries, app and export archives into `out`; return their site paths."""
    from mobile_app.webbuild.wheels import runtime_wheel

    sourceless, app = work / "sourceless", work / "app"
    libraries, export = sourceless / "libraries", sourceless / "export"
    entries = [entry for name in spec.libraries for entry in archive.installed_files(name)]
    for index, name in enumerate(spec.runtime_wheels):
        wheel = runtime_wheel(name, runtime, cache)
        entries += archive.wheel_files(wheel, work / f"wheel-{index}")
    archive.stage(entries, libraries)
    export_data, export_files = shared_with_site(
        [entry for folder in spec.export_data for entry in archive.folder_files(spec.source_root, folder)],
        spec.assets)
    archive.stage([entry for name in spec.export_libraries
                   for entry in archive.installed_files(name, spec.export_modules)] + export_data, export)
    archive.stage([entry for package in spec.packages
                   for entry in archive.package_files(spec.source_root, package, spec.leave_out)], app)
    try:
        archive.compile_bytecode(client.web_dir() / "pyodide", sourceless, app)
    except DependencyError as error:
        notes.append(f"no bytecode in the archives ({error}): the page compiles at every start")
    stems = [(libraries, "libraries"), (app, "app")]
    if spec.export_libraries or spec.export_data:
        stems.append((export, "export"))
    named = [archive.content_name(archive.write_archive(folder, out / (stem + archive.ARCHIVE_SUFFIX)),
                                  stem).name for folder, stem in stems]
    if len(named) < 3:
        return Archives(named[0], named[1], None)
    return Archives(named[0], named[1], named[2], export_files)


def copy_assets(spec: AppSpec, out: Path) -> list[str]:
    """Copy the manifest, icons and page scripts of ours into `out`; return their site paths."""
    names = list(ASSET_FILES) + [f"icons/{p.name}" for p in sorted((spec.assets / "icons").glob("*.png"))]
    for name in names:
        (out / name).parent.mkdir(parents=True, exist_ok=True)
        shutil.copyfile(spec.assets / name, out / name)
    for name in OWN_SCRIPTS:
        shutil.copyfile(SITE_TEMPLATES / name, out / name)
    return [*names, *OWN_SCRIPTS]


def page(spec: AppSpec, config: dict) -> str:
    """index.html from site/index.html with the app's name, description and configuration."""
    text = (SITE_TEMPLATES / "index.html").read_text(encoding="utf-8")
    for key, value in (("@NAME@", spec.name), ("@DESCRIPTION@", spec.description),
                       ("@THEME_COLOR@", spec.theme_color), ("@SITE_CONFIG@", json.dumps(config, indent=1))):
        text = text.replace(key, value)
    return text


def service_worker(groups: tuple[Group, ...], keep: list[str]) -> str:
    """sw.js from site/sw.js with the site's cache groups and the other caches it keeps (`keep`)."""
    site = {"page": "index.html", "keep": keep,
            "groups": [{"name": g.name, "version": g.version, "files": list(g.files)} for g in groups]}
    text = (SITE_TEMPLATES / "sw.js").read_text(encoding="utf-8")
    return text.replace('"@SITE_FILES@"', json.dumps(site, indent=1))


def build_site(out: Path, spec: AppSpec | None = None, cache: Path | None = None) -> Site:
    """Build the static site of `spec` (default: Boardside) into `out`, downloads cached in `cache`."""
    from mobile_app.webbuild.wheels import default_cache

    spec = spec or boardside_spec()
    prepare_output(out)
    source = client.web_dir()
    notes: list[str] = []
    runtime_files = client.copy_client(source, out)
    with tempfile.TemporaryDirectory(prefix="boardside-web-") as work:
        archives = build_archives(spec, out, client.runtime(source), cache or default_cache(), Path(work),
                                  notes)
    libraries, app_archive = archives.libraries, archives.app
    app_files = copy_assets(spec, out)
    # a new runtime, new archives or a worker that keeps its snapshot differently: a new snapshot
    snapshot_cache = SNAPSHOT_CACHE + group_version(out, [*runtime_files, libraries, app_archive,
                                                          "python-worker.js"])
    config = {
        "python": {
            "archives": [{"url": libraries}, {"url": app_archive}],
            "extras": {"export": {"url": archives.export, "files": archives.export_files}}
            if archives.export else {},
            "deviceKeyStore": "boardside-device",
            "officeCache": OFFICE_CACHE,
            "module": spec.module,
            "home": "/app",
            "dataDir": "/data",
            "lockName": "boardside-store",
            "snapshotCache": snapshot_cache,
        },
        "serviceWorker": "sw.js",
    }
    (out / "index.html").write_text(page(spec, config), encoding="utf-8")
    app_files += ["index.html", app_archive]
    grouped = [("runtime", runtime_files), ("libraries", [libraries])]
    if archives.export:
        grouped.append(("export", [archives.export]))
    fonts = [name for name in app_files if name.startswith("fonts/")]  # kept across updates of our code
    if fonts:
        grouped.append(("fonts", fonts))
    groups = tuple(Group(name, tuple(files), group_version(out, files))
                   for name, files in (*grouped, ("app", [n for n in app_files if n not in fonts])))
    (out / "sw.js").write_text(service_worker(groups, [snapshot_cache, OFFICE_CACHE]), encoding="utf-8")
    site = Site(out, groups, tuple(notes))
    marker = {"groups": {g.name: {"version": g.version, "files": list(g.files)} for g in groups}}
    (out / MARKER).write_text(json.dumps(marker, indent=1), encoding="utf-8")
    return site


def cli_build_web(out: Path, cache: Path | None = None) -> int:
    """`python -m mobile_app build-web OUT`: build the site and say how to serve it."""
    try:
        site = build_site(out, cache=cache)
    except (BuildError, OSError) as error:
        print(f"build-web: {error}", file=sys.stderr)
        return 2
    for note in site.notes:
        print(f"build-web: note: {note}", file=sys.stderr)
    size, packed = site.size_bytes() / 1e6, site.compressed_bytes() / 1e6
    print(f"built {out}: {size:.1f} MB ({packed:.1f} MB compressed); "
          f"serve the folder with any static host, e.g. `python -m http.server -d {out}`")
    return 0
