"""Attack at coating holidays over a coating's life, and which side to coat.

The two members and the coating
-------------------------------
``coated`` and ``other`` are the two members of the couple, with their wetted
areas ``coated_area`` and ``other_area``; ``coated`` is the member that
carries the coating as built (the one the holidays were found on). The
galvanic series (:func:`noblegap.alloys.potential_range`, midpoints of the
ranges in the chosen environment) decides which member is the **anode** (less
noble: it corrodes) and which the **cathode**. That order is physics, not a
choice.

``coated_side`` ∈ {anode, cathode, both, none} says which member of the couple
is coated in the *highlighted* scenario. The coating state entered (holidays
found, or breakdown constants) is applied to whichever member(s) that
scenario coats; the areas and the anode thickness stay with their members. So
when ``coated`` turns out to be the anode, ``coated_side = anode`` is the
as-built case and ``coated_side = cathode`` asks "what if the same coating
had gone on the other member instead?". When ``coated`` is the cathode,
``coated_side = cathode`` is the as-built case, and ``coated_side = anode`` is a
what-if that moves the coating onto the anode; the page says so. All four
scenarios are computed and shown side by side whatever is selected.

Coating state: exposed fraction over time
-----------------------------------------
The bare fraction of a coated member is

    f(t) = min(1, f0 + b·t)                         t in years

* from an inspection: ``f0 = n·π·d²/4 / A_inspected`` (``holiday_count`` n of
  ``holiday_diameter`` d over ``inspected_area``; the fraction is taken to hold
  over the whole coated area) or ``f0 = exposed_area / coated_area``;
* from a specification: the DNV-RP-B401 §6.4 breakdown ``fc(t) = a + b·t``
  (``coating_category`` from ``data/coatings.csv``, or ``breakdown_a`` and
  ``breakdown_b`` entered directly), i.e. ``f0 = a``;
* both: the measured fraction replaces the specification's initial breakdown
  ``a`` (it is the measured value of the same thing) and ``b`` adds the growth.
  With an inspection alone, b = 0: the exposed area stays as found.

Attack at the holidays
----------------------
Exposed areas: a coated member exposes ``f(t)·A``, a bare one all of ``A``.
The anode dissolves at the catchment rule's current density
(:func:`noblegap.faraday.catchment_current_density`)

    i_a(t) = i_L · (A_c,exposed + A_a,exposed) / A_a,exposed

with ``i_L`` the environment's oxygen-limited current density, and penetrates
at Faraday's rate (:func:`noblegap.faraday.penetration_rate_m_per_s`). The
cumulative penetration ``P(t) = ∫ rate dt`` is integrated numerically (pure
Python, Simpson's rule on a grid refined geometrically where f(t) is small);
the years to perforation solve ``P(t) = thickness`` of the anode member, up to
1000 years ("beyond 1000 years" past that).

Consequences the page states: coating only the anode concentrates the whole
cathode's current on its holidays (never better than coating only the
cathode, since f ≤ 1); with the cathode area fixed, one holiday on the anode
perforates sooner than each of many, because the holidays share the cathode's
current; coating both sides leaves the local rate at the holidays as for bare
metal but cuts the total metal loss by the factor f.

Sign convention: all currents and rates are magnitudes (≥ 0).

References
----------
.. [1] DNV-RP-B401, Cathodic Protection Design, §6.4 (coating breakdown
   factors) and Table 10-4 (constants a, b).
.. [2] ASTM G102 (Faraday's law), via :mod:`noblegap.rates`.
.. [3] ASTM D5162 (holiday-test method by film thickness); NACE SP0274
   (high-voltage test voltage), via :mod:`noblegap.coatings`.
"""

from __future__ import annotations

import math

from .. import units
from ..errors import InputError, MissingDataError, RangeError
from ..materials import alloys, data
from ..methods import coatings, faraday
from ..report import Report
from ..schema import CHOICE, INTEGER, NUMBER, QUANTITY, Calculator, Field
from ..svg import Svg, nice_ticks, scale

SIDES = ("anode", "cathode", "both", "none")
SIDE_LABELS = {
    "anode": "Coat the anode only",
    "cathode": "Coat the cathode only",
    "both": "Coat both",
    "none": "Coat neither",
}
SIDE_PHRASES = {
    "anode": "only the anode coated",
    "cathode": "only the cathode coated",
    "both": "both members coated",
    "none": "neither member coated",
}
LEGEND = {"anode": "anode coated", "cathode": "cathode coated", "both": "both coated",
          "none": "neither coated"}
#: Life-estimate status when the model gives no finite time: the anode is coated
#: with no initial holidays, so its first breakdown point takes the whole
#: cathode's current on a vanishing area (the integral of 1/t diverges).
LIFE_UNBOUNDED = "at_first_breakdown"
YEAR_S = faraday.SECONDS_PER_YEAR
HORIZON_YR = faraday.BEYOND_YEARS
_GEOMETRIC_STEP = 1.05       # f grows by 5 % per grid step where it is small
_F_FLOOR = 1e-12             # start of the geometric grid when f0 = 0
_CATEGORY_NONE = "none"


# --------------------------------------------------------------------------
# The physics, on plain floats
# --------------------------------------------------------------------------

def exposed_fraction(f0, b_per_yr, t_yr):
    """Bare fraction of a coated member at time t: min(1, f0 + b·t)."""
    return coatings.breakdown(f0, b_per_yr, t_yr)


def exposed_areas(side, A_anode_m2, A_cathode_m2, f):
    """(exposed anode, exposed cathode) areas [m²] for a scenario at fraction f."""
    a_coated = side in ("anode", "both")
    c_coated = side in ("cathode", "both")
    return (A_anode_m2 * f if a_coated else A_anode_m2,
            A_cathode_m2 * f if c_coated else A_cathode_m2)


def anode_current_density(side, i_limit_A_m2, A_anode_m2, A_cathode_m2, f):
    """Anodic current density at the exposed anode [A/m²] (catchment rule).

    Zero when no anode metal is exposed (coated anode, f = 0). For ``both`` at
    f = 0 the limit f → 0⁺ is returned (the fraction cancels).
    """
    if side == "both" and f == 0:
        f = 1.0
    A_a, A_c = exposed_areas(side, A_anode_m2, A_cathode_m2, f)
    if A_a <= 0:
        return 0.0
    return faraday.catchment_current_density(i_limit_A_m2, A_c, A_a)


