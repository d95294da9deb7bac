"""What the fastener, joint and holiday pages share: inputs for the electrolyte,
alternatives, mitigations, and the words and pictures of a galvanic result.

Numbers come from :func:`noblegap.methods.galvanic.assess`; this module turns
them into fields, table rows, sentences and SVG charts. Verdict classes and
labels come from :mod:`noblegap.verdicts` only.
"""

from __future__ import annotations

import math

from .. import units, verdicts
from ..errors import InputError
from ..materials import alloys, cell_data, data
from ..methods import cell, faraday, galvanic
from ..schema import CHOICE, QUANTITY, Field
from ..svg import TEXT, Svg, drawings, nice_ticks, scale, text_width

#: Coating efficiency assumed in the mitigations (fraction of area sealed).
COATING_EFFICIENCY = 0.95
#: Cases the verdict needs (alternatives and mitigations skip the low case).
LIGHT_CASES = ("likely", "high")
#: Mark shown beside a headline that rests on a value recalled from memory.
FROM_MEMORY_MARK = "≈ from memory"
FRESH_NOTE = ("These are the rates of fresh, bare metal. Corrosion products on the anode "
              "and calcareous deposits or fouling on the cathode add resistance and usually "
              "lower the rate with time; no published model of that is applied here.")

BASIS_WORDS = {
    "allowance_used": "at the likely rate the anode uses its allowance in {likely} — "
                      "inside the design life of {life}",
    "allowance_at_risk": "at the likely rate the allowance lasts ({likely}), but at the "
                         "high end of the range it is used in {high}, inside the design "
                         "life of {life}",
    "delta_v": "the allowance lasts the design life even at the high rate ({high}), but "
               "the potential difference can reach {dv} where {allowed} is the usual limit "
               "here",
    "lasts": "the allowance lasts the design life even at the high rate ({high}) and the "
             "potential difference stays within the {allowed} usual here",
    "no_couple": "both members sit in the same place in the galvanic series: no galvanic "
                 "current; the allowance lasts {likely} against the anode's own corrosion",
    "isolated": "no galvanic current flows; the anode's own corrosion uses the allowance in "
                "{likely}",
}


# ---------------------------------------------------------------------------
# Inputs
# ---------------------------------------------------------------------------

def environment_field(default="seawater_flowing"):
    return Field("environment", "Environment", CHOICE, default=default,
                 choices=cell_data.environment_choices, widget="select",
                 resolve=lambda text, field: cell_data.resolve_environment(text, field),
                 source="data/electrolytes.csv, data/atmospheres.csv",
                 help="Immersion sets the water's conductivity and oxygen supply; the "
                      "atmospheric categories C1–CX (ISO 9223) set how long the surface "
                      "is wet and the film it carries.")


def electrolyte_fields():
    """Optional conductivity / resistivity that replace the environment's range."""
    return [
        Field("conductivity", "Water conductivity (optional)", QUANTITY, optional=True,
              quantity="conductivity", unit="µS/cm", min=0.0, min_inclusive=False,
              max=100.0, group="Electrolyte",
              help="Measured conductivity, e.g. 350 µS/cm or 5 S/m; replaces the "
                   "environment's range.", range_note="Between 0 and 100 S/m."),
        Field("resistivity", "Water resistivity (optional)", QUANTITY, optional=True,
              quantity="resistivity", unit="ohm*m", min=0.01, max=1e6,
              group="Electrolyte",
              help="Alternative to conductivity, e.g. 25 ohm*m or 2500 ohm*cm.",
              range_note="Between 0.01 and 10⁶ Ω·m."),
    ]


def conductivity_from(conductivity, resistivity):
    """The user's conductivity [S/m] from either field, or None."""
    if conductivity is not None and resistivity is not None:
        raise InputError("Enter the conductivity or the resistivity, not both.",
                         field="resistivity", value=units.fmt(resistivity, "Ω·m"),
                         allowed="leave one of the two empty")
    if resistivity is not None:
        return 1.0 / resistivity
    return conductivity


# ---------------------------------------------------------------------------
# Where the honest model and the plausibility table disagree (tests/test_plausibility.py)
# ---------------------------------------------------------------------------

#: Couples for which the project's plausibility table (a recalled band of field
#: experience, not a published value) and the model disagree. Shown on the
#: page beside the result; the model is never tuned to close the gap.
KNOWN_GAPS = (
    {"anode_family": "aluminium", "cathode_family": "stainless steel",
     "environments": ("seawater_flowing", "seawater_quiescent", "brackish"),
     "band_mm_per_yr": (0.1, 1.0),
     "text": ("Field experience recalled by the project puts the local attack of aluminium "
              "around passive stainless fasteners in seawater at 0.1–1 mm/yr. This model "
              "gives less ({rate}): seawater conducts well enough that its current spreads "
              "over the whole plate, and it does not model the crevice and pitting attack "
              "under fastener heads that concentrates the loss in service. Treat the "
              "figure as the spread-out lower bound.")},
)


