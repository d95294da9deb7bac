"""The electrolyte between two joined metals: conductivity and ohmic resistance.

Units inside: conductivity κ in S/m, resistivity ρ = 1/κ in Ω·m, lengths in m,
temperatures in °C (ITS-90 unless a name says ``t68``), pressure in dbar
(sea pressure, 0 at the surface). Conductivity *ratios* are dimensionless.

Seawater: the Practical Salinity Scale 1978 (PSS-78)
----------------------------------------------------
Practical salinity S is defined from the conductivity ratio
R = C(S, t, p) / C(35, 15 °C, 0), C(35, 15, 0) = 42.914 mS/cm:

    R_p = 1 + p·(e1 + e2·p + e3·p²) / (1 + d1·t + d2·t² + (d3 + d4·t)·R)
    r_t = c0 + c1·t + c2·t² + c3·t³ + c4·t⁴
    R_t = R / (R_p · r_t)
    S   = Σ a_i·R_t^(i/2) + (t − 15)/(1 + k·(t − 15)) · Σ b_i·R_t^(i/2)   (i = 0…5)

with t on the IPTS-68 scale (t68 = 1.00024·t90). :func:`salinity_from_ratio`
evaluates it; :func:`seawater_conductivity` inverts it for the conductivity of
a sample of given salinity and temperature (bisection on R: S rises with R).
Valid for 2 ≤ S ≤ 42, −2 to 35 °C, 0 to 10 000 dbar.

Fresh and brackish water have no such scale: their conductivity is a measured
range (``data/electrolytes.csv``) or what the user enters.

Resistance of the cell's geometry (primary current distribution)
-----------------------------------------------------------------
A disk electrode of radius r flush in an insulating plane, facing a
semi-infinite electrolyte of resistivity ρ, has the ohmic resistance

    R = ρ / (4·r)                         (:func:`disk_resistance_ohm`)

to a counter electrode far away. A coating holiday is such a disk; a
fastener head or a contact zone is approximated as a disk of the same area
(:func:`equivalent_radius_m`), which the pages state.

References
----------
.. [1] Lewis, E. L., The Practical Salinity Scale 1978 and its antecedents,
   IEEE J. Oceanic Eng. OE-5 (1980) 3–8; UNESCO Technical Papers in Marine
   Science 36 and 37 (1981).
.. [2] Fofonoff, N. P. and Millard, R. C., Algorithms for computation of
   fundamental properties of seawater, UNESCO Technical Papers in Marine
   Science 44 (1983), check values of the salinity algorithm.
.. [3] IOC, SCOR and IAPSO, TEOS-10 (2010); the coefficients as coded in the
   GSW toolbox (``gsw_internal_const.h``).
.. [4] Newman, J., Resistance for flow of current to a disk, J. Electrochem.
   Soc. 113 (1966) 501–502.
"""

from __future__ import annotations

import math
from functools import lru_cache

from ..errors import InputError, RangeError

#: C(35, 15 °C, 0) in S/m (42.914 mS/cm), the PSS-78 reference conductivity.
C_35_15_0_S_M = 4.2914

_A = (0.0080, -0.1692, 25.3851, 14.0941, -7.0261, 2.7081)
_B = (0.0005, -0.0056, -0.0066, -0.0375, 0.0636, -0.0144)
_K = 0.0162
_C = (0.6766097, 2.00564e-2, 1.104259e-4, -6.9698e-7, 1.0031e-9)
_D = (3.426e-2, 4.464e-4, 4.215e-1, -3.107e-3)
_E = (2.070e-5, -6.370e-10, 3.989e-15)

#: Validity of PSS-78 as implemented here.
S_MIN, S_MAX = 2.0, 42.0
T_MIN_DEGC, T_MAX_DEGC = -2.0, 35.0


def t68_from_t90(t90_degC):
    """IPTS-68 temperature from ITS-90: t68 = 1.00024·t90 (the scale PSS-78 uses)."""
    return 1.00024 * t90_degC