class History:
    """Cumulative penetration P(t) [m] of one scenario, integrated numerically.

    ``rate(t_yr)`` gives the penetration rate [m/yr]. The grid holds 0, the
    breakpoints given, a uniform mesh and a geometric mesh where f is small
    (the coated-anode rate goes as 1/f); Simpson's rule integrates each step.
    """

    def __init__(self, rate, grid):
        self.rate = rate
        self.t = grid
        self.P = [0.0]
        for t0, t1 in zip(grid, grid[1:]):
            self.P.append(self.P[-1] + self._simpson(t0, t1))

    def _simpson(self, t0, t1):
        if t1 <= t0:
            return 0.0
        tm = 0.5 * (t0 + t1)
        return (t1 - t0) / 6.0 * (self.rate(t0) + 4.0 * self.rate(tm) + self.rate(t1))

    def _index(self, t_yr):
        lo, hi = 0, len(self.t) - 1
        while hi - lo > 1:
            mid = (lo + hi) // 2
            if self.t[mid] <= t_yr:
                lo = mid
            else:
                hi = mid
        return lo

    def at(self, t_yr):
        """P(t) [m] for 0 ≤ t ≤ the grid's end."""
        t_yr = min(max(t_yr, 0.0), self.t[-1])
        k = self._index(t_yr)
        return self.P[k] + self._simpson(self.t[k], t_yr)

    def time_to(self, depth_m):
        """First t [yr] with P(t) = depth, or None if not within the grid."""
        if depth_m <= 0:
            return 0.0
        if self.P[-1] < depth_m:
            return None
        k = next(i for i, p in enumerate(self.P) if p >= depth_m)
        lo, hi = self.t[k - 1], self.t[k]
        base = self.P[k - 1]
        for _ in range(60):
            mid = 0.5 * (lo + hi)
            if base + self._simpson(self.t[k - 1], mid) < depth_m:
                lo = mid
            else:
                hi = mid
        return 0.5 * (lo + hi)


def time_grid(f0, b_per_yr, extra=(), horizon_yr=HORIZON_YR):
    """Integration grid [yr] from 0 to ``horizon_yr``."""
    pts = {0.0, horizon_yr}
    pts.update(t for t in extra if t is not None and 0 < t < horizon_yr)
    n = 200
    for i in range(1, n):
        pts.add(horizon_yr * (i / n) ** 2)
    if b_per_yr > 0 and f0 < 1:
        t_cap = (1.0 - f0) / b_per_yr
        pts.add(min(t_cap, horizon_yr))
        f = max(f0, _F_FLOOR)
        while f < 1.0:
            f *= _GEOMETRIC_STEP
            t = (min(f, 1.0) - f0) / b_per_yr
            if 0 < t < horizon_yr:
                pts.add(t)
        for i in range(1, 100):
            t = t_cap * i / 100
            if t < horizon_yr:
                pts.add(t)
    return sorted(pts)


def scenario(side, *, f0, b_per_yr, i_limit_A_m2, A_anode_m2, A_cathode_m2,
             rate_per_A_m2_m_per_yr, thickness_m, design_life_yr):
    """Compute one scenario; returns a dict of SI / engineering floats.

    Keys: ``side``, ``initial_rate_mm_per_yr``, ``rate_at_design_life_mm_per_yr``,
    ``i_initial_A_m2``, ``i_design_life_A_m2``, ``penetration_at_design_life_mm``,
    ``years_to_perforation`` (float or None), ``perforation_status``,
    ``perforation_text``, ``years_to_half_thickness``, ``anode_current_initial_A``,
    ``anode_current_design_life_A``, ``history`` (a :class:`History`, or None
    when unbounded).
    """
    def i_at(t_yr):
        f = exposed_fraction(f0, b_per_yr, t_yr)
        return anode_current_density(side, i_limit_A_m2, A_anode_m2, A_cathode_m2, f)

    def rate(t_yr):
        return rate_per_A_m2_m_per_yr * i_at(t_yr)

    def current(t_yr):
        f = exposed_fraction(f0, b_per_yr, t_yr)
        if side == "both" and f == 0:
            return 0.0
        A_a, _ = exposed_areas(side, A_anode_m2, A_cathode_m2, f)
        return i_at(t_yr) * A_a

    unbounded = (side == "anode" and f0 == 0 and b_per_yr > 0 and A_cathode_m2 > 0)
    out = {
        "side": side,
        "label": SIDE_LABELS[side],
        "i_initial_A_m2": i_at(0.0),
        "i_design_life_A_m2": i_at(design_life_yr),
        "initial_rate_mm_per_yr": rate(0.0) * 1e3,
        "rate_at_design_life_mm_per_yr": rate(design_life_yr) * 1e3,
        "anode_current_initial_A": current(0.0),
        "anode_current_design_life_A": current(design_life_yr),
        "exposed_anode_initial_m2": exposed_areas(
            side, A_anode_m2, A_cathode_m2, exposed_fraction(f0, b_per_yr, 0.0))[0],
        "exposed_anode_design_life_m2": exposed_areas(
            side, A_anode_m2, A_cathode_m2, exposed_fraction(f0, b_per_yr, design_life_yr))[0],
    }
    if unbounded:
        out.update(history=None, penetration_at_design_life_mm=None,
                   years_to_perforation=None, perforation_status=LIFE_UNBOUNDED,
                   perforation_text="at the first breakdown (no finite value in this model)",
                   years_to_half_thickness=None)
        return out
    hist = History(rate, time_grid(f0, b_per_yr, extra=(design_life_yr,)))
    t_perf = hist.time_to(thickness_m)
    if hist.P[-1] == 0:
        status, text = faraday.LIFE_NO_ATTACK, "no attack (no anode metal exposed)"
    elif t_perf is None:
        status, text = faraday.LIFE_BEYOND, f"beyond {HORIZON_YR:.0f} years"
    else:
        status, text = faraday.LIFE_FINITE, years_text(t_perf)
    out.update(history=hist, penetration_at_design_life_mm=hist.at(design_life_yr) * 1e3,
               years_to_perforation=t_perf, perforation_status=status,
               perforation_text=text, years_to_half_thickness=hist.time_to(0.5 * thickness_m))
    return out


def years_text(t_yr):
    """A time in years for display; under a year also in days."""
    text = units.fmt(t_yr, "years", 3)
    if t_yr * 365 < 1:
        text += f" ({units.fmt(t_yr * 365 * 24, 'hours', 2)})"
    elif t_yr < 1:
        text += f" ({units.fmt(t_yr * 365, 'days', 2)})"
    return text


