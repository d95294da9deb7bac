"""Attack at coating holidays, and which side of a couple to coat.

Parse (the schema) → compute (:func:`compute_numbers`, numbers only) →
report (:func:`report`, the words).

The two members: ``coated`` carries the coating as built (the holidays were
found on it), ``other`` is the member it is joined to. The anode rule
(:func:`noblegap.methods.galvanic.anode_rule`) decides which is the anode.
``coated_side`` ∈ {anode, cathode, both, none} picks the highlighted
scenario; all four are computed. ``none`` is the bare couple, and needs no
coating input at all.

Coating state: the bare fraction of a coated member f(t) = min(1, f0 + b·t)
(DNV-RP-B401 §6.4 form), f0 from the inspection (n·π·d²/4 over the area
inspected, held over the whole coated area) or the category's a. Holidays are
disks of diameter d (the entered diameter, else :data:`ASSUMED_DIAMETER_M`,
stated on the page); a coated member with fraction f has n = f·A/(π·d²/4) of
them.

Rates: the galvanic-cell model (:mod:`noblegap.methods.galvanic`). Each
holiday is a disk in an insulating plane, R = ρ/(4r) (Newman 1966), so the
electrolyte caps the current a holiday can draw, and a smaller holiday never
draws more total current. The headline is the fresh-holiday rate of the
highlighted scenario with its low / likely / high range; the years to use the
allowance integrate the likely rate over the coating's breakdown (the low and
high years scale with the ratio of the fresh rates).
"""

from __future__ import annotations

import math

from .. import units
from ..errors import InputError, RangeError
from ..materials import alloys
from ..methods import coatings, faraday, galvanic
from ..report import Report
from ..schema import CHOICE, INTEGER, NUMBER, QUANTITY, Calculator, Field
from . import members

SIDES = ("anode", "cathode", "both", "none")
SIDE_LABELS = {"anode": "Coat the anode only", "cathode": "Coat the cathode only",
               "both": "Coat both", "none": "Coat neither (bare couple)"}
YEAR_S = faraday.SECONDS_PER_YEAR
#: Holiday diameter taken when none is entered (stated on the page; a typical
#: small mechanical-damage holiday, common practice for screening).
ASSUMED_DIAMETER_M = 0.005
_CATEGORY_NONE = "none"
#: Points of the breakdown timeline (fractions of the design life).
TIMELINE = (0.0, 0.5, 1.0)


# --------------------------------------------------------------------------
# Inputs → coating state
# --------------------------------------------------------------------------

def coating_state(*, coated_area, holiday_count=None, inspected_area=None,
                  holiday_diameter=None, exposed_area=None, coating_category=None,
                  breakdown_a=None, breakdown_b=None, bare_ok=False):
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

    if f_insp is None and a is None and not bare_ok:
        raise InputError("Describe the coating: the holidays found (count with diameter, "
                         "or exposed area), or a coating category, or breakdown "
                         "constants a and b.", field="holiday_count", value="",
                         allowed="at least one of holiday_count, exposed_area, "
                                 "coating_category, breakdown_a with breakdown_b")
    if f_insp is None and a is None:
        info["notes"].append("No coating was described: the couple is taken bare.")
        return 1.0, 0.0, info
    f0 = f_insp if f_insp is not None else a
    b_yr = b if b is not None else 0.0
    if f_insp is not None and a is not None:
        info["notes"].append(
            f"The measured holiday fraction ({units.fmt_fraction(f_insp)}) replaces the specification's "
            f"initial breakdown a = {a:g}; its growth b = {b_yr:g} per year is added.")
    elif f_insp is not None:
        info["notes"].append("No breakdown growth was entered: the exposed area stays as "
                             "found for the whole life. Add a coating category or a and b "
                             "to let the coating age.")
    return f0, b_yr, info


# --------------------------------------------------------------------------
# Layouts of the four scenarios
# --------------------------------------------------------------------------

def holidays_on(area_m2, f, d_m):
    """Number of holidays of diameter d that expose the fraction f of an area."""
    return max(1, round(f * area_m2 / (math.pi * d_m * d_m / 4.0)))


