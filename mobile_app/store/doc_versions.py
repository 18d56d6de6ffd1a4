"""Versions of the job document (the JSON export) and how an older one is brought up to date before
it is imported. Each step takes a document of one version to the next and never changes what was
typed; EXPORT-FORMAT.md says what each version changed."""

from __future__ import annotations

import copy
from collections.abc import Callable
from typing import Any

from mobile_app.store.errors import DocumentError

Document = dict[str, Any]


def _v1_to_v2(doc: Document) -> Document:
    """Version 1 → 2: a version 1 document has no instruments or observations (empty lists) and no
    overall outcome (worked out again when the job is exported). Every field is kept as typed; the
    fields added in version 2 are blank. A device typed "rcbo" was read as a breaker in version 1
    and reads as an RCBO (which needs its RCD's IΔn) from version 2."""
    upgraded = copy.copy(doc)
    upgraded["schema_version"] = 2
    upgraded.setdefault("instruments", [])
    upgraded.setdefault("observations", [])
    return upgraded


UPGRADES: tuple[Callable[[Document], Document], ...] = (_v1_to_v2,)
"""UPGRADES[n - 1] takes a version n document to version n + 1."""
CURRENT_VERSION = len(UPGRADES) + 1
VERSIONS = tuple(range(1, CURRENT_VERSION + 1))
"""The versions this code reads."""


def upgrade_document(doc: Document) -> Document:
    """A job document of any version this code reads, brought to CURRENT_VERSION (a new dict; the
    one given is not changed). DocumentError for a version it does not know."""
    version = doc.get("schema_version")
    if not isinstance(version, int) or isinstance(version, bool) or not 1 <= version <= CURRENT_VERSION:
        raise DocumentError(f"schema_version {version!r} is not supported")
    for step in UPGRADES[version - 1 :]:
        doc = step(doc)
    return doc