def _rank_key(s):
    order = {faraday.LIFE_NO_ATTACK: 0, faraday.LIFE_BEYOND: 1, faraday.LIFE_FINITE: 2,
             LIFE_UNBOUNDED: 3}[s["perforation_status"]]
    years = s["years_to_perforation"] or 0.0
    pen = s["penetration_at_design_life_mm"]
    return (order, -years, math.inf if pen is None else round(pen, 9),
            s["anode_current_design_life_A"])


def rank(scenarios):
    """Rank scenarios best first: later perforation, then less penetration at
    the design life, then less total anode current (less metal lost)."""
    ordered = sorted(scenarios, key=_rank_key)
    for i, s in enumerate(ordered, start=1):
        s["rank"] = i
    return ordered


# --------------------------------------------------------------------------
# Inputs → coating state
# --------------------------------------------------------------------------

def coating_state(*, coated_area, holiday_count=None, inspected_area=None,
                  holiday_diameter=None, exposed_area=None, coating_category=None,
                  breakdown_a=None, breakdown_b=None):
    """Resolve the coating inputs to (f0, b, description dict).

    Raises
    ------
    InputError, RangeError
        Missing partners (a count without a diameter, a without b), both
        inspection forms at once, holidays larger than the area, constants
        outside 0–1, or no coating state at all.
    """
    info = {"inspection": None, "specification": None, "notes": []}
    f_insp = None
    if holiday_count is not None and exposed_area is not None:
        raise InputError("Enter the holidays either as a count with a diameter or as a "
                         "total exposed area, not both.", field="exposed_area",
                         value=exposed_area, allowed="leave exposed area empty, or clear "
                         "holiday count")
    if holiday_count is not None:
        if holiday_count < 0:
            raise RangeError("The number of holidays cannot be negative.",
                             field="holiday_count", value=holiday_count,
                             allowed="a whole number ≥ 0")
        if holiday_diameter is None:
            raise InputError("A holiday count needs the holidays' diameter.",
                             field="holiday_diameter", value="",
                             allowed="a length > 0, e.g. 3 mm")
        A_insp = coated_area if inspected_area is None else inspected_area
        if A_insp > coated_area * (1 + 1e-12):
            raise RangeError("The inspected area is larger than the coated area.",
                             field="inspected_area", value=units.fmt(A_insp, "m²", 4),
                             allowed=f"at most the coated area, {units.fmt(coated_area, 'm²', 4)}")
        A_holes = holiday_count * math.pi * holiday_diameter ** 2 / 4.0
        if A_holes > A_insp:
            raise RangeError(
                f"{holiday_count} holidays of {units.fmt(holiday_diameter * 1e3, 'mm', 3)} "
                f"expose {units.fmt(A_holes, 'm²', 3)}, more than the "
                f"{units.fmt(A_insp, 'm²', 3)} inspected.", field="holiday_count",
                value=holiday_count,
                allowed="holidays whose total area is at most the inspected area")
        f_insp = A_holes / A_insp
        info["inspection"] = {"holiday_count": holiday_count,
                              "holiday_diameter_m": holiday_diameter,
                              "inspected_area_m2": A_insp, "holiday_area_m2": A_holes,
                              "fraction": f_insp, "form": "count"}
    elif exposed_area is not None:
        if exposed_area > coated_area * (1 + 1e-12):
            raise RangeError("The exposed area is larger than the coated area.",
                             field="exposed_area", value=units.fmt(exposed_area, "m²", 4),
                             allowed=f"at most the coated area, {units.fmt(coated_area, 'm²', 4)}")
        f_insp = exposed_area / coated_area
        info["inspection"] = {"exposed_area_m2": exposed_area, "fraction": f_insp,
                              "form": "area"}
    elif holiday_diameter is not None or inspected_area is not None:
        info["notes"].append("A holiday diameter or inspected area was given without a "
                             "holiday count; it is not used.")

    a = b = None
    row = None
    if breakdown_a is not None or breakdown_b is not None:
        if breakdown_a is None or breakdown_b is None:
            missing = "breakdown_a" if breakdown_a is None else "breakdown_b"
            raise InputError("Breakdown constants come in a pair: enter both a and b.",
                             field=missing, value="", allowed="a number from 0 to 1")
        coatings.check_constants(breakdown_a, breakdown_b)
        a, b = breakdown_a, breakdown_b
        if coating_category not in (None, _CATEGORY_NONE):
            info["notes"].append(f"The constants entered (a = {a:g}, b = {b:g}/yr) are "
                                 f"used instead of coating category {coating_category}.")
        info["specification"] = {"a": a, "b_per_yr": b, "category": None, "row": None}
    elif coating_category not in (None, _CATEGORY_NONE):
        row = coatings.category(coating_category)
        a, b = row["a_fraction"], row["b_per_yr"]
        coatings.check_constants(a, b, "coating_category", "coating_category")
        info["specification"] = {"a": a, "b_per_yr": b, "category": row["id"], "row": row}

    if f_insp is None and a is None:
        raise InputError("Describe the coating: the holidays found (count with diameter, "
                         "or exposed area), or a coating category, or breakdown "
                         "constants a and b.", field="holiday_count", value="",
                         allowed="at least one of holiday_count, exposed_area, "
                                 "coating_category, breakdown_a with breakdown_b")
    f0 = f_insp if f_insp is not None else a
    b_yr = b if b is not None else 0.0
    if f_insp is not None and a is not None:
        info["notes"].append(
            f"The measured holiday fraction ({f_insp:.3g}) replaces the specification's "
            f"initial breakdown a = {a:g}; its growth b = {b_yr:g} per year is added.")
    elif f_insp is not None:
        info["notes"].append("No breakdown growth was entered: the exposed area stays as "
                             "found for the whole life. Add a coating category or a and b "
                             "to let the coating age.")
    return f0, b_yr, info


def roles(coated, other, environment):
    """Decide anode and cathode by the galvanic series (midpoint of each range).

    Returns
    -------
    dict
        ``anode``, ``cathode`` (alloy ids), ``coated_is_anode``, the ranges and
        midpoints [V vs SCE], ``overlap`` (True when the ranges overlap).
    """
    rc = alloys.potential_range(coated, environment)
    ro = alloys.potential_range(other, environment)
    mc, mo = 0.5 * (rc[0] + rc[1]), 0.5 * (ro[0] + ro[1])
    coated_is_anode = mc <= mo
    overlap = not (rc[1] > ro[0] or ro[1] > rc[0])
    return {
        "anode": coated if coated_is_anode else other,
        "cathode": other if coated_is_anode else coated,
        "coated_is_anode": coated_is_anode,
        "range_coated_V_SCE": rc, "range_other_V_SCE": ro,
        "mid_coated_V_SCE": mc, "mid_other_V_SCE": mo,
        "delta_E_V": abs(mc - mo), "overlap": overlap,
    }


