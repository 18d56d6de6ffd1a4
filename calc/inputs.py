"""One circuit's inputs: read from the JSON shape, checked field by field, into frozen dataclasses.

Every check raises InputError with the dotted field path (`measured.zs`, `circuit.line.csa`), so the
edge can tell a person exactly which field is wrong.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any, NamedTuple

from calc import tables
from calc.errors import InputError
from calc.units import (
    AREA,
    CURRENT,
    ENERGY,
    IMPEDANCE,
    RATIO,
    TEMPERATURE,
    TIME,
    VOLTAGE,
    Kind,
    parse_quantity,
)

SYSTEMS = ("TN-S", "TN-C-S", "TT")
ROLES = ("final", "distribution")
DEVICE_KINDS = ("mcb", "fuse-gg", "curve")
CURVES = ("B", "C", "D")
LINE_MATERIALS = ("copper", "aluminium")
CPC_MATERIALS = ("copper", "aluminium", "steel")
INSULATIONS = ("thermoplastic-70", "thermoplastic-90", "thermosetting-90", "rubber-60")
ARRANGEMENTS = ("in-cable", "separate", "armour")
RCD_TYPES = ("general", "s")
DEFAULT_U0_V = 230.0
"""Nominal voltage to earth when none is given (IEC 60038 230/400 V systems)."""
DEFAULT_CMIN = 0.95
"""Minimum voltage factor when none is given (IEC 60909-0 Table 1, 100 V to 1000 V)."""


@dataclass(frozen=True)
class FieldSpec:
    """How one numeric field is read: its kind of quantity and its allowed range (base units)."""

    kind: Kind
    low: float
    high: float
    low_inclusive: bool = False
    positive: bool = True


_Z = (1e-4, 1e5)
"""Credible loop impedances: from 0.1 mΩ to 100 kΩ (an RA in TT can be hundreds of ohms)."""
FIELDS: dict[str, FieldSpec] = {
    "supply.u0": FieldSpec(VOLTAGE, 50.0, 1000.0),
    "supply.cmin": FieldSpec(RATIO, 0.5, 1.1, low_inclusive=True),
    "supply.ze": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "supply.pfc": FieldSpec(CURRENT, 1e-3, 1e6, low_inclusive=True),
    "circuit.device.rating": FieldSpec(CURRENT, 0.0, 10000.0),
    "circuit.device.points.current": FieldSpec(CURRENT, 1e-3, 1e7, low_inclusive=True),
    "circuit.device.points.time": FieldSpec(TIME, 1e-4, 1e6, low_inclusive=True),
    "circuit.let_through_i2t": FieldSpec(ENERGY, 1e-3, 1e12, low_inclusive=True),
    "circuit.rcd.idn": FieldSpec(CURRENT, 1e-3, 10.0, low_inclusive=True),
    "circuit.line.csa": FieldSpec(AREA, 0.1, 5000.0, low_inclusive=True),
    "circuit.cpc.csa": FieldSpec(AREA, 0.1, 5000.0, low_inclusive=True),
    "measured.zs": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.zsc": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.r1r2": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.ze": FieldSpec(IMPEDANCE, *_Z, low_inclusive=True),
    "measured.test_temp_c": FieldSpec(TEMPERATURE, -40.0, 80.0, low_inclusive=True, positive=False),
    "settings.final_circuit_max_a": FieldSpec(CURRENT, 0.0, 10000.0),
}


def parse_value(field: str, value: object) -> float:
    """Parse one numeric field by its dotted path into a float in base units (Ω, A, V, s, mm², °C).

    Raises InputError naming the field when the value is not a number, has a unit of another kind, or
    lies outside the field's range (impedances, currents and sizes must be greater than zero).
    """
    spec = FIELDS.get(field)
    if spec is None:
        raise InputError(field, "is not a numeric field")
    if type(value) is float or type(value) is int:  # the common case, checked in one comparison
        inside_low = spec.low <= value if spec.low_inclusive else spec.low < value
        if inside_low and value <= spec.high and (value > 0 or not spec.positive):
            return float(value)
    number = parse_quantity(field, value, spec.kind)
    if spec.positive and number <= 0:
        raise InputError(field, "must be greater than zero")
    below = number < spec.low if spec.low_inclusive else number <= spec.low
    if below:
        bound = "at least" if spec.low_inclusive else "greater than"
        raise InputError(field, f"must be {bound} {spec.low:g} {spec.kind.symbol}".rstrip())
    if number > spec.high:
        raise InputError(field, f"must be at most {spec.high:g} {spec.kind.symbol}".rstrip())
    return number


class Supply(NamedTuple):
    """The supply at the origin: earthing system, nominal voltage to earth, voltage factor, readings."""

    system: str
    u0_v: float
    cmin: float
    ze_ohm: float | None
    pfc_a: float | None


class DeviceSpec(NamedTuple):
    """The protective device as described by the user (not yet its time-current model)."""

    kind: str
    curve: str | None
    rating_a: float | None
    points: tuple[tuple[float, float], ...] | None


class Rcd(NamedTuple):
    """A residual current device: rated residual operating current and type (general or S)."""

    idn_a: float
    type: str


class Conductor(NamedTuple):
    """A line or protective conductor: size, material and the cable's insulation or arrangement."""

    csa_mm2: float
    material: str
    insulation: str
    arrangement: str | None


