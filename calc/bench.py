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


def stages() -> list[tuple[str, Callable[[], object]]]:
    """The walk cut into its stages, each runnable alone on the bench circuit, to show where the time
    goes."""
    from calc.assessment import assess_input
    from calc.circuit_test_checks import test_checks
    from calc.conductors import Clearing, k_values, line_checks, protective_conductor
    from calc.devices import make_device
    from calc.disconnection import disconnection
    from calc.inputs import read_input
    from calc.limits import max_disconnection_time
    from calc.verdict import primary_cause, reasons
    from calc.walk import device_time_step, fault_current_step, loop_impedance, zs_max_step

    inp = read_input(NUMBERS)
    s = inp.supply
    device = make_device(inp.device)
    loop, _ = loop_impedance(inp)
    limit = max_disconnection_time(s.system, s.u0_v, inp.role, inp.device.rating_a, inp.final_circuit_max_a)
    if_a, _ = fault_current_step("f", "f", "If", "Zs", s.u0_v, s.cmin, loop.zs_ohm, "")
    op, _ = device_time_step("d", "d", device, "If", if_a)
    zs_max, _ = zs_max_step(inp, device, limit)
    k_l, k_p, _ = k_values(inp)
    earth = Clearing(op, "device") if op is not None else None
    checks = assess_input(inp).checks

    def figures() -> None:
        loop_impedance(inp)
        fault_current_step("f", "f", "If", "Zs", s.u0_v, s.cmin, loop.zs_ohm, "")
        fault_current_step("i", "i", "Isc", "Zsc", s.u0_v, s.cmin, inp.readings.zsc_ohm, "")
        device_time_step("d", "d", device, "If", if_a)
        zs_max_step(inp, device, limit)
        k_values(inp)

    return [
        ("reading the input", lambda: read_input(NUMBERS)),
        ("the walk's figures (Zs, If, Isc, times, Zs max, k)", figures),
        ("disconnection", lambda: disconnection(inp, loop, if_a, limit, op, None, zs_max, k_p)),
        ("line conductor, both ends", lambda: line_checks(inp, device, k_l, if_a, 500.0, earth, False)),
        ("protective conductor", lambda: protective_conductor(inp, k_l, k_p, if_a, earth, False)),
        ("the other tests", lambda: test_checks(inp)),
        ("verdict, cause, reasons", lambda: (primary_cause(checks), reasons(checks))),
    ]


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
    print("where the time of one assess from numbers goes:")
    for name, func in stages():
        print(f"  {name:52} {median_us(func, number=1000):7.2f} µs")


if __name__ == "__main__":
    main()
