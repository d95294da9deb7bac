"""One galvanic assessment for every page: the anode rule, the cell in its
environment with low / likely / high cases, where the current goes, the
years to use the allowance and the verdict.

Numbers only (SI floats, ids); calculators build the words.

The anode rule (:func:`anode_rule`) — the one place that decides which member
corrodes: the member whose galvanic-series range has the lower midpoint in the
environment is the anode. ΔV as low / likely / high: the closest ends of the
two ranges (0 when they overlap), the midpoints, the farthest ends.

The cases (:data:`CASES`): *likely* takes every input at its likely value;
*high* every input at the end that drives more attack (largest ΔV, highest own
corrosion, oxygen limit, conductivity and time of wetness); *low* the other
end. Only inputs that carry a range in the data enter the range.

Layout (:class:`Layout`): ``sites`` equal small features of one member
(fasteners, holidays, the smaller member of a joint) of radius r₀ each, in a
larger ``surround`` member; ``faces`` plate faces per site. Resistance of the
electrolyte (primary distribution):

* bulk: R = ρ/(4·r_site)/n + ρ/(4·r_surround) − [ρ/(π·D) for a joint at a
  centre distance D] (disks in an insulating plane, point-source
  superposition for the interaction);
* thin film of thickness h: R = [ρ/(2π·h) · ln((r₀ + λ)/r₀) + ρ/(8π·h)] /
  (n·faces): radial flow through the film out to the spread length λ, plus
  the site's own film (a uniformly loaded disk drained at its rim).

The surrounding member takes part only within λ of each site: effective area
A_eff = min(A, n·faces·2π·λ·(r₀ + λ)), the area under an exponential fall-off
i(x) = i(0)·e^(−x/λ) with distance x from the site's edge; a few fixed-point
iterations settle λ, A_eff and R together.

Atmospheres: the film is wet only part of the year. The annual rate is the
wet-time rate × the wet fraction (time of wetness / 8760 h); the anode's own
uncoupled annual rate is bounded by the first-year band of ISO 9223 for its
family where the standard tabulates one.

Time: the rates are those of a fresh, bare surface; no published model of the
resistance added by corrosion products or calcareous deposits is applied.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache

from .. import units, verdicts
from ..errors import InputError, MissingDataError, NoblegapError
from ..materials import alloys, cell_data
from . import cell, electrolyte, faraday

CASES = ("low", "likely", "high")
HOURS_PER_YEAR = 8760.0
#: Oxygen in air-saturated water at about 20 °C: diffusivity [m²/s] and
#: concentration [mol/m³]; with Fick's first law they give the limiting
#: current through a film, i_L = 4·F·D·c/h. Values recalled (from memory).
O2_DIFFUSIVITY_M2_S = 2.0e-9
O2_CONCENTRATION_MOL_M3 = 0.25
#: Fixed-point iterations of the spread length; a relative change of λ below
#: SPREAD_TOLERANCE ends early (results are exact to about that fraction).
SPREAD_ITERATIONS = 12
SPREAD_TOLERANCE = 0.02
#: Hydrogen evolution equilibrium at pH 8 on the SCE scale: −0.059·8 − 0.241 V.
E_H_V_SCE = -0.0592 * 8.0 - 0.2412


# ---------------------------------------------------------------------------
# The anode rule
# ---------------------------------------------------------------------------

def anode_rule(first_id, second_id, env_id):
    """Which of two members is the anode, and ΔV as (low, likely, high) [V].

    Returns
    -------
    dict
        ``anode``, ``cathode`` (alloy ids), ``first_is_anode``, ``ranges``
        {alloy id: (E_noble, E_active)} [V vs SCE], ``delta_V`` (low, likely,
        high), ``galvanic`` (False when both ranges coincide: same alloy or
        same group), ``overlap``.

    >>> r = anode_rule("S31600", "A95083", "seawater_flowing")
    >>> r["anode"], round(r["delta_V"][1], 3)
    ('A95083', 0.83)
    """
    series_env = cell_data.series_environment(env_id)["id"]
    r1 = alloys.potential_range(first_id, series_env)
    r2 = alloys.potential_range(second_id, series_env)
    m1, m2 = 0.5 * sum(r1), 0.5 * sum(r2)
    first_is_anode = m1 <= m2
    a, c = (first_id, second_id) if first_is_anode else (second_id, first_id)
    ra, rc = (r1, r2) if first_is_anode else (r2, r1)
    galvanic = not (first_id == second_id or r1 == r2)
    if not galvanic:
        dv = (0.0, 0.0, 0.0)
    else:
        dv = (max(0.0, rc[1] - ra[0]), 0.5 * sum(rc) - 0.5 * sum(ra), rc[0] - ra[1])
    return {"anode": a, "cathode": c, "first_is_anode": first_is_anode,
            "ranges": {first_id: r1, second_id: r2}, "range_anode": ra, "range_cathode": rc,
            "delta_V": dv, "galvanic": galvanic,
            "overlap": not (r1[1] > r2[0] or r2[1] > r1[0])}


# ---------------------------------------------------------------------------
# Electrolyte and electrodes per case
# ---------------------------------------------------------------------------

def _pick(triple, case):
    lo, likely, hi = triple
    return {"low": lo, "likely": likely, "high": hi}[case]


@lru_cache(maxsize=1)
def _faraday():
    return units.faraday()


def film_limit_A_m2(film_m):
    """Oxygen limiting current density through a still film: 4·F·D·c/h [A/m²].

    >>> round(film_limit_A_m2(1e-4), 2)
    1.93
    """
    return 4.0 * _faraday() * O2_DIFFUSIVITY_M2_S * O2_CONCENTRATION_MOL_M3 / film_m


@lru_cache(maxsize=256)
def electrolyte_case(env_id, case, conductivity_S_m=None):
    """Conductivity, oxygen limit, film and wet fraction of one case (read-only:
    the tables do not change while the core runs, so each case is read once).

    Returns
    -------
    dict
        ``kappa_S_m``, ``rho_ohm_m``, ``i_L_A_m2``, ``film_m`` (None in
        immersion), ``wet_fraction`` (1 in immersion), ``kind``,
        ``conductivity_entered``, ``salinity``/``T_degC`` where PSS-78 applies.
    """
    env = cell_data.environment(env_id)
    out = {"kind": env["kind"], "conductivity_entered": conductivity_S_m is not None,
           "salinity": None, "T_degC": None}
    if env["kind"] == cell_data.IMMERSION:
        if env["method"] == "pss78":
            S = _pick(cell_data.triple(env, "salinity", "psu"), case)
            T = _pick((env["T_low_degC"], env["T_degC"], env["T_high_degC"]), case)
            kappa = electrolyte.seawater_conductivity(S, min(T, electrolyte.T_MAX_DEGC))
            out.update(salinity=S, T_degC=T)
        else:
            kappa = _pick(cell_data.triple(env, "kappa", "S_m"), case)
        out.update(i_L_A_m2=_pick(cell_data.triple(env, "i_L", "A_m2"), case), film_m=None,
                   wet_fraction=1.0)
    else:
        kappa = _pick(cell_data.triple(env, "kappa", "S_m"), case)
        film = _pick(cell_data.triple(env, "film", "mm"), case) / 1000.0
        tow = _pick(cell_data.triple(env, "tow", "h_per_yr"), case)
        out.update(i_L_A_m2=film_limit_A_m2(film), film_m=film,
                   wet_fraction=min(1.0, tow / HOURS_PER_YEAR))
    if conductivity_S_m is not None:
        kappa = conductivity_S_m
    out["kappa_S_m"] = kappa
    out["rho_ohm_m"] = 1.0 / kappa
    return out


@lru_cache(maxsize=512)
def electrode(alloy_id, E_corr_V, case, i_L_A_m2):
    """:class:`cell.Electrode` of an alloy from ``data/cell_kinetics.csv`` (an
    immutable value, built once per set of arguments).

    ``case`` picks the own corrosion (passive) current density: high for the
    anode's high case. The own current density is kept below i_L.
    """
    row = cell_data.kinetics_row(alloy_id)
    i_corr = _pick(cell_data.triple(row, "i_corr", "A_m2"), case)
    i_corr = min(i_corr, 0.5 * i_L_A_m2)
    b_a = row["b_a_mV_per_decade"]
    return cell.Electrode(E_corr_V, i_corr, None if b_a is None else b_a / 1000.0,
                          row["b_c_mV_per_decade"] / 1000.0, i_L_A_m2,
                          passive=row["mode"] == "passive", E_b_V=row["E_b_V_SCE"],
                          i0_H_A_m2=row["i0_H_A_m2"] or 0.0, E_H_V=E_H_V_SCE)


# ---------------------------------------------------------------------------
# Geometry
# ---------------------------------------------------------------------------

@dataclass(frozen=True)
class Layout:
    """Where the two members meet (SI floats).

    ``site_role`` is ``"anode"`` or ``"cathode"``: the member made of the
    ``sites`` small features (fasteners, holidays, the smaller member of a
    joint), each of wetted area ``site_area_m2 / sites`` and joint radius
    ``site_radius_m`` (r₀, where the surround begins); ``faces`` surround
    faces per site. ``distance_m`` is the gap between two separate members
    (None: in contact / the site sits in the surround). ``surrounds`` is
    False when the larger member lies elsewhere (holidays facing a separate
    cathode): then the whole larger member takes part and no spread applies.
    """

    site_role: str
    sites: int
    site_area_m2: float
    surround_area_m2: float
    site_radius_m: float
    faces: int = 1
    distance_m: float | None = None
    surrounds: bool = True

    def areas(self):
        """(A_anode, A_cathode) wetted totals."""
        if self.site_role == "anode":
            return self.site_area_m2, self.surround_area_m2
        return self.surround_area_m2, self.site_area_m2


def _surround_area(layout, lam):
    n = layout.sites * layout.faces
    if math.isinf(lam):
        return layout.surround_area_m2
    return min(layout.surround_area_m2,
               n * 2.0 * math.pi * lam * (layout.site_radius_m + lam))


def resistance_ohm(layout, rho, A_surround_eff, film_m=None, lam=math.inf):
    """Electrolyte resistance between the members (see the module docstring)."""
    n = layout.sites
    if film_m is not None:
        r0 = layout.site_radius_m
        reach = lam if math.isfinite(lam) else math.sqrt(A_surround_eff / math.pi)
        faces = n * layout.faces
        # the surround: radial flow out to λ; the site's own film: a uniformly
        # loaded disk drained at its rim, ρ/(8π·h) per face; a gap d adds the
        # radial path across it
        gap = math.log((r0 + layout.distance_m) / r0) if layout.distance_m else 0.0
        return (rho / (2.0 * math.pi * film_m) * (math.log((r0 + reach) / r0) + gap)
                + rho / (8.0 * math.pi * film_m)) / faces
    r_site = electrolyte.equivalent_radius_m(layout.site_area_m2 / n)
    r_sur = electrolyte.equivalent_radius_m(A_surround_eff)
    R = electrolyte.disk_resistance_ohm(rho, r_site) / n + \
        electrolyte.disk_resistance_ohm(rho, r_sur)
    if layout.distance_m is not None:
        D = layout.distance_m + r_site + r_sur
        R -= rho / (math.pi * D)
    return R


# ---------------------------------------------------------------------------
# One case
# ---------------------------------------------------------------------------

def solve_case(anode_el, cathode_el, layout, elec, *, isolated=False, R_extra_ohm=0.0,
               coat_anode=0.0, coat_cathode=0.0):
    """Cell, spread length, effective areas and resistance of one case.

    ``coat_*`` are the fractions of each member's wetted area sealed by a
    coating; ``isolated`` breaks the metallic path (no galvanic current).

    Returns
    -------
    dict
        ``solution`` (:class:`cell.Solution`), ``A_anode_eff_m2``,
        ``A_cathode_eff_m2``, ``A_anode_m2`` (wetted total), ``R_ohm``,
        ``spread_m`` (λ on the surround member, math.inf when unbounded),
        ``ohmic_limit_A`` (ΔV/R, the current with no polarization at all).
        Read-only: the same inputs return the same dict (a page asks for the
        same case more than once: the current alloy among the alternatives,
        a bare couple at every point of a coating's life, an edit of the life
        or the allowance alone).
    """
    return _solve_case(anode_el, cathode_el, layout, elec["rho_ohm_m"], elec["film_m"],
                       isolated, R_extra_ohm, coat_anode, coat_cathode)


@lru_cache(maxsize=512)
def _solve_case(anode_el, cathode_el, layout, rho, film, isolated, R_extra_ohm, coat_anode,
                coat_cathode):
    A_an, A_ca = layout.areas()
    A_an *= (1.0 - coat_anode)
    A_ca *= (1.0 - coat_cathode)
    if A_an <= 0:
        raise InputError("The anode has no exposed area left.", field="coating",
                         value=coat_anode, allowed="a coated fraction below 1")
    lay = Layout(layout.site_role, layout.sites,
                 A_an if layout.site_role == "anode" else A_ca,
                 A_ca if layout.site_role == "anode" else A_an,
                 layout.site_radius_m, layout.faces, layout.distance_m, layout.surrounds)
    # λ beyond the member's own size changes nothing: cap it there, start there,
    # and damp the fixed point in log space (geometric mean of old and new). The
    # fixed point need not be unique (a cathode near its free potential is "stiff",
    # on its oxygen plateau "soft"); starting from the whole member and damping
    # finds the one with the larger area, which keeps "a larger cathode never
    # lowers the anode's rate" (tests/test_fasteners.py); undamped steps did not.
    # Where the new λ falls steeply with λ the damped steps cycle instead of
    # settling; then the root of log(λ_new/λ) is bisected in log λ (below).
    lam_cap = math.sqrt(max(lay.surround_area_m2, 1e-12) / math.pi) if lay.surround_area_m2 \
        else math.inf
    lam = lam_cap if lay.surrounds else math.inf
    per_site = lay.sites * (lay.faces if film is not None else 1)
    sur_is_cathode = lay.site_role == "anode"

    def at(lam, guess, step=3e-3):
        """(solution, A_a_eff, A_c_eff, R, new λ or None) with the surround within λ."""
        A_sur = _surround_area(lay, lam) if lay.surround_area_m2 > 0 else 0.0
        A_a_eff, A_c_eff = (lay.site_area_m2, A_sur) if sur_is_cathode else \
            (A_sur, lay.site_area_m2)
        if A_a_eff <= 0:
            return None
        R = (math.inf if isolated else
             (resistance_ohm(lay, rho, max(A_sur, 1e-12), film, lam) + R_extra_ohm)
             if A_c_eff > 0 else math.inf)
        sol = cell.solve(anode_el, cathode_el, A_a_eff, A_c_eff, R, guess_V=guess,
                         step_V=step)
        if not lay.surrounds or sol.current_A == 0:
            return sol, A_a_eff, A_c_eff, R, None
        sur_el, E_sur = (cathode_el, sol.E_cathode_V) if sur_is_cathode else \
            (anode_el, sol.E_anode_V)
        new_lam = min(lam_cap, cell.spread_length_m(cell.softness_V(sur_el, E_sur),
                                                    sol.current_A / per_site, rho,
                                                    lay.site_radius_m, film))
        return sol, A_a_eff, A_c_eff, R, new_lam

    def settle(lam):
        """The damped fixed point from λ: (λ, sol, A_a_eff, A_c_eff, R)."""
        sol = None
        visited = []          # (λ, log(λ_new/λ)) of every damped step that did not settle
        step = 3e-3           # how far the anode potential moved in the last step [V]
        for _ in range(SPREAD_ITERATIONS):
            prev = sol
            state = at(lam, sol.E_anode_V if sol is not None else None, step)
            if state is None:
                break
            sol, A_a_eff, A_c_eff, R, new_lam = state
            if prev is not None:
                step = 0.5 * abs(sol.E_anode_V - prev.E_anode_V)
            if new_lam is None:
                break
            phi = math.log(new_lam / lam)
            if abs(phi) <= SPREAD_TOLERANCE:
                break
            visited.append((lam, phi))
            lam = math.sqrt(lam * new_lam)
        else:
            lam, state = _bisect_spread(at, visited, sol, lay.site_radius_m)
            sol, A_a_eff, A_c_eff, R, _ = state
        return lam, sol, A_a_eff, A_c_eff, R

    lam, sol, A_a_eff, A_c_eff, R = settle(lam)
    # A passive anode around the sites can have two consistent states: passive
    # over a wide band (its flat passive current spreads the galvanic current
    # far), or pitting over a narrow one (the current concentrated next to the
    # sites holds it above its breakdown potential). Which one a joint reaches
    # depends on its history; a screening result takes the pitting state
    # wherever it is consistent, found by settling again from the sites' own
    # size. (Taking whichever state the first settling reached made the rate
    # jump down and up again as fasteners were added.)
    E_b = anode_el.E_b_V if anode_el.passive else None
    if (E_b is not None and lay.surrounds and not sur_is_cathode and sol is not None
            and sol.current_A > 0 and sol.E_anode_V <= E_b):
        pitting = settle(min(lam, lay.site_radius_m))
        if pitting[1] is not None and pitting[1].E_anode_V > E_b:
            lam, sol, A_a_eff, A_c_eff, R = pitting
    spread = lam if (lay.surrounds and lam < lam_cap) else math.inf
    return {"solution": sol, "A_anode_eff_m2": A_a_eff, "A_cathode_eff_m2": A_c_eff,
            "A_anode_m2": A_an, "A_cathode_m2": A_ca, "R_ohm": R, "spread_m": spread,
            "ohmic_limit_A": (sol.driving_V / R if R > 0 and math.isfinite(R) else math.inf)}


def _bisect_spread(at, visited, sol, r0_m):
    """λ where log(λ_new/λ) changes sign, bisected in log λ to SPREAD_TOLERANCE,
    and the state ``at(λ)`` there.

    Used when the damped fixed point cycles (λ_new falls steeply with λ, as where
    a fastener's current just reaches the size that spreads over the whole
    plate). Of the steps already taken, the bracket's upper end is the smallest λ
    above the largest λ whose λ_new was larger (log(λ_new/λ) > 0): the root next
    below the whole member, the one the damped steps aim at. Without such a step
    λ is divided by 4 until one is found, down to a thousandth of r₀.
    """
    guess = sol.E_anode_V
    up = [lam for lam, phi in visited if phi > 0]
    lo = max(up) if up else None
    if lo is None:
        lam = min(lam for lam, _ in visited)
        while lo is None:
            lam *= 0.25
            state = at(lam, guess)
            if state is None or state[4] is None or lam < 1e-3 * r0_m:
                return lam, state if state is not None else at(lam * 4.0, guess)
            guess = state[0].E_anode_V
            if state[4] > lam:
                lo = lam
    hi = min(lam for lam, phi in visited if phi < 0 and lam > lo)
    while True:
        lam = math.sqrt(lo * hi)
        state = at(lam, guess)
        if state[4] is None or math.log(hi / lo) <= SPREAD_TOLERANCE:
            return lam, state
        guess = state[0].E_anode_V
        if state[4] > lam:
            lo = lam
        else:
            hi = lam


@lru_cache(maxsize=128)
def _mm_per_yr_per_A_m2(EW_g_mol, density_g_cm3):
    return faraday.penetration_mm_per_yr(1.0, EW_g_mol, density_g_cm3)


def _rate(i_A_m2, row):
    """Faraday's law (linear in i): mm/yr of the anode row at i [A/m²]."""
    return i_A_m2 * _mm_per_yr_per_A_m2(row["equivalent_weight_g_mol"], row["density_g_cm3"])