# --------------------------------------------------------------------------
# The calculator
# --------------------------------------------------------------------------

def _fmt_rate(x):
    return units.fmt(x, "mm/yr", 3) + f" ({units.fmt(faraday.mm_per_yr_to_mpy(x), 'mpy', 3)})"


def compute_holiday(coated, other, environment, coated_side, holiday_count, inspected_area,
                    holiday_diameter, exposed_area, coating_category, breakdown_a,
                    breakdown_b, coated_area, other_area, thickness, design_life,
                    coating_thickness):
    """Attack at coating holidays over the design life; four coating scenarios."""
    if coated_side not in SIDES:
        raise InputError(f"Unknown coated side {coated_side!r}.", field="coated_side",
                         value=coated_side, allowed=", ".join(SIDES))
    tf_yr = design_life / YEAR_S
    if not tf_yr > 0:
        raise RangeError("The design life must be longer than zero.", field="design_life",
                         value=design_life, allowed="a time > 0, e.g. 20 year")
    f0, b_yr, info = coating_state(
        coated_area=coated_area, holiday_count=holiday_count, inspected_area=inspected_area,
        holiday_diameter=holiday_diameter, exposed_area=exposed_area,
        coating_category=coating_category, breakdown_a=breakdown_a, breakdown_b=breakdown_b)

    env = alloys.environment(environment)
    i_L = env["i_limit_A_m2"]
    r = roles(coated, other, environment)
    anode_row, cathode_row = alloys.alloy(r["anode"]), alloys.alloy(r["cathode"])
    coated_row, other_row = alloys.alloy(coated), alloys.alloy(other)
    A_an = coated_area if r["coated_is_anode"] else other_area
    A_ca = other_area if r["coated_is_anode"] else coated_area
    if r["delta_E_V"] == 0:
        A_ca = 0.0   # same potential range: no galvanic cathode, each metal on its own
    if anode_row["equivalent_weight_g_mol"] is None or anode_row["density_g_cm3"] is None:
        raise MissingDataError(f"{anode_row['name']} has no equivalent weight or density "
                               "in data/alloys.csv, so its penetration rate cannot be "
                               "computed.", field="coated" if r["coated_is_anode"] else "other",
                               value=r["anode"])
    # Faraday's law is linear in i: the rate per A/m², computed once by faraday.py.
    k_m_per_yr = faraday.penetration_rate_m_per_s(
        1.0, anode_row["equivalent_weight_g_mol"], anode_row["density_g_cm3"]) * YEAR_S

    common = dict(f0=f0, b_per_yr=b_yr, i_limit_A_m2=i_L, A_anode_m2=A_an,
                  A_cathode_m2=A_ca, rate_per_A_m2_m_per_yr=k_m_per_yr,
                  thickness_m=thickness, design_life_yr=tf_yr)
    scen = {side: scenario(side, **common) for side in SIDES}
    rank(list(scen.values()))
    sel = scen[coated_side]
    as_built = "anode" if r["coated_is_anode"] else "cathode"

    fc_initial = exposed_fraction(f0, b_yr, 0.0)
    fc_mean = coatings.mean_breakdown(f0, b_yr, tf_yr)
    fc_final = coatings.final_breakdown(f0, b_yr, tf_yr)
    is_capped = coatings.capped(f0, b_yr, tf_yr)
    t_cap = coatings.cap_time_yr(f0, b_yr)

    test = coatings.holiday_test(coating_thickness) if coating_thickness is not None else None

    # Single holiday against many, with the cathode area fixed (anode coated).
    single = None
    insp = info["inspection"]
    if insp and insp.get("form") == "count" and insp["holiday_count"] >= 1:
        n = insp["holiday_count"]
        a_one = math.pi * insp["holiday_diameter_m"] ** 2 / 4.0
        scale_up = coated_area / insp["inspected_area_m2"]
        A_each = a_one * scale_up
        i_many = faraday.catchment_current_density(i_L, A_ca, n * A_each) if A_each > 0 else 0
        i_one = faraday.catchment_current_density(i_L, A_ca, A_each) if A_each > 0 else 0
        single = {"holidays_on_anode": round(n * scale_up, 3),
                  "rate_each_of_many_mm_per_yr": k_m_per_yr * i_many * 1e3,
                  "rate_single_mm_per_yr": k_m_per_yr * i_one * 1e3}

    # Cathodic-protection current demand of the coated member (DNV form with i_L).
    A_coated_sel = {"anode": A_an, "cathode": A_ca, "both": A_an + A_ca, "none": 0.0}[coated_side]
    cp_mean_A = i_L * (A_an + A_ca if coated_side == "none" else A_coated_sel) * (
        1.0 if coated_side == "none" else fc_mean)

    timeline = []
    for frac in (0.0, 0.25, 0.5, 0.75, 1.0):
        t = tf_yr * frac
        f = exposed_fraction(f0, b_yr, t)
        A_a, A_c = exposed_areas(coated_side, A_an, A_ca, f)
        i_t = anode_current_density(coated_side, i_L, A_an, A_ca, f)
        hist = sel["history"]
        timeline.append({
            "t_yr": t, "fc": f, "exposed_anode_m2": A_a, "exposed_cathode_m2": A_c,
            "area_ratio": A_c / A_a if A_a > 0 else None, "i_a_A_m2": i_t,
            "rate_mm_per_yr": k_m_per_yr * i_t * 1e3,
            "penetration_mm": None if hist is None else hist.at(t) * 1e3,
        })

    rep = _report(locals())
    scen_rows = []
    for side in SIDES:
        s = scen[side]
        scen_rows.append({k: v for k, v in s.items() if k != "history"})
    return {
        "anode": r["anode"], "cathode": r["cathode"],
        "coated_member_role": as_built,
        "as_built_scenario": as_built,
        "coated_side": coated_side,
        "delta_E_V": r["delta_E_V"],
        "ranges_overlap": r["overlap"],
        "i_limit_A_m2": i_L,
        "fc_initial": fc_initial, "fc_mean": fc_mean, "fc_final": fc_final,
        "fc_capped_before_design_life": is_capped,
        "fc_reaches_1_at_years": t_cap if (t_cap is not None and t_cap <= HORIZON_YR) else None,
        "breakdown_a_used": f0, "breakdown_b_per_yr_used": b_yr,
        "coating_category": (info["specification"] or {}).get("category"),
        "holiday_fraction_measured": insp["fraction"] if insp else None,
        "anode_area_m2": A_an, "cathode_area_m2": A_ca,
        "exposed_anode_area_initial_m2": sel["exposed_anode_initial_m2"],
        "exposed_anode_area_design_life_m2": sel["exposed_anode_design_life_m2"],
        "area_ratio_initial": _ratio(sel, A_an, A_ca, f0, b_yr, 0.0, coated_side),
        "area_ratio_design_life": _ratio(sel, A_an, A_ca, f0, b_yr, tf_yr, coated_side),
        "anode_current_density_A_m2": sel["i_initial_A_m2"],
        "anode_current_density_design_life_A_m2": sel["i_design_life_A_m2"],
        "penetration_mm_per_yr_initial": sel["initial_rate_mm_per_yr"],
        "penetration_mpy_initial": faraday.mm_per_yr_to_mpy(sel["initial_rate_mm_per_yr"]),
        "penetration_mm_per_yr_design_life": sel["rate_at_design_life_mm_per_yr"],
        "penetration_at_design_life_mm": sel["penetration_at_design_life_mm"],
        "years_to_perforation": sel["years_to_perforation"],
        "perforation_status": sel["perforation_status"],
        "perforation_text": sel["perforation_text"],
        "perforation_beyond_1000_years": sel["perforation_status"] == faraday.LIFE_BEYOND,
        "reinspect_before_years": sel["years_to_half_thickness"],
        "scenarios": scen_rows,
        "timeline": timeline,
        "ranking": [s["side"] for s in sorted(scen.values(), key=lambda s: s["rank"])],
        "single_holiday": single,
        "cp_current_mean_A": cp_mean_A,
        "test_method": test["test_method"] if test else None,
        "test_method_name": test["test_method_name"] if test else None,
        "test_voltage_V": test["test_voltage_V"] if test else None,
        "display": rep.to_dict(),
    }


