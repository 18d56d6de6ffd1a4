"""Shared test helpers."""

from __future__ import annotations

import copy
from typing import Any

import pytest
from samples import BASE_CIRCUIT

from mobile_app.store import Store


@pytest.fixture
def circuit() -> dict[str, Any]:
    """A fresh copy of a plain B32 ring-style final circuit (2.5/1.5 mm² copper) with Zs 0.62 Ω."""
    return copy.deepcopy(BASE_CIRCUIT)


@pytest.fixture
def store(tmp_path):
    """A store in a real SQLite file under the test's folder (a file's own fixture of that name wins)."""
    opened = Store.open(tmp_path / "data")
    yield opened
    opened.close()
