"""k values: table look-ups (IEC 60364-4-43 Table 43A, IEC 60364-5-54 Tables A.54.2–A.54.4) and the
formula from material constants that reproduces them."""

from __future__ import annotations

from functools import lru_cache
from typing import NamedTuple

from calc import tables
from calc.formulas import k_from_constants


class KValue(NamedTuple):
    """A k value with the temperatures it assumes and where it comes from."""

    k: float
    theta_i_c: float
    theta_f_c: float
    source: str
    from_memory: bool = False


def k_formula(material: str, theta_i_c: float, theta_f_c: float) -> float:
    """k for a material between an initial and a final temperature.

    IEC 60364-5-54 Annex A (A.54.1) / IEC 60949, constants from `data/materials.toml`.
    """
    m = tables.load("materials")[material]
    return k_from_constants(m["qc_j_per_c_mm3"], m["beta_c"], m["rho20_ohm_mm"], theta_i_c, theta_f_c)


@lru_cache(maxsize=64)
def k_line(material: str, insulation: str, csa_mm2: float) -> KValue:
    """k of a line conductor, IEC 60364-4-43 Table 43A (the column above 300 mm² where it differs)."""
    row = tables.load("k_line")[insulation]
    large = csa_mm2 > 300
    k = row[f"{material}_large" if large else material]
    theta_f = row["theta_f_large_c" if large else "theta_f_c"]
    return KValue(float(k), float(row["theta_i_c"]), float(theta_f), "IEC 60364-4-43 Table 43A")


@lru_cache(maxsize=64)
def k_protective(material: str, arrangement: str, insulation: str) -> KValue | None:
    """k of a protective conductor, IEC 60364-5-54 Tables A.54.2 (separate), A.54.3 (core of a cable),
    A.54.4 (armour or sheath); None where the tables give no value for that combination."""
    row = tables.load("k_protective").get(arrangement, {}).get(insulation)
    if row is None or material not in row:
        return None
    return KValue(
        float(row[material]),
        float(row["theta_i_c"]),
        float(row["theta_f_c"]),
        f"IEC 60364-5-54 Table {row['table']}",
        material in row.get("memory", ()),
    )


def operating_temperature_c(insulation: str) -> float:
    """Maximum operating temperature of a conductor with this insulation (Table 43A's initial θ)."""
    return float(tables.load("k_line")[insulation]["theta_i_c"])


def beta_c(material: str) -> float:
    """β of a conductor material, °C (IEC 60364-5-54 Table A.54.1)."""
    return float(tables.load("materials")[material]["beta_c"])
