"""Fastener-versus-plate check: which member corrodes, how fast, what instead.

Sign convention: potentials are free-corrosion potentials in volts against a
saturated calomel electrode (``_V_SCE``), ranges as in :mod:`noblegap.materials`
(``E_noble ≥ E_active``). The *anode* is the member of lower potential; ΔV =
E(cathode) − E(anode) ≥ 0. Currents and current densities are magnitudes;
areas are effective wetted areas in m² named by role (``A_anode_m2``,
``A_cathode_m2``).

Method ``catchment`` (default): the cathode reaction is oxygen reduction at the
environment's diffusion-limited current density i_L, so each member collects
i_L per m² of effective area and the anode dissolves at

    i_a = i_L · (A_c + A_a) / A_a           (:func:`noblegap.faraday.catchment_current_density`)

— the galvanic part i_L·A_c/A_a is what the couple adds. Method ``mixed``
solves the couple potential of the two polarization curves
(:mod:`noblegap.kinetics`) with the anode at the active end and the cathode at
the noble end of their ranges (the worst case); it needs sourced rows in
``data/kinetics.csv`` and says so when they are missing.

Effective areas: in immersion the whole wetted plate area and the wetted
area of all fasteners. In an atmospheric environment the electrolyte is a thin
film, so only a band of the plate of width w around each fastener's bearing
face carries galvanic current: per exposed face an annulus
π·((r₀ + w)² − r₀²), r₀ the bearing radius (see :data:`KINDS`).

Penetration by Faraday's law (ASTM G102) from i_a, the equivalent weight and
density of the anode; years to consume the corrosion allowance; verdict by
the worst-case ΔV against the environment's allowed ΔV and by the life
against the design life.
"""

from __future__ import annotations

import math

from .. import units
from ..errors import InputError, MissingDataError
from ..materials import alloys, data
from ..methods import faraday, kinetics
from ..report import Report
from ..schema import CHOICE, INTEGER, QUANTITY, Calculator, Field
from ..svg import Svg, nice_ticks, scale

METHOD_CATCHMENT = "catchment"
METHOD_MIXED = "mixed"
METHODS = (METHOD_CATCHMENT, METHOD_MIXED)

#: Verdict classes: (id used for styling, our label, rank: higher is worse).
SOUND, WATCH, REJECT = "ok", "caution", "avoid"
VERDICT_LABEL = {SOUND: "sound", WATCH: "watch", REJECT: "reject"}
VERDICT_RANK = {SOUND: 0, WATCH: 1, REJECT: 2}

#: Default corrosion allowance as a fraction of the anode member's size.
ALLOWANCE_FRACTION = 0.10
#: Coating efficiency assumed in the mitigations (fraction of area sealed).
COATING_EFFICIENCY = 0.95

#: Fastener kinds and the approximate proportions used to estimate the wetted
#: area from the nominal diameter d (typical metric hex bolt, nut and plain
#: washer; pan-head screw; round-head solid rivet). ``faces`` is the number of
#: plate faces the fastener bears on (each gets a band in atmospheric service);
#: ``bearing_radius`` is r₀/d.
KINDS = {
    "bolt": {
        "label": "Bolt with nut and washer",
        "faces": 2,
        "bearing_radius": 1.0,
        "proportions": ("hex head across flats 1.5d, height 0.65d; nut across flats 1.5d, "
                        "height 0.8d; plain washer outside diameter 2d, thickness 0.2d, "
                        "under the nut; thread end protruding 1d beyond the nut"),
    },
    "screw": {
        "label": "Screw (head side wetted)",
        "faces": 1,
        "bearing_radius": 0.9,
        "proportions": ("pan head diameter 1.8d, height 0.6d; only the head side is wetted "
                        "(the point is buried or on a dry side)"),
    },
    "rivet": {
        "label": "Rivet (both heads wetted)",
        "faces": 2,
        "bearing_radius": 0.875,
        "proportions": "round (domed) heads of diameter 1.75d and height 0.6d on both faces",
    },
}


def fastener_area_estimate_m2(kind, diameter_m):
    """Approximate wetted area of one fastener from its nominal diameter.

    Bolt (hex head + nut + washer + thread end), with s = 1.5d:
        head: 0.866·s² (top) + 6·(s/√3)·0.65d (flanks)
        nut:  0.866·s² − π d²/4 (top) + 6·(s/√3)·0.8d (flanks)
        washer: π(2d)²/4 − 0.866·s² (ring outside the nut) + π·2d·0.2d (rim)
        thread end: π·d·d + π d²/4
      ≈ 17.0·d²
    Screw (pan head 1.8d × 0.6d): π(1.8d)²/4 + π·1.8d·0.6d ≈ 5.9·d²
    Rivet (two spherical-cap heads, base radius 0.875d, height 0.6d):
        2·π·(0.875² + 0.6²)·d² ≈ 7.1·d²

    Parameters
    ----------
    kind : str
        A key of :data:`KINDS`.
    diameter_m : float
        Nominal diameter [m], > 0.

    Returns
    -------
    float
        Wetted area of one fastener [m²] (an approximation; enter the real
        area when known).

    >>> round(fastener_area_estimate_m2("bolt", 0.010) * 1e6)   # mm²
    1703
    """
    d = diameter_m
    if kind == "bolt":
        s = 1.5 * d
        hexa = 0.866 * s * s
        flank = 6 * (s / math.sqrt(3))
        head = hexa + flank * 0.65 * d
        nut = hexa - math.pi * d * d / 4 + flank * 0.8 * d
        washer = math.pi * (2 * d) ** 2 / 4 - hexa + math.pi * 2 * d * 0.2 * d
        stub = math.pi * d * d + math.pi * d * d / 4
        return head + nut + washer + stub
    if kind == "screw":
        D = 1.8 * d
        return math.pi * D * D / 4 + math.pi * D * 0.6 * d
    if kind == "rivet":
        return 2 * math.pi * ((0.875 * d) ** 2 + (0.6 * d) ** 2)
    raise InputError(f"Unknown fastener kind {kind!r}.", field="fastener_kind", value=kind,
                     allowed=", ".join(KINDS))


def band_area_m2(kind, diameter_m, band_width_m):
    """Plate area within ``band_width_m`` of one fastener's bearing faces [m²].

    faces · π·((r₀ + w)² − r₀²), r₀ = bearing_radius·d.
    """
    k = KINDS[kind]
    r0 = k["bearing_radius"] * diameter_m
    return k["faces"] * math.pi * ((r0 + band_width_m) ** 2 - r0 ** 2)


