"""The tests of a circuit beyond its loop readings, as typed: insulation resistance, continuity of the
protective conductor (R2), a ring final circuit's end-to-end readings, polarity, RCD operating times and
the RCD's test button. Every one is optional; a missing test leaves its check not shown."""

from __future__ import annotations

from collections.abc import Mapping
from typing import Any, NamedTuple

from calc.fields import check_known, parse_value, read_flag, read_number, read_section


class Bounded(NamedTuple):
    """A reading that may be an instrument's "beyond range" display: `>999` MΩ is at least 999 MΩ."""

    value: float
    above: bool = False

    def to_json(self) -> float | str:
        """The reading as the input takes it back: a number, or ">N" text for a bound."""
        return f">{self.value:g}" if self.above else self.value


class Insulation(NamedTuple):
    """Insulation resistance readings (MΩ) at a test voltage (V d.c.)."""

    test_voltage_v: float | None
    line_line: Bounded | None
    line_earth: Bounded | None


class Ring(NamedTuple):
    """A ring final circuit's end-to-end resistances of the line (r1), neutral (rn) and protective (r2)
    conductors, Ω."""

    r1_ohm: float | None
    rn_ohm: float | None
    r2_ohm: float | None


class CircuitTests(NamedTuple):
    """The circuit's other tests, each None when not recorded."""

    insulation: Insulation | None = None
    r2_ohm: float | None = None
    ring: Ring | None = None
    polarity: bool | None = None
    rcd_time_1x: Bounded | None = None
    rcd_time_5x: Bounded | None = None
    rcd_test_button: bool | None = None

    def to_dict(self) -> dict[str, Any]:
        """The tests in the `measured` shape the input takes (only those recorded)."""
        out: dict[str, Any] = {}
        if self.insulation is not None:
            ins = self.insulation
            part: dict[str, Any] = {}
            if ins.test_voltage_v is not None:
                part["test_voltage"] = ins.test_voltage_v
            if ins.line_line is not None:
                part["line_line"] = ins.line_line.to_json()
            if ins.line_earth is not None:
                part["line_earth"] = ins.line_earth.to_json()
            out["insulation"] = part
        if self.r2_ohm is not None:
            out["r2"] = self.r2_ohm
        if self.ring is not None:
            names = (("r1", self.ring.r1_ohm), ("rn", self.ring.rn_ohm), ("r2", self.ring.r2_ohm))
            out["ring"] = {name: value for name, value in names if value is not None}
        for name in ("polarity", "rcd_test_button"):
            if getattr(self, name) is not None:
                out[name] = getattr(self, name)
        for name in ("rcd_time_1x", "rcd_time_5x"):
            reading = getattr(self, name)
            if reading is not None:
                out[name] = reading.to_json()
        return out


TEST_FIELDS = ("insulation", "r2", "ring", "polarity", "rcd_time_1x", "rcd_time_5x", "rcd_test_button")
INSULATION_FIELDS = frozenset(("test_voltage", "line_line", "line_earth"))
RING_FIELDS = frozenset(("r1", "rn", "r2"))


def read_bounded(data: Mapping[str, Any], path: str, name: str) -> Bounded | None:
    """A reading that may be written `>999` (beyond the instrument's range) — a lower bound."""
    value = data.get(name)
    if value is None:
        return None
    if isinstance(value, str):
        text = value.strip()
        if not text:
            return None
        if text.startswith(">"):
            return Bounded(parse_value(f"{path}.{name}", text[1:].strip()), above=True)
    return Bounded(parse_value(f"{path}.{name}", value))


def _insulation(measured: Mapping[str, Any]) -> Insulation | None:
    path = "measured.insulation"
    data = read_section(measured, "insulation", "measured.", required=False)
    if not data:
        return None
    check_known(data, path, INSULATION_FIELDS)
    return Insulation(
        read_number(data, path, "test_voltage"),
        read_bounded(data, path, "line_line"),
        read_bounded(data, path, "line_earth"),
    )


def _ring(measured: Mapping[str, Any]) -> Ring | None:
    path = "measured.ring"
    data = read_section(measured, "ring", "measured.", required=False)
    if not data:
        return None
    check_known(data, path, RING_FIELDS)
    return Ring(*(read_number(data, path, name) for name in ("r1", "rn", "r2")))


def read_tests(measured: Mapping[str, Any]) -> CircuitTests:
    """The circuit's tests from the input's `measured` object (which also holds the loop readings; the
    caller has checked its field names)."""
    if measured.keys().isdisjoint(TEST_FIELDS):
        return CircuitTests()
    return CircuitTests(
        _insulation(measured),
        read_number(measured, "measured", "r2"),
        _ring(measured),
        read_flag(measured, "measured", "polarity"),
        read_bounded(measured, "measured", "rcd_time_1x"),
        read_bounded(measured, "measured", "rcd_time_5x"),
        read_flag(measured, "measured", "rcd_test_button"),
    )
