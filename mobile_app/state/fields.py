"""What each step of the walk asks for: the circuit's fields, their labels, units and choices; and
the fields of a board, a job, an instrument and an observation.

Field names are the store's flat field names (`mobile_app.store.CIRCUIT_FIELDS`, …); the store
parses each by its calc path, and the screens turn a parse error into a message naming the field.
The walk follows the work: the circuit and its protection, its conductors, the tests made with the
supply off (continuity, insulation, polarity), the live tests (loop impedance, RCD), the results.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from mobile_app.store.fields import MAIN_DEVICES, REFERENCE_METHODS, WIRING_TYPES

STEPS: tuple[str, ...] = ("device", "conductors", "tests", "readings", "results")
STEP_TITLES: dict[str, str] = {
    "device": "Circuit and protection",
    "conductors": "Conductors",
    "tests": "Supply-off tests",
    "readings": "Live tests",
    "results": "Results",
}


@dataclass(frozen=True)
class Choice:
    """One option of a choice field: the value saved and the words shown."""

    value: str
    label: str


@dataclass(frozen=True)
class FieldSpec:
    """One input of the walk."""

    name: str
    label: str
    kind: str  # "number" | "whole" | "choice" | "text"
    unit: str = ""
    hint: str = ""
    required: bool = False
    choices: tuple[Choice, ...] = ()
    default: str = ""
    shown_when: dict[str, tuple[str, ...]] = field(default_factory=dict)
    required_when: dict[str, tuple[str, ...]] = field(default_factory=dict)
    suggestions: tuple[str, ...] = ()
    multiline: bool = False

    @property
    def numeric(self) -> bool:
        """Typed on a numeric keyboard (a number with its unit, or a whole count)."""
        return self.kind in ("number", "whole")


ROLES = (Choice("final", "Final circuit"), Choice("distribution", "Distribution"))
DEVICE_KINDS = (
    Choice("mcb", "Circuit-breaker"),
    Choice("rcbo", "RCBO"),
    Choice("fuse-gg", "gG fuse"),
    Choice("curve", "From library"),
)
BREAKERS = ("mcb", "rcbo")
YES_NO = (Choice("yes", "Yes"), Choice("no", "No"))
POLARITY = (Choice("yes", "Correct"), Choice("no", "Wrong"))
BUTTON = (Choice("yes", "Trips"), Choice("no", "Does not trip"))
RCD_WAVEFORMS = (Choice("AC", "Type AC"), Choice("A", "Type A"), Choice("F", "Type F"), Choice("B", "Type B"))
PURPOSES = (
    Choice("new-work", "New work"),
    Choice("periodic", "Periodic inspection"),
    Choice("fault-finding", "Fault finding"),
)
SEVERITIES = (
    Choice("serious", "Serious: unsafe"),
    Choice("attention", "Needs attention"),
    Choice("note", "Note"),
)
TEST_VOLTAGES = ("250 V", "500 V", "1000 V")
CURVES = (Choice("B", "B"), Choice("C", "C"), Choice("D", "D"))
RCD_TYPES = (Choice("general", "General"), Choice("s", "Type S (delayed)"))
LINE_MATERIALS = (Choice("copper", "Copper"), Choice("aluminium", "Aluminium"))
CPC_MATERIALS = LINE_MATERIALS + (Choice("steel", "Steel"),)
INSULATIONS = (
    Choice("thermoplastic-70", "Thermoplastic 70 °C"),
    Choice("thermoplastic-90", "Thermoplastic 90 °C"),
    Choice("thermosetting-90", "Thermosetting 90 °C"),
    Choice("rubber-60", "Rubber 60 °C"),
)
ARRANGEMENTS = (
    Choice("in-cable", "Core in cable"),
    Choice("separate", "Separate"),
    Choice("armour", "Armour"),
)
SYSTEMS = (Choice("TN-S", "TN-S"), Choice("TN-C-S", "TN-C-S"), Choice("TT", "TT"))

_SEPARATE = {"cpc_arrangement": ("separate",)}
_RING = {"ring": ("yes",)}
_SPECS: dict[str, tuple[FieldSpec, ...]] = {
    "device": (
        FieldSpec("number", "Circuit reference", "text", hint="as on the board, e.g. 3 or L2-4",
                  required=True),
        FieldSpec("description", "Description", "text", hint="e.g. Kitchen sockets"),
        FieldSpec("role", "Circuit role", "choice", choices=ROLES, required=True, default="final"),
        FieldSpec("device_kind", "Device type", "choice", choices=DEVICE_KINDS, required=True,
                  default="mcb"),
        FieldSpec("device_curve", "Curve", "choice", choices=CURVES, required=True,
                  shown_when={"device_kind": BREAKERS}),
        FieldSpec("library_device_id", "Library device", "choice", required=True,
                  shown_when={"device_kind": ("curve",)}),
        FieldSpec("device_rating", "Rating In", "number", unit="A", hint="e.g. 32 or 32 A",
                  required=True),
        FieldSpec("breaking_capacity", "Breaking capacity (optional)", "number", unit="A",
                  hint="as marked, e.g. 6 kA"),
        FieldSpec("rcd_idn", "RCD IΔn (optional)", "number", unit="A", hint="e.g. 30 mA",
                  required_when={"device_kind": ("rcbo",)}),
        FieldSpec("rcd_type", "RCD delay", "choice", choices=RCD_TYPES, default="general"),
        FieldSpec("rcd_waveform", "RCD type letter (optional)", "choice", choices=RCD_WAVEFORMS),
        FieldSpec("rcd_additional", "RCD for additional protection? (optional)", "choice",
                  choices=YES_NO),
        FieldSpec("let_through_i2t", "Let-through I²t (optional)", "number", unit="A²s",
                  hint="from the maker's data"),
        FieldSpec("let_through_at", "Let-through stated at (optional)", "number", unit="A",
                  hint="prospective current, e.g. 6 kA"),
    ),
    "conductors": (
        FieldSpec("line_csa", "Line size", "number", unit="mm²", hint="e.g. 2.5 or 2.5mm2",
                  required=True),
        FieldSpec("line_material", "Line material", "choice", choices=LINE_MATERIALS,
                  required=True, default="copper"),
        FieldSpec("line_insulation", "Insulation", "choice", choices=INSULATIONS, required=True,
                  default="thermoplastic-70"),
        FieldSpec("cpc_csa", "CPC size", "number", unit="mm²", hint="e.g. 1.5", required=True),
        FieldSpec("cpc_material", "CPC material", "choice", choices=CPC_MATERIALS, required=True,
                  default="copper"),
        FieldSpec("cpc_arrangement", "CPC arrangement", "choice", choices=ARRANGEMENTS,
                  required=True, default="in-cable"),
        FieldSpec("cpc_insulation", "CPC's own insulation (optional)", "choice", choices=INSULATIONS,
                  shown_when=_SEPARATE),
        FieldSpec("cpc_bunched", "CPC bunched with other cables? (optional)", "choice",
                  choices=YES_NO, shown_when=_SEPARATE),
        FieldSpec("cpc_protected", "CPC mechanically protected? (optional)", "choice",
                  choices=YES_NO, shown_when=_SEPARATE),
        FieldSpec("wiring_type", "Wiring type (optional)", "text", suggestions=WIRING_TYPES),
        FieldSpec("reference_method", "Reference method (optional)", "text",
                  suggestions=REFERENCE_METHODS),
        FieldSpec("length_m", "Length (optional)", "number", unit="m", hint="e.g. 23 m"),
        FieldSpec("points_served", "Points served (optional)", "whole", hint="e.g. 8"),
        FieldSpec("ring", "Ring final circuit? (optional)", "choice", choices=YES_NO),
        FieldSpec("selv", "SELV or PELV circuit? (optional)", "choice", choices=YES_NO),
    ),
    "tests": (
        FieldSpec("r1r2", "R1+R2 (optional)", "number", unit="Ω"),
        FieldSpec("r2", "R2 (optional)", "number", unit="Ω", hint="protective conductor alone"),
        FieldSpec("ring_r1", "Ring r1 end to end", "number", unit="Ω", shown_when=_RING),
        FieldSpec("ring_rn", "Ring rn end to end", "number", unit="Ω", shown_when=_RING),
        FieldSpec("ring_r2", "Ring r2 end to end", "number", unit="Ω", shown_when=_RING),
        FieldSpec("insulation_test_voltage", "Insulation test voltage (optional)", "number",
                  unit="V", suggestions=TEST_VOLTAGES),
        FieldSpec("insulation_line_line", "Insulation L–L (optional)", "number", unit="MΩ",
                  hint="e.g. 200, or >999 beyond the range"),
        FieldSpec("insulation_line_earth", "Insulation L–E (optional)", "number", unit="MΩ",
                  hint="e.g. 200, or >999 beyond the range"),
        FieldSpec("polarity", "Polarity (optional)", "choice", choices=POLARITY),
    ),
    "readings": (
        FieldSpec("zs", "Zs", "number", unit="Ω", hint="e.g. 0.62 or 620 mΩ"),
        FieldSpec("zsc", "Zsc (optional)", "number", unit="Ω", hint="line–neutral loop"),
        FieldSpec("ze", "Ze (optional)", "number", unit="Ω", hint="at the origin"),
        FieldSpec("test_temp_c", "Test temperature (optional)", "number", unit="°C",
                  hint="e.g. 20"),
        FieldSpec("rcd_time_1x", "RCD time at IΔn (optional)", "number", unit="s",
                  hint="e.g. 24 ms"),
        FieldSpec("rcd_time_5x", "RCD time at 5 IΔn (optional)", "number", unit="s",
                  hint="e.g. 12 ms"),
        FieldSpec("rcd_test_button", "RCD test button (optional)", "choice", choices=BUTTON),
    ),
    "results": (),
}


def specs_for_step(step: str) -> tuple[FieldSpec, ...]:
    """The fields one step asks for, in screen order."""
    return _SPECS[step]


def all_specs() -> dict[str, FieldSpec]:
    """Every walk field by its store name."""
    return {spec.name: spec for specs in _SPECS.values() for spec in specs}


def label_for(name: str) -> str:
    """The short label of a field (without "(optional)"), for messages."""
    spec = all_specs().get(name)
    if spec is None:
        return name
    return spec.label.replace(" (optional)", "").rstrip("?").strip()

JOB_SPECS: tuple[FieldSpec, ...] = (
    FieldSpec("client_ref", "Client reference", "text", required=True),
    FieldSpec("client_name", "Client", "text"),
    FieldSpec("client_address", "Client's address", "text", multiline=True),
    FieldSpec("site_address", "Site address", "text"),
    FieldSpec("date", "Date", "text", hint="YYYY-MM-DD"),
    FieldSpec("purpose", "Purpose", "choice", choices=PURPOSES),
    FieldSpec("description", "Work description", "text"),
    FieldSpec("next_inspection", "Next inspection by (optional)", "text", hint="YYYY-MM-DD",
              shown_when={"purpose": ("periodic",)}),
    FieldSpec("limitations", "Limitations of the inspection", "text", multiline=True,
              hint="what could not be inspected or tested, and why"),
)
SUPPLY_SPECS: tuple[FieldSpec, ...] = (
    FieldSpec("system", "Earthing system", "choice", choices=SYSTEMS, required=True, default="TN-C-S"),
    FieldSpec("u0", "U0", "number", unit="V", hint="e.g. 230", required=True, default="230"),
    FieldSpec("cmin", "Cmin", "number", hint="voltage factor, e.g. 0.95", required=True,
              default="0.95"),
    FieldSpec("ze", "Ze (optional)", "number", unit="Ω", hint="at the origin"),
    FieldSpec("pfc", "Prospective fault current (optional)", "number", unit="A", hint="e.g. 1.5 kA"),
)

BOARD_SPECS: tuple[FieldSpec, ...] = (
    FieldSpec("designation", "Board name", "text", required=True, hint="e.g. DB-1"),
    FieldSpec("location", "Location", "text"),
    FieldSpec("supplied_from", "Fed from", "text", hint="e.g. origin, or DB-1 way 10"),
    FieldSpec("system", "Earthing system here (blank: the job's)", "choice", choices=SYSTEMS),
    FieldSpec("ze", "Ze or Zdb here (optional)", "number", unit="Ω"),
    FieldSpec("pfc", "Prospective fault current here (optional)", "number", unit="A",
              hint="e.g. 1.5 kA"),
    FieldSpec("ra", "Earth electrode RA (TT)", "number", unit="Ω"),
    FieldSpec("main_device", "Main switch or device (optional)", "text", suggestions=MAIN_DEVICES),
    FieldSpec("main_rating", "Its rating (optional)", "number", unit="A"),
    FieldSpec("origin", "Board at the origin?", "choice", choices=YES_NO),
    FieldSpec("earthing_csa", "Earthing conductor size", "number", unit="mm²",
              shown_when={"origin": ("yes",)}),
    FieldSpec("bonding_csa", "Main bonding conductor size", "number", unit="mm²",
              shown_when={"origin": ("yes",)}),
)
INSTRUMENT_SPECS: tuple[FieldSpec, ...] = (
    FieldSpec("name", "Instrument", "text", hint="e.g. multifunction tester"),
    FieldSpec("serial", "Serial number", "text"),
    FieldSpec("calibration_date", "Calibrated on", "text", hint="YYYY-MM-DD"),
)
OBSERVATION_SPECS: tuple[FieldSpec, ...] = (
    FieldSpec("severity", "Severity", "choice", choices=SEVERITIES, required=True),
    FieldSpec("location", "Where", "text"),
    FieldSpec("finding", "What was found", "text", multiline=True, required=True),
)