def anode_props(alloy_id, field):
    """Density and equivalent weight of an anode, or MissingDataError naming the gap."""
    row = alloys.alloy(alloy_id)
    if row.get("density_g_cm3") is None or row.get("equivalent_weight_g_mol") is None:
        raise MissingDataError(
            f"No density or equivalent weight for {row['name']} ({alloy_id}) in "
            "the alloy table, so its penetration rate cannot be computed.", field=field,
            value=alloy_id, allowed="an alloy with a density and an equivalent weight")
    return row


def assess(*args, **kwargs):
    """See :func:`_assess`; arithmetic that fails on values far outside any real
    joint (a domain error, a division by zero) becomes an :class:`InputError`."""
    try:
        return _assess(*args, **kwargs)
    except NoblegapError:
        raise
    except (ValueError, ZeroDivisionError, OverflowError) as exc:
        raise InputError("The sizes entered are too small or too large to compute a "
                         f"galvanic cell with ({type(exc).__name__}).",
                         allowed="sizes of a real joint: millimetres to metres, "
                                 "square millimetres to hundreds of square metres") from None


def _assess(first_id, second_id, env_id, layout_of, *, conductivity_S_m=None,
           allowance_of=None, design_life_yr=25.0, isolated=False, coat_anode=0.0,
           coat_cathode=0.0, field_of=None, cases=CASES):
    """The whole assessment of one couple in one layout, all three cases.

    Parameters
    ----------
    first_id, second_id : str
        Alloy ids of the two members (in the calculator's order).
    env_id : str
        Cell environment (``data/electrolytes.csv`` or ``data/atmospheres.csv``).
    layout_of : callable
        ``layout_of(rule) -> Layout`` given the anode rule's result (the
        calculator knows which member is the site).
    allowance_of : callable
        ``allowance_of(anode_id) -> (allowance_m, default_text or None)``.
    design_life_yr : float
        Design life [years].

    Returns
    -------
    dict
        ``rule``, ``galvanic`` (bool), ``cases`` {case: numbers}, ``likely`` (the
        likely case), ``years`` (low, likely, high: years to use the allowance
        at the local rate), ``verdict`` (class), ``verdict_basis`` (a key of
        :data:`BASES`), ``from_memory`` (bool).
    """
    rule = anode_rule(first_id, second_id, env_id)
    an_id, ca_id = rule["anode"], rule["cathode"]
    field = (field_of or (lambda role: role))("anode")
    an_row = anode_props(an_id, field)
    layout = layout_of(rule)
    allowance_m, allowance_default = allowance_of(an_id)
    sev = cell_data.series_environment(env_id)
    band = cell_data.iso_band_um_per_yr(env_id, an_id)
    k_an, k_ca = cell_data.kinetics_row(an_id), cell_data.kinetics_row(ca_id)
    env = cell_data.environment(env_id)
    # the environment's own values behind the rate: wetness, film and the anode's
    # first-year band in an atmosphere; conductivity and oxygen limit in immersion
    env_confs = [c["confidence"] for c in cell_data.cite_env(env_id, an_id).values()]
    from_memory = env.get("confidence") == "from-memory" or "from-memory" in env_confs or \
        any(cell_data.kinetics_cite(k, role)["confidence"] == "from-memory"
            for k, role in ((k_an, "anode"), (k_ca, "cathode"))) or \
        any(alloys.alloy(a)["confidence"] == "from-memory" for a in (an_id, ca_id))
    ra, rc = rule["range_anode"], rule["range_cathode"]
    wanted = cases
    cases = {}
    for case in wanted:
        if (case == "high" and "low" not in wanted and "likely" in cases
                and not _lasts(cases["likely"], design_life_yr)):
            continue   # the verdict is already "avoid"; the high case cannot change it
        elec = electrolyte_case(env_id, case, conductivity_S_m)
        # potentials: low = closest ends, likely = midpoints, high = farthest ends
        E_a = {"low": ra[0], "likely": 0.5 * sum(ra), "high": ra[1]}[case]
        E_c = {"low": rc[1], "likely": 0.5 * sum(rc), "high": rc[0]}[case]
        if not rule["galvanic"]:
            E_c = E_a
        E_c = max(E_c, E_a)
        a_el = electrode(an_id, E_a, case, elec["i_L_A_m2"])
        c_el = electrode(ca_id, E_c, "likely", elec["i_L_A_m2"])
        sc = solve_case(a_el, c_el, layout, elec, isolated=isolated or not rule["galvanic"],
                        coat_anode=coat_anode, coat_cathode=coat_cathode)
        sol = sc["solution"]
        wet = elec["wet_fraction"]
        A_eff = sc["A_anode_eff_m2"]
        i_g_local = sol.current_A / A_eff
        own_uncoupled = a_el.dissolution(a_el.E_corr_V)
        own_mm = _rate(own_uncoupled, an_row) * wet
        own_bounded = own_mm
        if band is not None:
            own_bounded = cell_data.bound_by_band(
                own_mm, (band[0] / 1000.0, None if band[1] is None else band[1] / 1000.0))
        local_mm = _rate(i_g_local + sol.i_local_A_m2, an_row) * wet
        galv_mm = _rate(i_g_local, an_row) * wet
        local_own_mm = local_mm - galv_mm
        # atmospheres: the own share follows the standard's band, the galvanic part adds
        if band is not None:
            local_own_mm = own_bounded
            local_mm = galv_mm + own_bounded
        A_tot = sc["A_anode_m2"]
        avg_mm = (_rate(sol.current_A / A_tot, an_row) * wet
                  + (local_own_mm * A_eff + own_bounded * (A_tot - A_eff)) / A_tot)
        years = faraday.years_to_consume(allowance_m, local_mm / 1000.0)
        cases[case] = {
            "E_anode_corr_V_SCE": E_a, "E_cathode_corr_V_SCE": E_c,
            "delta_V": E_c - E_a,
            "kappa_S_m": elec["kappa_S_m"], "rho_ohm_m": elec["rho_ohm_m"],
            "i_L_A_m2": elec["i_L_A_m2"], "film_m": elec["film_m"],
            "wet_fraction": wet, "salinity": elec["salinity"], "T_degC": elec["T_degC"],
            "R_ohm": sc["R_ohm"], "spread_m": sc["spread_m"],
            "A_anode_eff_m2": A_eff, "A_cathode_eff_m2": sc["A_cathode_eff_m2"],
            "A_anode_m2": A_tot, "A_cathode_m2": sc["A_cathode_m2"],
            "current_A": sol.current_A, "ohmic_limit_A": sc["ohmic_limit_A"],
            "E_anode_V_SCE": sol.E_anode_V, "E_cathode_V_SCE": sol.E_cathode_V,
            "eta_anode_V": sol.eta_anode_V, "eta_cathode_V": sol.eta_cathode_V,
            "ohmic_V": sol.ohmic_V, "limit": sol.limit,
            "cathode_fraction_of_iL": sol.cathode_fraction_of_iL,
            "i_galvanic_local_A_m2": i_g_local, "i_local_cell_A_m2": sol.i_local_A_m2,
            "i_own_uncoupled_A_m2": own_uncoupled,
            "local_mm_per_yr": local_mm, "galvanic_mm_per_yr": galv_mm,
            "own_mm_per_yr": local_mm - galv_mm, "own_uncoupled_mm_per_yr": own_bounded,
            "average_mm_per_yr": avg_mm,
            "years_to_allowance": years.years, "life_status": years.status,
            "_electrodes": (a_el, c_el),
        }
    for case in CASES:   # a case left out takes the likely numbers (alternatives)
        cases.setdefault(case, cases["likely"])
    ys = tuple(cases[c]["years_to_allowance"] for c in CASES)
    cls, basis = judge(cases, rule, sev["allowed_delta_V"], design_life_yr,
                       isolated=isolated)
    return {"rule": rule, "anode": an_id, "cathode": ca_id, "galvanic": rule["galvanic"],
            "layout": layout, "cases": cases, "likely": cases["likely"], "years": ys,
            "allowance_m": allowance_m, "allowance_default": allowance_default,
            "allowed_delta_V": sev["allowed_delta_V"], "series_env": sev["id"],
            "verdict": cls, "verdict_basis": basis, "from_memory": from_memory,
            "iso_band_um_per_yr": band, "env": env, "anode_row": an_row,
            "design_life_yr": design_life_yr, "isolated": isolated}