def known_gaps(a):
    """Sentences for the page where the result falls in a known disagreement."""
    an, ca = alloys.alloy(a["anode"]), alloys.alloy(a["cathode"])
    out = []
    for g in KNOWN_GAPS:
        if (an["family"] == g["anode_family"] and ca["family"] == g["cathode_family"]
                and a["env"]["id"] in g["environments"] and a["galvanic"]
                and a["likely"]["local_mm_per_yr"] < g["band_mm_per_yr"][0]):
            out.append(g["text"].format(rate=rate_text(a["likely"]["local_mm_per_yr"])))
    return out


# ---------------------------------------------------------------------------
# Alternatives and mitigations (numbers)
# ---------------------------------------------------------------------------

def summary(a, case="likely"):
    """The few numbers a table row needs from an assessment."""
    c = a["cases"][case]
    return {"local_mm_per_yr": c["local_mm_per_yr"],
            "galvanic_mm_per_yr": c["galvanic_mm_per_yr"],
            "average_mm_per_yr": c["average_mm_per_yr"],
            "years_to_allowance": c["years_to_allowance"], "life_status": c["life_status"],
            "high_local_mm_per_yr": a["cases"]["high"]["local_mm_per_yr"],
            "verdict_class": a["verdict"], "verdict": verdicts.label(a["verdict"]),
            "verdict_basis": a["verdict_basis"], "anode": a["anode"]}


def alternatives(evaluate, current_id, limit=5):
    """Every alloy of the fastener list in place of the current member, best first.

    ``evaluate(alloy_id) -> assessment`` (the calculator binds the rest).
    Ranked by verdict, then years to use the allowance (longest first), then
    the likely local rate.
    """
    out = []
    for aid in alloys.fastener_alloys():
        try:
            a = evaluate(aid, cases=LIGHT_CASES)
        except (LookupError, ValueError):
            continue
        row = alloys.alloy(aid)
        s = summary(a)
        s.update({"alloy": aid, "name": row["name"], "uns": row["uns"],
                  "delta_V_high": a["rule"]["delta_V"][2], "current": aid == current_id})
        out.append(s)

    def key(s):
        y = s["years_to_allowance"]
        return (verdicts.RANK[s["verdict_class"]], -(y if y is not None else math.inf),
                s["local_mm_per_yr"])
    out.sort(key=key)
    return out[:limit] if limit else out


MITIGATIONS = {
    "isolate": ("Electrically isolate the members",
                "Insulating washers and sleeves (or an insulating gasket) so that no "
                "metallic path remains: no shank touching a bore, no shared earth bond, no "
                "conductive sealant or bridging fitting."),
    "coat_cathode": ("Coat the cathode",
                     "Coating the noble member shrinks the area that collects oxygen; "
                     f"computed at a coating efficiency of {COATING_EFFICIENCY:.0%} "
                     "(common practice for a sound, inspected system)."),
    "coat_both": ("Coat both members",
                  f"At {COATING_EFFICIENCY:.0%} on both, the remaining holidays on the anode "
                  "face a cathode shrunk by the same factor. Keep the cathode's coating at "
                  "least as good as the anode's."),
    "coat_anode_only": ("Coating only the anode (a trap)",
                        f"At {COATING_EFFICIENCY:.0%} the holidays left on the anode collect "
                        "the whole cathode's current. The next steps open the coating-holiday "
                        "page with these alloys."),
    "seal": ("Seal out the electrolyte",
             "Jointing compound or sealant in the faying surfaces and holes, caps over "
             "fastener ends: no electrolyte bridging the members, no cell. Effective only "
             "while the seal lasts; inspect and renew."),
}


def mitigations(evaluate):
    """Each mitigation re-assessed: ``evaluate(**options) -> assessment``.

    The verdict of each comes from the same judge as the joint itself, so a
    mitigation that leaves the anode using its allowance within the design
    life is never rated acceptable.
    """
    eff = COATING_EFFICIENCY
    plans = {"isolate": {"isolated": True}, "coat_cathode": {"coat_cathode": eff},
             "coat_both": {"coat_cathode": eff, "coat_anode": eff},
             "coat_anode_only": {"coat_anode": eff}, "seal": {"isolated": True}}
    out = []
    for mid, opts in plans.items():
        a = evaluate(cases=LIGHT_CASES, **opts)
        s = summary(a)
        s.update({"id": mid, "title": MITIGATIONS[mid][0], "how": MITIGATIONS[mid][1]})
        out.append(s)
    return out


# ---------------------------------------------------------------------------
# Numbers for the result dict
# ---------------------------------------------------------------------------

def public_case(c):
    return {k: v for k, v in c.items() if not k.startswith("_")}


