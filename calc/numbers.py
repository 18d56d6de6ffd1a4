"""Numbers for people, one format throughout the core's words."""

from __future__ import annotations


def fmt(x: float) -> str:
    """A number for people: four significant figures, no exponent for everyday magnitudes."""
    if 1e-3 <= x < 1e4 or -1e4 < x <= -1e-3 or x == 0:
        return f"{x:.4g}"
    if x >= 1e4 or x <= -1e4:
        return f"{x:.0f}"
    return f"{x:.3g}"
