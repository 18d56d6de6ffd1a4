"""What each step of the walk asks for: the circuit's fields, their labels, units and choices.

Field names are the store's flat circuit field names (`mobile_app.store.CIRCUIT_FIELDS`); the store
parses each by its calc path, and the walk turns a parse error into a message naming the field.
"""

from __future__ import annotations

from dataclasses import dataclass, field

STEPS: tuple[str, ...] = ("device", "conductors", "readings", "results")
STEP_TITLES: dict[str, str] = {
    "device": "Protective device",
    "conductors": "Conductors",
    "readings": "Readings",
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
    kind: str  # "number" | "choice" | "text"
    unit: str = ""
    hint: str = ""
    required: bool = False
    choices: tuple[Choice, ...] = ()
    default: str = ""
    shown_when: dict[str, tuple[str, ...]] = field(default_factory=dict)


ROLES = (Choice("final", "Final circuit"), Choice("distribution", "Distribution"))
DEVICE_KINDS = (
    Choice("mcb", "Circuit-breaker"),
    Choice("fuse-gg", "gG fuse"),
    Choice("curve", "From library"),
)
CURVES = (Choice("B", "B"), Choice("C", "C"), Choice("D", "D"))
RCD_TYPES = (Choice("general", "General"), Choice("s", "Type S (delayed)"))
LINE_MATERIALS = (Choice("copper", "Copper"), Choice("aluminium", "Aluminium"))
CPC_MATERIALS = LINE_MATERIALS + (Choice("steel", "Steel"),)
INSULATIONS = (
    Choice("thermoplastic-70", "Thermoplastic 70 °C"),
    Choice("thermoplastic-90", "Thermoplastic 90 °C"),
    Choice("thermosetting-90", "Thermosetting 90 °C"),
)
ARRANGEMENTS = (
    Choice("in-cable", "Core in cable"),
    Choice("separate", "Separate"),
    Choice("armour", "Armour"),
)
SYSTEMS = (Choice("TN-S", "TN-S"), Choice("TN-C-S", "TN-C-S"), Choice("TT", "TT"))

_SPECS: dict[str, tuple[FieldSpec, ...]] = {
    "device": (
        FieldSpec("description", "Description", "text", hint="e.g. Kitchen sockets"),
        FieldSpec("role", "Circuit role", "choice", choices=ROLES, required=True, default="final"),
        FieldSpec("device_kind", "Device type", "choice", choices=DEVICE_KINDS, required=True,
                  default="mcb"),
        FieldSpec("device_curve", "Curve", "choice", choices=CURVES, required=True,
                  shown_when={"device_kind": ("mcb",)}),
        FieldSpec("library_device_id", "Library device", "choice", required=True,
                  shown_when={"device_kind": ("curve",)}),
        FieldSpec("device_rating", "Rating In", "number", unit="A", hint="e.g. 32 or 32 A",
                  required=True),
        FieldSpec("rcd_idn", "RCD IΔn (optional)", "number", unit="A", hint="e.g. 30 mA"),
        FieldSpec("rcd_type", "RCD type", "choice", choices=RCD_TYPES, default="general"),
        FieldSpec("let_through_i2t", "Let-through I²t (optional)", "number", unit="A²s",
                  hint="from the maker's data"),
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
    ),
    "readings": (
        FieldSpec("zs", "Zs", "number", unit="Ω", hint="e.g. 0.62 or 620 mΩ"),
        FieldSpec("zsc", "Zsc (optional)", "number", unit="Ω", hint="line–neutral loop"),
        FieldSpec("r1r2", "R1+R2 (optional)", "number", unit="Ω"),
        FieldSpec("ze", "Ze (optional)", "number", unit="Ω", hint="at the origin"),
        FieldSpec("test_temp_c", "Test temperature (optional)", "number", unit="°C",
                  hint="e.g. 20"),
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
    return spec.label.replace(" (optional)", "")

JOB_SPECS: tuple[FieldSpec, ...] = (
    FieldSpec("client_ref", "Client reference", "text", required=True),
    FieldSpec("site_address", "Site address", "text"),
    FieldSpec("date", "Date", "text", hint="YYYY-MM-DD"),
    FieldSpec("description", "Work description", "text"),
)
SUPPLY_SPECS: tuple[FieldSpec, ...] = (
    FieldSpec("system", "Earthing system", "choice", choices=SYSTEMS, required=True, default="TN-C-S"),
    FieldSpec("u0", "U0", "number", unit="V", hint="e.g. 230", required=True, default="230"),
    FieldSpec("cmin", "Cmin", "number", hint="voltage factor, e.g. 0.95", required=True,
              default="0.95"),
    FieldSpec("ze", "Ze (optional)", "number", unit="Ω", hint="at the origin"),
    FieldSpec("pfc", "Prospective fault current (optional)", "number", unit="A", hint="e.g. 1.5 kA"),
)
