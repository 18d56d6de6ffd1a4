"""The equations of the walk, one small pure function each, floats in base units.

Every function names the standard and clause it implements. None mutates its inputs.
"""

from __future__ import annotations

import math


def fault_current_a(u0_v: float, cmin: float, loop_ohm: float) -> float:
    """Prospective fault current I = U0 · Cmin / Z.

    IEC 60364-4-41 411.4.4 (Zs · Ia ≤ U0) with the minimum voltage factor Cmin of IEC 60909-0 Table 1.
    Used with Zs for the earth fault current and with Zsc for the short-circuit current.
    """
    return u0_v * cmin / loop_ohm


def max_loop_impedance_ohm(u0_v: float, cmin: float, operating_current_a: float) -> float:
    """Largest loop impedance Z = U0 · Cmin / Ia at which the device still clears in time.

    IEC 60364-4-41 411.4.4, rearranged for Zs.
    """
    return u0_v * cmin / operating_current_a


def adiabatic_withstand_time_s(k: float, csa_mm2: float, current_a: float) -> float:
    """Time a conductor withstands a fault current, t = (k · S / I)².

    IEC 60364-4-43 434.5.2 (valid for durations up to 5 s).
    """
    return (k * csa_mm2 / current_a) ** 2


def adiabatic_energy_limit_a2s(k: float, csa_mm2: float) -> float:
    """Let-through energy a conductor withstands, k² · S² in A²s.

    IEC 60364-4-43 434.5.2: for durations under 0.1 s, or energy-limiting devices, I²t ≤ k²S².
    """
    return (k * csa_mm2) ** 2


def adiabatic_min_csa_mm2(current_a: float, time_s: float, k: float) -> float:
    """Minimum protective conductor cross-section, S = √(I² · t) / k.

    IEC 60364-5-54 543.1.2.
    """
    return math.sqrt(current_a * current_a * time_s) / k


def adiabatic_min_csa_from_energy_mm2(energy_a2s: float, k: float) -> float:
    """Minimum cross-section for a let-through energy, S = √(I²t) / k.

    IEC 60364-5-54 543.1.2 with I²t taken from the device maker's let-through data.
    """
    return math.sqrt(energy_a2s) / k


def proportional_cpc_csa_mm2(line_csa_mm2: float, k_line: float, k_cpc: float) -> float:
    """Protective conductor size by proportion to the line conductor.

    IEC 60364-5-54 Table 54.2: S ≤ 16 → S; 16 < S ≤ 35 → 16; S > 35 → S/2, for the same material;
    for another material the result is multiplied by k1/k2 (k1 of the line, k2 of the protective).
    """
    if line_csa_mm2 <= 16:
        same_material = line_csa_mm2
    elif line_csa_mm2 <= 35:
        same_material = 16.0
    else:
        same_material = line_csa_mm2 / 2
    return same_material * k_line / k_cpc


def k_from_constants(
    qc_j_per_c_mm3: float, beta_c: float, rho20_ohm_mm: float, theta_i_c: float, theta_f_c: float
) -> float:
    """k = √(Qc(β+20)/ρ20 · ln((β+θf)/(β+θi))), in A·s½/mm².

    IEC 60364-5-54 Annex A (A.54.1) and IEC 60949 clause 3.
    """
    return math.sqrt(
        qc_j_per_c_mm3
        * (beta_c + 20.0)
        / rho20_ohm_mm
        * math.log((beta_c + theta_f_c) / (beta_c + theta_i_c))
    )


def resistance_ratio(beta_c: float, from_c: float, to_c: float) -> float:
    """Factor that takes a conductor resistance from one temperature to another, (β+θ2)/(β+θ1).

    IEC 60228 Annex B temperature correction (β = 234.5 °C for copper, 228 °C for aluminium).
    """
    return (beta_c + to_c) / (beta_c + from_c)


def touch_voltage_v(ra_ohm: float, idn_a: float) -> float:
    """Touch voltage RA · IΔn for a TT installation protected by an RCD.

    IEC 60364-4-41 411.5.3 (must not exceed 50 V).
    """
    return ra_ohm * idn_a