class Readings(NamedTuple):
    """What was measured on the circuit; any reading may be missing."""

    zs_ohm: float | None
    zsc_ohm: float | None
    r1r2_ohm: float | None
    ze_ohm: float | None
    test_temp_c: float | None


class CircuitInput(NamedTuple):
    """Everything one assessment needs, checked and in base units."""

    supply: Supply
    role: str
    device: DeviceSpec
    let_through_a2s: float | None
    rcd: Rcd | None
    line: Conductor
    cpc: Conductor
    readings: Readings
    final_circuit_max_a: float

    def to_dict(self) -> dict[str, Any]:
        """The normalised input in the JSON shape `read_input` accepts (numbers in base units)."""
        device: dict[str, Any] = {"kind": self.device.kind}
        if self.device.curve is not None:
            device["curve"] = self.device.curve
        if self.device.rating_a is not None:
            device["rating"] = self.device.rating_a
        if self.device.points is not None:
            device["points"] = [[i, t] for i, t in self.device.points]
        circuit: dict[str, Any] = {
            "role": self.role,
            "device": device,
            "line": {
                "csa": self.line.csa_mm2,
                "material": self.line.material,
                "insulation": self.line.insulation,
            },
            "cpc": {
                "csa": self.cpc.csa_mm2,
                "material": self.cpc.material,
                "arrangement": self.cpc.arrangement,
            },
        }
        if self.let_through_a2s is not None:
            circuit["let_through_i2t"] = self.let_through_a2s
        if self.rcd is not None:
            circuit["rcd"] = {"idn": self.rcd.idn_a, "type": self.rcd.type}
        supply = {
            "system": self.supply.system,
            "u0": self.supply.u0_v,
            "cmin": self.supply.cmin,
            "ze": self.supply.ze_ohm,
            "pfc": self.supply.pfc_a,
        }
        r = self.readings
        measured = {
            "zs": r.zs_ohm,
            "zsc": r.zsc_ohm,
            "r1r2": r.r1r2_ohm,
            "ze": r.ze_ohm,
            "test_temp_c": r.test_temp_c,
        }
        return {
            "supply": {k: v for k, v in supply.items() if v is not None},
            "circuit": circuit,
            "measured": {k: v for k, v in measured.items() if v is not None},
            "settings": {"final_circuit_max_a": self.final_circuit_max_a},
        }