def result_numbers(a):
    """The machine outputs every galvanic page returns at top level."""
    lk = a["likely"]
    return {
        "anode": a["anode"], "cathode": a["cathode"], "galvanic_couple": a["galvanic"],
        "delta_V_low": a["rule"]["delta_V"][0], "delta_V_likely": a["rule"]["delta_V"][1],
        "delta_V_high": a["rule"]["delta_V"][2], "allowed_delta_V": a["allowed_delta_V"],
        "local_mm_per_yr": lk["local_mm_per_yr"],
        "local_mm_per_yr_low": a["cases"]["low"]["local_mm_per_yr"],
        "local_mm_per_yr_high": a["cases"]["high"]["local_mm_per_yr"],
        "local_mpy": faraday.mm_per_yr_to_mpy(lk["local_mm_per_yr"]),
        "galvanic_mm_per_yr": lk["galvanic_mm_per_yr"], "own_mm_per_yr": lk["own_mm_per_yr"],
        "average_mm_per_yr": lk["average_mm_per_yr"],
        "galvanic_current_A": lk["current_A"], "ohmic_limit_A": lk["ohmic_limit_A"],
        "resistance_ohm": lk["R_ohm"], "conductivity_S_m": lk["kappa_S_m"],
        "spread_m": lk["spread_m"] if math.isfinite(lk["spread_m"]) else None,
        "wet_fraction": lk["wet_fraction"], "governing_limit": lk["limit"],
        "E_anode_V_SCE": lk["E_anode_V_SCE"], "E_cathode_V_SCE": lk["E_cathode_V_SCE"],
        "allowance_m": a["allowance_m"], "years_to_allowance": a["years"][1],
        "years_to_allowance_low_rate": a["years"][0],
        "years_to_allowance_high_rate": a["years"][2],
        "design_life_yr": a["design_life_yr"],
        "verdict_class": a["verdict"], "verdict": verdicts.label(a["verdict"]),
        "verdict_basis": a["verdict_basis"], "from_memory": a["from_memory"],
        "environment": a["env"]["id"], "environment_kind": a["env"]["kind"],
        "cases": {k: public_case(v) for k, v in a["cases"].items()},
    }


# ---------------------------------------------------------------------------
# Words
# ---------------------------------------------------------------------------

def years_text(y, status=None):
    if status == faraday.LIFE_NO_ATTACK or (y is None and status is None):
        return "no attack"
    if y is None:
        return f"beyond {faraday.BEYOND_YEARS:.0f} years"
    if y < 1:
        return units.fmt(y * 365, "days", 2)
    return units.fmt(y, "years", 3)


def rate_text(mm):
    return units.fmt(mm, "mm/yr", 3)


def range_text(a, key="local_mm_per_yr"):
    lo, li, hi = (a["cases"][c][key] for c in galvanic.CASES)
    return f"{rate_text(li)} (range {units.fmt(lo, '', 2)}–{units.fmt(hi, 'mm/yr', 2)})"


def allowance_phrase(y, status):
    """'allowance used in 12.3 years' or 'allowance lasts beyond 1000 years'."""
    if y is None:
        return ("no loss of the allowance" if status == faraday.LIFE_NO_ATTACK else
                f"allowance lasts beyond {faraday.BEYOND_YEARS:.0f} years")
    return f"allowance used in {years_text(y, status)}"


def headline(a, where):
    """One sentence: the local rate with its range, years to the allowance, mark."""
    lk = a["likely"]
    mark = f" [{FROM_MEMORY_MARK}]" if a["from_memory"] else ""
    an = alloys.alloy(a["anode"])["name"]
    when = allowance_phrase(a["years"][1], lk["life_status"])
    if not a["galvanic"] or a["isolated"]:
        return (f"No galvanic current. {an} loses {range_text(a)} by its own corrosion"
                f"{mark}; {when}.")
    return f"{an} {where}: {range_text(a)} locally{mark}; {when}."


def short_headline(a):
    """The headline's numbers for the summary bar: the local rate and the allowance."""
    lk = a["likely"]
    return (f"{rate_text(lk['local_mm_per_yr'])} locally; "
            f"{allowance_phrase(a['years'][1], lk['life_status'])}")


def verdict_reason(a):
    y = a["years"]
    lk, hi = a["likely"], a["cases"]["high"]
    return BASIS_WORDS[a["verdict_basis"]].format(
        likely=years_text(y[1], lk["life_status"]), high=years_text(y[2], hi["life_status"]),
        life=units.fmt(a["design_life_yr"], "years", 3),
        dv=units.fmt(a["rule"]["delta_V"][2], "V", 2),
        allowed=units.fmt(a["allowed_delta_V"], "V", 2))


def limit_sentence(a):
    lk = a["likely"]
    if lk["limit"] == cell.LIMIT_NONE:
        return "No driving voltage between the members: " + cell.LIMITS[cell.LIMIT_NONE] + "."
    share = {cell.LIMIT_ANODE: lk["eta_anode_V"], cell.LIMIT_CATHODE: lk["eta_cathode_V"],
             cell.LIMIT_RESISTANCE: lk["ohmic_V"]}
    return (f"What limits the rate: {cell.LIMITS[lk['limit']]}. Of the "
            f"{units.fmt(lk['delta_V'], 'V', 2)} available, the anode takes "
            f"{units.fmt(share[cell.LIMIT_ANODE], 'V', 2)}, the cathode "
            f"{units.fmt(share[cell.LIMIT_CATHODE], 'V', 2)} and the electrolyte "
            f"{units.fmt(share[cell.LIMIT_RESISTANCE], 'V', 2)} (I·R with R = "
            f"{units.fmt(lk['R_ohm'], 'Ω', 3)}).")


