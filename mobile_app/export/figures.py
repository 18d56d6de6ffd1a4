"""Figures and times as the office reads them: readings rounded to what an instrument shows, ratings
without trailing zeros, times in local time written out.

The working (the calculation annex and the JSON) keeps full precision; only the schedule rounds.
"""

from __future__ import annotations

import datetime
import math
from decimal import ROUND_HALF_UP, Decimal
from typing import Any

SIGNIFICANT = 3
"""Figures a schedule shows: three significant figures, as the usual test instruments display them."""


def significant(
    value: float, digits: int = SIGNIFICANT, max_decimals: int = 2, keep_zeros: bool = True
) -> str:
    """`value` to `digits` significant figures with at most `max_decimals` decimals, never an exponent:
    0.6666 → "0.67", 0.345 → "0.35", 1.13 → "1.13", 48 → "48.0", 6039.6 → "6040"; `keep_zeros=False`
    drops trailing zeros (6.0 → "6")."""
    number = float(value)
    if not math.isfinite(number):
        return "∞" if number > 0 else "—"
    if number == 0:
        return "0"
    decimals = digits - 1 - math.floor(math.log10(abs(number)))
    decimals = max(0, min(max_decimals, decimals))
    # half away from zero on the shortest decimal form, as a display rounds: 0.345 → 0.35
    text = f"{Decimal(repr(number)).quantize(Decimal(1).scaleb(-decimals), rounding=ROUND_HALF_UP):f}"
    if not keep_zeros and "." in text:
        text = text.rstrip("0").rstrip(".")
    return text


def _bound(value: Any) -> tuple[float, bool] | None:
    """A stored reading as (number, beyond range): 0.62 → (0.62, False), ">999" → (999, True)."""
    if isinstance(value, bool) or value is None:
        return None
    if isinstance(value, int | float):
        return float(value), False
    text = str(value).strip()
    if text.startswith(">"):
        try:
            return float(text[1:]), True
        except ValueError:
            return None
    try:
        return float(text), False
    except ValueError:
        return None


def reading(value: Any, scale: float = 1.0, max_decimals: int = 2) -> str:
    """A reading as an instrument shows it (times `scale`, e.g. 1000 for s → ms); a beyond-range
    reading keeps its `>`; blank when there is none."""
    parsed = _bound(value)
    if parsed is None:
        return ""
    number, above = parsed
    text = significant(number * scale, max_decimals=max_decimals, keep_zeros=not above)
    return (">" if above else "") + text


def rating(value: Any, scale: float = 1.0) -> str:
    """A rating or size without trailing zeros (32, 2.5, 6 kA as "6" with scale 1e-3); blank if none."""
    parsed = _bound(value)
    if parsed is None:
        return ""
    return significant(parsed[0] * scale, max_decimals=2, keep_zeros=False)


def local_time(stamp: Any) -> str:
    """An ISO-8601 time as local time written out: "24 Nov 2026, 14:05 CET"; blank if none."""
    if not stamp:
        return ""
    try:
        moment = datetime.datetime.fromisoformat(str(stamp))
    except ValueError:
        return str(stamp)
    if moment.tzinfo is None:
        moment = moment.replace(tzinfo=datetime.UTC)
    local = moment.astimezone()
    return f"{local.day} {local:%b %Y, %H:%M} {local.tzname() or ''}".rstrip()


def local_date(text: Any) -> str:
    """An ISO date written out: "2026-11-24" → "24 Nov 2026"; other text as it is; blank if none."""
    if not text:
        return ""
    try:
        day = datetime.date.fromisoformat(str(text))
    except ValueError:
        return str(text)
    return f"{day.day} {day:%b %Y}"
