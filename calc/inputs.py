"""One circuit's inputs: read from the JSON shape, checked field by field, into typed records.

Every check raises InputError with the dotted field path (`measured.zs`, `circuit.line.csa`), so the
edge can tell a person exactly which field is wrong.
"""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any, NamedTuple

from calc import tables
from calc.circuit_tests import TEST_FIELDS, CircuitTests, read_tests
from calc.errors import InputError
from calc.fields import (
    check_known,
    parse_value,
    read_choice,
    read_flag,
    read_number,
    read_required,
    read_section,
)

SYSTEMS = ("TN-S", "TN-C-S", "TT")
ROLES = ("final", "distribution")
DEVICE_KINDS = ("mcb", "rcbo", "fuse-gg", "curve")
BREAKER_KINDS = ("mcb", "rcbo")
CURVES = ("B", "C", "D")
LINE_MATERIALS = ("copper", "aluminium")
CPC_MATERIALS = ("copper", "aluminium", "steel")
INSULATIONS = ("thermoplastic-70", "thermoplastic-90", "thermosetting-90", "rubber-60")
ARRANGEMENTS = ("in-cable", "separate", "armour")
RCD_TYPES = ("general", "s")
RCD_WAVEFORMS = ("AC", "A", "F", "B")
"""The RCD's type letter for the residual currents it detects (IEC 60755, IEC 61008-1 / IEC 61009-1):
recorded, not used in the arithmetic."""
SEPARATE_CPC_INSULATION = "thermoplastic-70"
"""A separate protective conductor whose insulation is not given is taken as 70 °C thermoplastic
(PVC): of the insulations in IEC 60364-5-54 Table A.54.2 it has the lowest k, so the check errs safe."""
DEFAULT_U0_V = 230.0
"""Nominal voltage to earth when none is given (IEC 60038 230/400 V systems)."""
DEFAULT_CMIN = 0.95
"""Minimum voltage factor when none is given (IEC 60909-0 Table 1, 100 V to 1000 V)."""
LOOP_READINGS = ("zs", "zsc", "r1r2", "ze", "test_temp_c")
"""The loop readings among the `measured` fields, in the order of `Readings`."""

TOP_FIELDS = frozenset(("supply", "circuit", "measured", "settings", "meta"))
SUPPLY_FIELDS = frozenset(("system", "u0", "cmin", "ze", "pfc", "ra"))
CIRCUIT_FIELDS = frozenset(
    ("role", "device", "let_through_i2t", "let_through_at", "rcd", "line", "cpc", "length_m", "selv", "ring")
)
DEVICE_FIELDS = frozenset(("kind", "curve", "rating", "points", "breaking_capacity"))
LINE_FIELDS = frozenset(("csa", "material", "insulation"))
CPC_FIELDS = frozenset(("csa", "material", "arrangement", "insulation", "bunched", "protected"))
RCD_FIELDS = frozenset(("idn", "type", "waveform", "additional"))
MEASURED_FIELDS = frozenset(LOOP_READINGS + TEST_FIELDS)
SETTINGS_FIELDS = frozenset(("final_circuit_max_a",))
"""The fields each object of the input may hold; any other is refused, naming it."""


class Supply(NamedTuple):
    """The supply at the board: earthing system, nominal voltage to earth, voltage factor, readings."""

    system: str
    u0_v: float
    cmin: float
    ze_ohm: float | None
    pfc_a: float | None
    ra_ohm: float | None = None


class DeviceSpec(NamedTuple):
    """The protective device as described by the user (not yet its time-current model)."""

    kind: str
    curve: str | None
    rating_a: float | None
    points: tuple[tuple[float, float], ...] | None
    breaking_capacity_a: float | None = None


class LetThrough(NamedTuple):
    """The maker's let-through energy I²t and the prospective current it is stated at (None: not
    recorded)."""

    energy_a2s: float
    at_current_a: float | None


class Rcd(NamedTuple):
    """A residual current device: IΔn, delay type (general or S), type letter, and whether it gives
    additional protection (IEC 60364-4-41 415.1)."""

    idn_a: float
    type: str
    waveform: str | None = None
    additional: bool | None = None


class Conductor(NamedTuple):
    """A line or protective conductor: size, material, insulation, and for a protective conductor its
    arrangement, whether a separate one is bunched with cables and mechanically protected."""

    csa_mm2: float
    material: str
    insulation: str
    arrangement: str | None
    bunched: bool | None = None
    protected: bool | None = None