def _section(data: Mapping[str, Any], name: str, path: str, required: bool) -> Mapping[str, Any]:
    value = data.get(name)
    field = f"{path}{name}"
    if value is None:
        if required:
            raise InputError(field, "is required")
        return {}
    if not isinstance(value, dict):
        raise InputError(field, "must be an object")
    return value


def _only(section: Mapping[str, Any], path: str, allowed: tuple[str, ...]) -> None:
    for key in section:
        if key not in allowed:
            raise InputError(f"{path}.{key}" if path else str(key), "is not a known field")


def _number(
    section: Mapping[str, Any], path: str, name: str, default: float | None = None, required: bool = False
) -> float | None:
    field = f"{path}.{name}"
    value = section.get(name)
    if value is None or (isinstance(value, str) and not value.strip() and not required):
        if required:
            raise InputError(field, "is required")
        return default
    return parse_value(field, value)


def _required_number(section: Mapping[str, Any], path: str, name: str) -> float:
    number = _number(section, path, name, required=True)
    if number is None:
        raise InputError(f"{path}.{name}", "is required")
    return number


def _choice(
    section: Mapping[str, Any], path: str, name: str, choices: tuple[str, ...], default: str | None = None
) -> str:
    field = f"{path}.{name}"
    value = section.get(name)
    if value is None:
        if default is None:
            raise InputError(field, f"is required (one of {', '.join(choices)})")
        return default
    if value in choices:
        return value
    if not isinstance(value, str):
        raise InputError(field, f"must be one of {', '.join(choices)}")
    for choice in choices:
        if value.strip().lower() == choice.lower():
            return choice
    shown = value if len(value) <= 20 else value[:19] + "…"
    raise InputError(field, f'"{shown}" is not one of {", ".join(choices)}')


def read_device(section: Mapping[str, Any]) -> DeviceSpec:
    path = "circuit.device"
    _only(section, path, ("kind", "curve", "rating", "points"))
    kind = _choice(section, path, "kind", DEVICE_KINDS)
    if kind == "mcb":
        curve = _choice(section, path, "curve", CURVES)
        rating = _required_number(section, path, "rating")
        ratings = tables.load("mcb")["ratings_a"]
        if rating not in ratings:
            raise InputError(
                f"{path}.rating",
                f"{rating:g} A is not a rating of IEC 60898-1 (one of {', '.join(str(r) for r in ratings)})",
            )
        return DeviceSpec("mcb", curve, rating, None)
    if kind == "fuse-gg":
        rating = _required_number(section, path, "rating")
        ratings = [row["in_a"] for row in tables.load("fuse_gg")["rating"]]
        if rating not in ratings:
            raise InputError(
                f"{path}.rating",
                f"{rating:g} A has no gG data here "
                f"(one of {', '.join(str(r) for r in ratings)}); enter its curve points",
            )
        return DeviceSpec("fuse-gg", None, rating, None)
    rating = _number(section, path, "rating")
    return DeviceSpec("curve", None, rating, read_points(section.get("points")))


def read_points(points: object) -> tuple[tuple[float, float], ...]:
    """Manufacturer curve points [[current, time], ...], sorted by current; time must fall as current rises.

    Raises InputError on `circuit.device.points` otherwise.
    """
    field = "circuit.device.points"
    if points is None:
        raise InputError(field, "is required for a curve device")
    if not isinstance(points, list | tuple) or len(points) < 2:
        raise InputError(field, "needs at least two [current, time] points")
    parsed: list[tuple[float, float]] = []
    for index, point in enumerate(points, start=1):
        if not isinstance(point, list | tuple) or len(point) != 2:
            raise InputError(f"{field}[{index}]", "must be a pair [current, time]")
        try:
            current = parse_value("circuit.device.points.current", point[0])
            time = parse_value("circuit.device.points.time", point[1])
        except InputError as exc:
            what = "current" if "current" in exc.field else "time"
            raise InputError(f"{field}[{index}]", f"{what} {exc.problem}") from None
        parsed.append((current, time))
    parsed.sort()
    for (i0, t0), (i1, t1) in zip(parsed, parsed[1:], strict=False):
        if i1 == i0:
            raise InputError(field, f"two points at the same current {i0:g} A")
        if t1 >= t0:
            raise InputError(
                field, f"time must fall as current rises ({i0:g} A at {t0:g} s, then {i1:g} A at {t1:g} s)"
            )
    return tuple(parsed)