def layout(side, f, A_anode_m2, A_cathode_m2, d_m, distance_m=None):
    """The :class:`galvanic.Layout` of one scenario at bare fraction f, or None
    when the anode has no exposed metal (a coated anode without holidays)."""
    coat_a = side in ("anode", "both")
    coat_c = side in ("cathode", "both")
    A_a = f * A_anode_m2 if coat_a else A_anode_m2
    A_c = f * A_cathode_m2 if coat_c else A_cathode_m2
    if A_a <= 0:
        return None
    if coat_a:
        n = holidays_on(A_anode_m2, f, d_m)
        return galvanic.Layout("anode", n, A_a, A_c, min(d_m / 2, math.sqrt(A_a / n / math.pi)),
                               1, distance_m, surrounds=False)
    if coat_c:
        if A_c <= 0:
            return galvanic.Layout("cathode", 1, 0.0, A_a, d_m / 2)
        n = holidays_on(A_cathode_m2, f, d_m)
        return galvanic.Layout("cathode", n, A_c, A_a, min(d_m / 2, math.sqrt(A_c / n / math.pi)),
                               1, distance_m, surrounds=False)
    # bare couple: the smaller member is the site, the larger surrounds it
    if A_a <= A_c:
        return galvanic.Layout("anode", 1, A_a, A_c, math.sqrt(A_a / math.pi), 1, distance_m)
    return galvanic.Layout("cathode", 1, A_c, A_a, math.sqrt(A_c / math.pi), 1, distance_m)


def _likely_rate(a_id, c_id, env, lay, conductivity):
    """Likely local rate [mm/yr] of one layout (no layout: 0)."""
    if lay is None or lay.site_area_m2 <= 0 and lay.site_role == "anode":
        return 0.0
    if lay.site_role == "cathode" and lay.site_area_m2 <= 0:
        lay = None
    r = galvanic.assess(a_id, c_id, env, lambda rule: lay if lay is not None else
                        galvanic.Layout("anode", 1, 1.0, 1.0, 0.5),
                        conductivity_S_m=conductivity, allowance_of=lambda _a: (1.0, None),
                        isolated=lay is None, cases=("likely",))
    return r["likely"]["local_mm_per_yr"]


def years_from_timeline(points, allowance_mm):
    """First time the integrated likely rate reaches the allowance [years], or
    None (never within 1000 years). ``points`` [(t_yr, mm_per_yr)]; the last
    rate holds after the last point (trapezoid rule)."""
    P = 0.0
    for (t0, r0), (t1, r1) in zip(points, points[1:]):
        step = 0.5 * (r0 + r1) * (t1 - t0)
        if P + step >= allowance_mm:
            # solve within the step (linear rate): P + r0·x + (r1−r0)·x²/(2Δt) = allowance
            dt = t1 - t0
            lo, hi = 0.0, dt
            for _ in range(60):
                x = 0.5 * (lo + hi)
                if P + r0 * x + (r1 - r0) * x * x / (2 * dt) < allowance_mm:
                    lo = x
                else:
                    hi = x
            return t0 + 0.5 * (lo + hi)
        P += step
    t_end, r_end = points[-1]
    if r_end <= 0:
        return None
    t = t_end + (allowance_mm - P) / r_end
    return t if t <= faraday.BEYOND_YEARS else None


# --------------------------------------------------------------------------
# Compute
# --------------------------------------------------------------------------

