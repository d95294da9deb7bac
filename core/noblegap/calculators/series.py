"""The galvanic series of engineering alloys, and which alloy of a pair corrodes.

Sign convention: potentials are free corrosion potentials, metal minus
reference, in volts (``E_V_SCE`` on the saturated calomel scale unless a
``reference`` is chosen). Each alloy has a range ``[E_active, E_noble]`` from
the galvanic series in flowing seawater (ASTM G82, Fig. 1). In a pair the
alloy of the lower range is the anode (it corrodes faster than alone); the
other is the cathode (it corrodes slower).

For alloy ranges ``[lo_a, hi_a]`` and ``[lo_b, hi_b]`` with b the more
active one (``hi_b ≤ lo_a``):

    ΔE_min = lo_a − hi_b        (best case, ≥ 0)
    ΔE_max = hi_a − lo_b        (worst case)

When the ranges overlap neither alloy is reliably the anode: ``anode`` is
``"overlap"``, ΔE_min = 0 and ΔE_max is the largest difference the ranges
allow. The same alloy on both sides is no couple: ``anode`` is ``"none"`` and
ΔE = 0.

Compatibility classes (our names) compare ΔE with the environment's allowed
difference ΔE_allowed (common practice, see ``data/environments.csv``):

* ``compatible`` — ΔE_max ≤ ΔE_allowed: even the worst case is within it;
* ``marginal`` — ΔE_min ≤ ΔE_allowed < ΔE_max: it depends where in their
  ranges the two alloys sit;
* ``incompatible`` — ΔE_min > ΔE_allowed: even the best case exceeds it.

A potential difference says which metal corrodes and how strongly it is
driven, not how fast: the rate depends on the area ratio, the cathode's
oxygen supply and the electrolyte's conductivity.

References
----------
.. [1] ASTM G82, Standard Guide for Development and Use of a Galvanic Series
   for Predicting Galvanic Corrosion Performance, Fig. 1.
.. [2] MIL-STD-889 (anodic-index guidance), environment limits 0.15 / 0.25 /
   0.50 V — common practice.
"""

from __future__ import annotations

import re

from .. import units
from ..materials import alloys, cell_data, references
from .. import verdicts
from ..report import Report
from ..schema import Calculator
from .fields import reference_field

COMPATIBLE, MARGINAL, INCOMPATIBLE = "compatible", "marginal", "incompatible"
VERDICT_CLASS = {COMPATIBLE: "ok", MARGINAL: "caution", INCOMPATIBLE: "avoid"}
OVERLAP, NONE = "overlap", "none"


def _ref_name(ref):
    return references.reference(ref)["name"]


def _ref_short(ref):
    """``SCE``, ``CSE``, ``SHE`` where the name gives an abbreviation, else the name."""
    name = _ref_name(ref)
    m = re.search(r"\(([A-Z]{2,5})\)", name)
    return m.group(1) if m else name


def ordered_series(environment="seawater_flowing", reference="sce"):
    """Alloys ordered most noble → most active, potentials on ``reference``.

    Returns
    -------
    list of dict
        ``{id, name, uns, state, E_noble_V, E_active_V, source, confidence}``.
    """
    out = []
    for row in alloys.alloy_table():
        hi, lo = alloys.potential_range(row["id"], environment, reference)
        out.append({"id": row["id"], "name": row["name"], "uns": row["uns"],
                    "state": row["state"], "label": alloys._label(row),
                    "E_noble_V": hi, "E_active_V": lo,
                    "source": alloys.cite_potential(row),
                    "confidence": row["confidence"]})
    out.sort(key=lambda r: (-r["E_noble_V"], -r["E_active_V"]))
    return out


def _v(value):
    """A potential to 2 decimals, as the series prints it."""
    return (f"{value:+.2f}".replace("-", "\u2212")) + " V"