# --------------------------------------------------------------------------
# The couple: ranges, ΔV, anode/cathode cases
# --------------------------------------------------------------------------

def potential_cases(fastener_id, plate_id, env_id):
    """Anode/cathode cases from the galvanic-series ranges.

    Returns
    -------
    dict
        ``ranges`` {role: (E_noble, E_active)}, ``delta_E_V_min``,
        ``delta_E_V_max`` (worst case over every possible anode), ``overlap``
        (bool), ``cases``: list of {anode_role, cathode_role, dE_max_V} — one
        case when the ranges are apart, two when they overlap, none for the
        same alloy.
    """
    rf = alloys.potential_range(fastener_id, env_id)
    rp = alloys.potential_range(plate_id, env_id)
    ranges = {"fastener": rf, "plate": rp}
    if fastener_id == plate_id or rf == rp:
        # the same alloy, or two alloys the series cannot tell apart (one group)
        return {"ranges": ranges, "delta_E_V_min": 0.0, "delta_E_V_max": 0.0,
                "overlap": True, "cases": [], "same": True,
                "same_group": fastener_id != plate_id}
    (fn, fa), (pn, pa) = rf, rp
    cases = []
    # plate as anode: worst-case ΔV = fastener noble end − plate active end
    if pa < fn:
        cases.append({"anode_role": "plate", "cathode_role": "fastener", "dE_max_V": fn - pa,
                      "E_anode_V": pa, "E_cathode_V": fn})
    if fa < pn:
        cases.append({"anode_role": "fastener", "cathode_role": "plate", "dE_max_V": pn - fa,
                      "E_anode_V": fa, "E_cathode_V": pn})
    overlap = not (fn < pa or pn < fa)
    if overlap:
        dmin = 0.0
    elif fn < pa:   # fastener wholly below the plate
        dmin = pa - fn
        cases = [c for c in cases if c["anode_role"] == "fastener"]
    else:
        dmin = fa - pn
        cases = [c for c in cases if c["anode_role"] == "plate"]
    dmax = max((c["dE_max_V"] for c in cases), default=0.0)
    return {"ranges": ranges, "delta_E_V_min": dmin, "delta_E_V_max": dmax,
            "overlap": overlap, "cases": cases, "same": False, "same_group": False}


def _anode_props(row, role):
    """Density and EW of an anode row, or MissingDataError naming the column."""
    missing = [c for c in ("density_g_cm3", "equivalent_weight_g_mol") if row.get(c) is None]
    if missing:
        raise MissingDataError(
            f"No {' or '.join(missing)} for {row['name']} ({row['id']}) in data/alloys.csv, "
            "so its penetration rate cannot be computed.", field=role, value=row["id"],
            allowed="an alloy with a density and an equivalent weight")
    return row["density_g_cm3"], row["equivalent_weight_g_mol"]


def couple_current(method, anode_id, cathode_id, env_id, i_L, A_anode_m2, A_cathode_m2,
                   E_anode_V, E_cathode_V):
    """Anode current densities for one anode/cathode case.

    Returns
    -------
    dict
        ``i_anode_A_m2`` (total dissolution on the anode), ``i_galvanic_A_m2``
        (the couple's part, galvanic current / A_a), ``i_own_A_m2`` (the
        anode's uncoupled rate in the same model), ``galvanic_current_A``,
        ``E_couple_V`` (mixed only, else None), ``kinetics`` (rows used).
    """
    if method == METHOD_CATCHMENT:
        i_a = faraday.catchment_current_density(i_L, A_cathode_m2, A_anode_m2)
        I_g = faraday.galvanic_current_A(i_L, A_cathode_m2)
        return {"i_anode_A_m2": i_a, "i_galvanic_A_m2": I_g / A_anode_m2, "i_own_A_m2": i_L,
                "galvanic_current_A": I_g, "E_couple_V": None, "kinetics": None}
    ea, row_a = kinetics.electrode_from_data(anode_id, env_id, i_L, A_anode_m2, E_anode_V)
    ec, row_c = kinetics.electrode_from_data(cathode_id, env_id, i_L, A_cathode_m2,
                                             E_cathode_V)
    sol = kinetics.solve_couple([ea, ec])
    i_net_a = max(sol.net_A_m2[0], 0.0)
    return {"i_anode_A_m2": sol.anodic_A_m2[0], "i_galvanic_A_m2": i_net_a,
            "i_own_A_m2": ea.i_corr_A_m2, "galvanic_current_A": i_net_a * A_anode_m2,
            "E_couple_V": sol.E_couple_V,
            "kinetics": {"anode": row_a, "cathode": row_c, "electrodes": (ea, ec),
                         "solution": sol}}


def _life(allowance_m, i_A_m2, rho, EW):
    mm_yr = faraday.penetration_mm_per_yr(i_A_m2, EW, rho)
    return mm_yr, faraday.years_to_consume(allowance_m, mm_yr / 1000.0)


def judge(dE_max_V, allowed_V, life_total, life_galvanic, design_life_yr, isolated=False):
    """Verdict class and one-line reason, on the couple's (galvanic) attack.

    sound  — worst-case ΔV within the allowed ΔV and the galvanic attack
             leaves the allowance for the design life (or no galvanic path);
    reject — ΔV beyond the allowed ΔV and the galvanic attack consumes the
             allowance within the design life;
    watch  — one of the two fails: ΔV beyond the limit but an area ratio that
             spreads the attack, or ΔV within the limit but a catchment bound
             (pessimistic for a passive anode) that is short.

    The anode's own corrosion is not a galvanic effect (the same alloy on
    both sides is "sound" however fast it corrodes); when it alone would use
    the allowance within the design life the reason says so.
    """
    def lasts(life):
        return life.status != faraday.LIFE_FINITE or life.years >= design_life_yr

    own = ("" if lasts(life_total) else
           f"; the anode's total loss including its own corrosion uses the allowance in "
           f"{life_total.text} — check that separately")
    if isolated:
        return SOUND, "no galvanic current once the metallic path is broken" + own
    dv_ok = dE_max_V <= allowed_V + 1e-12
    g_ok = lasts(life_galvanic)
    if dv_ok and g_ok:
        return SOUND, (f"worst-case ΔV {dE_max_V:.2f} V is within the {allowed_V:.2f} V "
                       f"allowed here and the couple's attack needs {life_galvanic.text} to "
                       "use the allowance" + own)
    if not dv_ok and not g_ok:
        return REJECT, (f"ΔV up to {dE_max_V:.2f} V exceeds the {allowed_V:.2f} V allowed, "
                        f"and the galvanic attack alone consumes the allowance in "
                        f"{life_galvanic.text} (design life {design_life_yr:g} years)")
    if not dv_ok:
        return WATCH, (f"ΔV up to {dE_max_V:.2f} V exceeds the {allowed_V:.2f} V allowed, "
                       f"but the area ratio spreads the attack: the couple alone needs "
                       f"{life_galvanic.text} to use the allowance" + own)
    return WATCH, (f"ΔV {dE_max_V:.2f} V is within the {allowed_V:.2f} V allowed; the "
                   f"catchment bound ({life_galvanic.text} to use the allowance) assumes "
                   "an active anode and is pessimistic for a passive one — inspect")


