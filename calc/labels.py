"""Trade words for the core's codes, so every surface prints "70 °C thermoplastic (PVC)" and never
`thermoplastic-70`."""

from __future__ import annotations

from calc import tables
from calc.inputs import Conductor

ARRANGEMENTS = {
    "in-cable": "core of the cable",
    "separate": "separate conductor",
    "armour": "armour or sheath of the cable",
}
DEVICE_KINDS = {
    "mcb": "circuit-breaker",
    "rcbo": "RCBO",
    "fuse-gg": "gG fuse",
    "curve": "device from the maker's curve",
}
RCD_TYPES = {"general": "general (no delay)", "s": "type S (time-delayed)"}
SYSTEMS = {"TN-S": "TN-S", "TN-C-S": "TN-C-S", "TT": "TT"}
ROLES = {"final": "final circuit", "distribution": "distribution circuit"}
MATERIALS = {"copper": "copper", "aluminium": "aluminium", "steel": "steel"}


def insulation(code: str) -> str:
    """ "thermoplastic-70" → "70 °C thermoplastic (PVC)" (IEC 60364-4-43 Table 43A's rows)."""
    row = tables.load("k_line").get(code)
    return str(row["label"]) if row else code


def arrangement(cpc: Conductor, bunched_note: bool = False) -> str:
    """How a protective conductor runs, in words; a separate one says whether it is bunched with
    cables (which sets its k, IEC 60364-5-54 Tables A.54.2 and A.54.3)."""
    words = ARRANGEMENTS.get(cpc.arrangement or "in-cable", cpc.arrangement or "")
    if bunched_note and cpc.arrangement == "separate":
        words += ", bunched with cables" if cpc.bunched else ", not bunched with cables"
    return words


def word(kind: str, code: str | None) -> str:
    """Any other code in words: kind is "device", "rcd", "system", "role" or "material"."""
    table = {
        "device": DEVICE_KINDS,
        "rcd": RCD_TYPES,
        "system": SYSTEMS,
        "role": ROLES,
        "material": MATERIALS,
    }
    if code is None:
        return ""
    return table.get(kind, {}).get(code, code)