def breakdown_sentence(a):
    """Local rate = galvanic part + the anode's own corrosion; the parts add up."""
    lk = a["likely"]
    tot, g = lk["local_mm_per_yr"], lk["galvanic_mm_per_yr"]
    own = tot - g
    return (f"Of the local {rate_text(tot)}, {rate_text(g)} is the couple's current and "
            f"{rate_text(own)} the anode's own corrosion (the two add up). Spread over the "
            f"whole anode member the average is {rate_text(lk['average_mm_per_yr'])}.")


def wet_sentence(a):
    lk = a["likely"]
    if lk["film_m"] is None:
        return None
    band = a["iso_band_um_per_yr"]
    s = (f"The surface is wet about {lk['wet_fraction']:.0%} of the year (time of wetness "
         f"typical of {a['env']['id']}); the annual rates are the wet-time rates times that "
         f"fraction, with a film of {units.fmt(lk['film_m'] * 1e6, 'µm', 2)} and "
         f"{units.fmt(lk['kappa_S_m'], 'S/m', 2)}.")
    if band is not None:
        s += (f" The anode's own uncoupled rate is held within the first-year band of "
              f"ISO 9223 for its family in {a['env']['id']}: {band_text(band)}.")
    return s


def band_text(band):
    """The ISO 9223 band (low, high) [µm/yr] in words: a range, open above, or negligible."""
    low, high = band
    if high is None:
        return f"above {units.fmt(low, 'µm/yr', 2)} (the standard sets no upper limit)"
    if high == 0:
        return "negligible (taken as 0 µm/yr)"
    return f"{units.fmt(low, '', 2)}–{units.fmt(high, 'µm/yr', 2)}"