def evaluate(fastener_id, plate_id, env_id, *, kind, diameter_m, count, plate_area_m2,
             thickness_m, design_life_yr, method=METHOD_CATCHMENT, fastener_area_m2=None,
             band_width_m=None, allowance_m=None, coat_cathode=0.0, coat_anode=0.0,
             isolated=False):
    """Evaluate one fastener/plate pair (SI floats in, a plain dict out).

    ``coat_cathode`` / ``coat_anode`` are coating efficiencies (fraction of
    the member's wetted area sealed); ``isolated`` removes the metallic path.
    The returned dict holds the governing (worst) case at top level and every
    possible-anode case in ``cases``.
    """
    env = alloys.environment(env_id)
    f_row, p_row = alloys.alloy(fastener_id), alloys.alloy(plate_id)
    pc = potential_cases(fastener_id, plate_id, env_id)
    i_L = env["i_limit_A_m2"]
    if i_L is None:
        raise MissingDataError(f"No oxygen limiting current density for {env['name']} in "
                               "data/environments.csv.", field="environment", value=env_id)
    atmospheric = env["kind"] == "atmospheric"
    a_one = fastener_area_m2 if fastener_area_m2 is not None else \
        fastener_area_estimate_m2(kind, diameter_m)
    A_fast = count * a_one
    if atmospheric:
        w = band_width_m if band_width_m is not None else (env["band_width_mm"] or 0) / 1000.0
        if w <= 0:
            raise MissingDataError(f"No band width for {env['name']} in data/environments.csv; "
                                   "enter one.", field="band_width", value="")
        band = count * band_area_m2(kind, diameter_m, w)
        A_plate = min(plate_area_m2, band)
    else:
        w, band = None, None
        A_plate = plate_area_m2
    areas = {"fastener": A_fast, "plate": A_plate}
    rows = {"fastener": f_row, "plate": p_row}
    allowed = env["allowed_delta_V"]

    results = []
    for c in pc["cases"]:
        ar, cr = c["anode_role"], c["cathode_role"]
        rho, EW = _anode_props(rows[ar], ar)
        A_a = areas[ar] * (1.0 - coat_anode)
        A_c = 0.0 if isolated else areas[cr] * (1.0 - coat_cathode)
        if A_a <= 0:
            raise InputError("The anode has no exposed area left.", field="coating",
                             value=coat_anode, allowed="a coating efficiency below 1")
        cur = couple_current(method, rows[ar]["id"], rows[cr]["id"], env_id, i_L, A_a, A_c,
                             c["E_anode_V"], c["E_cathode_V"])
        if isolated:
            cur["i_anode_A_m2"] = cur["i_own_A_m2"]
            cur["i_galvanic_A_m2"] = 0.0
            cur["galvanic_current_A"] = 0.0
        if allowance_m is not None:
            allow, allow_default = allowance_m, None
        elif ar == "fastener":
            allow, allow_default = ALLOWANCE_FRACTION * diameter_m, "10 % of the fastener diameter"
        else:
            allow, allow_default = ALLOWANCE_FRACTION * thickness_m, "10 % of the plate thickness"
        mm_yr, life = _life(allow, cur["i_anode_A_m2"], rho, EW)
        g_mm_yr, g_life = _life(allow, cur["i_galvanic_A_m2"], rho, EW)
        o_mm_yr, _ = _life(allow, cur["i_own_A_m2"], rho, EW)
        cls, reason = judge(c["dE_max_V"], allowed, life, g_life, design_life_yr, isolated)
        results.append({
            "anode_role": ar, "cathode_role": cr, "anode": rows[ar]["id"],
            "cathode": rows[cr]["id"], "dE_max_V": c["dE_max_V"],
            "E_anode_V_SCE": c["E_anode_V"], "E_cathode_V_SCE": c["E_cathode_V"],
            "A_anode_m2": A_a, "A_cathode_m2": A_c,
            "area_ratio": A_c / A_a,
            "anode_current_density_A_m2": cur["i_anode_A_m2"],
            "galvanic_current_density_A_m2": cur["i_galvanic_A_m2"],
            "own_current_density_A_m2": cur["i_own_A_m2"],
            "galvanic_current_A": cur["galvanic_current_A"],
            "E_couple_V_SCE": cur["E_couple_V"],
            "penetration_mm_per_yr": mm_yr, "penetration_mpy": faraday.mm_per_yr_to_mpy(mm_yr),
            "galvanic_penetration_mm_per_yr": g_mm_yr, "own_penetration_mm_per_yr": o_mm_yr,
            "allowance_m": allow, "allowance_default": allow_default,
            "years_to_allowance": life.years, "life_status": life.status,
            "life_text": life.text, "galvanic_years": g_life.years,
            "galvanic_life_text": g_life.text,
            "verdict": cls, "reason": reason, "_kinetics": cur["kinetics"],
        })
    if results:
        gov = max(results, key=lambda r: (VERDICT_RANK[r["verdict"]],
                                          r["galvanic_penetration_mm_per_yr"]))
    else:
        gov = None
    return {"env": env, "rows": rows, "pc": pc, "areas": areas, "A_fastener_one_m2": a_one,
            "band_width_m": w, "band_area_m2": band, "atmospheric": atmospheric,
            "i_L": i_L, "allowed": allowed, "cases": results, "governing": gov,
            "method": method}


def _verdict_of(ev, design_life_yr):
    gov = ev["governing"]
    if gov is None:
        if ev["pc"].get("same_group"):
            return SOUND, ("both alloys sit in the same galvanic-series group: no "
                           "predictable potential difference, no galvanic attack expected")
        return SOUND, "same alloy on both sides: no potential difference, no galvanic attack"
    return gov["verdict"], gov["reason"]


