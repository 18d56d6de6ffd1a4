"""A circuit's device and cables in the trade's shorthand (`B32`, `gG 63 A`, `2.5/1.5 mm²`), and the
flag for a saved curve whose rating differs from the circuit's."""

from __future__ import annotations

from typing import Any

RATING_TOLERANCE = 0.01  # ratings are whole amperes; 1 % only absorbs rounding


def plain(value: Any) -> str:
    """A size or rating without trailing zeros (32.0 → `32`, 2.5 → `2.5`); blank if none."""
    if isinstance(value, bool) or not isinstance(value, int | float):
        return ""
    return f"{value:g}"


def device_text(kind: str | None, curve: str | None, rating_a: Any, library_name: str | None) -> str:
    """`B32`, `RCBO C16`, `gG 63 A`, a saved curve's name; `device not set` when there is none."""
    rating = plain(rating_a)
    if kind in ("mcb", "rcbo") and not (curve or rating):
        return "breaker not set" if kind == "mcb" else "RCBO not set"
    if kind == "mcb":
        return f"{curve or '?'}{rating or '?'}"
    if kind == "rcbo":
        return f"RCBO {curve or '?'}{rating or '?'}"
    if kind == "fuse-gg":
        return f"gG {rating or '?'} A"
    if kind == "curve":
        return library_name or "saved curve not chosen"
    return "device not set"


def cable_text(line_mm2: Any, cpc_mm2: Any) -> str:
    """The line/CPC pair as written on site: `2.5/1.5 mm²`; `cable not set` when neither is."""
    line, cpc = plain(line_mm2), plain(cpc_mm2)
    if not line and not cpc:
        return "cable not set"
    return f"{line or '?'}/{cpc or '?'} mm²"


def rating_mismatch(kind: str | None, rating_a: Any, library_rating_a: Any) -> str | None:
    """What to say when a circuit uses a saved curve rated otherwise than the circuit's own rating
    (`Saved curve rated 100 A; this circuit's In is 16 A`), else None."""
    circuit, curve = plain(rating_a), plain(library_rating_a)
    if kind != "curve" or not circuit or not curve:
        return None
    if abs(float(rating_a) - float(library_rating_a)) <= RATING_TOLERANCE * float(library_rating_a):
        return None
    return f"Saved curve rated {curve} A; this circuit's In is {circuit} A"
