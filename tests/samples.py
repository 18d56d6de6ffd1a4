"""Sample inputs shared by the calculation tests (an invented circuit, not a reference)."""

from __future__ import annotations

from typing import Any

BASE_CIRCUIT: dict[str, Any] = {
    "supply": {"system": "TN-C-S", "u0": 230, "cmin": 0.95},
    "circuit": {
        "role": "final",
        "device": {"kind": "mcb", "curve": "B", "rating": 32},
        "line": {"csa": 2.5, "material": "copper", "insulation": "thermoplastic-70"},
        "cpc": {"csa": 1.5, "material": "copper", "arrangement": "in-cable"},
    },
    "measured": {"zs": 0.62},
}