# Our grouping of the table's families, in the order a fabricator reaches for
# them (structural and fastener metals first, the rarely joined after).
def series_view(rows, environment, reference, centre=None, partner=None, filters=True):
    """The job-centred series view: families, one potential track, the window.

    ``centre`` is the alloy the window is drawn around (the cathode of the
    user's pair, or the one alloy highlighted); every other row gets the
    verdict it would have joined to ``centre`` in ``environment``. Returns a
    JSON-ready dict the page draws (``Report.view``).
    """
    env = alloys.environment(environment)
    allowed = env["allowed_delta_V"]
    ref_label = _ref_short(reference)
    lo = min(r["E_active_V"] for r in rows)
    hi = max(r["E_noble_V"] for r in rows)
    pad = 0.03 * (hi - lo or 1.0)
    lo, hi = lo - pad, hi + pad
    pct = lambda v: round(100.0 * (v - lo) / (hi - lo), 2)  # noqa: E731
    by_id = {r["id"]: r for r in rows}
    fast = {r["id"]: r["fastener_use"] == "yes" for r in alloys.alloy_table()}
    fam = {r["id"]: alloys.family_group(r["family"]) for r in alloys.alloy_table()}
    window = None
    window_text = ""
    if centre:
        c = by_id[centre]
        w_lo, w_hi = c["E_active_V"] - allowed, c["E_noble_V"] + allowed
        window = [pct(max(w_lo, lo)), pct(min(w_hi, hi))]
        window_text = (f"Shaded: potentials within {units.fmt(allowed, 'V', 2)} of "
                       f"{c['label']} (the allowed difference for "
                       f"{env['name'].lower()}). An alloy whose whole bar sits in the "
                       "shading is acceptable joined to it.")
    groups = {}
    for r in rows:
        role, role_text, verdict = "other", "", None
        if r["id"] == centre:
            role, role_text = ("cathode", "your cathode") if partner else ("mine", "your alloy")
        elif r["id"] == partner:
            role, role_text = "anode", "your anode"
        if centre and r["id"] != centre:
            cls = VERDICT_CLASS[couple(r["id"], centre, environment)["compatibility"]]
            verdict = {"class": cls, "label": verdicts.label(cls)}
        groups.setdefault(fam[r["id"]], []).append({
            "key": r["id"], "label": r["label"], "fastener": fast[r["id"]],
            "role": role, "role_text": role_text, "verdict": verdict,
            "x0": pct(r["E_active_V"]), "x1": pct(r["E_noble_V"]),
            "range": f"{_v(r['E_active_V'])} to {_v(r['E_noble_V'])}",
        })
    mine = {centre, partner} - {None}
    order = [name for name, _ in alloys.FAMILY_GROUPS] + ["Other metals"]
    out = []
    for name in sorted(groups, key=lambda g: (not any(x["key"] in mine for x in groups[g]),
                                              order.index(g))):
        members = sorted(groups[name], key=lambda x: (x["role"] == "other", x["label"]))
        out.append({"name": name, "rows": members,
                    "open": any(x["key"] in mine for x in members) or not mine and not out})
    return {
        "title": "Your alloys among the families" if mine else "Alloy families",
        "groups": out, "window": window, "window_text": window_text, "filters": filters,
        "axis": (f"Each bar is an alloy's range of corrosion potential on one scale, from "
                 f"{_v(lo)} at the left (more active: corrodes) to {_v(hi)} at the right "
                 f"(more noble), vs {ref_label}."),
        "citation": "Potential ranges: ASTM G82, Fig. 1 (flowing seawater), unless a row's "
                    "source says otherwise; allowed differences: common practice.",
    }