def common_rows(rep, a, conductivity_entered):
    """Rows with sources for the cell's inputs and outputs."""
    lk = a["likely"]
    env = a["env"]
    cites = cell_data.cite_env(env["id"], a["anode"])
    ra, rc = a["rule"]["range_anode"], a["rule"]["range_cathode"]
    an, ca = alloys.alloy(a["anode"]), alloys.alloy(a["cathode"])
    rep.row("Anode (corrodes) by the galvanic series", f"{an['name']}: "
            f"{units.fmt(ra[1], 'V')} to {units.fmt(ra[0], 'V')} vs SCE",
            alloys.cite_potential(an), key="anode_range")
    rep.row("Cathode", f"{ca['name']}: {units.fmt(rc[1], 'V')} to {units.fmt(rc[0], 'V')} "
            "vs SCE", alloys.cite_potential(ca), key="cathode_range")
    rep.row("ΔV low / likely / high", " / ".join(units.fmt(v, "V", 2)
                                                 for v in a["rule"]["delta_V"]),
            "computed: closest ends, midpoints, farthest ends of the two ranges",
            key="delta_V")
    sev = alloys.environment(a["series_env"])
    rep.row("Usual limit of ΔV here", units.fmt(a["allowed_delta_V"], "V"),
            alloys.cite_allowed(sev), key="allowed_delta_V")
    if lk["film_m"] is None:
        if conductivity_entered:
            src = "as entered"
        else:
            src = cites["conductivity"]
        txt = " / ".join(units.fmt(a["cases"][c]["kappa_S_m"], "S/m", 3)
                         for c in galvanic.CASES)
        if lk["salinity"] is not None and not conductivity_entered:
            txt += (f" (PSS-78 at salinity {units.fmt(lk['salinity'], '', 3)}, "
                    f"{units.fmt(lk['T_degC'], '°C', 3)})")
        rep.row("Conductivity low / likely / high", txt, src, key="conductivity")
        rep.row("Oxygen limiting current density", " / ".join(
            units.fmt(a["cases"][c]["i_L_A_m2"], "A/m²", 2) for c in galvanic.CASES),
            cites["i_L"], key="i_L")
    else:
        rep.row("Wet fraction of the year", " / ".join(
            f"{a['cases'][c]['wet_fraction']:.0%}" for c in galvanic.CASES),
            cites["wetness"], key="wet_fraction")
        rep.row("Film thickness, conductivity", f"{units.fmt(lk['film_m'] * 1e6, 'µm', 2)}, "
                f"{units.fmt(lk['kappa_S_m'], 'S/m', 2)}",
                "as entered (conductivity)" if conductivity_entered else cites["film"],
                key="film")
        rep.row("Oxygen limit through the film", units.fmt(lk["i_L_A_m2"], "A/m²", 3),
                "computed: i_L = 4·F·D·c/h (Fick's first law; D and c of oxygen recalled, "
                "from memory)", key="i_L")
        if a["iso_band_um_per_yr"] is not None:
            rep.row("ISO 9223 first-year band (anode's family)",
                    band_text(a["iso_band_um_per_yr"]), cites["iso_rates"], key="iso_band")
    k_an = cell_data.kinetics_row(a["anode"])
    k_ca = cell_data.kinetics_row(a["cathode"])
    rep.row("Anode kinetics", f"{k_an['mode']}, own current "
            f"{units.fmt(k_an['i_corr_A_m2'], 'A/m²', 2)}"
            + (f", b_a {k_an['b_a_mV_per_decade']:g} mV/decade"
               if k_an["b_a_mV_per_decade"] is not None else ", no breakdown in range")
            + (f", breakdown {units.fmt(k_an['E_b_V_SCE'], 'V')} vs SCE"
               if k_an["E_b_V_SCE"] is not None else ""),
            cell_data.kinetics_cite(k_an), key="anode_kinetics")
    rep.row("Cathode kinetics", f"{k_ca['mode']}, own current "
            f"{units.fmt(k_ca['i_corr_A_m2'], 'A/m²', 2)}, b_c "
            f"{k_ca['b_c_mV_per_decade']:g} mV/decade",
            cell_data.kinetics_cite(k_ca, role="cathode"),
            key="cathode_kinetics")
    rep.row("Electrolyte resistance", units.fmt(lk["R_ohm"], "Ω", 3),
            "computed: disks in an insulating plane R = ρ/(4r) (Newman 1966)"
            if lk["film_m"] is None else
            "computed: radial flow in the film R = ρ/(2πh)·ln((r₀+λ)/r₀)", key="R")
    rep.row("Galvanic current", units.fmt(lk["current_A"], "A", 3) +
            f" (no-polarization limit ΔV/R = {units.fmt(lk['ohmic_limit_A'], 'A', 3)})",
            "computed: bracketed solution of the cell", key="current")
    if math.isfinite(lk["spread_m"]):
        rep.row("Spread of the current on the surrounding member",
                units.fmt(lk["spread_m"] * 1000, "mm", 3),
                "computed: Wagner length κ·r_p (bulk) or √(κ·h·r_p) (film)", key="spread")
    rep.row("Anode penetration, local", f"{rate_text(lk['local_mm_per_yr'])} = "
            f"{units.fmt(faraday.mm_per_yr_to_mpy(lk['local_mm_per_yr']), 'mpy', 3)}",
            "computed: ASTM G102 CR = K·i·EW/ρ with K from CODATA F", key="local_rate")
    rep.row("Anode penetration, member average", rate_text(lk["average_mm_per_yr"]),
            "computed: galvanic current spread over the whole anode plus own corrosion",
            key="average_rate")
    rep.row("Corrosion allowance", units.fmt(a["allowance_m"] * 1000, "mm", 3),
            "as entered" if a["allowance_default"] is None else
            f"default: {a['allowance_default']}", key="allowance")
    rep.row("Years to use the allowance (low / likely / high rate)", " / ".join(
        years_text(a["years"][i], a["cases"][c]["life_status"])
        for i, c in enumerate(("high", "likely", "low")[::-1])),
        "computed: allowance / local rate", key="years")


def alternatives_table(rep, alts, title, member_word):
    rep.table(title, [member_word, "verdict", "years to use the allowance",
                      "local mm/yr", "corrodes"],
              [[a["name"] + (f" ({a['uns']})" if a["uns"] else "") +
                (" — as entered" if a["current"] else ""), a["verdict"],
                years_text(a["years_to_allowance"], a["life_status"]),
                units.fmt(a["local_mm_per_yr"], "", 3),
                alloys.alloy(a["anode"])["name"]] for a in alts],
              note="Each alloy re-assessed with the same geometry and environment (likely "
                   "rates); ranked by verdict, then years to use the allowance.")


def mitigations_table(rep, mits):
    rep.table("Mitigations and their computed effect",
              ["mitigation", "verdict", "years to use the allowance", "local mm/yr", "how"],
              [[m["title"], m["verdict"], years_text(m["years_to_allowance"], m["life_status"]),
                units.fmt(m["local_mm_per_yr"], "", 3), m["how"]] for m in mits],
              note="Judged like the joint itself: a measure that leaves the anode using its "
                   "allowance within the design life is never rated acceptable. Isolation and "
                   "sealing leave the anode's own corrosion.")


# ---------------------------------------------------------------------------
# Next steps: the other pages, opened with these alloys
# ---------------------------------------------------------------------------

#: Which holiday-page choice each coating mitigation is.
_MITIGATION_SIDE = {"coat_anode_only": "anode", "coat_cathode": "cathode", "coat_both": "both"}


def _name(alloy_id):
    """An alloy as a link carries it: the label the pages' lists show."""
    return alloys._label(alloys.alloy(alloy_id))


def shared_inputs(a, conductivity_entered):
    """What every galvanic page asks alike, as a link carries it: the environment,
    the design life and an entered conductivity."""
    out = {"environment": a["env"]["id"], "design_life": f"{a['design_life_yr']:g} year"}
    if conductivity_entered:
        out["conductivity"] = f"{a['likely']['kappa_S_m']:.4g} S/m"
    return out