def _conductor(circuit: Mapping[str, Any], name: str) -> Conductor:
    path = f"circuit.{name}"
    section = _section(circuit, name, "circuit.", required=True)
    csa = _required_number(section, path, "csa")
    if name == "line":
        _only(section, path, ("csa", "material", "insulation"))
        material = _choice(section, path, "material", LINE_MATERIALS, "copper")
        insulation = _choice(section, path, "insulation", INSULATIONS, "thermoplastic-70")
        return Conductor(csa, material, insulation, None)
    _only(section, path, ("csa", "material", "arrangement", "insulation"))
    material = _choice(section, path, "material", CPC_MATERIALS, "copper")
    arrangement = _choice(section, path, "arrangement", ARRANGEMENTS, "in-cable")
    if material == "steel" and arrangement == "in-cable":
        raise InputError(f"{path}.material", "steel is not a core of a cable (use armour or separate)")
    insulation = _choice(section, path, "insulation", INSULATIONS, "") if "insulation" in section else ""
    return Conductor(csa, material, insulation, arrangement)


def read_input(data: object) -> CircuitInput:
    """Check one circuit's input (the JSON shape of the calc contract) and return it typed.

    Raises InputError naming the first offending field.
    """
    if not isinstance(data, dict):
        raise InputError("input", "must be a JSON object")
    _only(data, "", ("supply", "circuit", "measured", "settings", "meta"))
    s = _section(data, "supply", "", required=True)
    _only(s, "supply", ("system", "u0", "cmin", "ze", "pfc"))
    system = _choice(s, "supply", "system", SYSTEMS)
    u0 = _number(s, "supply", "u0") or DEFAULT_U0_V
    cmin = _number(s, "supply", "cmin") or DEFAULT_CMIN
    supply = Supply(system, u0, cmin, _number(s, "supply", "ze"), _number(s, "supply", "pfc"))
    c = _section(data, "circuit", "", required=True)
    _only(c, "circuit", ("role", "device", "let_through_i2t", "rcd", "line", "cpc"))
    role = _choice(c, "circuit", "role", ROLES, "final")
    device = read_device(_section(c, "device", "circuit.", required=True))
    rcd_section = _section(c, "rcd", "circuit.", required=False)
    rcd = None
    if rcd_section:
        _only(rcd_section, "circuit.rcd", ("idn", "type"))
        idn = _required_number(rcd_section, "circuit.rcd", "idn")
        rcd = Rcd(idn, _choice(rcd_section, "circuit.rcd", "type", RCD_TYPES, "general"))
    line = _conductor(c, "line")
    cpc = _conductor(c, "cpc")
    if not cpc.insulation:
        cpc = Conductor(cpc.csa_mm2, cpc.material, line.insulation, cpc.arrangement)
    m = _section(data, "measured", "", required=False)
    _only(m, "measured", ("zs", "zsc", "r1r2", "ze", "test_temp_c"))
    readings = Readings(*(_number(m, "measured", n) for n in ("zs", "zsc", "r1r2", "ze", "test_temp_c")))
    st = _section(data, "settings", "", required=False)
    _only(st, "settings", ("final_circuit_max_a",))
    default_scope = float(tables.load("disconnection_times")["final_circuit_max_a_default"])
    scope = _number(st, "settings", "final_circuit_max_a") or default_scope
    return CircuitInput(
        supply, role, device, _number(c, "circuit", "let_through_i2t"), rcd, line, cpc, readings, scope
    )