def _ratio(sel, A_an, A_ca, f0, b_yr, t_yr, side):
    f = exposed_fraction(f0, b_yr, t_yr)
    A_a, A_c = exposed_areas(side, A_an, A_ca, f)
    if A_a <= 0:
        return None
    return A_c / A_a


def _report(v):
    """Build the display for :func:`compute_holiday` from its local variables."""
    rep = Report()
    r, scen, sel = v["r"], v["scen"], v["sel"]
    anode_row, cathode_row = v["anode_row"], v["cathode_row"]
    coated_row, other_row = v["coated_row"], v["other_row"]
    side, as_built = v["coated_side"], v["as_built"]
    tf_yr, thickness = v["tf_yr"], v["thickness"]
    env = v["env"]
    life = units.fmt(tf_yr, "years", 3)
    th = units.fmt(thickness * 1e3, "mm", 3)

    what = SIDE_PHRASES[side]
    if sel["perforation_status"] == faraday.LIFE_FINITE:
        verdict_cls = "avoid" if sel["years_to_perforation"] < tf_yr else "caution"
        head = (f"{anode_row['name']} is the anode. With {what}, the {th} wall perforates "
                f"at the holidays in {sel['perforation_text']}"
                + (f" — inside the {life} design life." if verdict_cls == "avoid"
                   else f", after the {life} design life."))
    elif sel["perforation_status"] == LIFE_UNBOUNDED:
        verdict_cls = "avoid"
        head = (f"{anode_row['name']} is the anode. With {what} and no initial holidays, "
                "the first breakdown point takes the whole cathode's current: the model "
                "gives no finite life.")
    else:
        verdict_cls = "ok"
        head = (f"{anode_row['name']} is the anode. With {what}, the {th} wall does not "
                f"perforate: {sel['perforation_text']}.")
    rep.headline(head)
    rep.verdict(verdict_cls,
                {"avoid": "Perforates within the design life",
                 "caution": "Perforates after the design life",
                 "ok": "No perforation within 1000 years"}[verdict_cls],
                f"Years to perforation {sel['perforation_text']} against a design life of "
                f"{life} (computed below).")

    role_c = "anode" if r["coated_is_anode"] else "cathode"
    if r["delta_E_V"] > 0:
        rep.para(f"In {env['name'].lower()}, {coated_row['name']} (the coated member, "
                 f"{units.fmt(r['mid_coated_V_SCE'], 'V', 3)} vs SCE mid-range) is the "
                 f"{role_c} and {other_row['name']} "
                 f"({units.fmt(r['mid_other_V_SCE'], 'V', 3)}) the "
                 f"{'cathode' if role_c == 'anode' else 'anode'}. The galvanic series decides "
                 "this; the coated side only decides which member's surface the coating covers.")
    if side in ("anode", "cathode") and side != as_built:
        rep.warn(f"You entered {coated_row['name']} as the coated member, but it is the "
                 f"{as_built} of this couple. The highlighted scenario ('{what}') moves the "
                 f"same coating onto {(anode_row if side == 'anode' else cathode_row)['name']}"
                 f" — a what-if. Your as-built case is '{SIDE_LABELS[as_built].lower()}' in "
                 "the table below.")
    if r["delta_E_V"] == 0:
        rep.warn("Both members have the same galvanic-series range: there is no galvanic "
                 "driving force between them, so no cathode area is counted and the rates "
                 "shown are the metal's own oxygen-limited corrosion at its exposed area.")
    elif r["overlap"]:
        rep.warn("The two members' galvanic-series ranges overlap: which one is the anode "
                 "depends on the actual surfaces. Measure both potentials in the service "
                 "water before relying on the ranking.")
    for w in alloys.applicability(v["environment"]):
        rep.warn(w)

    rep.para("Inspectors: with the cathode area fixed, a single holiday in the anode's "
             "coating perforates sooner than each of many — the holidays share the "
             "cathode's current. A few holidays are not 'only a few': each one is "
             "attacked harder than if there were many.")
    single = v["single"]
    if single:
        rep.para(f"For these holidays on the anode: each of the "
                 f"{single['holidays_on_anode']:g} holidays (scaled to the whole coated "
                 f"area) penetrates at {_fmt_rate(single['rate_each_of_many_mm_per_yr'])}; "
                 f"one holiday alone would penetrate at "
                 f"{_fmt_rate(single['rate_single_mm_per_yr'])}.")

    # Coating state
    info = v["info"]
    for n in info["notes"]:
        rep.note(n)
    insp, spec = info["inspection"], info["specification"]
    if insp:
        if insp["form"] == "count":
            rep.row("Holiday area fraction (inspection)", f"{insp['fraction']:.4g}",
                    "computed: f0 = n·π·d²/4 / A_inspected", key="holiday_fraction_measured")
        else:
            rep.row("Holiday area fraction (inspection)", f"{insp['fraction']:.4g}",
                    "computed: f0 = A_exposed / A_coated", key="holiday_fraction_measured")
    if spec:
        cite = data.cite(spec["row"]) if spec["row"] else "entered directly"
        label = (f"Breakdown constants, category {spec['row']['category']}, "
                 f"{spec['row']['depth_band']}" if spec["row"] else "Breakdown constants")
        rep.row(label, f"a = {spec['a']:g}, b = {spec['b_per_yr']:g} per year", cite)
        if spec["row"] and spec["row"]["confidence"] == "from-memory":
            rep.warn(f"The constants of coating category {spec['row']['category']} "
                     f"({spec['row']['depth_band']}) are from memory, not confirmed against "
                     "DNV-RP-B401 Table 10-4; check them against the standard.")
    dnv = data.cite(coatings.category("I-0-30"))
    dnv_formula = {"source_id": dnv["source_id"], "confidence": "published",
                   "text": "DNV-RP-B401, §6.4 (coating breakdown factors)"}
    rep.row("Initial bare fraction fc(0)", f"{v['fc_initial']:.4g}",
            "computed: fc = min(1, f0 + b·t) at t = 0", key="fc_initial")
    rep.row("Mean breakdown factor fcm over the design life", f"{v['fc_mean']:.4g}",
            ("computed: fcm = 1 − (1 − a)²/(2·b·tf) (fc reaches 1 before tf), "
             if v["is_capped"] else "computed: fcm = a + b·tf/2, ") + dnv_formula["text"],
            key="fc_mean")
    rep.row("Final breakdown factor fcf", f"{v['fc_final']:.4g}",
            "computed: fcf = min(1, a + b·tf), " + dnv_formula["text"], key="fc_final")
    if v["is_capped"]:
        rep.note(f"The coating is fully broken down (fc = 1) after "
                 f"{units.fmt(v['t_cap'], 'years', 3)}, before the end of the design life.")

    # Highlighted scenario numbers
    rep.row("Oxygen-limited current density i_L", units.fmt(v["i_L"], "A/m²", 3),
            data.cite(env))
    rep.row("Anode exposed area, initial", units.fmt(sel["exposed_anode_initial_m2"], "m²", 3),
            "computed: A_a = f(t)·A_anode when the anode is coated, else A_anode")
    rep.row("Anode current density at the holidays, initial",
            units.fmt(sel["i_initial_A_m2"], "A/m²", 3)
            + f" ({units.fmt(faraday.A_m2_to_uA_cm2(sel['i_initial_A_m2']), 'µA/cm²', 3)})",
            "computed: i_a = i_L·(A_c + A_a)/A_a (catchment rule)",
            key="anode_current_density_A_m2")
    rep.row("Local penetration rate, initial", _fmt_rate(sel["initial_rate_mm_per_yr"]),
            "computed: rate = i·EW/(F·ρ) (Faraday's law, ASTM G102)",
            key="penetration_mm_per_yr_initial")
    rep.row(f"Local penetration rate at {life}", _fmt_rate(sel["rate_at_design_life_mm_per_yr"]),
            "computed: as above with f(tf)", key="penetration_mm_per_yr_design_life")
    pen = sel["penetration_at_design_life_mm"]
    rep.row(f"Cumulative penetration at {life}",
            "unbounded" if pen is None else units.fmt(pen, "mm", 3),
            "computed: P = ∫ rate dt (Simpson's rule)", key="penetration_at_design_life_mm")
    rep.row(f"Years to perforate {th}", sel["perforation_text"],
            "computed: P(t) = thickness", key="years_to_perforation")
    rep.row(f"Equivalent weight of {anode_row['name']}",
            f"{anode_row['equivalent_weight_g_mol']:g} g/mol",
            alloys.cite_ew(anode_row) or "not tabulated")
    rep.row(f"Density of {anode_row['name']}", f"{anode_row['density_g_cm3']:g} g/cm³",
            alloys.cite_density(anode_row))
    rep.row(f"Galvanic-series range of {coated_row['name']}",
            f"{units.fmt(r['range_coated_V_SCE'][1], 'V', 3)} to "
            f"{units.fmt(r['range_coated_V_SCE'][0], 'V', 3)} vs SCE",
            alloys.cite_potential(coated_row))
    rep.row(f"Galvanic-series range of {other_row['name']}",
            f"{units.fmt(r['range_other_V_SCE'][1], 'V', 3)} to "
            f"{units.fmt(r['range_other_V_SCE'][0], 'V', 3)} vs SCE",
            alloys.cite_potential(other_row))

    # Four scenarios
    rows = []
    for s_side in SIDES:
        s = scen[s_side]
        mark = " ◀ selected" if s_side == side else ""
        built = " (as built)" if s_side == as_built else ""
        rows.append([s["label"] + built + mark, str(s["rank"]),
                     _fmt_rate(s["initial_rate_mm_per_yr"]),
                     _fmt_rate(s["rate_at_design_life_mm_per_yr"]),
                     "unbounded" if s["penetration_at_design_life_mm"] is None
                     else units.fmt(s["penetration_at_design_life_mm"], "mm", 3),
                     s["perforation_text"],
                     units.fmt(s["anode_current_design_life_A"] * 1e3, "mA", 3)])
    rep.table("Which side to coat: four scenarios with the same coating",
              ["Scenario", "Rank", "Rate at the holidays, initial",
               f"Rate at {life}", f"Penetration at {life}", "Years to perforation",
               f"Anode current at {life}"], rows,
              note=("Rank 1 is best: later perforation first, then less penetration at "
                    "the design life, then less total anode current (less metal lost). "
                    "Coating both leaves the local rate at the holidays as for bare metal "
                    "(the exposed areas shrink together) but cuts the metal lost; coating "
                    "only the anode concentrates the whole cathode's current on its "
                    "holidays."), key="scenarios")

    trows = []
    for p in v["timeline"]:
        trows.append([units.fmt(p["t_yr"], "yr", 3), f"{p['fc']:.4g}",
                      units.fmt(p["exposed_anode_m2"], "m²", 3),
                      "—" if p["area_ratio"] is None else f"{p['area_ratio']:.4g}",
                      units.fmt(p["i_a_A_m2"], "A/m²", 3), _fmt_rate(p["rate_mm_per_yr"]),
                      "unbounded" if p["penetration_mm"] is None
                      else units.fmt(p["penetration_mm"], "mm", 3)])
    rep.table(f"Over the design life, {SIDE_PHRASES[side]}",
              ["Time", "Bare fraction f", "Exposed anode", "Area ratio A_c/A_a",
               "Anode current density", "Local rate", "Cumulative penetration"], trows,
              note=("computed: f = min(1, f0 + b·t); i_a = i_L·(A_c + A_a)/A_a; "
                    "rate by Faraday's law; penetration integrated over time."),
              key="timeline")

    svg, alt = _chart(scen, side, thickness, tf_yr)
    rep.chart("Cumulative penetration at the holidays", svg, alt)

    # Inspector's helper
    test = v["test"]
    if test:
        ct = v["coating_thickness"]
        method_src = test["sources"]["method"]
        rep.row("Holiday test method",
                f"{test['test_method_name']} (film {units.fmt(ct * 1e3, 'mm', 3)} = "
                f"{units.fmt(test['thickness_mil'], 'mil', 3)}; limit "
                f"{units.fmt(test['threshold_mm'], 'mm', 3)})", method_src, key="test_method")
        if test["test_voltage_V"] is not None:
            rep.row("High-voltage test voltage", units.fmt(test["test_voltage_V"] / 1e3, "kV", 4),
                    "computed: V = 1250·√T, T in mil — " + test["sources"]["voltage"]["text"],
                    key="test_voltage_V")
        rep.note("Holiday-test settings here are screening values: the coating "
                 "manufacturer's and the governing local specification's values govern. "
                 "Too high a voltage can damage a sound film.")

    # Recommendations tied to the numbers
    best = min(scen.values(), key=lambda s: s["rank"])
    sa, sc = scen["anode"], scen["cathode"]
    rep.para(f"Recommendation — coat the cathode (or both): coating only the cathode gives "
             f"{_fmt_rate(sc['initial_rate_mm_per_yr'])} at the holidays at first and "
             f"perforation {sc['perforation_text']}; coating only the anode gives "
             f"{_fmt_rate(sa['initial_rate_mm_per_yr'])} and perforation "
             f"{sa['perforation_text']}. Best here: {best['label'].lower()}.")
    if insp:
        rep.para("Repair the holidays found before immersion: every holiday left on the "
                 f"anode carries its share of the cathode's current (initial rate "
                 f"{_fmt_rate(sel['initial_rate_mm_per_yr'])} in the selected scenario).")
    if sel["perforation_status"] in (faraday.LIFE_FINITE, LIFE_UNBOUNDED) and (
            sel["years_to_perforation"] is None or sel["years_to_perforation"] < tf_yr):
        rep.para(f"Consider cathodic protection: the selected scenario perforates "
                 f"{sel['perforation_text']}, inside the {life} design life. A first "
                 f"estimate of the mean protection current is "
                 f"{units.fmt(v['cp_mean_A'] * 1e3, 'mA', 3)} (computed: I = i_L·A·fcm, "
                 "the DNV-RP-B401 form with the environment's oxygen-limited current "
                 "density in place of the standard's design current density; a CP "
                 "design to the standard replaces it).")
    t_half = sel["years_to_half_thickness"]
    if t_half is not None:
        rep.para(f"Re-inspect well before {years_text(t_half)}: that is when "
                 f"the holidays would have lost half of the {th} wall in the selected "
                 "scenario (computed; an interval set by this model, not by a standard).")
    if sel["initial_rate_mm_per_yr"] > 10:
        rep.warn("The catchment rule gives a very high rate at very small holidays; real "
                 "attack there is also limited by the solution's resistance, so treat the "
                 "rate as an upper bound — but a fast one.")
    rep.note("The catchment rule is an upper bound when the cathode reaction is slow or the "
             "water's resistance is high; attack is taken as uniform over the exposed "
             "area of each holiday.")
    return rep