class Readings(NamedTuple):
    """The loop readings of the circuit; any may be missing. θt is the conductors' temperature at the
    test."""

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
    let_through: LetThrough | None
    rcd: Rcd | None
    line: Conductor
    cpc: Conductor
    readings: Readings
    final_circuit_max_a: float
    tests: CircuitTests = CircuitTests()
    length_m: float | None = None
    selv: bool = False
    ring: bool = False

    def to_dict(self) -> dict[str, Any]:
        """The normalised input in the JSON shape `read_input` accepts (numbers in base units)."""
        device: dict[str, Any] = {"kind": self.device.kind}
        if self.device.curve is not None:
            device["curve"] = self.device.curve
        if self.device.rating_a is not None:
            device["rating"] = self.device.rating_a
        if self.device.points is not None:
            device["points"] = [[i, t] for i, t in self.device.points]
        if self.device.breaking_capacity_a is not None:
            device["breaking_capacity"] = self.device.breaking_capacity_a
        cpc: dict[str, Any] = {
            "csa": self.cpc.csa_mm2,
            "material": self.cpc.material,
            "arrangement": self.cpc.arrangement,
            "insulation": self.cpc.insulation,
        }
        if self.cpc.bunched is not None:
            cpc["bunched"] = self.cpc.bunched
        if self.cpc.protected is not None:
            cpc["protected"] = self.cpc.protected
        circuit: dict[str, Any] = {
            "role": self.role,
            "device": device,
            "line": {
                "csa": self.line.csa_mm2,
                "material": self.line.material,
                "insulation": self.line.insulation,
            },
            "cpc": cpc,
        }
        if self.let_through is not None:
            circuit["let_through_i2t"] = self.let_through.energy_a2s
            if self.let_through.at_current_a is not None:
                circuit["let_through_at"] = self.let_through.at_current_a
        if self.rcd is not None:
            rcd: dict[str, Any] = {"idn": self.rcd.idn_a, "type": self.rcd.type}
            if self.rcd.waveform is not None:
                rcd["waveform"] = self.rcd.waveform
            if self.rcd.additional is not None:
                rcd["additional"] = self.rcd.additional
            circuit["rcd"] = rcd
        if self.length_m is not None:
            circuit["length_m"] = self.length_m
        if self.selv:
            circuit["selv"] = True
        if self.ring:
            circuit["ring"] = True
        supply = {
            "system": self.supply.system,
            "u0": self.supply.u0_v,
            "cmin": self.supply.cmin,
            "ze": self.supply.ze_ohm,
            "pfc": self.supply.pfc_a,
            "ra": self.supply.ra_ohm,
        }
        r = self.readings
        measured: dict[str, Any] = {
            "zs": r.zs_ohm,
            "zsc": r.zsc_ohm,
            "r1r2": r.r1r2_ohm,
            "ze": r.ze_ohm,
            "test_temp_c": r.test_temp_c,
        }
        measured = {k: v for k, v in measured.items() if v is not None}
        measured.update(self.tests.to_dict())
        return {
            "supply": {k: v for k, v in supply.items() if v is not None},
            "circuit": circuit,
            "measured": measured,
            "settings": {"final_circuit_max_a": self.final_circuit_max_a},
        }


def read_device(data: Mapping[str, Any]) -> DeviceSpec:
    """The device description: a breaker or RCBO (IEC 60898-1 curve and rating), a gG fuse (rating with
    data here) or a maker's curve (points); with its rated breaking capacity when given."""
    path = "circuit.device"
    check_known(data, path, DEVICE_FIELDS)
    kind = read_choice(data, path, "kind", DEVICE_KINDS)
    capacity = read_number(data, path, "breaking_capacity")
    if kind in BREAKER_KINDS:
        curve = read_choice(data, path, "curve", CURVES)
        rating = read_required(data, path, "rating")
        ratings = tables.load("mcb")["ratings_a"]
        if rating not in ratings:
            raise InputError(
                f"{path}.rating",
                f"{rating:g} A is not a rating of IEC 60898-1 (one of {', '.join(str(r) for r in ratings)})",
            )
        return DeviceSpec(kind, curve, rating, None, capacity)
    if kind == "fuse-gg":
        rating = read_required(data, path, "rating")
        ratings = [row["in_a"] for row in tables.load("fuse_gg")["rating"]]
        if rating not in ratings:
            raise InputError(
                f"{path}.rating",
                f"{rating:g} A has no gG data here "
                f"(one of {', '.join(str(r) for r in ratings)}); enter its curve points",
            )
        return DeviceSpec("fuse-gg", None, rating, None, capacity)
    rating = read_number(data, path, "rating")
    return DeviceSpec("curve", None, rating, read_points(data.get("points")), capacity)


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


def _line(circuit: Mapping[str, Any]) -> Conductor:
    path = "circuit.line"
    data = read_section(circuit, "line", "circuit.", required=True)
    check_known(data, path, LINE_FIELDS)
    csa = read_required(data, path, "csa")
    material = read_choice(data, path, "material", LINE_MATERIALS, "copper")
    insulation = read_choice(data, path, "insulation", INSULATIONS, "thermoplastic-70")
    return Conductor(csa, material, insulation, None)


