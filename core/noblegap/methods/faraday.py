"""Corrosion-rate machinery shared by the calculators: Faraday's law and the
catchment (oxygen-collection) rule.

Sign convention: every current and current density here is a magnitude
(≥ 0). An anodic current density ``i_A_m2`` is the rate at which the anode
metal gives up electrons per unit of its wetted area; a penetration rate is
the mean thickness lost per unit time (uniform attack over the stated area).

Units inside: A, A/m², m, m², s; g/mol for equivalent weights and g/cm³ for
densities, because that is how every table prints them. Conversions to
engineering units (mm/yr, mils per year, µA/cm²) are done by named functions.

Faraday's law (ASTM G102, Eq. 1–3)::

    CR [mm/yr] = K · i [µA/cm²] · EW [g/mol] / ρ [g/cm³]

with K = 3.27e-3 mm·g/(µA·cm·yr) as printed, or K = 0.1288 mpy·g/(µA·cm) for
mils per year. The core computes K from the CODATA Faraday constant and a
365-day year (:func:`k_mm_per_yr`, 3.2685e-3), so the printed K is used only
as a check.

Catchment rule: when the cathode reaction is oxygen reduction at its
diffusion-limited current density ``i_L``, every square metre of wetted
cathode collects ``i_L`` worth of oxygen whatever its alloy, and all of that
current must be supplied by the anode. The anode's own wetted area also
collects oxygen (it is polarised into its active range by the couple, so
oxygen is reduced on it too, and that current is also balanced by its own
dissolution). So the anode dissolves at::

    i_a = i_L · (A_c + A_a) / A_a

of which ``i_L · A_c / A_a`` is the galvanic part (current that crosses the
metallic path, :func:`galvanic_current_A`) and ``i_L`` the anode's own
oxygen-limited corrosion. With no cathode (``A_c = 0``, e.g. fully isolated)
i_a = i_L and the galvanic current is zero.

References
----------
.. [1] ASTM G102, Standard Practice for Calculation of Corrosion Rates and
   Related Information from Electrochemical Measurements, Eq. 1–3, Table 1
   (K constants) and the equivalent-weight section.
.. [2] Flowers, P. et al., OpenStax Chemistry 2e (2019), Example 17.9
   (charge → mass by Faraday's law).
"""

from __future__ import annotations

import math
from typing import NamedTuple

from .. import units
from ..errors import InputError

#: ASTM G102 K for CR in mm/yr with i in µA/cm², EW in g/mol, ρ in g/cm³ (as printed).
K_MM_PER_YR_G102 = 3.27e-3
#: ASTM G102 K for CR in mils per year (as printed).
K_MPY_G102 = 0.1288
#: Seconds in the 365-day year of the G102 K constants.
SECONDS_PER_YEAR = 365 * 24 * 3600.0
#: One mil (0.001 in) in mm.
MM_PER_MIL = 0.0254
#: Lives longer than this are reported as "beyond" rather than as a number.
BEYOND_YEARS = 1000.0

#: Status values of :class:`LifeEstimate`.
LIFE_NO_ATTACK, LIFE_FINITE, LIFE_BEYOND = "no_attack", "finite", "beyond"


def k_mm_per_yr():
    """G102's K recomputed: mm·g/(µA·cm·yr) from CODATA F and a 365-day year.

    K = (1e-2 A/m² per µA/cm²) · (3.1536e7 s/yr) · (1e3 mm/m) / (F · 1e6 g/m³ per g/cm³)

    >>> round(k_mm_per_yr(), 7)
    0.0032685
    """
    return 1e-2 * SECONDS_PER_YEAR * 1e3 / (units.faraday() * 1e6)


def k_mpy():
    """G102's mpy K recomputed (≈ 0.12868) from :func:`k_mm_per_yr`."""
    return k_mm_per_yr() / MM_PER_MIL


def _positive(value, name, *, allow_zero=False):
    ok = value is not None and math.isfinite(value) and (value >= 0 if allow_zero else value > 0)
    if not ok:
        raise InputError(f"{name} must be {'zero or ' if allow_zero else ''}positive.",
                         field=name, value=value,
                         allowed="a finite number ≥ 0" if allow_zero else "a finite number > 0")


