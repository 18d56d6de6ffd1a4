"""Sample inputs shared by the calculation tests (an invented circuit, not a reference)."""

from __future__ import annotations

from typing import Any

BASE_CIRCUIT: dict[str, Any] = {
    "supply": {"system": "TN-C-S", "u0": 230, "cmin": 0.95, "pfc": 800},
    "circuit": {
        "role": "final",
        "device": {"kind": "mcb", "curve": "B", "rating": 32, "breaking_capacity": 6000},
        "line": {"csa": 2.5, "material": "copper", "insulation": "thermoplastic-70"},
        "cpc": {"csa": 1.5, "material": "copper", "arrangement": "in-cable"},
    },
    "measured": {
        "zs": 0.62,
        "r1r2": 0.27,
        "insulation": {"test_voltage": 500, "line_line": ">999", "line_earth": ">999"},
        "polarity": True,
    },
}
"""A B32 radial final circuit in 2.5/1.5 mm² copper thermoplastic cable with every test recorded and
passing: Zs 0.62 Ω, PFC 800 A at the board, a 6 kA breaker."""