def _cpc(circuit: Mapping[str, Any], line: Conductor) -> Conductor:
    """The protective conductor. A core of the cable and an armour share the cable's insulation; a
    separate conductor has its own (70 °C thermoplastic when not given) and is taken as bunched with
    cables unless said otherwise (IEC 60364-5-54 Table A.54.3 then applies, the safer k)."""
    path = "circuit.cpc"
    data = read_section(circuit, "cpc", "circuit.", required=True)
    check_known(data, path, CPC_FIELDS)
    csa = read_required(data, path, "csa")
    material = read_choice(data, path, "material", CPC_MATERIALS, "copper")
    arrangement = read_choice(data, path, "arrangement", ARRANGEMENTS, "in-cable")
    if material == "steel" and arrangement == "in-cable":
        raise InputError(f"{path}.material", "steel is not a core of a cable (use armour or separate)")
    bunched = read_flag(data, path, "bunched")
    protected = read_flag(data, path, "protected")
    if arrangement != "separate":
        for name, given in (("bunched", bunched), ("protected", protected)):
            if given is not None:
                raise InputError(f"{path}.{name}", "applies only to a separate protective conductor")
        insulation = read_choice(data, path, "insulation", INSULATIONS, line.insulation)
        return Conductor(csa, material, insulation, arrangement)
    insulation = read_choice(data, path, "insulation", INSULATIONS, SEPARATE_CPC_INSULATION)
    return Conductor(csa, material, insulation, arrangement, True if bunched is None else bunched, protected)


def _let_through(circuit: Mapping[str, Any]) -> LetThrough | None:
    energy = read_number(circuit, "circuit", "let_through_i2t")
    at_current = read_number(circuit, "circuit", "let_through_at")
    if energy is None:
        if at_current is not None:
            raise InputError("circuit.let_through_at", "is given without circuit.let_through_i2t")
        return None
    return LetThrough(energy, at_current)


def _rcd(circuit: Mapping[str, Any], device: DeviceSpec) -> Rcd | None:
    path = "circuit.rcd"
    data = read_section(circuit, "rcd", "circuit.", required=False)
    if not data:
        if device.kind == "rcbo":
            raise InputError("circuit.rcd", "is required for an RCBO (its IΔn)")
        return None
    check_known(data, path, RCD_FIELDS)
    waveform = data.get("waveform")
    return Rcd(
        read_required(data, path, "idn"),
        read_choice(data, path, "type", RCD_TYPES, "general"),
        None if waveform is None else read_choice(data, path, "waveform", RCD_WAVEFORMS),
        read_flag(data, path, "additional"),
    )


def read_input(data: object) -> CircuitInput:
    """Check one circuit's input (the JSON shape of the calc contract) and return it typed.

    Raises InputError naming the first offending field.
    """
    if not isinstance(data, dict):
        raise InputError("input", "must be a JSON object")
    check_known(data, "", TOP_FIELDS)
    s = read_section(data, "supply", "", required=True)
    check_known(s, "supply", SUPPLY_FIELDS)
    system = read_choice(s, "supply", "system", SYSTEMS)
    u0 = read_number(s, "supply", "u0") or DEFAULT_U0_V
    cmin = read_number(s, "supply", "cmin") or DEFAULT_CMIN
    supply = Supply(
        system,
        u0,
        cmin,
        read_number(s, "supply", "ze"),
        read_number(s, "supply", "pfc"),
        read_number(s, "supply", "ra"),
    )
    c = read_section(data, "circuit", "", required=True)
    check_known(c, "circuit", CIRCUIT_FIELDS)
    role = read_choice(c, "circuit", "role", ROLES, "final")
    device = read_device(read_section(c, "device", "circuit.", required=True))
    rcd = _rcd(c, device)
    line = _line(c)
    cpc = _cpc(c, line)
    m = read_section(data, "measured", "", required=False)
    check_known(m, "measured", MEASURED_FIELDS)
    tests = read_tests(m)
    readings = Readings(
        read_number(m, "measured", "zs"),
        read_number(m, "measured", "zsc"),
        read_number(m, "measured", "r1r2"),
        read_number(m, "measured", "ze"),
        read_number(m, "measured", "test_temp_c"),
    )
    st = read_section(data, "settings", "", required=False)
    check_known(st, "settings", SETTINGS_FIELDS)
    default_scope = float(tables.load("disconnection_times")["final_circuit_max_a_default"])
    scope = read_number(st, "settings", "final_circuit_max_a") or default_scope
    return CircuitInput(
        supply,
        role,
        device,
        _let_through(c),
        rcd,
        line,
        cpc,
        readings,
        scope,
        tests,
        read_number(c, "circuit", "length_m"),
        bool(read_flag(c, "circuit", "selv")),
        bool(read_flag(c, "circuit", "ring")) or tests.ring is not None,
    )