# --------------------------------------------------------------------------
# Alternatives and mitigations
# --------------------------------------------------------------------------

def alternatives(plate_id, env_id, geometry, current_fastener=None, limit=5):
    """Every fastener alloy re-evaluated against the plate; ranked best first.

    Ranked by verdict class, then the galvanic penetration rate of the
    governing anode, then the worst-case ΔV. With method ``mixed`` an alloy
    without kinetics data is evaluated by the catchment rule and flagged.
    """
    out = []
    for fid in alloys.fastener_alloys():
        g = dict(geometry)
        fallback = False
        try:
            ev = evaluate(fid, plate_id, env_id, **g)
        except MissingDataError:
            if g.get("method") != METHOD_MIXED:
                continue
            g["method"] = METHOD_CATCHMENT
            fallback = True
            try:
                ev = evaluate(fid, plate_id, env_id, **g)
            except MissingDataError:
                continue
        cls, reason = _verdict_of(ev, geometry["design_life_yr"])
        gov = ev["governing"]
        row = alloys.alloy(fid)
        out.append({
            "fastener": fid, "name": row["name"], "uns": row["uns"],
            "verdict": VERDICT_LABEL[cls], "verdict_class": cls, "reason": reason,
            "anode": gov["anode"] if gov else None,
            "delta_E_V_max": ev["pc"]["delta_E_V_max"],
            "penetration_mm_per_yr": gov["penetration_mm_per_yr"] if gov else 0.0,
            "galvanic_penetration_mm_per_yr": gov["galvanic_penetration_mm_per_yr"] if gov else 0.0,
            "years_to_allowance": gov["years_to_allowance"] if gov else None,
            "life_text": gov["life_text"] if gov else "no galvanic attack",
            "galvanic_life_text": gov["galvanic_life_text"] if gov else "no galvanic attack",
            "method": g["method"], "catchment_fallback": fallback,
            "current": fid == current_fastener,
        })
    out.sort(key=lambda a: (VERDICT_RANK[a["verdict_class"]],
                            a["galvanic_penetration_mm_per_yr"], a["delta_E_V_max"]))
    return out[:limit] if limit else out


def _summary(ev):
    gov = ev["governing"]
    if gov is None:
        return {"penetration_mm_per_yr": 0.0, "galvanic_penetration_mm_per_yr": 0.0,
                "years_to_allowance": None, "life_text": "no galvanic attack",
                "galvanic_years": None, "galvanic_life_text": "no galvanic attack",
                "verdict": VERDICT_LABEL[SOUND]}
    return {"penetration_mm_per_yr": gov["penetration_mm_per_yr"],
            "galvanic_years": gov["galvanic_years"],
            "galvanic_life_text": gov["galvanic_life_text"],
            "galvanic_penetration_mm_per_yr": gov["galvanic_penetration_mm_per_yr"],
            "years_to_allowance": gov["years_to_allowance"], "life_text": gov["life_text"],
            "verdict": VERDICT_LABEL[gov["verdict"]]}


def mitigations(fastener_id, plate_id, env_id, geometry, best_alternative=None):
    """Mitigations with their computed effect on the governing anode."""
    out = []
    base = evaluate(fastener_id, plate_id, env_id, **geometry)
    gov = base["governing"]
    if gov is None:
        return out

    def add(mid, title, effect_ev, how, note=""):
        item = {"id": mid, "title": title, "how": how, "note": note}
        if effect_ev is not None:
            item.update(_summary(effect_ev))
        out.append(item)

    iso = evaluate(fastener_id, plate_id, env_id, isolated=True, **geometry)
    add("isolate", "Electrically isolate the fastener", iso,
        "Insulating washers under head and nut AND an insulating sleeve through the hole: "
        "the galvanic current is zero only if no metallic path remains (shank touching "
        "the bore, a shared earth bond, a conductive sealant or a bridging fitting).",
        "What remains is the anode's own corrosion, without the couple.")
    eff = COATING_EFFICIENCY
    cc = evaluate(fastener_id, plate_id, env_id, coat_cathode=eff, **geometry)
    add("coat_cathode", f"Coat the cathode ({gov['cathode_role']})", cc,
        f"Coating the noble member shrinks the area that collects oxygen; computed at a "
        f"coating efficiency of {eff:.0%} (common practice for a sound, inspected system).")
    cb = evaluate(fastener_id, plate_id, env_id, coat_cathode=eff, coat_anode=eff, **geometry)
    add("coat_both", "Coat both members", cb,
        f"At {eff:.0%} on both the area ratio is unchanged, so the attack at the anode's "
        "holidays is as fast as bare; the metal lost falls with the bare area. Protects "
        "while the cathode's coating is the better one.",
        "Keep the cathode's coating at least as good as the anode's.")
    ca = evaluate(fastener_id, plate_id, env_id, coat_anode=eff, **geometry)
    add("coat_anode_only", "Do NOT coat only the anode", ca,
        f"The classic mistake: at {eff:.0%} the remaining holidays on the anode collect "
        "the whole cathode's current and pit through fast. See the holiday-test page "
        "(holiday.html) to find and repair holidays.", "link: holiday.html")
    add("seal", "Seal out the electrolyte", iso,
        "Jointing compound or sealant in the faying surfaces and the hole, caps over the "
        "fastener ends: with no electrolyte bridging the members there is no galvanic "
        "cell. Effective only while the seal lasts; inspect and renew.")
    better = best_alternative is not None and best_alternative["fastener"] != fastener_id and (
        VERDICT_RANK[best_alternative["verdict_class"]] < VERDICT_RANK[gov["verdict"]] or (
            VERDICT_RANK[best_alternative["verdict_class"]] == VERDICT_RANK[gov["verdict"]]
            and best_alternative["galvanic_penetration_mm_per_yr"]
            < 0.9 * gov["galvanic_penetration_mm_per_yr"]))
    if not better:
        out.append({"id": "change_fastener", "title": "Change the fastener alloy",
                    "how": "No fastener alloy in the table does clearly better against this "
                           "plate here; isolate or seal the joint instead.", "note": ""})
    else:
        out.append({"id": "change_fastener",
                    "title": f"Change the fastener to {best_alternative['name']}",
                    "fastener": best_alternative["fastener"],
                    "how": best_alternative["reason"], "note": "",
                    "penetration_mm_per_yr": best_alternative["penetration_mm_per_yr"],
                    "galvanic_penetration_mm_per_yr":
                        best_alternative["galvanic_penetration_mm_per_yr"],
                    "years_to_allowance": best_alternative["years_to_allowance"],
                    "life_text": best_alternative["life_text"],
                    "galvanic_life_text": best_alternative["galvanic_life_text"],
                    "verdict": best_alternative["verdict"]})
    return out


