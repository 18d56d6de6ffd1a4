"""Wheels built for the browser's Python (compiled extensions such as msgpack), kept in a cache folder.

A wheel is looked for in the cache first; otherwise `pip download` fetches the installed version for
the browser's platform tag (read from Pyodide's lock file) from the package index into the cache, once.
Wheels are never committed to the repository.
"""

from __future__ import annotations

import re
import subprocess
import sys
from importlib import metadata
from pathlib import Path

from mobile_app.webbuild.client import Runtime
from mobile_app.webbuild.errors import DependencyError


def default_cache() -> Path:
    """The user's cache folder for the build's downloads."""
    import platformdirs

    return Path(platformdirs.user_cache_dir("Boardside", "Boardside")) / "web-wheels"


def wheel_prefix(distribution: str, version: str) -> str:
    """The start of a wheel file name for a distribution and version (PEP 427 name escaping)."""
    return f"{re.sub(r'[-_.]+', '_', distribution).lower()}-{version}-"


def cached_wheel(cache: Path, distribution: str, version: str, runtime: Runtime) -> Path | None:
    """A wheel of `distribution` `version` for the browser's platform already in `cache`, or None."""
    prefix = wheel_prefix(distribution, version)
    tag = runtime.wheel_platform + ".whl"
    found = sorted(p for p in cache.glob("*.whl")
                   if p.name.lower().startswith(prefix) and p.name.endswith(tag))
    return found[-1] if found else None


def runtime_wheel(distribution: str, runtime: Runtime, cache: Path) -> Path:
    """The browser wheel of the installed version of `distribution`: cached, or downloaded into `cache`.

    Raises DependencyError when it is neither cached nor downloadable.
    """
    try:
        version = metadata.version(distribution)
    except metadata.PackageNotFoundError as error:
        raise DependencyError(distribution, "is not installed") from error
    found = cached_wheel(cache, distribution, version, runtime)
    if found is not None:
        return found
    cache.mkdir(parents=True, exist_ok=True)
    command = [
        sys.executable, "-m", "pip", "download", "--quiet", "--disable-pip-version-check", "--no-deps",
        "--only-binary=:all:", "--platform", runtime.wheel_platform,
        "--python-version", runtime.python_version, "--dest", str(cache), f"{distribution}=={version}",
    ]
    done = subprocess.run(command, capture_output=True, text=True, timeout=300)
    found = cached_wheel(cache, distribution, version, runtime)
    if done.returncode != 0 or found is None:
        lines = (done.stderr or done.stdout).strip().splitlines() or ["no wheel was saved"]
        raise DependencyError(distribution, f"no wheel for {runtime.wheel_platform}: {lines[-1]}")
    return found