def penetration_rate_m_per_s(i_A_m2, EW_g_mol, density_g_cm3):
    """Uniform penetration rate from an anodic current density (Faraday's law).

    rate = i · EW / (F · ρ)

    Parameters
    ----------
    i_A_m2 : float
        Anodic current density [A/m²], ≥ 0.
    EW_g_mol : float
        Equivalent weight [g/mol] = molar mass / electrons per atom (for an
        alloy the G102 weighted form, :func:`equivalent_weight`).
    density_g_cm3 : float
        Density of the metal [g/cm³].

    Returns
    -------
    float
        Penetration rate [m/s].

    Raises
    ------
    InputError
        Negative current density, or non-positive EW or density.

    Example
    -------
    >>> r = penetration_rate_m_per_s(0.01, 27.92, 7.87)   # 1 µA/cm² on iron
    >>> round(r * SECONDS_PER_YEAR * 1e3, 4)               # mm/yr
    0.0116
    """
    _positive(i_A_m2, "i_A_m2", allow_zero=True)
    _positive(EW_g_mol, "EW_g_mol")
    _positive(density_g_cm3, "density_g_cm3")
    return i_A_m2 * EW_g_mol / (units.faraday() * density_g_cm3 * 1e6)


def penetration_mm_per_yr(i_A_m2, EW_g_mol, density_g_cm3):
    """As :func:`penetration_rate_m_per_s`, in mm per 365-day year.

    Equals ASTM G102's CR = K·i·EW/ρ with i in µA/cm² and the recomputed K.

    >>> round(penetration_mm_per_yr(0.01, 32.69, 7.13), 4)   # zinc, 1 µA/cm²
    0.015
    """
    return m_per_s_to_mm_per_yr(penetration_rate_m_per_s(i_A_m2, EW_g_mol, density_g_cm3))


def m_per_s_to_mm_per_yr(rate_m_per_s):
    """Convert m/s to mm per 365-day year."""
    return rate_m_per_s * SECONDS_PER_YEAR * 1e3


def mm_per_yr_to_mpy(rate_mm_per_yr):
    """Convert mm/yr to mils (0.001 in) per year: divide by 0.0254.

    >>> round(mm_per_yr_to_mpy(0.0116), 3)
    0.457
    """
    return rate_mm_per_yr / MM_PER_MIL


def uA_cm2_to_A_m2(i_uA_cm2):
    """µA/cm² → A/m² (1 µA/cm² = 0.01 A/m²)."""
    return i_uA_cm2 * 1e-2


def A_m2_to_uA_cm2(i_A_m2):
    """A/m² → µA/cm²."""
    return i_A_m2 * 1e2


def equivalent_weight(components):
    """Equivalent weight of an alloy, ASTM G102 weighted form.

    EW = 1 / Σ (n_i · f_i / W_i)

    Parameters
    ----------
    components : iterable of (f_i, W_i_g_mol, n_i)
        Mass fraction, atomic weight [g/mol] and valence of each element that
        dissolves (elements under about 1 % by mass are usually left out).

    Returns
    -------
    float
        EW [g/mol].

    >>> round(equivalent_weight([(1.0, 55.845, 2)]), 2)   # pure iron as Fe2+
    27.92
    """
    total = 0.0
    for f, W, n in components:
        _positive(W, "W_i_g_mol")
        _positive(n, "n_i")
        _positive(f, "f_i", allow_zero=True)
        total += n * f / W
    if total <= 0:
        raise InputError("No dissolving element was given.", field="components",
                         value=components, allowed="at least one (f, W, n) with f > 0")
    return 1.0 / total