def salinity_from_ratio(R, t68_degC, p_dbar=0.0):
    """Practical salinity from the conductivity ratio R = C/C(35, 15, 0) (PSS-78).

    Parameters
    ----------
    R : float
        Conductivity ratio [-], > 0.
    t68_degC : float
        Temperature on the IPTS-68 scale [°C].
    p_dbar : float
        Sea pressure [dbar].

    Returns
    -------
    float
        Practical salinity S [-].

    Example (check value, Fofonoff & Millard 1983)
    -------
    >>> round(salinity_from_ratio(1.0, 15.0, 0.0), 3)
    35.0
    """
    if not R > 0:
        raise InputError("The conductivity ratio must be positive.", field="R", value=R,
                         allowed="> 0")
    t, p = t68_degC, p_dbar
    rt = _C[0] + t * (_C[1] + t * (_C[2] + t * (_C[3] + t * _C[4])))
    Rp = 1.0 + p * (_E[0] + p * (_E[1] + p * _E[2])) / (
        1.0 + _D[0] * t + _D[1] * t * t + (_D[2] + _D[3] * t) * R)
    Rt = R / (Rp * rt)
    x = math.sqrt(Rt)
    s_a = sum(a * x ** i for i, a in enumerate(_A))
    s_b = sum(b * x ** i for i, b in enumerate(_B))
    return s_a + (t - 15.0) / (1.0 + _K * (t - 15.0)) * s_b


@lru_cache(maxsize=256)
def seawater_conductivity(S, t_degC, p_dbar=0.0):
    """Conductivity of seawater of practical salinity S at t (ITS-90), p [S/m].

    Inverts :func:`salinity_from_ratio` by bisection on R in (0, 3].

    Raises
    ------
    RangeError
        S or t outside the scale's range (2–42, −2–35 °C).

    >>> round(seawater_conductivity(35.0, 15.0 / 1.00024), 4)   # C(35, 15 °C t68, 0)
    4.2914
    """
    if not S_MIN <= S <= S_MAX:
        raise RangeError(f"Practical salinity {S:g} is outside the range of PSS-78.",
                         field="salinity", value=S, allowed=f"{S_MIN:g} to {S_MAX:g}")
    if not T_MIN_DEGC <= t_degC <= T_MAX_DEGC:
        raise RangeError(f"Temperature {t_degC:g} °C is outside the range of PSS-78.",
                         field="temperature", value=t_degC,
                         allowed=f"{T_MIN_DEGC:g} to {T_MAX_DEGC:g} °C")
    t68 = t68_from_t90(t_degC)
    lo, hi = 1e-4, 3.0
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        if salinity_from_ratio(mid, t68, p_dbar) < S:
            lo = mid
        else:
            hi = mid
    return 0.5 * (lo + hi) * C_35_15_0_S_M


def disk_resistance_ohm(resistivity_ohm_m, radius_m):
    """Ohmic resistance of a disk electrode in an insulating plane: R = ρ/(4r).

    Primary current distribution, semi-infinite electrolyte, counter electrode
    at infinity (Newman 1966).

    >>> disk_resistance_ohm(0.2, 0.005)   # 10 mm holiday in seawater
    10.0
    """
    if not resistivity_ohm_m >= 0 or not radius_m > 0:
        raise InputError("A disk resistance needs a resistivity ≥ 0 and a radius > 0.",
                         field="radius", value=radius_m, allowed="radius > 0")
    return resistivity_ohm_m / (4.0 * radius_m)


def equivalent_radius_m(area_m2):
    """Radius of the disk with the same area: r = √(A/π)."""
    if not area_m2 > 0:
        raise InputError("An equivalent radius needs an area > 0.", field="area",
                         value=area_m2, allowed="> 0")
    return math.sqrt(area_m2 / math.pi)


def film_resistance_per_length(resistivity_ohm_m, film_m):
    """Resistance of a thin film per square [Ω]: ρ/h (sheet resistance)."""
    if not film_m > 0:
        raise InputError("A film thickness must be positive.", field="film_thickness",
                         value=film_m, allowed="> 0")
    return resistivity_ohm_m / film_m