def compute_series(environment, reference, alloy_a=None, alloy_b=None):
    env = alloys.environment(environment)
    ref_label = _ref_short(reference)
    rows = ordered_series(environment, reference)
    highlight = [a for a in (alloy_a, alloy_b) if a]
    centre = partner = None
    if alloy_a and alloy_b and alloy_a != alloy_b:
        c = couple(alloy_a, alloy_b, environment)
        if c["cathode"] not in (OVERLAP, NONE):
            centre, partner = c["cathode"], c["anode"]
        else:
            centre, partner = alloy_a, alloy_b
    elif highlight:
        centre = highlight[0]
    by_id = {r["id"]: r for r in rows}
    rep = Report()
    if centre and partner:
        rep.headline(f"{by_id[partner]['label']} is the more active of your two alloys "
                     f"({env['name'].lower()}); {by_id[centre]['label']} is the cathode.")
    elif centre:
        rep.headline(f"{by_id[centre]['label']} among {len(rows)} alloys, and which of "
                     f"them it can be joined to ({env['name'].lower()}).")
    else:
        rep.headline(f"{len(rows)} alloys in {len(alloys.FAMILY_GROUPS)} families, potentials vs "
                     f"{_ref_name(reference)}: enter your alloys to see what they can be "
                     "joined to.")
    rep.para("Each bar spans the range of corrosion potentials the alloy shows in "
             "flowing seawater. Of two joined alloys, the one further left is the anode "
             "and corrodes; the further apart the bars, the stronger the drive.")
    for w in alloys.applicability(environment):
        rep.warn(w)
    if reference != alloys.SERIES_REF:
        rep.note(f"Potentials converted from SCE to {_ref_name(reference)} at 25 °C: "
                 f"E(vs {ref_label}) = E(vs SCE) + E(SCE) − E({ref_label}).")
    rep.view(series_view(rows, environment, reference, centre, partner))
    fam = {r["id"]: alloys.family_group(r["family"]) for r in alloys.alloy_table()}
    listed = sorted(rows, key=lambda r: ([g for g, _ in alloys.FAMILY_GROUPS].index(fam[r["id"]])
                                         if fam[r["id"]] != "Other metals" else 99, r["name"],
                                         r["state"]))
    rep.table(f"Potential ranges by family (V vs {ref_label})",
              ["Alloy", "Family", "UNS", f"Range, V vs {ref_label}", "Confidence"],
              [[r["name"] + (f", {r['state']}" if r["state"] in ("passive", "active") else ""),
                fam[r["id"]], r["uns"] or "—",
                f"{_v(r['E_active_V'])} to {_v(r['E_noble_V'])}", r["confidence"]]
               for r in listed],
              note="Source: ASTM G82 Fig. 1 (flowing seawater) unless the row says "
                   "otherwise. Stainless steels have two rows: passive and active.",
              filterable=True, key="alloys",
              sources=[r["source"] for r in listed])
    rep.row("Environment", env["name"],
            "input: the ranges are those measured in flowing seawater (ASTM G82, Fig. 1); "
            + env["series_applicability"], key="environment")
    if centre and partner:
        rep.link("Check this pair", "pair.html",
                 {"alloy_a": by_id[alloy_a]["label"], "alloy_b": by_id[alloy_b]["label"],
                  "environment": environment})
    missing = [r["label"] for r in rows if r["confidence"] == "from-memory"]
    if missing:
        rep.warn("Ranges not confirmed against a published source (from memory): "
                 + "; ".join(missing) + ".")
    return {
        "environment": environment, "reference": reference,
        "alloys": [{k: r[k] for k in ("id", "name", "uns", "state", "E_noble_V",
                                      "E_active_V", "source", "confidence")}
                   for r in rows],
        "highlight": highlight,
        "applicability": alloys.applicability(environment),
        "display": rep.to_dict(),
    }


def _apply_state(alloy_id, state, field):
    """The row id for the requested surface state (``auto`` keeps the id as typed)."""
    if state in (None, "", "auto"):
        return alloy_id
    row = alloys.alloy(alloy_id)
    if row["state"] == "n/a":
        return alloy_id
    return alloys.resolve_alloy(row["uns"] or alloy_id, field, state=state)


def classify(dE_min, dE_max, allowed):
    """Compatibility class for a ΔE range against the allowed difference [V]."""
    tol = 1e-9
    if dE_max <= allowed + tol:
        return COMPATIBLE
    if dE_min <= allowed + tol:
        return MARGINAL
    return INCOMPATIBLE


