"""Shared test helpers."""

from __future__ import annotations

import copy
from typing import Any

import pytest
from samples import BASE_CIRCUIT


@pytest.fixture
def circuit() -> dict[str, Any]:
    """A fresh copy of a plain B32 ring-style final circuit (2.5/1.5 mm² copper) with Zs 0.62 Ω."""
    return copy.deepcopy(BASE_CIRCUIT)