# --------------------------------------------------------------------------
# Charts
# --------------------------------------------------------------------------

_FAST_FILL, _PLATE_FILL = "#3b6ea5", "#b5651d"


def _tick(v, digits=2):
    text = f"{v:.{digits}f}"
    return text[1:] if text.startswith("-") and float(text) == 0 else text


def range_chart(ev):
    """Both potential ranges on one axis, ΔV (worst case) and the allowed ΔV."""
    pc, rows = ev["pc"], ev["rows"]
    W, H = 640, 240
    svg = Svg(W, H, "Potential ranges of fastener and plate")
    (fn, fa), (pn, pa) = pc["ranges"]["fastener"], pc["ranges"]["plate"]
    lo = min(fa, pa) - 0.1
    hi = max(fn, pn) + 0.1
    gov = ev["governing"]
    if gov is not None:
        hi = max(hi, gov["E_anode_V_SCE"] + ev["allowed"] + 0.05)
    x = scale(lo, hi, 30, W - 30)
    y_axis = 190
    svg.line(30, y_axis, W - 30, y_axis, stroke="#555")
    for t in nice_ticks(lo, hi, 7):
        svg.line(x(t), y_axis, x(t), y_axis + 5, stroke="#555")
        svg.text(x(t), y_axis + 18, _tick(t), size=11, anchor="middle")
    svg.text(W / 2, y_axis + 38, "free-corrosion potential, V vs SCE "
             "(more active ← → more noble)", size=11, anchor="middle", fill="#444")
    for i, (role, (n, a), fill) in enumerate((("fastener", (fn, fa), _FAST_FILL),
                                              ("plate", (pn, pa), _PLATE_FILL))):
        yy = 50 + i * 50
        svg.rect(x(a), yy, max(x(n) - x(a), 3), 20, fill=fill, rx=3, opacity=0.85)
        mid = (x(a) + x(n)) / 2
        anchor = "start" if mid < W * 0.3 else ("end" if mid > W * 0.7 else "middle")
        lx = x(a) if anchor == "start" else (x(n) if anchor == "end" else mid)
        svg.text(lx, yy - 5, f"{role}: {rows[role]['name']}", size=11, anchor=anchor)
    if gov is not None:
        xa, xc = x(gov["E_anode_V_SCE"]), x(gov["E_cathode_V_SCE"])
        svg.line(xa, 160, xc, 160, stroke="#a11", width=2)
        svg.line(xa, 154, xa, 166, stroke="#a11", width=2)
        svg.line(xc, 154, xc, 166, stroke="#a11", width=2)
        svg.text((xa + xc) / 2, 152, f"worst-case ΔV {gov['dE_max_V']:.2f} V", size=11,
                 anchor="middle", fill="#a11", weight="bold")
        xl = x(gov["E_anode_V_SCE"] + ev["allowed"])
        svg.line(xl, 24, xl, y_axis, stroke="#2a7", width=1.5, dash="5,4")
        svg.text(xl + 4, 20, f"allowed ΔV {ev['allowed']:.2f} V above the anode's active end",
                 size=11, fill="#2a7", anchor="start" if xl < W * 0.55 else "end")
    return svg