def couple(alloy_a, alloy_b, environment="seawater_flowing"):
    """Anode, cathode and ΔE range of two alloys in an environment [V].

    Returns
    -------
    dict
        ``anode``, ``cathode`` (ids, ``"overlap"`` or ``"none"``),
        ``likely_anode`` (the lower mid-range, or None), ``delta_E_V_min``,
        ``delta_E_V_max``, ``delta_E_V_mid``, ``allowed_delta_E_V``,
        ``compatibility``.

    Example
    -------
    >>> couple("S31600", "zinc")["anode"]
    'zinc'
    """
    ra, rb = alloys.alloy(alloy_a), alloys.alloy(alloy_b)
    env = alloys.environment(environment)
    hi_a, lo_a = alloys.potential_range(ra["id"], environment)
    hi_b, lo_b = alloys.potential_range(rb["id"], environment)
    mid_a, mid_b = 0.5 * (hi_a + lo_a), 0.5 * (hi_b + lo_b)
    if ra["id"] == rb["id"]:
        anode = cathode = NONE
        likely = None
        d_min = d_max = 0.0
    elif lo_a >= hi_b:
        anode, cathode, likely = rb["id"], ra["id"], rb["id"]
        d_min, d_max = lo_a - hi_b, hi_a - lo_b
    elif lo_b >= hi_a:
        anode, cathode, likely = ra["id"], rb["id"], ra["id"]
        d_min, d_max = lo_b - hi_a, hi_b - lo_a
    else:
        anode = cathode = OVERLAP
        likely = None if abs(mid_a - mid_b) < 1e-9 else (ra["id"] if mid_a < mid_b
                                                          else rb["id"])
        d_min, d_max = 0.0, max(hi_a - lo_b, hi_b - lo_a)
    allowed = env["allowed_delta_V"]
    return {"anode": anode, "cathode": cathode, "likely_anode": likely,
            "delta_E_V_min": d_min, "delta_E_V_max": d_max,
            "delta_E_V_mid": abs(mid_a - mid_b) if ra["id"] != rb["id"] else 0.0,
            "allowed_delta_E_V": allowed,
            "compatibility": classify(d_min, d_max, allowed),
            "range_a_V_SCE": (hi_a, lo_a), "range_b_V_SCE": (hi_b, lo_b)}


EXPLAIN = {
    COMPATIBLE: "Even in the worst case the potential difference is within the "
                "{allowed} commonly allowed {where}.",
    MARGINAL: "The difference is within the {allowed} commonly allowed {where} only if "
              "the two alloys sit near the favourable ends of their ranges; in the worst "
              "case it exceeds it.",
    INCOMPATIBLE: "Even in the best case the potential difference exceeds the {allowed} "
                  "commonly allowed {where}.",
}