_COLOURS = {"anode": "#b3261e", "cathode": "#1f6f43", "both": "#1d4f91", "none": "#e0b252"}
_DASH = {"anode": None, "cathode": None, "both": "6 4", "none": None}
_WIDTH = {"anode": 2, "cathode": 2, "both": 2, "none": 6}
# "none" is drawn first and wide, so that "both" (often the same curve) shows on top.
_DRAW_ORDER = ("none", "both", "cathode", "anode")


def _chart(scen, side, thickness_m, tf_yr):
    W, H = 640, 360
    L, R, T, B = 64, 180, 24, 48
    x_end = tf_yr * 1.25
    th_mm = thickness_m * 1e3
    finals = [s["history"].at(x_end) * 1e3 for s in scen.values() if s["history"] is not None]
    y_top = max([th_mm * 1.3] + [min(p, th_mm * 2.0) for p in finals])
    svg = Svg(W, H, "Cumulative penetration at the holidays against time")
    sx, sy = scale(0, x_end, L, W - R), scale(0, y_top, H - B, T)
    svg.rect(L, T, W - R - L, H - B - T, fill="#fbfaf7", stroke="#c9c4b8")
    for t in nice_ticks(0, x_end, 6):
        svg.line(sx(t), H - B, sx(t), H - B + 4, stroke="#555")
        svg.text(sx(t), H - B + 18, f"{t:g}", size=11, anchor="middle")
    for p in nice_ticks(0, y_top, 5):
        svg.line(L - 4, sy(p), W - R, sy(p), stroke="#e4e0d6")
        svg.text(L - 8, sy(p) + 4, f"{p:g}", size=11, anchor="end")
    svg.text((L + W - R) / 2, H - 10, "years in service", size=12, anchor="middle")
    svg.text(14, T - 8, "penetration, mm", size=12)
    svg.line(L, sy(th_mm), W - R, sy(th_mm), stroke="#222", width=1.5, dash="8 3")
    svg.text(W - R - 4, sy(th_mm) - 6, f"wall {th_mm:g} mm", size=11, anchor="end")
    svg.line(sx(tf_yr), T, sx(tf_yr), H - B, stroke="#777", dash="3 3")
    svg.text(sx(tf_yr) + 4, T + 12, "design life", size=11)
    alt = []
    for i, s_side in enumerate(SIDES):
        ly = T + 16 + i * 22
        bold = s_side == side
        svg.line(W - R + 12, ly - 4, W - R + 36, ly - 4, stroke=_COLOURS[s_side],
                 width=_WIDTH[s_side] + (1 if bold else 0), dash=_DASH[s_side])
        svg.text(W - R + 42, ly, LEGEND[s_side], size=11,
                 weight="bold" if bold else None)
        if scen[s_side]["history"] is None:
            svg.text(W - R + 42, ly + 11, "(unbounded: not drawn)", size=9, fill="#666")
    for s_side in _DRAW_ORDER:
        s = scen[s_side]
        if s["history"] is None:
            alt.append(f"{SIDE_LABELS[s_side]}: no finite curve")
            continue
        pts = []
        n = 120
        for k in range(n + 1):
            t = x_end * k / n
            p = s["history"].at(t) * 1e3
            pts.append((sx(t), sy(min(p, y_top))))
            if p >= y_top:
                break
        svg.polyline(pts, stroke=_COLOURS[s_side],
                     width=_WIDTH[s_side] + (1 if s_side == side else 0), dash=_DASH[s_side])
        alt.append(f"{SIDE_LABELS[s_side]}: perforation {s['perforation_text']}")
    return str(svg), ("Cumulative penetration against time for four coating scenarios, "
                      f"wall {th_mm:g} mm. " + "; ".join(alt) + ".")