#: Why a verdict was given (calculators word it).
BASES = ("allowance_used", "allowance_at_risk", "delta_v", "lasts", "no_couple", "isolated")


def _lasts(case, design_life_yr):
    y = case["years_to_allowance"]
    return y is None or y >= design_life_yr


def judge(cases, rule, allowed_V, design_life_yr, isolated=False):
    """Verdict class (:mod:`noblegap.verdicts`) and its basis.

    avoid   — at the likely rates the anode uses its allowance within the design life;
    caution — it lasts at the likely rates but not at the high ones, or the
              worst-case ΔV exceeds the environment's allowed difference;
    ok      — the allowance lasts the design life even at the high rates and ΔV
              is within the allowed difference (or there is no couple).
    A mitigation is judged by the same function, so one that leaves the anode
    losing its allowance within the design life is never ``ok``.
    """
    if not _lasts(cases["likely"], design_life_yr):
        return verdicts.AVOID, "allowance_used"
    if not _lasts(cases["high"], design_life_yr):
        return verdicts.CAUTION, "allowance_at_risk"
    if isolated:
        return verdicts.OK, "isolated"
    if not rule["galvanic"]:
        return verdicts.OK, "no_couple"
    if rule["delta_V"][2] > allowed_V + 1e-12:
        return verdicts.CAUTION, "delta_v"
    return verdicts.OK, "lasts"