def next_steps(rep, a, here, larger, smaller, conductivity_entered, alternatives=(),
               alternative_key=None, alternative_word=None, mitigations=()):
    """Links from a galvanic page (``here``) to the others with the same alloys.

    ``larger``/``smaller`` are the members' alloy ids as the joint and fastener
    pages take them (plate and fastener); ``alternatives`` each open this page
    with that alloy in ``alternative_key`` and the other inputs kept; a coating
    mitigation opens the coating-holiday page on its choice.
    """
    shared = shared_inputs(a, conductivity_entered)
    for alt in alternatives:
        if not alt["current"]:
            rep.link(f"Try {alt['name']} as the {alternative_word}", here,
                     {alternative_key: _name(alt["alloy"])}, keep=True,
                     group=f"Try another {alternative_word}")
    an, ca = _name(a["anode"]), _name(a["cathode"])
    for m in mitigations:
        side = _MITIGATION_SIDE.get(m["id"])
        if side and a["galvanic"]:
            coated, other = (ca, an) if side == "cathode" else (an, ca)
            rep.link(f"{m['title']}: holidays on the coating-holiday page", "holiday.html",
                     {"coated": coated, "other": other, "coated_side": side, **shared},
                     group="Coatings and their holidays")
    other = "Other checks of these alloys"
    if here != "fastener.html":
        rep.link(f"Fastener check: {_name(smaller)} fasteners in {_name(larger)}",
                 "fastener.html", {"fastener": _name(smaller), "plate": _name(larger), **shared},
                 group=other)
    if here != "joint.html":
        rep.link(f"Joint check: {_name(larger)} joined to {_name(smaller)}", "joint.html",
                 {"first": _name(larger), "second": _name(smaller), **shared}, group=other)
    series_env = {"environment": a["series_env"]}
    rep.link("Compare the pair in the galvanic series", "pair.html",
             {"alloy_a": _name(smaller), "alloy_b": _name(larger), **series_env}, group=other)
    rep.link("See both among the alloy families", "series.html",
             {"alloy_a": _name(smaller), "alloy_b": _name(larger), **series_env}, group=other)


# ---------------------------------------------------------------------------
# Charts
# ---------------------------------------------------------------------------

_ANODE, _CATHODE, _OHMIC = "#b3261e", "#1d4f91", "#6b4fa0"


def _y_margin(labels):
    """Left margin [px] that holds the longest y-axis label and its tick."""
    return max(44.0, max(text_width(t) for t in labels) + 14.0)


def _place(svg, x, y, text, lo, hi, gap=6, **kw):
    """A label beside ``x``: right of it where it fits before ``hi``, else left
    of it, and never past ``lo``."""
    w = text_width(text, kw.get("size", TEXT))
    if x + gap + w <= hi:
        return svg.text(x + gap, y, text, **kw)
    return svg.text(max(x - gap, lo + w), y, text, anchor="end", **kw)