def evans_chart(ev):
    """Polarization curves (current in A on a log axis) and the couple point."""
    gov = ev["governing"]
    kin = gov["_kinetics"]
    ea, ec = kin["electrodes"]
    sol = kin["solution"]
    lo = min(ea.E_corr_V, ec.E_corr_V) - 0.2
    hi = max(ea.E_corr_V, ec.E_corr_V) + 0.1
    n = 160
    Es = [lo + (hi - lo) * k / n for k in range(n + 1)]
    c_anode = _PLATE_FILL if gov["anode_role"] == "plate" else _FAST_FILL
    c_cath = _FAST_FILL if gov["anode_role"] == "plate" else _PLATE_FILL
    I_c = max(ea.area_m2 * ea.anodic(sol.E_couple_V), 1e-15)
    I_max = max(ea.i_limit_A_m2 * (ea.area_m2 + ec.area_m2), I_c)
    xhi = math.ceil(math.log10(I_max) + 1)
    I_min = min(e.area_m2 * e.i_corr_A_m2 for e in (ea, ec) if e.area_m2 > 0)
    xlo = math.floor(min(math.log10(I_min), math.log10(I_c)) - 1)
    curves = []
    for e, colour in ((ea, c_anode), (ec, c_cath)):
        if e.area_m2 <= 0:
            continue
        an = [(math.log10(max(e.area_m2 * e.anodic(E), 1e-300)), E) for E in Es]
        ca = [(math.log10(max(e.area_m2 * e.cathodic(E), 1e-300)), E) for E in Es]
        curves.append((an, colour, None))
        curves.append((ca, colour, "5,4"))
    W, H = 640, 340
    svg = Svg(W, H, "Polarization curves and couple point")
    x = scale(xlo, xhi, 60, W - 20)
    y = scale(lo, hi, H - 40, 60)
    svg.line(60, H - 40, W - 20, H - 40, stroke="#555")
    svg.line(60, 60, 60, H - 40, stroke="#555")
    for t in range(int(xlo), int(xhi) + 1):
        svg.line(x(t), H - 40, x(t), H - 36, stroke="#555")
        svg.text(x(t), H - 24, f"1e{t}", size=10, anchor="middle")
    for t in nice_ticks(lo, hi, 6):
        svg.text(54, y(t) + 4, _tick(t), size=10, anchor="end")
    svg.text((60 + W - 20) / 2, H - 6, "current, A (log scale)", size=11, anchor="middle")
    svg.text(8, 52, "E, V vs SCE", size=11)
    for pts, colour, dash in curves:
        seg = [(x(px), y(py)) for px, py in pts if xlo <= px <= xhi]
        if len(seg) > 1:
            svg.polyline(seg, stroke=colour, width=2, dash=dash)
    svg.circle(x(math.log10(I_c)), y(sol.E_couple_V), 5, fill="#a11")
    svg.text(x(math.log10(I_c)) - 8, y(sol.E_couple_V) - 8,
             f"couple {sol.E_couple_V:.3f} V", size=11, anchor="end", fill="#a11")
    # legend
    legend = ((c_anode, None, f"anode ({ea.name}) metal dissolution"),
              (c_anode, "5,4", f"anode ({ea.name}) oxygen reduction"),
              (c_cath, None, f"cathode ({ec.name}) metal dissolution"),
              (c_cath, "5,4", f"cathode ({ec.name}) oxygen reduction"))
    for k, (colour, dash, label) in enumerate(legend):
        lx, ly = 70 + (k % 2) * 280, 14 + (k // 2) * 18
        svg.line(lx, ly, lx + 24, ly, stroke=colour, width=2, dash=dash)
        svg.text(lx + 30, ly + 4, label, size=10)
    return svg


# --------------------------------------------------------------------------
# The calculator
# --------------------------------------------------------------------------

def _m2(v):
    return units.fmt(v * 1e4, "cm²") if v < 0.01 else units.fmt(v, "m²")


def compute_fastener(fastener, plate, environment, fastener_kind, diameter, count,
                     fastener_area, plate_area, thickness, band_width, allowance,
                     design_life, method):
    """Compute the fastener check from parsed inputs (SI floats)."""
    design_life_yr = design_life / faraday.SECONDS_PER_YEAR
    geometry = {"kind": fastener_kind, "diameter_m": diameter, "count": count,
                "plate_area_m2": plate_area, "thickness_m": thickness,
                "design_life_yr": design_life_yr, "method": method,
                "fastener_area_m2": fastener_area, "band_width_m": band_width,
                "allowance_m": allowance}
    ev = evaluate(fastener, plate, environment, **geometry)
    env, rows, pc, gov = ev["env"], ev["rows"], ev["pc"], ev["governing"]
    cls, reason = _verdict_of(ev, design_life_yr)
    rep = Report()
    fr, pr = rows["fastener"], rows["plate"]

    for w in alloys.applicability(environment):
        rep.warn(w)
    if ev["areas"]["fastener"] > plate_area:
        rep.warn("The fasteners' wetted area is larger than the plate's: check the areas "
                 "(computed as entered).")
    if band_width is not None and not ev["atmospheric"]:
        rep.note("The band width applies to atmospheric environments only; in immersion "
                 "the whole wetted plate area takes part, so it was not used.")
    if fastener_area is None:
        rep.note(f"Fastener wetted area estimated from the diameter, an approximation: "
                 f"{KINDS[fastener_kind]['proportions']}. Enter the real area if known.")
    if ev["atmospheric"]:
        rep.note(f"Thin-film electrolyte: only a {units.fmt(ev['band_width_m'] * 1000, 'mm')} "
                 "band of the plate around each fastener carries galvanic current"
                 + (" (the environment's default; change it in 'band width')."
                    if band_width is None else " (as entered).")
                 + " Rates assume the film stays wet; real joints are wet part of the time.")

    alts = alternatives(plate, environment, geometry, current_fastener=fastener)
    mits = mitigations(fastener, plate, environment, geometry,
                       best_alternative=alts[0] if alts else None)

    if gov is None:
        if pc.get("same_group"):
            rep.headline(f"{fr['name']} and {pr['name']} sit in the same galvanic-series "
                         "group: no galvanic attack expected.")
        else:
            rep.headline(f"{fr['name']} against itself: no potential difference, no "
                         "galvanic attack.")
        rep.verdict(SOUND, VERDICT_LABEL[SOUND], reason)
        rep.para("No galvanic cell forms between fastener and plate. The metal's own "
                 "corrosion in this environment is outside this check.")
    else:
        an, ca = rows[gov["anode_role"]], rows[gov["cathode_role"]]
        rep.headline(f"The {gov['anode_role']} ({an['name']}) is the anode: "
                     f"{units.fmt(gov['penetration_mm_per_yr'], 'mm/yr')} "
                     f"({units.fmt(gov['penetration_mpy'], 'mpy')}); allowance used in "
                     f"{gov['life_text']}.")
        rep.verdict(cls, VERDICT_LABEL[cls], reason)
        if pc["overlap"]:
            rep.para("The two potential ranges overlap, so either member can end up the "
                     "anode. Both cases were computed; the worse one governs.")
        rep.para(f"Cathode: the {gov['cathode_role']} ({ca['name']}) collects oxygen on "
                 f"{_m2(gov['A_cathode_m2'])}; the anode's effective area is "
                 f"{_m2(gov['A_anode_m2'])} (area ratio A_c/A_a = "
                 f"{units.fmt(gov['area_ratio'])}). "
                 + ("A small anode with a large cathode concentrates the attack."
                    if gov["area_ratio"] > 1.5 else
                    "A large anode with a small cathode spreads the attack thinly."
                    if gov["area_ratio"] < 0.67 else
                    "The two areas are comparable, so the area ratio neither helps nor "
                    "hurts much."))
        rep.para(f"Of the anode's {units.fmt(gov['penetration_mm_per_yr'], 'mm/yr')}, the "
                 f"couple adds {units.fmt(gov['galvanic_penetration_mm_per_yr'], 'mm/yr')}; "
                 f"the rest ({units.fmt(gov['own_penetration_mm_per_yr'], 'mm/yr')}) is the "
                 "anode's own corrosion in the same model.")
        if method == METHOD_CATCHMENT:
            rep.para("The catchment rule assumes oxygen reaches every wetted surface at its "
                     "limiting rate and the anode is active: an upper bound for a passive "
                     "anode (aluminium, stainless) — whose own share is then much "
                     "overstated — or for a poorly conducting electrolyte.")

    # ---- rows with sources
    rep.row("Fastener range", f"{units.fmt(pc['ranges']['fastener'][1], 'V')} to "
            f"{units.fmt(pc['ranges']['fastener'][0], 'V')} vs SCE",
            alloys.cite_potential(fr), key="fastener_range")
    rep.row("Plate range", f"{units.fmt(pc['ranges']['plate'][1], 'V')} to "
            f"{units.fmt(pc['ranges']['plate'][0], 'V')} vs SCE",
            alloys.cite_potential(pr), key="plate_range")
    rep.row("ΔV, best to worst case", f"{units.fmt(pc['delta_E_V_min'], 'V')} to "
            f"{units.fmt(pc['delta_E_V_max'], 'V')}",
            "computed: ΔV = E(cathode) − E(anode) over both ranges", key="delta_E_V")
    rep.row("Allowed ΔV here", units.fmt(ev["allowed"], "V"), alloys.cite_allowed(env),
            key="allowed_delta_E_V")
    rep.row("Oxygen limiting current density i_L", units.fmt(ev["i_L"], "A/m²"),
            data.cite(env), key="i_limit")
    rep.row("Fastener wetted area (each)", _m2(ev["A_fastener_one_m2"]),
            "as entered" if fastener_area is not None else
            f"computed (approximation): {KINDS[fastener_kind]['proportions']}",
            key="fastener_area")
    if ev["atmospheric"]:
        rep.row("Band width", units.fmt(ev["band_width_m"] * 1000, "mm"),
                "as entered" if band_width is not None else data.cite(env, "band_"),
                key="band_width")
    if gov is not None:
        an = rows[gov["anode_role"]]
        rep.row("Anode density", units.fmt(an["density_g_cm3"], "g/cm³"),
                alloys.cite_density(an), key="density")
        rep.row("Anode equivalent weight", units.fmt(an["equivalent_weight_g_mol"], "g/mol"),
                alloys.cite_ew(an), key="EW")
        rep.row("Area ratio A_c/A_a", units.fmt(gov["area_ratio"]),
                "computed: effective cathode area / effective anode area", key="area_ratio")
        rep.row("Anode current density", units.fmt(gov["anode_current_density_A_m2"], "A/m²"),
                "computed: i_a = i_L·(A_c + A_a)/A_a" if method == METHOD_CATCHMENT else
                "computed: anodic branch at the couple potential (bisection)",
                key="anode_current_density")
        if gov["E_couple_V_SCE"] is not None:
            rep.row("Couple potential", units.fmt(gov["E_couple_V_SCE"], "V vs SCE", 4),
                    "computed: Σ A·i_net(E) = 0 by bisection", key="E_couple")
            kin = gov["_kinetics"]
            for role, krow in (("anode", kin["anode"]), ("cathode", kin["cathode"])):
                rep.row(f"Kinetics, {role} ({krow['alloy_id']}): i_corr, b_c",
                        f"{units.fmt(krow['i_corr_A_m2'], 'A/m²')}, "
                        f"{krow['b_c_mV_per_decade']:g} mV/decade", data.cite(krow))
                rep.row(f"Kinetics, {role} ({krow['alloy_id']}): b_a",
                        f"{krow['b_a_mV_per_decade']:g} mV/decade", data.cite(krow, "ba_"))
        rep.row("Penetration rate", f"{units.fmt(gov['penetration_mm_per_yr'], 'mm/yr')} = "
                f"{units.fmt(gov['penetration_mpy'], 'mpy')}",
                "computed: ASTM G102 CR = K·i·EW/ρ, K from CODATA F", key="penetration")
        rep.row("Corrosion allowance", units.fmt(gov["allowance_m"] * 1000, "mm"),
                "as entered" if allowance is not None else
                f"default: {gov['allowance_default']}", key="allowance")
        rep.row("Years to consume the allowance", gov["life_text"],
                "computed: allowance / penetration rate", key="years")
        if len(ev["cases"]) > 1:
            rep.table("Both possible anodes (ranges overlap)",
                      ["anode", "worst-case ΔV", "mm/yr", "life", "class"],
                      [[f"{c['anode_role']} ({c['anode']})", units.fmt(c["dE_max_V"], "V"),
                        units.fmt(c["penetration_mm_per_yr"]), c["life_text"],
                        VERDICT_LABEL[c["verdict"]]] for c in ev["cases"]])
    rep.table("Better fasteners for this plate here",
              ["fastener", "class", "worst-case ΔV", "galvanic mm/yr", "why"],
              [[f"{a['name']}" + (f" ({a['uns']})" if a["uns"] else ""), a["verdict"],
                units.fmt(a["delta_E_V_max"], "V"),
                units.fmt(a["galvanic_penetration_mm_per_yr"]), a["reason"]] for a in alts],
              note="Every fastener alloy in the table re-evaluated with the same geometry; "
                   "ranked by class, then galvanic rate.")
    rep.table("Mitigations and their computed effect",
              ["mitigation", "galvanic mm/yr", "allowance lasts (galvanic)",
               "anode total mm/yr", "class", "how"],
              [[m["title"], units.fmt(m.get("galvanic_penetration_mm_per_yr")),
                m.get("galvanic_life_text", "—"), units.fmt(m.get("penetration_mm_per_yr")),
                m.get("verdict", "—"), m["how"]] for m in mits],
              note="Galvanic = what the couple adds; total includes the anode's own "
                   "corrosion in the same model.")
    rep.chart("Potential ranges", str(range_chart(ev)),
              "Bars for the fastener and plate potential ranges on a volts-vs-SCE axis, "
              "with the worst-case potential difference and the allowed difference marked.")
    if gov is not None and gov["_kinetics"] is not None:
        rep.chart("Polarization curves", str(evans_chart(ev)),
                  "Anodic and cathodic curves of both members (current on a log axis) and "
                  "the couple point where they balance.")

    def clean_case(c):
        return {k: v for k, v in c.items() if not k.startswith("_")}

    sources = {"fastener_range": alloys.cite_potential(fr),
               "plate_range": alloys.cite_potential(pr),
               "allowed_delta_E_V": alloys.cite_allowed(env),
               "i_limit_A_m2": data.cite(env)}
    used = {"fastener_E_noble_V_SCE": pc["ranges"]["fastener"][0],
            "fastener_E_active_V_SCE": pc["ranges"]["fastener"][1],
            "plate_E_noble_V_SCE": pc["ranges"]["plate"][0],
            "plate_E_active_V_SCE": pc["ranges"]["plate"][1],
            "allowed_delta_E_V": ev["allowed"], "i_limit_A_m2": ev["i_L"]}
    if ev["atmospheric"]:
        used["band_width_m"] = ev["band_width_m"]
        sources["band_width"] = ({"text": "as entered", "confidence": "input", "source_id": ""}
                                 if band_width is not None else data.cite(env, "band_"))
    if gov is not None:
        an = rows[gov["anode_role"]]
        used.update({"anode_density_g_cm3": an["density_g_cm3"],
                     "anode_equivalent_weight_g_mol": an["equivalent_weight_g_mol"]})
        sources.update({"anode_density": alloys.cite_density(an),
                        "anode_equivalent_weight": alloys.cite_ew(an)})
        if gov["_kinetics"] is not None:
            for role in ("anode", "cathode"):
                krow = gov["_kinetics"][role]
                used[f"{role}_i_corr_A_m2"] = krow["i_corr_A_m2"]
                used[f"{role}_b_a_mV_per_decade"] = krow["b_a_mV_per_decade"]
                used[f"{role}_b_c_mV_per_decade"] = krow["b_c_mV_per_decade"]
                sources[f"{role}_kinetics"] = data.cite(krow)
                sources[f"{role}_b_a"] = data.cite(krow, "ba_")
    return {
        "anode": gov["anode"] if gov else None,
        "cathode": gov["cathode"] if gov else None,
        "anode_member": gov["anode_role"] if gov else None,
        "galvanic_couple": gov is not None,
        "overlap": pc["overlap"],
        "delta_E_V_min": pc["delta_E_V_min"], "delta_E_V_max": pc["delta_E_V_max"],
        "allowed_delta_E_V": ev["allowed"],
        "A_fastener_each_m2": ev["A_fastener_one_m2"],
        "fastener_area_estimated": fastener_area is None,
        "A_anode_m2": gov["A_anode_m2"] if gov else None,
        "A_cathode_m2": gov["A_cathode_m2"] if gov else None,
        "area_ratio": gov["area_ratio"] if gov else None,
        "band_width_m": ev["band_width_m"],
        "anode_current_density_A_m2": gov["anode_current_density_A_m2"] if gov else 0.0,
        "galvanic_current_A": gov["galvanic_current_A"] if gov else 0.0,
        "E_couple_V_SCE": gov["E_couple_V_SCE"] if gov else None,
        "penetration_mm_per_yr": gov["penetration_mm_per_yr"] if gov else 0.0,
        "penetration_mpy": gov["penetration_mpy"] if gov else 0.0,
        "galvanic_penetration_mm_per_yr": gov["galvanic_penetration_mm_per_yr"] if gov else 0.0,
        "allowance_m": gov["allowance_m"] if gov else allowance,
        "allowance_default": gov["allowance_default"] if gov else None,
        "years_to_allowance": gov["years_to_allowance"] if gov else None,
        "life_status": gov["life_status"] if gov else faraday.LIFE_NO_ATTACK,
        "life_text": gov["life_text"] if gov else "no galvanic attack",
        "design_life_yr": design_life_yr,
        "verdict": VERDICT_LABEL[cls], "verdict_class": cls, "verdict_reason": reason,
        "method": method,
        "cases": [clean_case(c) for c in ev["cases"]],
        "alternatives": alts, "mitigations": mits,
        "data_used": used, "sources": sources,
        "display": rep.to_dict(),
    }


def _method_choices():
    return [(METHOD_CATCHMENT, "Catchment rule (oxygen-limited cathode; default)"),
            (METHOD_MIXED, "Mixed potential (polarization data; seawater only)")]


def _kind_choices():
    return [(k, v["label"]) for k, v in KINDS.items()]


_POS = {"min": 0.0, "min_inclusive": False}

CALCULATORS = [
    Calculator(
        name="fastener",
        title="Fastener against plate",
        summary=("Which member of a fastened joint corrodes, how fast, whether it lasts "
                 "the design life, and which fasteners and measures do better."),
        intro=("Pick the fastener and plate alloys and the service environment, give the "
               "joint's size, and the check ranks the couple by potential difference and "
               "by the area rule: a small anode next to a large cathode corrodes fast."),
        fields=[
            alloys.alloy_field("fastener", "Fastener alloy", "S31600",
                                  help="Generic name or UNS number, e.g. 316 stainless, "
                                       "S31600, carbon steel, galvanized. For a stainless "
                                       "in a crevice pick its active row from the list."),
            alloys.alloy_field("plate", "Plate alloy", "A95083"),
            alloys.environment_field(default="marine_splash"),
            Field("fastener_kind", "Fastener kind", CHOICE, default="bolt",
                  choices=_kind_choices,
                  help="Sets the estimated wetted area and the plate faces it bears on."),
            Field("diameter", "Nominal diameter", QUANTITY, default="10 mm",
                  quantity="length", unit="mm", max=1.0, help="e.g. 10 mm or 3/8 in.",
                  range_note="It must be positive.", **_POS),
            Field("count", "Number of fasteners", INTEGER, default=12, min=1, max=1e6,
                  range_note="At least one fastener."),
            Field("fastener_area", "Wetted area per fastener (optional)", QUANTITY,
                  quantity="area", unit="mm**2", optional=True,
                  help="Leave empty to estimate it from the diameter (approximate "
                       "proportions, stated with the result).",
                  range_note="It must be positive.", **_POS),
            Field("plate_area", "Wetted plate area", QUANTITY, default="1.2 m * 0.8 m",
                  quantity="area", unit="m**2",
                  help="An area (0.96 m²) or a product such as 1.2 m * 0.8 m * 2 (both "
                       "faces wetted).", range_note="It must be positive.", **_POS),
            Field("thickness", "Plate thickness", QUANTITY, default="6 mm", quantity="length",
                  unit="mm", help="Sets the default allowance when the plate is the anode.",
                  range_note="It must be positive.", **_POS),
            Field("band_width", "Band width (atmospheric only, optional)", QUANTITY,
                  quantity="length", unit="mm", optional=True,
                  help="Width of plate around each fastener that carries galvanic current "
                       "in a thin film; empty = the environment's default.",
                  range_note="It must be positive.", **_POS),
            Field("allowance", "Corrosion allowance (optional)", QUANTITY, quantity="length",
                  unit="mm", optional=True,
                  help="Thickness the anode may lose; empty = 10 % of the fastener "
                       "diameter (fastener anode) or of the plate thickness (plate anode).",
                  range_note="It must be positive.", **_POS),
            Field("design_life", "Design life", QUANTITY, default="25 year", quantity="time",
                  unit="year", max=1000 * faraday.SECONDS_PER_YEAR,
                  range_note="Between 0 and 1000 years.", **_POS),
            Field("method", "Method", CHOICE, default=METHOD_CATCHMENT,
                  choices=_method_choices),
        ],
        compute=compute_fastener,
        example={"fastener": "316 stainless", "plate": "5083", "environment": "marine_splash",
                 "fastener_kind": "bolt", "diameter": "10 mm", "count": "12",
                 "fastener_area": "", "plate_area": "1.2 m * 0.8 m", "thickness": "6 mm",
                 "band_width": "", "allowance": "", "design_life": "25 year",
                 "method": "catchment"},
    ),
]