def compute_numbers(coated, other, environment, coated_side, holiday_count, inspected_area,
                    holiday_diameter, exposed_area, coating_category, breakdown_a,
                    breakdown_b, coated_area, other_area, thickness, allowance, design_life,
                    coating_thickness, conductivity, resistivity, *, page=True):
    """Numbers of the holiday check (SI floats in; rates in mm/yr, times in years).

    ``page=False`` (a schedule's row): the highlighted scenario only, without the
    other three choices, the single-holiday comparison and the fall-off.
    """
    tf = design_life / YEAR_S
    if not tf > 0:
        raise RangeError("The design life must be longer than zero.", field="design_life",
                         value=design_life, allowed="a time > 0, e.g. 20 year")
    kappa = members.conductivity_from(conductivity, resistivity)
    f0, b_yr, info = coating_state(
        coated_area=coated_area, holiday_count=holiday_count, inspected_area=inspected_area,
        holiday_diameter=holiday_diameter, exposed_area=exposed_area,
        coating_category=coating_category, breakdown_a=breakdown_a, breakdown_b=breakdown_b,
        bare_ok=coated_side == "none")
    rule = galvanic.anode_rule(coated, other, environment)
    an, ca = rule["anode"], rule["cathode"]
    coated_is_anode = rule["first_is_anode"]
    A_an = coated_area if coated_is_anode else other_area
    A_ca = other_area if coated_is_anode else coated_area
    d = holiday_diameter if holiday_diameter is not None else ASSUMED_DIAMETER_M
    allow = allowance if allowance is not None else thickness
    if allow > thickness:
        raise RangeError("The allowance is larger than the anode's wall.", field="allowance",
                         value=units.fmt(allow * 1000, "mm"),
                         allowed=f"at most the wall thickness, {units.fmt(thickness * 1000, 'mm')}")

    def frac(t):
        return coatings.breakdown(f0, b_yr, t)

    # the highlighted scenario, fresh (t = 0), all three cases
    lay0 = layout(coated_side, frac(0.0), A_an, A_ca, d)
    no_metal = lay0 is None
    sel = galvanic.assess(
        coated, other, environment,
        lambda r: lay0 if lay0 is not None else galvanic.Layout("anode", 1, A_an, A_ca, 0.5),
        conductivity_S_m=kappa, allowance_of=lambda _a: (allow, None),
        design_life_yr=tf, isolated=no_metal)
    scen = {}
    for side in (SIDES if page else (coated_side,)):
        pts = []
        for k in TIMELINE:
            t = k * tf
            lay = layout(side, frac(t), A_an, A_ca, d)
            if side == coated_side and k == 0.0 and lay is not None:
                rate = sel["likely"]["local_mm_per_yr"]
            else:
                rate = _likely_rate(an, ca, environment, lay, kappa)
            pts.append((t, rate))
        years = years_from_timeline(pts, allow * 1000)
        scen[side] = {"side": side, "label": SIDE_LABELS[side], "timeline": pts,
                      "rate_initial_mm_per_yr": pts[0][1],
                      "rate_design_life_mm_per_yr": pts[-1][1],
                      "years_to_allowance": years,
                      "penetration_at_design_life_mm": _integral(pts)}
    ranking = sorted(scen, key=lambda s: (-(scen[s]["years_to_allowance"] or math.inf),
                                          scen[s]["penetration_at_design_life_mm"]))
    # one years-to-allowance for the highlighted scenario, low/likely/high
    y_likely = scen[coated_side]["years_to_allowance"]
    r0 = sel["likely"]["local_mm_per_yr"]
    ys = []
    for c in galvanic.CASES:
        rc = sel["cases"][c]["local_mm_per_yr"]
        if y_likely is None or r0 <= 0:
            ys.append(None if rc <= 0 or y_likely is None else y_likely * r0 / rc)
        else:
            ys.append(y_likely * r0 / rc if rc > 0 else None)
    for c, y in zip(galvanic.CASES, ys):
        sel["cases"][c]["years_to_allowance"] = y
        sel["cases"][c]["life_status"] = (faraday.LIFE_NO_ATTACK if
                                          sel["cases"][c]["local_mm_per_yr"] <= 0 else
                                          faraday.LIFE_FINITE if y is not None else
                                          faraday.LIFE_BEYOND)
    sel["years"] = tuple(ys)
    sel["verdict"], sel["verdict_basis"] = galvanic.judge(
        sel["cases"], rule, sel["allowed_delta_V"], tf, isolated=no_metal)

    # one holiday alone against each of many (defect fixed: the holiday's own
    # area, never scaled by coated ÷ inspected area)
    single = None
    insp = info["inspection"]
    if (page and coated_is_anode and insp and insp.get("form") == "count"
            and insp["holiday_count"] >= 1):
        n_all = holidays_on(A_an, frac(0.0), insp["holiday_diameter_m"])
        r_many = _likely_rate(an, ca, environment,
                              layout("anode", frac(0.0), A_an, A_ca, insp["holiday_diameter_m"]),
                              kappa)
        r_one = _likely_rate(an, ca, environment, galvanic.Layout(
            "anode", 1, math.pi * insp["holiday_diameter_m"] ** 2 / 4, A_ca,
            insp["holiday_diameter_m"] / 2, surrounds=False), kappa)
        single = {"holidays_on_anode": n_all, "rate_each_of_many_mm_per_yr": r_many,
                  "rate_single_mm_per_yr": r_one}

    # distance fall-off: one holiday at distance x from the cathode's edge
    falloff = []
    if page and not no_metal and lay0.site_role == "anode" and sel["galvanic"]:
        for x_mm in (0, 10, 30, 100, 300, 1000, 3000):
            lay_x = galvanic.Layout("anode", 1, math.pi * d * d / 4, lay0.surround_area_m2,
                                    d / 2, 1, x_mm / 1000.0, surrounds=False)
            falloff.append((float(x_mm), _likely_rate(an, ca, environment, lay_x, kappa)))

    test = coatings.holiday_test(coating_thickness) if coating_thickness is not None else None
    out = members.result_numbers(sel)
    out.update({
        "coated": coated, "other": other, "coated_side": coated_side,
        "coated_member_role": "anode" if coated_is_anode else "cathode",
        "holiday_diameter_m": d, "holiday_diameter_assumed": holiday_diameter is None,
        "fc_initial": frac(0.0), "fc_mean": coatings.mean_breakdown(f0, b_yr, tf),
        "fc_final": coatings.final_breakdown(f0, b_yr, tf),
        "breakdown_a_used": f0, "breakdown_b_per_yr_used": b_yr,
        "coating_category": (info["specification"] or {}).get("category"),
        "holiday_fraction_measured": insp["fraction"] if insp else None,
        "anode_area_m2": A_an, "cathode_area_m2": A_ca,
        "no_exposed_anode": no_metal,
        "scenarios": [{k: v for k, v in scen[s].items()} for s in SIDES if s in scen],
        "ranking": ranking if page else None, "best_side": ranking[0] if page else None,
        "single_holiday": single, "falloff": falloff,
        "test_method": test["test_method"] if test else None,
        "test_method_name": test["test_method_name"] if test else None,
        "test_voltage_V": test["test_voltage_V"] if test else None,
        "notes": info["notes"], "_assessment": sel, "_info": info, "_test": test,
        "_coating_thickness": coating_thickness,
    })
    return out