def _category_choices():
    return [(_CATEGORY_NONE, "None (constants below, or the holidays found only)")] + \
        coatings.category_ids()


SIDE_CHOICES = [(s, SIDE_LABELS[s]) for s in SIDES]

CALCULATORS = [
    Calculator(
        name="holiday",
        title="Coating holidays and which side to coat",
        summary=("Attack at holidays in a coating over its life, and the four choices: "
                 "coat the anode, the cathode, both or neither."),
        intro=("A coated part joined to a more noble metal corrodes only where the coating "
               "is broken — but there the whole cathode's current arrives. Enter the "
               "holidays found or the coating's specification to see how fast the holidays "
               "are attacked, when the wall perforates, and which side is worth coating. The "
               "example: Harrow Creek tidal pumping station, a coated carbon-steel intake "
               "screen bolted to a nickel-aluminium bronze pump casing, 12 holidays found "
               "on the 1.5 m² inspected."),
        fields=[
            alloys.alloy_field("coated", "Coated member", "carbon_steel",
                                  help="The member that carries the coating as built "
                                       "(generic name or UNS number)."),
            alloys.alloy_field("other", "Other member", "C95800",
                                  help="The member it is joined to."),
            alloys.environment_field(),
            Field("coated_side", "Coated side (highlighted scenario)", CHOICE,
                  default="anode", choices=SIDE_CHOICES,
                  help=("Which member of the couple is coated in the highlighted scenario. "
                        "The galvanic series decides which member is the anode; all four "
                        "scenarios are always shown.")),
            Field("holiday_count", "Holidays found", INTEGER, optional=True, min=0,
                  group="Inspection", help="Number of holidays found over the inspected area."),
            Field("inspected_area", "Area inspected", QUANTITY, optional=True,
                  quantity="area", unit="m**2", min=0.0, min_inclusive=False,
                  group="Inspection", help="Empty: the whole coated area."),
            Field("holiday_diameter", "Holiday diameter", QUANTITY, optional=True,
                  quantity="length", unit="mm", min=0.0, min_inclusive=False,
                  group="Inspection", help="Typical diameter of a holiday."),
            Field("exposed_area", "Total exposed area", QUANTITY, optional=True,
                  quantity="area", unit="mm**2", min=0.0, group="Inspection",
                  help="Alternative to count × diameter: the total bare area."),
            Field("coating_category", "Coating category (DNV-RP-B401)", CHOICE,
                  default="II-0-30", choices=_category_choices, optional=True,
                  group="Specification", source="data/coatings.csv",
                  help=("Breakdown constants a, b by coating category and depth. Choose "
                        "'none' to use the holidays found alone (no ageing).")),
            Field("breakdown_a", "Initial breakdown a", QUANTITY, optional=True,
                  quantity="fraction", unit="", min=0.0, max=1.0, group="Specification",
                  help="Fraction 0–1 (or %), instead of a category."),
            Field("breakdown_b", "Breakdown growth b (per year)", NUMBER, optional=True,
                  min=0.0, max=1.0, group="Specification",
                  help="Fraction per year, 0–1, instead of a category."),
            Field("coated_area", "Area of the coated member", QUANTITY, default="2 m²",
                  quantity="area", unit="m**2", min=0.0, min_inclusive=False,
                  help="Wetted area of the coated member."),
            Field("other_area", "Area of the other member", QUANTITY, default="1 m²",
                  quantity="area", unit="m**2", min=0.0, min_inclusive=False,
                  help="Wetted area of the other member."),
            Field("thickness", "Anode wall thickness", QUANTITY, default="6 mm",
                  quantity="length", unit="mm", min=0.0, min_inclusive=False,
                  help="Thickness of the member that corrodes (the anode)."),
            Field("design_life", "Design life", QUANTITY, default="20 year",
                  quantity="time", unit="year", min=0.0, min_inclusive=False,
                  max=1000 * YEAR_S, range_note="The design life must be longer than zero.",
                  help="Years in service."),
            Field("coating_thickness", "Coating dry film thickness", QUANTITY, optional=True,
                  quantity="length", unit="mm", min=0.0, min_inclusive=False,
                  group="Inspector", help="Total dry film, for the holiday-test helper."),
        ],
        compute=compute_holiday,
        example={
            "coated": "carbon steel", "other": "nickel-aluminium bronze",
            "environment": "seawater_quiescent", "coated_side": "anode",
            "holiday_count": "12", "inspected_area": "1.5 m²", "holiday_diameter": "3 mm",
            "exposed_area": "", "coating_category": "II-0-30", "breakdown_a": "",
            "breakdown_b": "", "coated_area": "3 m²", "other_area": "1.2 m²",
            "thickness": "8 mm", "design_life": "25 year", "coating_thickness": "0.45 mm",
        },
    ),
]