def catchment_current_density(i_limit_A_m2, A_cathode_m2, A_anode_m2):
    """Anode dissolution current density by the catchment rule.

    i_a = i_L · (A_c + A_a) / A_a

    The anode's own area also collects oxygen (see the module docstring), so
    even with no cathode it dissolves at i_L.

    Parameters
    ----------
    i_limit_A_m2 : float
        Diffusion-limited oxygen-reduction current density [A/m²], ≥ 0.
    A_cathode_m2 : float
        Effective wetted area of the cathode [m²], ≥ 0 (0 = isolated or fully
        coated cathode).
    A_anode_m2 : float
        Effective wetted area of the anode [m²], > 0.

    Returns
    -------
    float
        Anodic current density on the anode [A/m²].

    Raises
    ------
    InputError
        Negative i_L or cathode area, non-positive anode area.

    Notes
    -----
    Valid where oxygen diffusion controls the cathode (aerated near-neutral
    waters, thin films) and the anode is active at the couple potential. It
    is an upper bound when the cathode is slow (passive films with poor
    catalytic activity) or the solution resistance is high.

    Example
    -------
    >>> catchment_current_density(0.1, 9.0, 1.0)   # 10× total area → 1 A/m²
    1.0
    """
    _positive(i_limit_A_m2, "i_limit_A_m2", allow_zero=True)
    _positive(A_cathode_m2, "A_cathode_m2", allow_zero=True)
    _positive(A_anode_m2, "A_anode_m2")
    return i_limit_A_m2 * (A_cathode_m2 + A_anode_m2) / A_anode_m2


def galvanic_current_A(i_limit_A_m2, A_cathode_m2):
    """Galvanic current through the metallic path by the catchment rule [A].

    I_g = i_L · A_c — the oxygen collected on the cathode. Zero when the
    cathode is isolated (no metallic path) or fully coated (A_c = 0).

    >>> galvanic_current_A(0.1, 2.0)
    0.2
    """
    _positive(i_limit_A_m2, "i_limit_A_m2", allow_zero=True)
    _positive(A_cathode_m2, "A_cathode_m2", allow_zero=True)
    return i_limit_A_m2 * A_cathode_m2


def charge_C(current_A, time_s):
    """Charge passed [C] = I·t."""
    _positive(current_A, "current_A", allow_zero=True)
    _positive(time_s, "time_s", allow_zero=True)
    return current_A * time_s


def moles_electrons(charge_coulomb):
    """Moles of electrons in a charge [mol] = Q / F."""
    _positive(charge_coulomb, "charge_C", allow_zero=True)
    return charge_coulomb / units.faraday()


def mass_from_charge_g(charge_coulomb, molar_mass_g_mol, n):
    """Mass of metal dissolved or deposited by a charge [g] = Q·M/(n·F).

    Example (OpenStax Chemistry 2e, Example 17.9): 10.23 A for 1 h on Ag⁺/Ag
    (M = 107.868 g/mol, n = 1) → 0.3817 mol e⁻, 41.19 g.

    >>> round(mass_from_charge_g(10.23 * 3600, 107.868, 1), 2)
    41.17
    """
    _positive(molar_mass_g_mol, "molar_mass_g_mol")
    _positive(n, "n")
    return moles_electrons(charge_coulomb) * molar_mass_g_mol / n


class LifeEstimate(NamedTuple):
    """Years for a penetration rate to consume an allowance.

    ``years`` is a float only when ``status == "finite"``; ``None`` when there
    is no attack (rate 0) or the life is beyond :data:`BEYOND_YEARS`.
    ``text`` is a ready display string.
    """

    years: float | None
    status: str
    text: str


def years_to_consume(allowance_m, rate_m_per_yr):
    """Years until uniform attack consumes a thickness allowance.

    t = allowance / rate

    Parameters
    ----------
    allowance_m : float
        Corrosion allowance [m], > 0.
    rate_m_per_yr : float
        Penetration rate [m per 365-day year], ≥ 0.

    Returns
    -------
    LifeEstimate
        ``status`` "no_attack" (rate 0 → years None), "beyond" (> 1000 years
        → years None) or "finite".

    >>> years_to_consume(1e-3, 1e-4).years
    10.0
    >>> years_to_consume(1e-3, 0.0).status
    'no_attack'
    """
    _positive(allowance_m, "allowance_m")
    _positive(rate_m_per_yr, "rate_m_per_yr", allow_zero=True)
    if rate_m_per_yr == 0:
        return LifeEstimate(None, LIFE_NO_ATTACK, "no galvanic attack")
    years = allowance_m / rate_m_per_yr
    if not math.isfinite(years) or years > BEYOND_YEARS:
        return LifeEstimate(None, LIFE_BEYOND, f"beyond {BEYOND_YEARS:.0f} years")
    return LifeEstimate(years, LIFE_FINITE, units.fmt(years, "years", 3))