def _integral(points):
    return sum(0.5 * (r0 + r1) * (t1 - t0) for (t0, r0), (t1, r1) in zip(points, points[1:]))


# --------------------------------------------------------------------------
# Report
# --------------------------------------------------------------------------

def recommendation(n):
    """One consistent sentence: the best scenario, and why coating only the
    anode is the trap (never two contradicting advices)."""
    best = n["best_side"]
    s = f"Best here: {SIDE_LABELS[best].lower()}"
    y = next(x["years_to_allowance"] for x in n["scenarios"] if x["side"] == best)
    s += f" (allowance lasts {members.years_text(y, None if y else faraday.LIFE_BEYOND)})."
    if best != "anode":
        s += (" Coating only the anode is the trap: every holiday in it faces the whole "
              "cathode.")
    else:
        s += (" Here the cathode is small enough that coating the anode alone ranks first; "
              "inspect and repair its holidays.")
    return s


def report(n, page=True):
    """The page's words and charts (``page=False``: headline, verdict, rows and
    warnings only, from :func:`compute_numbers` with ``page=False``)."""
    a = n["_assessment"]
    rep = Report()
    side = n["coated_side"]
    where = {"anode": "at the holidays", "both": "at the holidays",
             "cathode": "near the cathode's holidays", "none": "near the joint"}[side]
    if n["no_exposed_anode"]:
        y = a["years"][1]
        rep.headline("No holidays found on the coated anode: no galvanic attack now; "
                     + ("as the coating ages the allowance is used in "
                        f"{members.years_text(y)}." if y is not None else
                        "the allowance lasts beyond 1000 years."))
    else:
        rep.headline(members.headline(a, where))
        rep.summary(members.short_headline(a))
    rep.verdict(n["verdict_class"], n["verdict"], members.verdict_reason(a))
    an, ca = alloys.alloy(a["anode"]), alloys.alloy(a["cathode"])
    rep.para(f"The {n['coated_member_role'] if side != 'none' else 'anode'} here is decided by "
             f"the galvanic series: {an['name']} is the anode, {ca['name']} the cathode. The "
             f"coated member is the {n['coated_member_role']}.")
    if not n["no_exposed_anode"] and a["galvanic"]:
        rep.para(members.limit_sentence(a))
        rep.para(members.breakdown_sentence(a))
        lk = a["likely"]
        if lk["limit"] == "resistance" and lk["film_m"] is None:
            rep.para(f"The electrolyte caps the current a holiday can draw: with no "
                     f"polarization at all the ohmic limit would be "
                     f"{units.fmt(lk['ohmic_limit_A'], 'A', 3)}; the cell draws "
                     f"{units.fmt(lk['current_A'], 'A', 3)}.")
    wet = members.wet_sentence(a)
    if wet:
        rep.para(wet)
    if page:
        rep.para(recommendation(n))
    if n["single_holiday"]:
        s = n["single_holiday"]
        rep.para(f"One holiday alone against the same cathode: "
                 f"{members.rate_text(s['rate_single_mm_per_yr'])}, against "
                 f"{members.rate_text(s['rate_each_of_many_mm_per_yr'])} at each of the "
                 f"{s['holidays_on_anode']} holidays on the whole coated area: the holidays "
                 "share the cathode's current, and each holiday's own resistance caps what "
                 "it can draw.")
    members.add_caveats(rep, a, wet=False)
    for note in n["notes"]:
        rep.note(note)
    if n["holiday_diameter_assumed"]:
        rep.note(f"No holiday diameter entered: holidays of "
                 f"{units.fmt(ASSUMED_DIAMETER_M * 1000, 'mm')} are assumed.")
    rep.note("Each holiday is a disk in an insulating plane (R = ρ/(4r)); the primary current "
             "distribution attacks its rim hardest, the rate shown is its average.")
    rep.note(members.SCREENING_NOTE)
    rep.row("Bare fraction now / mean / at design life",
            " / ".join(units.fmt_fraction(n[k]) for k in ("fc_initial", "fc_mean", "fc_final")),
            "computed: f(t) = min(1, f0 + b·t), DNV-RP-B401 §6.4 form", key="fc")
    rep.row("Holiday diameter", units.fmt(n["holiday_diameter_m"] * 1000, "mm", 3),
            "assumed (none entered)" if n["holiday_diameter_assumed"] else "as entered",
            key="holiday_diameter")
    members.common_rows(rep, a, n["_conductivity_entered"])
    test = n["_test"]
    if test:
        ct = n["_coating_thickness"]
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
    if not page:
        return rep
    rep.table("The four choices", ["choice", "rate now, mm/yr", "rate at design life, mm/yr",
                                   "years to use the allowance", "rank"],
              [[SIDE_LABELS[s["side"]] + (" — highlighted" if s["side"] == side else ""),
                units.fmt(s["rate_initial_mm_per_yr"], "", 3),
                units.fmt(s["rate_design_life_mm_per_yr"], "", 3),
                members.years_text(s["years_to_allowance"],
                                   None if s["years_to_allowance"] else faraday.LIFE_BEYOND),
                str(n["ranking"].index(s["side"]) + 1)] for s in n["scenarios"]],
              note="Likely rates; the years integrate the rate as the coating breaks down.",
              key="scenarios")
    for s in n["ranking"]:
        if s != side:
            rep.link(f"{SIDE_LABELS[s]}: its result here", "holiday.html", {"coated_side": s},
                     keep=True, group="The other coating choices")
    members.next_steps(rep, a, "holiday.html", n["coated"], n["other"],
                       n["_conductivity_entered"])
    rep.chart("Likely rate over the design life, the four choices",
              members.lines_svg([(SIDE_LABELS[sc["side"]], sc["timeline"])
                                 for sc in n["scenarios"]], "years in service",
                                "Likely rate over the design life"),
              "The likely local rate of each coating choice as the coating breaks down, on "
              "a log scale; a choice with no exposed anode sits on the axis floor.")
    if a["galvanic"] and not n["no_exposed_anode"]:
        rep.chart("Polarization diagram", members.polarization_svg(a),
                  "Potential against log current: anode and cathode curves, the ohmic drop "
                  "at the operating current, and the limit that governs.")
    if n["falloff"]:
        rep.chart("Rate at one holiday against its distance from the cathode",
                  members.falloff_svg(n["falloff"], "distance from the cathode's edge, mm",
                                      "Holiday rate against distance"),
                  "The likely rate at a single holiday falls slowly with its distance from "
                  "the cathode: in a bulk electrolyte the holiday's own resistance dominates.")
    return rep


