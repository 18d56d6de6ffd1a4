"""Reference tables, read once from the TOML files in `calc/data` (each file names its source)."""

from __future__ import annotations

import tomllib
from functools import cache
from importlib import resources
from typing import Any


@cache
def load(name: str) -> dict[str, Any]:
    """Return the parsed table `calc/data/<name>.toml`; read once per process."""
    text = resources.files("calc").joinpath("data", f"{name}.toml").read_text(encoding="utf-8")
    return tomllib.loads(text)


TABLE_NAMES = (
    "materials",
    "k_line",
    "k_protective",
    "disconnection_times",
    "mcb",
    "fuse_gg",
    "rcd",
    "insulation",
    "conductor_resistance",
)