def polarization_svg(a):
    """E against log current: anode and cathode curves, ohmic drop, operating
    point; one drawing per width class (:data:`noblegap.svg.SIZES`)."""
    lk = a["likely"]
    a_el, c_el = lk["_electrodes"]
    A_a, A_c = lk["A_anode_eff_m2"], lk["A_cathode_eff_m2"]
    E_lo = min(a_el.E_corr_V, lk["E_anode_V_SCE"]) - 0.15
    E_hi = max(c_el.E_corr_V, lk["E_cathode_V_SCE"]) + 0.1
    I_op = max(lk["current_A"], 1e-12)
    tops = [I_op, A_c * c_el.i_L_A_m2, A_a * a_el.i_corr_A_m2, A_c * c_el.i_corr_A_m2]
    x_hi = math.ceil(math.log10(max(tops)) + 1)
    x_lo = math.floor(math.log10(max(min(t for t in tops if t > 0), 1e-12)) - 1)
    x_lo = max(x_lo, x_hi - 10)
    n = 60

    def curve(fn, e0, e1):
        out = []
        for k in range(n + 1):
            E = e0 + (e1 - e0) * k / n
            I = fn(E)
            if I > 0:
                out.append((min(max(math.log10(I), x_lo), x_hi), E))
        return out
    anode = curve(lambda E: A_a * a_el.net(E), a_el.E_corr_V + 1e-4, E_hi)
    cathode = curve(lambda E: -A_c * c_el.net(E), E_lo, c_el.E_corr_V - 1e-4)
    iL = A_c * c_el.i_L_A_m2
    y_ticks = [(t, f"{t:.2f}") for t in nice_ticks(E_lo, E_hi, 6)]

    def draw(size):
        W = size["width"]
        H = 340 if W >= 600 else 300
        L, R, T, B = _y_margin([t for _, t in y_ticks]), 14, 28, 50
        svg = Svg(W, H, "Polarization diagram: potential against log current")
        x = scale(x_lo, x_hi, L, W - R)
        y = scale(E_lo, E_hi, H - B, T)
        svg.line(L, T, L, H - B, stroke="#555")
        svg.line(L, H - B, W - R, H - B, stroke="#555")
        for t, label in y_ticks[::max(1, round(len(y_ticks) / size["ticks"]))]:
            svg.line(L - 4, y(t), L, y(t), stroke="#555")
            svg.text(L - 6, y(t) + 4, label, size=TEXT, anchor="end")
        decades = list(range(int(x_lo), int(x_hi) + 1))
        every = max(1, math.ceil(len(decades) * (text_width("1e-10") + 8) / (W - L - R)))
        for d in decades:
            svg.line(x(d), H - B, x(d), H - B + 4, stroke="#555")
            if (d - decades[-1]) % every == 0:
                svg.text(x(d), H - B + 18, f"1e{d}", size=TEXT, anchor="middle")
        svg.text(W / 2, H - 8, "current, A (log scale)", size=TEXT, anchor="middle",
                 fill="#444")
        svg.text(4, 16, "E, V vs SCE", size=TEXT, fill="#444")
        svg.polyline([(x(lx), y(E)) for lx, E in anode], stroke=_ANODE, width=2)
        svg.polyline([(x(lx), y(E)) for lx, E in cathode], stroke=_CATHODE, width=2)
        if iL > 0 and x_lo < math.log10(iL) < x_hi:
            xl = x(math.log10(iL))
            svg.line(xl, T, xl, H - B, stroke=_CATHODE, dash="4 4")
            _place(svg, xl, T + 14, "oxygen limit", L, W - R, gap=4, size=TEXT,
                   fill=_CATHODE)
        if lk["current_A"] > 0:
            xo = x(min(max(math.log10(I_op), x_lo), x_hi))
            ya, yc = y(lk["E_anode_V_SCE"]), y(lk["E_cathode_V_SCE"])
            svg.line(xo, ya, xo, yc, stroke=_OHMIC, width=3)
            svg.circle(xo, ya, 4, fill=_ANODE)
            svg.circle(xo, yc, 4, fill=_CATHODE)
            _place(svg, xo, (ya + yc) / 2, f"I·R {lk['ohmic_V']:.2f} V", L, W - R,
                   size=TEXT, fill=_OHMIC)
            _place(svg, xo, ya + 16, f"I = {units.fmt(lk['current_A'], 'A', 2)}", L, W - R,
                   size=TEXT)
        svg.text(W - R, H - B - 8, f"limit: {lk['limit']}", size=TEXT, anchor="end",
                 weight="bold")
        svg.text(L + 6, y(a_el.E_corr_V) - 4, "anode", size=TEXT, fill=_ANODE)
        svg.text(L + 6, y(c_el.E_corr_V) - 4, "cathode", size=TEXT, fill=_CATHODE)
        return str(svg)
    return drawings(draw)


def _display_units(points, x_label):
    """Chart points and axis names in the display system (:func:`noblegap.units.system`):
    mm/yr → mpy and a distance axis named ``…, mm`` → in under US customary."""
    if units.system() != units.US:
        return points, x_label, "mm/yr"
    to_in = x_label.endswith(", mm")
    pts = [(x / 25.4 if to_in else x, y / 0.0254) for x, y in points]
    return pts, (x_label[:-4] + ", in") if to_in else x_label, "mpy"


def falloff_svg(points, x_label, title):
    """Local rate against distance: ``points`` [(x_mm, mm_per_yr)]; one drawing per
    width class, in the display system's units."""
    points, x_label, rate_unit = _display_units(points, x_label)
    xs = [p[0] for p in points]
    ys = [p[1] for p in points]
    x_hi = max(xs) if max(xs) > 0 else 1.0
    y_hi = max(ys) * 1.1 if max(ys) > 0 else 1.0

    def draw(size):
        W = size["width"]
        H = 260 if W >= 600 else 240
        y_ticks = [(t, units.fmt(t, "", 2)) for t in nice_ticks(0.0, y_hi, size["ticks"])]
        L, R, T, B = _y_margin([t for _, t in y_ticks]), 18, 28, 48
        svg = Svg(W, H, title)
        x = scale(0.0, x_hi, L, W - R)
        y = scale(0.0, y_hi, H - B, T)
        svg.line(L, T, L, H - B, stroke="#555")
        svg.line(L, H - B, W - R, H - B, stroke="#555")
        for t, label in y_ticks:
            svg.line(L - 4, y(t), L, y(t), stroke="#555")
            svg.text(L - 6, y(t) + 4, label, size=TEXT, anchor="end")
        for t in nice_ticks(0.0, x_hi, size["ticks"]):
            svg.line(x(t), H - B, x(t), H - B + 4, stroke="#555")
            svg.text(x(t), H - B + 18, f"{t:g}", size=TEXT, anchor="middle")
        svg.text(W / 2, H - 8, x_label, size=TEXT, anchor="middle", fill="#444")
        svg.text(4, 16, rate_unit, size=TEXT, fill="#444")
        svg.polyline([(x(p[0]), y(p[1])) for p in points], stroke=_ANODE, width=2)
        return str(svg)
    return drawings(draw)