def _result(params, page):
    if params["coated_side"] not in SIDES:
        raise InputError(f"Unknown coated side {params['coated_side']!r}.",
                         field="coated_side", value=params["coated_side"],
                         allowed=", ".join(SIDES))
    return members.page_result(compute_numbers, report, params, page)


def compute_holiday(coated, other, environment, coated_side, holiday_count, inspected_area,
                    holiday_diameter, exposed_area, coating_category, breakdown_a,
                    breakdown_b, coated_area, other_area, thickness, allowance, design_life,
                    coating_thickness, conductivity, resistivity):
    """Parse → compute → report for the page: numbers plus ``display``."""
    return _result(dict(coated=coated, other=other, environment=environment,
                        coated_side=coated_side, holiday_count=holiday_count,
                        inspected_area=inspected_area, holiday_diameter=holiday_diameter,
                        exposed_area=exposed_area, coating_category=coating_category,
                        breakdown_a=breakdown_a, breakdown_b=breakdown_b,
                        coated_area=coated_area, other_area=other_area, thickness=thickness,
                        allowance=allowance, design_life=design_life,
                        coating_thickness=coating_thickness, conductivity=conductivity,
                        resistivity=resistivity), page=True)


def headline_holiday(**params):
    """The compute-only path of a schedule's row: :func:`compute_holiday`'s
    numbers, headline, verdict and warnings for the highlighted choice, without
    the other three choices, the single-holiday comparison and the charts."""
    return _result(params, page=False)