def compute_pair(alloy_a, alloy_b, environment, state_a=None, state_b=None):
    alloy_a = _apply_state(alloy_a, state_a, "state_a")
    alloy_b = _apply_state(alloy_b, state_b, "state_b")
    ra, rb = alloys.alloy(alloy_a), alloys.alloy(alloy_b)
    env = alloys.environment(environment)
    c = couple(alloy_a, alloy_b, environment)
    la, lb = alloys._label(ra), alloys._label(rb)
    d_min, d_max, allowed = c["delta_E_V_min"], c["delta_E_V_max"], c["allowed_delta_E_V"]
    cls = c["compatibility"]
    where = f"for {env['name'].lower()}"
    rep = Report()
    for st, row in ((state_a, ra), (state_b, rb)):
        if st in ("passive", "active") and row["state"] == "n/a":
            rep.note(f"{alloys.alloy_label(row)} has no passive/active distinction in "
                     f"the series; the state '{st}' does not change its range.")
    if c["anode"] == NONE:
        rep.headline(f"{la} against itself: no galvanic couple (ΔE = 0 V).")
        rep.para("The same alloy in the same state on both sides drives no galvanic "
                 "current. Differences in surface state (passive against active), "
                 "oxygen supply or crevices can still make a cell: set one side's "
                 "state to active to see that case.")
    elif c["anode"] == OVERLAP:
        rep.headline(f"The ranges of {la} and {lb} overlap: either may be the anode; "
                     f"ΔE is 0 to {units.fmt(d_max, 'V', 2)}.")
        likely = c["likely_anode"]
        text = ("Their seawater potential ranges overlap, so the series cannot say which "
                "one corrodes: it depends on the surface condition of each piece. ")
        if likely:
            other = lb if likely == ra["id"] else la
            text += (f"On mid-range values {alloys._label(alloys.alloy(likely))} is "
                     f"slightly more active than {other} "
                     f"(by {units.fmt(c['delta_E_V_mid'], 'V', 2)}).")
        rep.para(text)
    else:
        an, ca = alloys.alloy(c["anode"]), alloys.alloy(c["cathode"])
        rep.headline(f"{alloys._label(an)} is the anode and corrodes faster; "
                     f"{alloys._label(ca)} is the cathode. ΔE = "
                     f"{units.fmt(d_min, '', 2)} to {units.fmt(d_max, 'V', 2)}.")
        rep.summary(f"ΔE {units.fmt(d_min, '', 2)} to {units.fmt(d_max, 'V', 2)}; "
                    f"{an['name']} corrodes")
        rep.para(f"{alloys._label(an)} sits lower in the galvanic series "
                 f"({_v(alloys.potential_range(an['id'], environment)[1])} to "
                 f"{_v(alloys.potential_range(an['id'], environment)[0])} vs SCE) than "
                 f"{alloys._label(ca)}: joined in an electrolyte it gives up electrons "
                 f"and corrodes faster than it would alone, while {alloys._label(ca)} "
                 "is protected.")
    allowed_txt = units.fmt(allowed, "V", 2)
    rep.verdict(VERDICT_CLASS[cls], EXPLAIN[cls].format(allowed=allowed_txt, where=where))
    rep.para("A potential difference tells the direction and the drive, not the rate: a "
             "small anode on a large cathode (a steel bolt in a stainless plate) "
             "corrodes fast; a large anode with a small cathode barely notices.")
    for w in alloys.applicability(environment):
        rep.warn(w)
    for row in (ra, rb) if ra["id"] != rb["id"] else (ra,):
        if row["confidence"] == "from-memory":
            rep.warn(f"The range for {alloys._label(row)} is not confirmed against a "
                     f"published source: {row['locator']}.")
        if (row["state"] == "passive" and env["id"] != "seawater_flowing"
                and alloys.sibling(row["id"], "active")):
            rep.warn(f"{alloys._label(row)} may lose passivity in crevices, under "
                     "deposits or in still, oxygen-poor water; then it behaves like its "
                     "active row. Set its state to active to check that case.")
        if row["id"] == "galvanized_steel":
            rep.note("Galvanized steel is represented by its zinc coating; once the zinc "
                     "is consumed locally the exposed steel follows the carbon-steel row.")
    sources = {"alloy_a": alloys.cite_potential(ra), "alloy_b": alloys.cite_potential(rb),
               "allowed": alloys.cite_allowed(env)}
    for key, row in (("a", ra), ("b", rb)):
        hi, lo = alloys.potential_range(row["id"], environment)
        rep.row(f"{alloys._label(row)}, range vs SCE", f"{_v(lo)} to {_v(hi)}",
                alloys.cite_potential(row), key=f"range_{key}")
    rep.row("ΔE best case (closest ends)", units.fmt(d_min, "V", 2),
            "computed: ΔE_min = E_active(cathode) − E_noble(anode), 0 when the ranges "
            "overlap", key="delta_E_V_min")
    rep.row("ΔE worst case (farthest ends)", units.fmt(d_max, "V", 2),
            "computed: ΔE_max = E_noble(cathode) − E_active(anode)", key="delta_E_V_max")
    rep.row(f"Allowed ΔE, {env['name'].lower()}", allowed_txt, sources["allowed"],
            key="allowed_delta_E_V")
    ai_a, ai_b = ra.get("anodic_index_V"), rb.get("anodic_index_V")
    ai_diff = None
    if ai_a is not None and ai_b is not None:
        ai_diff = abs(ai_a - ai_b)
        rep.row("Anodic-index difference (cross-check)", units.fmt(ai_diff, "V", 2),
                alloys.cite_anodic_index(ra))
    elif ai_a is not None or ai_b is not None:
        # One side has a sourced index and the other none: say so rather than
        # dropping the cross-check without a word.
        missing = ra if ai_a is None else rb
        rep.note(f"No anodic-index cross-check: {alloys._label(missing)} has no "
                 "sourced anodic index in the tables.")
    rows = [r for r in ordered_series(environment) if r["id"] in (ra["id"], rb["id"])]
    if c["anode"] not in (NONE, OVERLAP):
        centre, partner = c["cathode"], c["anode"]
    else:
        centre, partner = ra["id"], (rb["id"] if rb["id"] != ra["id"] else None)
    view = series_view(rows, environment, "sce", centre, partner, filters=False)
    view["title"] = "The pair on one potential scale"
    rep.view(view)
    env_id = env["id"]
    # The rate pages list their own environments: the link names the one this opens.
    cell_env = cell_data.resolve_environment(env_id)
    rep.link(f"Fastener check: {la} fasteners in {lb}", "fastener.html",
             {"fastener": la, "plate": lb, "environment": cell_env})
    if ra["id"] != rb["id"]:
        rep.link(f"Fastener check: {lb} fasteners in {la}", "fastener.html",
                 {"fastener": lb, "plate": la, "environment": cell_env})
    rep.link(f"Joint check: {la} joined to {lb} (pipe on a bracket, plate on plate)",
             "joint.html", {"first": la, "second": lb, "environment": cell_env})
    coated = alloys.alloy(c["anode"]) if c["anode"] not in (NONE, OVERLAP) else ra
    other = rb if coated["id"] == ra["id"] else ra
    rep.link(f"Coating holidays: coated {alloys._label(coated)} next to "
             f"{alloys._label(other)}", "holiday.html",
             {"coated": alloys._label(coated), "other": alloys._label(other),
              "environment": cell_env})
    rep.link("See both among the alloy families", "series.html",
             {"alloy_a": la, "alloy_b": lb, "environment": env_id})
    return {
        "alloy_a": ra["id"], "alloy_b": rb["id"], "environment": env["id"],
        "anode": c["anode"], "cathode": c["cathode"], "likely_anode": c["likely_anode"],
        "delta_E_V_min": d_min, "delta_E_V_max": d_max, "delta_E_V_mid": c["delta_E_V_mid"],
        "allowed_delta_E_V": allowed, "compatibility": cls,
        "compatibility_explanation": EXPLAIN[cls].format(allowed=allowed_txt, where=where),
        "range_a_V_SCE": list(c["range_a_V_SCE"]), "range_b_V_SCE": list(c["range_b_V_SCE"]),
        "anodic_index_difference_V": ai_diff,
        "sources": sources,
        "applicability": alloys.applicability(environment),
        "display": rep.to_dict(),
    }


