"""A sacrificial anode added to a galvanic joint: three electrodes on one metallic path.

Numbers only (SI floats, ids); the compare view builds the words. Pure Python.

Sign convention as in :mod:`noblegap.methods.cell`: electrode potentials on
the SCE scale (``_V``); a branch current is *net anodic* (positive when the
electrode gives up metal and current leaves it into the water); Kirchhoff's
law on the one metallic path is I_A + I_C + I_S = 0.

The circuit
-----------
The joint's anode member (A), its cathode member (C) and the sacrificial
anode (S) are joined metallically: one metal potential V, measured against
the water far away. Each electrode k has its own polarization law n_k(E)
(:class:`noblegap.methods.cell.Electrode`: the cell model's laws), its
wetted area A_k and its ohmic resistance to the water. The joint's two
members keep the resistances of the current design: their series resistance
R = r_A + r_C + [2·r_N] is split in a star, r_A and r_C from each member to a
common node near the joint and r_N (the mutual resistance of the two, ρ/(2πD)
for two disks a centre distance D apart) from that node to the remote water.
The sacrificial anode stands apart from the joint with its own resistance
R_S to the remote water (:func:`standoff_resistance_ohm`,
:func:`flush_resistance_ohm`).

One branch at a metal-to-node voltage U carries I = A·n(E) with E = U − I·r
(:func:`branch_current`, a bracketed bisection on E: the residual
A·n(E) − (U − E)/r rises strictly with E and changes sign between E_corr and
U). For a trial U of the joint's node, the joint carries I_J(U) = I_A + I_C,
the node sits at r_N·I_J above the remote water, so the metal is at
V = U + r_N·I_J(U) and the sacrificial anode gives I_S(V). The residual
F(U) = I_J(U) + I_S(U + r_N·I_J(U)) rises strictly with U and changes sign
between the lowest and the highest free potential, so one outer bisection
finds the unique operating point (:func:`solve`).

Limits (tested): R_S → ∞ gives I_S = 0 and the two-member cell of
:func:`noblegap.methods.cell.solve` back; a sacrificial anode more noble than
the joint's anode is a second cathode and raises its rate; a larger anode
(more area, less resistance) never raises the joint anode's rate (I_S(V)
grows at every V, so the root in U moves down).

Anode resistance (primary distribution, to the remote water; from memory —
the forms and their validity ranges as given by the cathodic-protection
recommended practice DNV-RP-B401, Table 10-7 of the 2010 edition, recalled):

* slender stand-off, length L ≥ 4·r (modified Dwight):
  R = ρ/(2πL)·(ln(4L/r) − 1);
* slender stand-off, L < 4·r:
  R = ρ/(2πL)·(ln[(2L/r)·(1 + √(1 + (r/2L)²))] + r/(2L) − √(1 + (r/2L)²));
* flush-mounted (short) or bracelet, exposed area A: R = 0.315·ρ/√A.

Anode life (Faraday, as in the same practice's anode-mass formula):
t = m·ε·u / (I·8760 h), m the net mass [kg], ε the electrochemical capacity
[A·h/kg], u the utilisation factor, I the mean current [A].

Where it does not apply: in a thin film (atmospheres, splash) the anode's
current reaches only about the spread length of the film from the anode; no
benefit is computed there (:func:`applicable`).

Left out: the anode's own IR-free potential drifting with time, calcareous
deposits lowering the cathode's demand (the rates are those of fresh bare
metal, as in the cell model), hydrogen evolution on the sacrificial anode,
the metallic path's resistance, and the mutual resistance between the
sacrificial anode and the joint (the anode is taken to stand apart).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from .. import verdicts
from ..errors import InputError
from . import cell, electrolyte, faraday, galvanic

HOURS_PER_YEAR = 8760.0
STANDOFF, FLUSH = "standoff", "flush"
SHAPES = (STANDOFF, FLUSH)
#: A stand-off anode is "long slender" when its length is at least this many radii.
SLENDER_RATIO = 4.0
#: Length of an assumed stand-off anode: this many radii (a slender bar).
ASSUMED_LENGTH_RADII = 8.0
#: Coefficient of the flush-mounted form R = 0.315·ρ/√A (from memory).
FLUSH_COEFFICIENT = 0.315

#: Why a verdict of the anode variant was given (the compare view words it).
BASES = galvanic.BASES + ("protected", "anode_life", "anode_alloy")


# ---------------------------------------------------------------------------
# The anode: resistance, size, life
# ---------------------------------------------------------------------------

def standoff_resistance_ohm(rho_ohm_m, length_m, radius_m):
    """Resistance of a slender stand-off anode to the remote water [Ω].

    >>> round(standoff_resistance_ohm(0.3, 1.0, 0.05), 4)      # L = 20 r: 0.3/(2π)·(ln 80 − 1)
    0.1615
    >>> standoff_resistance_ohm(0.3, 0.1, 0.05) > standoff_resistance_ohm(0.3, 0.2, 0.05)
    True
    """
    if not (length_m > 0 and radius_m > 0 and rho_ohm_m >= 0):
        raise InputError("An anode needs a positive length and radius.", field="anode",
                         value=length_m, allowed="length and radius > 0")
    L, r = length_m, radius_m
    k = rho_ohm_m / (2.0 * math.pi * L)
    if L >= SLENDER_RATIO * r:
        return k * (math.log(4.0 * L / r) - 1.0)
    q = r / (2.0 * L)
    root = math.sqrt(1.0 + q * q)
    return k * (math.log(2.0 * L / r * (1.0 + root)) + q - root)


def flush_resistance_ohm(rho_ohm_m, area_m2):
    """Resistance of a flush-mounted anode of exposed area A [Ω]: 0.315·ρ/√A.

    >>> round(flush_resistance_ohm(0.3, 0.09), 3)
    0.315
    """
    if not area_m2 > 0:
        raise InputError("A flush anode needs a positive exposed area.", field="anode",
                         value=area_m2, allowed="> 0")
    return FLUSH_COEFFICIENT * rho_ohm_m / math.sqrt(area_m2)


def standoff_radius_m(mass_kg, density_g_cm3, length_m):
    """Radius of a cylinder of the given mass, density and length [m]."""
    return math.sqrt(mass_kg / (density_g_cm3 * 1000.0 * math.pi * length_m))


def slender_length_m(mass_kg, density_g_cm3):
    """Length of a cylinder of the given mass whose length is 8 radii [m]."""
    r = (mass_kg / (ASSUMED_LENGTH_RADII * math.pi * density_g_cm3 * 1000.0)) ** (1.0 / 3.0)
    return ASSUMED_LENGTH_RADII * r


def life_yr(net_mass_kg, capacity_Ah_kg, utilisation, current_A):
    """Years the anode delivers ``current_A``: m·ε·u / (I·8760) (inf for no current).

    >>> round(life_yr(10.0, 780.0, 0.9, 0.2), 3)     # zinc, 10 kg at 0.2 A
    4.007
    """
    if current_A <= 0:
        return math.inf
    return net_mass_kg * capacity_Ah_kg * utilisation / (current_A * HOURS_PER_YEAR)


@dataclass(frozen=True)
class Anode:
    """A sacrificial anode in the water (SI floats).

    ``electrode`` its polarization laws, ``area_m2`` its wetted area,
    ``R_ohm`` its resistance to the remote water, ``mass_kg`` its net mass,
    ``capacity_Ah_kg`` and ``utilisation`` for its life.
    """

    electrode: cell.Electrode
    area_m2: float
    R_ohm: float
    mass_kg: float
    capacity_Ah_kg: float
    utilisation: float


def sacrificial_electrode(kinetics_alloy, E_V, i_L_A_m2):
    """The anode alloy as a :class:`cell.Electrode`: the laws and data of the cell
    model (:func:`galvanic.electrode`, ``data/cell_kinetics.csv``) of the alloy
    ``kinetics_alloy``, from the anode's closed-circuit potential ``E_V``; its
    self-corrosion at the likely value, balanced by oxygen reduction.

    Using the closed-circuit (working) potential as the free potential leaves
    out the few tens of millivolts between an anode's open and closed circuit,
    which lowers the drive slightly: on the safe side.
    """
    return galvanic.electrode(kinetics_alloy, E_V, "likely", i_L_A_m2)


# ---------------------------------------------------------------------------
# The three-electrode cell
# ---------------------------------------------------------------------------

def branch_current(el, area_m2, R_ohm, U_V, tol_V=1e-9, max_iter=80):
    """Net anodic current [A] and interface potential [V] of one electrode whose
    metal sits at ``U_V`` against the water node it faces through ``R_ohm``.

    Solves I = A·n(E), E = U − I·R (see the module docstring).

    >>> el = cell.Electrode(-0.66, 0.086, 0.054, 0.12, 1.0)
    >>> I, E = branch_current(el, 1.0, 0.0, -0.60)
    >>> E, round(I, 4) == round(el.net(-0.60), 4)
    (-0.6, True)
    """
    if math.isinf(R_ohm) or area_m2 <= 0:
        return 0.0, el.E_corr_V
    if R_ohm == 0:
        return area_m2 * el.net(U_V), U_V
    lo, hi = min(U_V, el.E_corr_V), max(U_V, el.E_corr_V)
    if hi - lo <= 0:
        return 0.0, U_V

    def h(E):
        return area_m2 * el.net(E) - (U_V - E) / R_ohm

    it = 0
    while hi - lo > tol_V and it < max_iter:
        mid = 0.5 * (lo + hi)
        if h(mid) > 0:
            hi = mid
        else:
            lo = mid
        it += 1
    h_lo, h_hi = h(lo), h(hi)
    E = lo - h_lo * (hi - lo) / (h_hi - h_lo) if h_lo < 0 < h_hi else 0.5 * (lo + hi)
    return area_m2 * el.net(E), E


@dataclass(frozen=True)
class Solution:
    """Operating point of the three-electrode cell (see :func:`solve`).

    Currents are net anodic [A] (the joint anode's and the sacrificial
    anode's positive when they corrode, the cathode's negative); potentials
    are interface potentials [V]. ``limit`` names what takes the largest
    share of the voltage between the sacrificial anode and the cathode's free
    potential (:data:`LIMITS`).
    """

    I_anode_A: float
    I_cathode_A: float
    I_sacrificial_A: float
    E_anode_V: float
    E_cathode_V: float
    E_sacrificial_V: float
    V_metal_V: float
    i_dissolution_A_m2: float
    eta_sacrificial_V: float
    ohmic_sacrificial_V: float
    eta_cathode_V: float
    limit: str


LIMIT_ANODE_RESISTANCE = "anode_resistance"
LIMIT_ANODE_KINETICS = "anode_kinetics"
LIMIT_DEMAND = "demand"
LIMIT_NONE = "none"
LIMITS = {
    LIMIT_ANODE_RESISTANCE: "the anode's resistance to the water: most of its driving "
                            "voltage is lost as ohmic drop around the anode (a larger or "
                            "longer anode delivers more)",
    LIMIT_ANODE_KINETICS: "the anode's own polarization: it cannot dissolve fast enough "
                          "at its potential",
    LIMIT_DEMAND: "the joint's demand: the cathode is polarized towards its oxygen limit "
                  "and takes most of the voltage (a larger anode changes little)",
    LIMIT_NONE: "no current from the anode: it is not less noble than the joint",
}


def solve(anode_el, cathode_el, A_anode_m2, A_cathode_m2, r_anode_ohm, r_cathode_ohm,
          r_node_ohm, sacrificial=None, *, tol_V=1e-7, max_iter=200):
    """The joint (anode and cathode members) with a sacrificial anode attached.

    Parameters
    ----------
    anode_el, cathode_el : cell.Electrode
        The joint's members.
    A_anode_m2, A_cathode_m2 : float
        Their wetted (effective) areas [m²].
    r_anode_ohm, r_cathode_ohm, r_node_ohm : float
        The star split of the joint's electrolyte resistance [Ω]: each member
        to the node near the joint, the node to the remote water.
    sacrificial : Anode or None
        The sacrificial anode (None or ``R_ohm = inf``: none attached).

    Returns
    -------
    Solution

    Example
    -------
    >>> st = cell.Electrode(-0.70, 0.086, 0.054, 0.12, 0.1, i0_H_A_m2=1e-3)
    >>> cu = cell.Electrode(-0.20, 0.02, 0.06, 0.12, 0.1)
    >>> bare = solve(st, cu, 0.1, 1.0, 0.5, 0.1, 0.0)
    >>> zn = Anode(cell.Electrode(-1.03, 0.013, 0.04, 0.12, 0.1), 0.05, 0.2, 5.0, 780.0, 0.9)
    >>> with_zn = solve(st, cu, 0.1, 1.0, 0.5, 0.1, 0.0, zn)
    >>> with_zn.i_dissolution_A_m2 < bare.i_dissolution_A_m2
    True
    >>> with_zn.I_sacrificial_A > 0
    True
    """
    for name, r in (("r_anode_ohm", r_anode_ohm), ("r_cathode_ohm", r_cathode_ohm),
                    ("r_node_ohm", r_node_ohm)):
        if not r >= 0:
            raise InputError("Resistances cannot be negative.", field=name, value=r,
                             allowed="≥ 0")
    S = sacrificial if sacrificial is not None and math.isfinite(sacrificial.R_ohm) else None
    pots = [anode_el.E_corr_V, cathode_el.E_corr_V]
    if S is not None:
        pots.append(S.electrode.E_corr_V)
    lo, hi = min(pots), max(pots)

    def joint(U):
        Ia, Ea = branch_current(anode_el, A_anode_m2, r_anode_ohm, U)
        Ic, Ec = branch_current(cathode_el, A_cathode_m2, r_cathode_ohm, U)
        return Ia, Ea, Ic, Ec

    def sac(V):
        if S is None:
            return 0.0, None
        return branch_current(S.electrode, S.area_m2, S.R_ohm, V)

    def F(U):
        Ia, _, Ic, _ = joint(U)
        Is, _ = sac(U + r_node_ohm * (Ia + Ic))
        return Ia + Ic + Is

    it = 0
    while hi - lo > tol_V and it < max_iter:
        mid = 0.5 * (lo + hi)
        if F(mid) > 0:
            hi = mid
        else:
            lo = mid
        it += 1
    f_lo, f_hi = F(lo), F(hi)
    U = lo - f_lo * (hi - lo) / (f_hi - f_lo) if f_lo < 0 < f_hi else 0.5 * (lo + hi)
    Ia, Ea, Ic, Ec = joint(U)
    V = U + r_node_ohm * (Ia + Ic)
    Is, Es = sac(V)
    i_d = anode_el.dissolution(Ea)
    if S is None or Is <= 0:
        return Solution(Ia, Ic, Is, Ea, Ec, Es if Es is not None else V, V, i_d, 0.0, 0.0,
                        cathode_el.E_corr_V - Ec, LIMIT_NONE)
    eta_s = Es - S.electrode.E_corr_V
    ohm_s = Is * S.R_ohm
    eta_c = max(cathode_el.E_corr_V - Ec, 0.0)
    parts = {LIMIT_ANODE_KINETICS: eta_s, LIMIT_ANODE_RESISTANCE: ohm_s, LIMIT_DEMAND: eta_c}
    return Solution(Ia, Ic, Is, Ea, Ec, Es, V, i_d, eta_s, ohm_s, eta_c,
                    max(parts, key=parts.get))


# ---------------------------------------------------------------------------
# The joint of an assessment, with an anode added
# ---------------------------------------------------------------------------

def applicable(assessment):
    """(True, None) in immersion; (False, reason id) in a thin film (atmospheres)."""
    if assessment["likely"]["film_m"] is not None:
        return False, "atmosphere"
    return True, None


def joint_resistances(assessment, case):
    """The star split (r_anode, r_cathode, r_node) [Ω] of one case's joint.

    The two members' self resistances to the remote water come from the same
    formulas as the current design's (:func:`galvanic.resistance_ohm` without
    the members' interaction), the mutual part from the difference to the
    case's resistance; their sum r_anode + r_cathode = R of the case.
    """
    c = assessment["cases"][case]
    lay = assessment["layout"]
    rho = c["rho_ohm_m"]
    A_sur = c["A_cathode_eff_m2"] if lay.site_role == "anode" else c["A_anode_eff_m2"]
    R_sum = galvanic.resistance_ohm(replace(lay, distance_m=None), rho, max(A_sur, 1e-12))
    R_site = electrolyte.disk_resistance_ohm(
        rho, electrolyte.equivalent_radius_m(lay.site_area_m2 / lay.sites)) / lay.sites
    R_sur = max(R_sum - R_site, 0.0)
    R = c["R_ohm"]
    mutual = 0.0 if not math.isfinite(R) else min(max(0.5 * (R_sum - R), 0.0), R_site, R_sur)
    r_site, r_sur = R_site - mutual, R_sur - mutual
    if lay.site_role == "anode":
        return r_site, r_sur, mutual
    return r_sur, r_site, mutual


@dataclass(frozen=True)
class AnodeSpec:
    """The anode to add: alloy row values and size (SI floats)."""

    E_V: float                 # closed-circuit potential, SCE scale
    kinetics_alloy: str        # alloy id of its polarization data
    capacity_Ah_kg: float
    density_g_cm3: float
    utilisation: float
    mass_kg: float
    shape: str                 # STANDOFF or FLUSH
    length_m: float | None = None
    area_m2: float | None = None

    def size(self):
        """(wetted area [m²], radius [m] or None, length [m] or None)."""
        if self.shape == STANDOFF:
            r = standoff_radius_m(self.mass_kg, self.density_g_cm3, self.length_m)
            return 2 * math.pi * r * self.length_m + 2 * math.pi * r * r, r, self.length_m
        return self.area_m2, None, None

    def resistance_ohm(self, rho_ohm_m):
        if self.shape == STANDOFF:
            _, r, L = self.size()
            return standoff_resistance_ohm(rho_ohm_m, L, r)
        return flush_resistance_ohm(rho_ohm_m, self.area_m2)


def with_anode(assessment, spec, *, R_extra_ohm=0.0):
    """Each case of ``assessment`` (from :func:`galvanic.assess`, immersion) solved
    again with the sacrificial anode ``spec`` attached.

    ``R_extra_ohm`` is added to the anode's resistance (``math.inf``: the
    anode detached; used by the limit tests).

    Returns
    -------
    dict
        ``cases`` {case: numbers}, ``years`` (low, likely, high), ``R_anode_ohm``
        (likely), ``area_m2``, ``radius_m``, ``length_m``.
    """
    an_row = assessment["anode_row"]
    out = {}
    area, radius, length = spec.size()
    for case in galvanic.CASES:
        c = assessment["cases"][case]
        a_el, c_el = c["_electrodes"]
        ra, rc, rn = joint_resistances(assessment, case)
        R_s = spec.resistance_ohm(c["rho_ohm_m"]) + R_extra_ohm
        s_el = sacrificial_electrode(spec.kinetics_alloy, spec.E_V, c["i_L_A_m2"])
        anode = Anode(s_el, area, R_s, spec.mass_kg, spec.capacity_Ah_kg, spec.utilisation)
        sol = solve(a_el, c_el, c["A_anode_eff_m2"], c["A_cathode_eff_m2"], ra, rc, rn, anode)
        rate = faraday.penetration_mm_per_yr(sol.i_dissolution_A_m2,
                                             an_row["equivalent_weight_g_mol"],
                                             an_row["density_g_cm3"])
        a_life = life_yr(spec.mass_kg, spec.capacity_Ah_kg, spec.utilisation,
                         sol.I_sacrificial_A)
        years, status = years_to_allowance(assessment["allowance_m"], rate,
                                           c["local_mm_per_yr"], a_life)
        out[case] = {"solution": sol, "local_mm_per_yr": rate, "R_anode_ohm": R_s,
                     "current_A": max(sol.I_sacrificial_A, 0.0), "anode_life_yr": a_life,
                     "years_to_allowance": years, "life_status": status,
                     "E_anode_V_SCE": sol.E_anode_V, "limit": sol.limit}
    return {"cases": out, "years": tuple(out[c]["years_to_allowance"] for c in galvanic.CASES),
            "R_anode_ohm": out["likely"]["R_anode_ohm"], "area_m2": area, "radius_m": radius,
            "length_m": length}


def years_to_allowance(allowance_m, protected_mm_per_yr, bare_mm_per_yr, anode_life):
    """Years until the allowance is used: at the protected rate while the anode
    lasts, then at the rate without it. Returns (years or None, status) with the
    statuses of :func:`faraday.years_to_consume`.

    >>> years_to_allowance(0.001, 0.01, 0.5, 10.0)          # 0.1 mm in 10 yr, 0.9 mm at 0.5
    (11.8, 'finite')
    >>> years_to_allowance(0.001, 0.0, 0.0, math.inf)
    (None, 'no_attack')
    """
    used_m = protected_mm_per_yr / 1000.0 * anode_life if math.isfinite(anode_life) else None
    if used_m is None or used_m >= allowance_m:
        est = faraday.years_to_consume(allowance_m, protected_mm_per_yr / 1000.0)
        return est.years, est.status
    after = faraday.years_to_consume(allowance_m - used_m, bare_mm_per_yr / 1000.0)
    if after.years is None:
        return None, (faraday.LIFE_BEYOND if after.status == faraday.LIFE_BEYOND or
                      protected_mm_per_yr > 0 else after.status)
    total = anode_life + after.years
    if total > faraday.BEYOND_YEARS:
        return None, faraday.LIFE_BEYOND
    return round(total, 12), faraday.LIFE_FINITE


def protected(E_reached_V, criterion, E_corr_V):
    """Whether the joint anode reached its protection criterion.

    ``criterion`` as :func:`noblegap.materials.anode_data.criterion` returns it:
    a potential (E ≤ E_protect) or a shift (E ≤ E_corr − shift).
    """
    if criterion["E_protect_V_SCE"] is not None:
        return E_reached_V <= criterion["E_protect_V_SCE"] + 1e-9
    return E_reached_V <= E_corr_V - criterion["shift_V"] + 1e-9


def judge(assessment, result, design_life_yr, *, all_protected=False, alloy_suits=True):
    """Verdict class (:mod:`noblegap.verdicts`) and basis of the anode variant.

    The joint is judged by :func:`galvanic.judge` on the residual rates; where
    the joint anode is held at its protection criterion even in the high case,
    the potential difference of the couple no longer drives its attack. Then
    the anode itself: an anode that is used up within the design life (at the
    likely or the high current), or an alloy that does not suit the water,
    is never rated ``ok``.
    """
    cases = result["cases"]
    cls, basis = galvanic.judge(cases, assessment["rule"], assessment["allowed_delta_V"],
                                design_life_yr)
    if basis == "delta_v" and all_protected:
        cls, basis = verdicts.OK, "protected"
    shortest = min(cases[c]["anode_life_yr"] for c in galvanic.CASES)
    if shortest < design_life_yr and cls == verdicts.OK:
        cls, basis = verdicts.CAUTION, "anode_life"
    if not alloy_suits and cls == verdicts.OK:
        cls, basis = verdicts.CAUTION, "anode_alloy"
    return cls, basis