def _category_choices():
    return [(_CATEGORY_NONE, "None (holidays found only, or bare)")] + \
        coatings.category_ids()


SIDE_CHOICES = [(s, SIDE_LABELS[s]) for s in SIDES]

CALCULATORS = [
    Calculator(
        name="holiday",
        title="Coating holidays and which side to coat",
        summary=("Attack at holidays in a coating, or at a bare couple, and the four choices: "
                 "coat the anode, the cathode, both or neither."),
        intro=("A coated part joined to a more noble metal corrodes only where the coating "
               "is broken — but there the cathode's current arrives, as far as the water's "
               "resistance lets it. Enter the holidays found or the coating's specification, "
               "or choose 'coat neither' for a bare couple. The example: the invented Harrow "
               "Creek tidal pumping station, a coated carbon-steel intake screen bolted to a "
               "nickel-aluminium bronze pump casing, 12 holidays found on the 1.5 m² "
               "inspected."),
        fields=[
            alloys.alloy_field("coated", "Coated member", "carbon_steel",
                                  help="The member that carries the coating as built "
                                       "(generic name or UNS number)."),
            alloys.alloy_field("other", "Other member", "C95800",
                                  help="The member it is joined to."),
            members.environment_field(),
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
                  quantity="length", unit="mm", min=1e-5, max=1.0,
                  range_note="From 0.01 mm (a pinhole) to 1 m.",
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
            Field("allowance", "Corrosion allowance (optional)", QUANTITY, optional=True,
                  quantity="length", unit="mm", min=0.0, min_inclusive=False,
                  help="Thickness the anode may lose; empty = the whole wall (perforation)."),
            Field("design_life", "Design life", QUANTITY, default="20 year",
                  quantity="time", unit="year", min=0.0, min_inclusive=False,
                  max=1000 * YEAR_S, range_note="The design life must be longer than zero.",
                  help="Years in service."),
            Field("coating_thickness", "Coating dry film thickness", QUANTITY, optional=True,
                  quantity="length", unit="mm", min=0.0, min_inclusive=False,
                  group="Inspector", help="Total dry film, for the holiday-test helper."),
        ] + members.electrolyte_fields(),
        compute=compute_holiday,
        headline=headline_holiday,
        example={
            "coated": "carbon steel", "other": "nickel-aluminium bronze",
            "environment": "seawater_quiescent", "coated_side": "anode",
            "holiday_count": "12", "inspected_area": "1.5 m²", "holiday_diameter": "3 mm",
            "exposed_area": "", "coating_category": "II-0-30", "breakdown_a": "",
            "breakdown_b": "", "coated_area": "3 m²", "other_area": "1.2 m²",
            "thickness": "8 mm", "allowance": "", "design_life": "25 year",
            "coating_thickness": "0.45 mm", "conductivity": "", "resistivity": "",
        },
    ),
]
