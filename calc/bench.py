"""`python -m calc.bench`: median CPU time (process time, steadier than wall time on a shared machine) of
one `assess`, from numbers and from unit strings, against the
bare formulas computed with floats in the same run. Prints figures; asserts nothing."""

from __future__ import annotations

import math
import statistics
import time
from collections.abc import Callable

from calc import assess

NUMBERS = {
    "supply": {"system": "TN-C-S", "u0": 230, "cmin": 0.95, "ze": 0.35, "pfc": 800},
    "circuit": {
        "role": "final",
        "device": {"kind": "mcb", "curve": "B", "rating": 32, "breaking_capacity": 6000},
        "line": {"csa": 2.5, "material": "copper", "insulation": "thermoplastic-70"},
        "cpc": {"csa": 1.5, "material": "copper", "arrangement": "in-cable"},
    },
    "measured": {
        "zs": 0.62,
        "zsc": 0.41,
        "r1r2": 0.3,
        "test_temp_c": 20,
        "insulation": {"test_voltage": 500, "line_line": 200, "line_earth": 150},
        "polarity": True,
    },
}
STRINGS = {
    "supply": {"system": "TN-C-S", "u0": "230 V", "cmin": "0.95", "ze": "350 mΩ", "pfc": "0.8 kA"},
    "circuit": {
        "role": "final",
        "device": {"kind": "mcb", "curve": "B", "rating": "32 A", "breaking_capacity": "6 kA"},
        "line": {"csa": "2.5mm2", "material": "copper", "insulation": "thermoplastic-70"},
        "cpc": {"csa": "1.5 mm²", "material": "copper", "arrangement": "in-cable"},
    },
    "measured": {
        "zs": "620 mΩ",
        "zsc": "0.41 ohm",
        "r1r2": "0.3 Ω",
        "test_temp_c": "20 °C",
        "insulation": {"test_voltage": "500 V", "line_line": ">999", "line_earth": "150 MΩ"},
        "polarity": True,
    },
}


def bare_formulas() -> float:
    """The headline arithmetic alone, with floats: If, Isc, times, k, withstand, CPC size, Zs max."""
    i_f = 230 * 0.95 / 0.62
    i_sc = 230 * 0.95 / 0.41
    t_f = 0.1 if i_f >= 160 else 60.0
    t_sc = 0.1 if i_sc >= 160 else 60.0
    zs_max = 230 * 0.95 / 160
    withstand = (115 * 2.5 / i_sc) ** 2
    s_min = math.sqrt(i_f * i_f * max(t_f, 0.1)) / 115
    hot = 0.35 + (zs_max - 0.35) * (254.5 / 304.5)
    return withstand + s_min + hot + t_sc


def median_us(func: Callable[[], object], repeats: int = 7, number: int = 2000) -> float:
    """Median over `repeats` runs of the mean time of `number` calls, in microseconds."""
    samples = []
    for _ in range(repeats):
        start = time.process_time()
        for _ in range(number):
            func()
        samples.append((time.process_time() - start) / number * 1e6)
    return statistics.median(samples)


def main() -> None:
    assess(STRINGS)  # first call fills the unit caches, as in a running app
    base = median_us(bare_formulas, number=20000)
    numbers = median_us(lambda: assess(NUMBERS))
    strings = median_us(lambda: assess(STRINGS))
    with_dict = median_us(lambda: assess(NUMBERS).to_dict())
    print(f"bare formulas (floats)        {base:8.2f} µs")
    print(
        f"assess from numbers           {numbers:8.2f} µs  ({numbers / base:5.1f}× bare; target ≤ 50 µs, "
        f"≤ 30×)"
    )
    print(f"assess from unit strings      {strings:8.2f} µs  ({strings / base:5.1f}× bare; target ≤ 300 µs)")
    print(f"assess + to_dict from numbers {with_dict:8.2f} µs  ({with_dict / base:5.1f}× bare)")


if __name__ == "__main__":
    main()