_SERIES = ("#b3261e", "#1f6f43", "#1d4f91", "#b07d12")


def lines_svg(series, x_label, title):
    """Several rate curves on a log rate axis: ``series`` [(label, [(x, mm_per_yr)])].
    Zero rates sit on the axis floor and are named in the legend. One drawing
    per width class: the narrow one lists the legend in one column."""
    series = [(label, _display_units(pts, x_label)[0]) for label, pts in series]
    _, x_label, rate_unit = _display_units([], x_label)
    xs = [x for _, pts in series for x, _ in pts]
    pos = [y for _, pts in series for _, y in pts if y > 0]
    x_hi = max(xs) if xs and max(xs) > 0 else 1.0
    y_hi = math.ceil(math.log10(max(pos))) if pos else 0
    y_lo = min(math.floor(math.log10(min(pos))), y_hi - 1) if pos else -1
    y_ticks = [(d, units.fmt(10.0 ** d, "", 1)) for d in range(int(y_lo), int(y_hi) + 1)]

    def draw(size):
        W = size["width"]
        cols = 2 if W >= 600 else 1
        rows = math.ceil(len(series) / cols)
        L, R, T = _y_margin([t for _, t in y_ticks]), 18, 30
        bottom = T + (190 if cols == 2 else 170)
        H = bottom + 52 + rows * 17
        svg = Svg(W, H, title)
        x = scale(0.0, x_hi, L, W - R)
        y = scale(y_lo, y_hi, bottom, T)
        svg.line(L, T, L, bottom, stroke="#555")
        svg.line(L, bottom, W - R, bottom, stroke="#555")
        every = max(1, math.ceil(len(y_ticks) / (size["ticks"] + 2)))
        for d, label in y_ticks:
            svg.line(L - 4, y(d), L, y(d), stroke="#555")
            if (d - y_ticks[-1][0]) % every == 0:
                svg.text(L - 6, y(d) + 4, label, size=TEXT, anchor="end")
        for t in nice_ticks(0.0, x_hi, size["ticks"]):
            svg.line(x(t), bottom, x(t), bottom + 4, stroke="#555")
            svg.text(x(t), bottom + 18, f"{t:g}", size=TEXT, anchor="middle")
        svg.text(W / 2, bottom + 36, x_label, size=TEXT, anchor="middle", fill="#444")
        svg.text(4, 16, f"{rate_unit} (log scale)", size=TEXT, fill="#444")
        col_w = (W - 16) / cols
        for k, (label, pts) in enumerate(series):
            colour = _SERIES[k % len(_SERIES)]
            line = [(x(px), y(max(math.log10(py), y_lo) if py > 0 else y_lo)) for px, py in pts]
            svg.polyline(line, stroke=colour, width=2, dash="6 4" if k % 2 else None)
            svg.text(8 + (k % cols) * col_w, bottom + 58 + (k // cols) * 17, f"— {label}",
                     size=TEXT, fill=colour)
        return str(svg)
    return drawings(draw)


def spread_points(a):
    """(distance from the joint's edge [mm], local rate [mm/yr]) on the surround anode."""
    lk = a["likely"]
    lam = lk["spread_m"]
    g0, own = lk["galvanic_mm_per_yr"], lk["local_mm_per_yr"] - lk["galvanic_mm_per_yr"]
    if not math.isfinite(lam) or lam <= 0:
        return [(0.0, lk["local_mm_per_yr"]), (100.0, lk["local_mm_per_yr"])]
    span = 4 * lam
    return [(span * k / 40 * 1000, g0 * math.exp(-span * k / 40 / lam) + own)
            for k in range(41)]


SCREENING_NOTE = ("Screening tool: verify with the applicable standards, local codes and a "
                  "qualified corrosion engineer; safety-critical, structural and pressure-"
                  "retaining joints need licensed review.")


def add_caveats(rep, a, wet=True):
    """The caveats every rate page states in the same words: wet time, fresh
    metal, values from memory, the series' applicability and the model's gaps."""
    text = wet_sentence(a) if wet else None
    if text:
        rep.para(text)
    rep.para(FRESH_NOTE)
    if a["from_memory"]:
        rep.warn(f"{FROM_MEMORY_MARK}: some values behind this rate are recalled, "
                 "not confirmed against a published source (see the sources below). Treat "
                 "the range, not the single figure, as the result.")
    for w in alloys.applicability(a["series_env"]):
        rep.warn(w)
    for w in known_gaps(a):
        rep.warn(w)


def page_result(compute_numbers, report, params, page):
    """A rate calculator's result: its numbers (without the private ``_`` keys) and
    the report built from them, with whether a conductivity was typed."""
    n = compute_numbers(**params, page=page)
    n["_conductivity_entered"] = (params["conductivity"] is not None
                                  or params["resistivity"] is not None)
    rep = report(n, page=page)
    out = {k: v for k, v in n.items() if not k.startswith("_")}
    out["display"] = rep.to_dict()
    return out