CALCULATORS = [
    Calculator(
        name="series",
        title="Galvanic series",
        summary="Engineering alloys ranked by corrosion potential in seawater.",
        intro=("The galvanic series ranks alloys by the potential they take up in "
               "seawater. Of two joined alloys, the lower one corrodes. Pick two to "
               "highlight them, and any reference scale to read the potentials on."),
        fields=[
            alloys.environment_field(),
            reference_field("reference", "Potentials against", "sce"),
            alloys.alloy_field("alloy_a", "Highlight alloy A", "", optional=True),
            alloys.alloy_field("alloy_b", "Highlight alloy B", "", optional=True),
        ],
        compute=compute_series,
        example={"environment": "seawater_flowing", "reference": "sce",
                 "alloy_a": "316 stainless", "alloy_b": "aluminium 5083"},
    ),
    Calculator(
        name="pair",
        title="Alloy pair check",
        summary="Which of two joined alloys corrodes, and whether the pair is acceptable.",
        intro=("Two alloys in electrical contact and wetted by the same electrolyte form "
               "a cell. Enter both (generic name or UNS number) and the environment: "
               "the page names the anode, the potential difference and a verdict."),
        fields=[
            alloys.alloy_field("alloy_a", "Alloy A", "S31600"),
            alloys.state_field("state_a", "Surface state of A"),
            alloys.alloy_field("alloy_b", "Alloy B", "A95083"),
            alloys.state_field("state_b", "Surface state of B"),
            alloys.environment_field(),
        ],
        compute=compute_pair,
        example={"alloy_a": "316 stainless", "state_a": "auto",
                 "alloy_b": "aluminium 5083", "state_b": "auto",
                 "environment": "marine_splash"},
    ),
]
