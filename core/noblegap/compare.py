"""Alternatives side by side: one joint, up to four design variants as columns.

Interface layer, beside :mod:`noblegap.api`. From a fastener (or joint)
check, the page shows the current design next to variants with the same
geometry: another fastener alloy, the joint electrically isolated, the
cathode coated, a sacrificial anode added. Each column has the verdict, the
local penetration rate near the joint (with its range where the calculator gives one) and
the years to consume the corrosion allowance.

A variant is named by a short id that goes into the page's link
(``compare=alloy:A96061,isolate,coat_cathode``):

* ``current`` — the inputs as entered (always the first column);
* ``alloy:<id>`` — the same joint with another fastener alloy (on the joint
  page: another alloy for the second member), a full run of the calculator
  with that one input changed (:data:`ALLOY_FIELD`);
* ``isolate``, ``coat_cathode`` — the calculator's own computed mitigation
  of that id (its ``mitigations`` output). A calculator that does not compute
  one says so in the column instead of guessing;
* ``anode`` or ``anode:<key>=<value>;…`` — a sacrificial anode added to the
  joint (:mod:`noblegap.methods.anode`). The keys are what the user typed
  (:data:`ANODE_KEYS`: ``alloy``, ``mass``, ``shape``, ``length``, ``area``;
  each value percent-encoded, as ``encodeURIComponent`` writes it). Every
  value not typed is assumed by a stated rule and shown as assumed in the
  column (:func:`anode_column`), so the link reopens the same column.

>>> out = compare("fastener", {"fastener": "316 stainless", "plate": "5083"},
...               ["isolate", "alloy:A96061"])
>>> [c["id"] for c in out["columns"]]
['current', 'isolate', 'alloy:A96061']
>>> out["columns"][2]["verdict_class"]
'ok'
"""

from __future__ import annotations

import json
import math
from urllib.parse import unquote

from . import api, units
from .calculators import fastener as fastener_calc, joint as joint_calc, members
from .materials import alloys, anode_data, data
from .methods import anode as anode_method, cell, galvanic
from .errors import ChoiceError, InputError, NoblegapError, suggest
from .verdicts import RANK, label as verdict_label

MAX_COLUMNS = 4
MITIGATIONS = {
    "isolate": "Electrically isolated",
    "coat_cathode": "Cathode coated",
    "anode": "Sacrificial anode added",
}
#: The input a variant ``alloy:<id>`` changes, per calculator, and how its
#: column is titled: the fastener's alloy; on the joint page, the second
#: member (the part attached to the first: a clamp, a bracket, a fitting).
ALLOY_FIELD = {"fastener": "fastener", "joint": "second"}
ALLOY_TITLE = {"fastener": "Fastener", "joint": "Second member"}
CALCULATORS = tuple(ALLOY_FIELD)


def _num(x):
    return x if isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x) else None


def _class_of(verdict):
    """A mitigation's verdict word mapped to the one vocabulary's class."""
    if verdict in RANK:
        return verdict
    return {"sound": "ok", "marginal": "caution", "reject": "avoid"}.get(verdict, "")


def _column(vid, title, src, years_key="years_to_allowance"):
    rate = _num(src.get("local_mm_per_yr"))
    cls = src.get("verdict_class") or _class_of(src.get("verdict", ""))
    return {
        "id": vid, "title": title, "available": True, "note": src.get("note", "") or "",
        "verdict_class": cls, "verdict": verdict_label(cls) if cls else "",
        "rate_mm_per_yr": rate,
        "rate_low_mm_per_yr": _num(src.get("local_mm_per_yr_low")),
        "rate_high_mm_per_yr": _num(src.get("local_mm_per_yr_high",
                                            src.get("high_local_mm_per_yr"))),
        "years_to_allowance": _num(src.get(years_key)),
        "life_text": src.get("life_text", ""),
    }


def _unavailable(vid, title, why):
    return {"id": vid, "title": title, "available": False, "note": why, "verdict_class": "",
            "verdict": "", "rate_mm_per_yr": None, "rate_low_mm_per_yr": None,
            "rate_high_mm_per_yr": None, "years_to_allowance": None, "life_text": ""}


#: The anode variant's inputs, in the order the link writes them.
ANODE_KEYS = ("alloy", "mass", "shape", "length", "area")
ANODE_PREFIX = "anode:"
SHAPE_WORDS = {"standoff": anode_method.STANDOFF, "stand-off": anode_method.STANDOFF,
               "stand off": anode_method.STANDOFF, "flush": anode_method.FLUSH,
               "flush-mounted": anode_method.FLUSH, "bracelet": anode_method.FLUSH}
SHAPE_LABELS = {anode_method.STANDOFF: "slender stand-off",
                anode_method.FLUSH: "flush-mounted (or bracelet)"}
#: Assumed values are rounded up to this many significant figures.
ASSUMED_DIGITS = 2
#: The calculators' number functions, to reach the current design's assessment.
NUMBERS = {"fastener": fastener_calc.compute_numbers, "joint": joint_calc.compute_numbers}
MAX_ANODE_TEXT = 60


def _is_variant(v):
    return v in MITIGATIONS or (v.startswith("alloy:") and len(v) > 6) or _is_anode(v)


def _is_anode(vid):
    return vid == "anode" or vid.startswith(ANODE_PREFIX)


def anode_typed(vid):
    """The typed anode inputs of a variant id: ``{key: text}``.

    >>> anode_typed("anode:mass=2%2C5%20kg;shape=flush")
    {'mass': '2,5 kg', 'shape': 'flush'}
    >>> anode_typed("anode")
    {}
    """
    if vid == "anode":
        return {}
    out = {}
    for part in vid[len(ANODE_PREFIX):].split(";"):
        if not part.strip():
            continue
        key, sep, value = part.partition("=")
        key = key.strip()
        if not sep and key in ANODE_KEYS:
            raise InputError(f"The anode's {key} has no value.", field=f"anode_{key}",
                             value=part, allowed=f"{key}=<value>, e.g. mass=5 kg")
        if not sep or key not in ANODE_KEYS:
            raise ChoiceError(f"{key!r} is not an input of the sacrificial anode.",
                              field="compare", value=part,
                              allowed=", ".join(ANODE_KEYS))
        text = unquote(value).strip()
        if len(text) > MAX_ANODE_TEXT:
            raise InputError(f"The anode's {key} is too long.", field=f"anode_{key}",
                             value=text[:MAX_ANODE_TEXT] + "…",
                             allowed=f"at most {MAX_ANODE_TEXT} characters")
        if text:
            out[key] = text
    return out


def parse_variants(text):
    """``"alloy:A96061,isolate"`` (the link's value) or a list -> list of ids."""
    items = text.split(",") if isinstance(text, str) else list(text or [])
    out = []
    for raw in items:
        v = str(raw).strip()
        if not v or v == "current" or v in out:
            continue
        if not _is_variant(v):
            raise ChoiceError(f"{v!r} is not a variant to compare.", field="compare", value=v,
                              allowed="alloy:<fastener alloy>, " + ", ".join(MITIGATIONS))
        if _is_anode(v) and any(_is_anode(x) for x in out):
            continue   # one sacrificial anode column
        out.append(v)
    if len(out) > MAX_COLUMNS - 1:
        raise InputError(f"Too many variants ({len(out)}).", field="compare",
                         value=",".join(out),
                         allowed=f"up to {MAX_COLUMNS - 1} beside the current design")
    return out


def compare(calc, inputs, variants):
    """The current design and each variant as a column (see the module docstring).

    Returns ``{"ok": True, "calc", "variants", "columns"}`` or ``{"ok": False,
    "error"}`` when the current design itself cannot be computed, the
    calculator has no compare view, or a variant id is not known.
    """
    try:
        if calc not in CALCULATORS:
            raise ChoiceError(f"The {calc!r} check has no compare view.", field="calc",
                              value=calc, allowed=", ".join(CALCULATORS))
        wanted = parse_variants(variants)
    except NoblegapError as exc:
        return {"ok": False, "error": exc.to_dict()}
    base = api.run(calc, inputs)
    if not base["ok"]:
        return {"ok": False, "error": base["error"]}
    res = base["result"]
    columns = [_column("current", "Current design", res)]
    mitigations = {m.get("id"): m for m in res.get("mitigations", []) if isinstance(m, dict)}
    for vid in wanted:
        if vid.startswith("alloy:"):
            alloy = vid[6:]
            field = ALLOY_FIELD[calc]
            run = api.run(calc, {**base["inputs"], field: alloy})
            if not run["ok"]:
                err = run["error"]
                msg = (err.get("errors") or [err])[0].get("message", "")
                columns.append(_unavailable(vid, f"{ALLOY_TITLE[calc]}: {alloy}",
                                            f"Not computed: {msg}"))
                continue
            r = run["result"]
            name = next((a.get("name") for a in res.get("alternatives", [])
                         if alloy in (a.get("alloy"), a.get("fastener"))), None)
            if name is None:
                try:
                    name = alloys.alloy_label(alloy)
                except NoblegapError:
                    name = None
            col = _column(vid, f"{ALLOY_TITLE[calc]}: {name or alloy}", r)
            columns.append(col)
        elif _is_anode(vid):
            columns.append(anode_column(calc, base, vid))
        else:
            m = mitigations.get(vid)
            if m is None or _num(m.get("local_mm_per_yr")) is None:
                columns.append(_unavailable(vid, MITIGATIONS[vid],
                                            f"The {calc} check does not compute this variant."))
            else:
                columns.append(_column(vid, MITIGATIONS[vid], m))
    return {"ok": True, "calc": calc, "variants": wanted, "columns": columns}


def handle(request_json):
    """JSON text in and out for the browser worker: ``{"calc", "inputs", "variants"}``."""
    try:
        req = json.loads(request_json)
        out = compare(req.get("calc"), req.get("inputs") or {}, req.get("variants") or [])
    except (ValueError, TypeError, AttributeError) as exc:
        out = {"ok": False, "error": {"type": "UsageError", "message":
                                      f"The compare request is malformed ({type(exc).__name__})."}}
    return json.dumps(out, allow_nan=False, ensure_ascii=False)


# ---------------------------------------------------------------------------
# The sacrificial-anode column
# ---------------------------------------------------------------------------

#: Ranges the anode inputs are read within (SI), and what a user is told.
ANODE_LIMITS = {
    "mass": (0.01, 10000.0, "kg", "0.01 kg to 10 t"),
    "length": (0.02, 10.0, "m", "20 mm to 10 m"),
    "area": (1e-4, 10.0, "m²", "1 cm² to 10 m²"),
}
ANODE_KINDS = {"mass": ("mass", "kg"), "length": ("length", "mm"), "area": ("area", "cm**2")}

BASIS_WORDS = {
    **members.BASIS_WORDS,
    "protected": "the joint's anode is held at its protection potential in every case, and "
                 "the allowance lasts the design life",
    "anode_life": "the joint lasts while the anode does, but the anode is used up in "
                  "{anode_life}, inside the design life of {life}: plan its renewal or "
                  "enlarge it",
    "anode_alloy": "the anode alloy does not suit this water (see the note)",
}


def _round_up(x, digits=ASSUMED_DIGITS):
    """x rounded up to ``digits`` significant figures (an assumed size is never smaller)."""
    if x <= 0:
        return x
    e = math.floor(math.log10(x)) - digits + 1
    return math.ceil(x / 10 ** e - 1e-9) * 10 ** e


def _read_anode(typed, key):
    text = typed.get(key)
    if text is None:
        return None
    kind, unit = ANODE_KINDS[key]
    value = units.read(text, kind, field=f"anode_{key}", default_unit=unit).value
    lo, hi, si, words = ANODE_LIMITS[key]
    if not lo <= value <= hi:
        from .errors import RangeError
        raise RangeError(f"The anode's {key} {text!r} is outside what this check covers.",
                         field=f"anode_{key}", value=text, allowed=words)
    return value


def _anode_alloy(text):
    """The anode alloy row for an id or a name as typed (``zinc``, ``Magnesium``)."""
    key = text.strip().lower()
    for r in anode_data.anode_alloys():
        if key in (r["id"].lower(), r["name"].lower()):
            return r
    names = [r["name"] for r in anode_data.anode_alloys()]
    raise ChoiceError(f"{text!r} is not an anode alloy here.", field="anode_alloy",
                      value=text, allowed=", ".join(names),
                      suggestions=suggest(text, names))


def _assumed_alloy(rho_ohm_m, E_joint_anode_V):
    """The first alloy of the table that suits the water and is less noble than the
    joint's anode; else the first less noble one; else the least noble of all."""
    rows = anode_data.anode_alloys()
    below = [r for r in rows if anode_data.closed_circuit_V_SCE(r["id"]) < E_joint_anode_V]
    for r in below:
        if anode_data.suits(r["id"], rho_ohm_m):
            return r
    if below:
        return below[0]
    return min(rows, key=lambda r: anode_data.closed_circuit_V_SCE(r["id"]))


def anode_inputs(a, typed):
    """The anode to add: typed values where given, else assumed by the stated rules.

    Rules (each shown beside the value as assumed):

    * alloy — the first of ``data/anodes.csv`` (aluminium-zinc-indium, zinc,
      magnesium) that suits the water's resistivity and is less noble than the
      joint's anode (:func:`_assumed_alloy`);
    * net mass — enough for the design life at the joint's oxygen-limited
      demand, (A_anode + A_cathode)·i_L, by the anode-life formula, rounded up;
    * shape — a slender stand-off anode;
    * length (stand-off) — eight radii of a cylinder of that mass; exposed
      area (flush) — one face of a block four times as wide as it is thick.

    Returns ``(spec, info)``: :class:`noblegap.methods.anode.AnodeSpec` and a
    dict of the values with ``assumed`` (keys not typed) and the rows used.
    """
    lk = a["likely"]
    rho = lk["rho_ohm_m"]
    assumed = []
    if "alloy" in typed:
        row = _anode_alloy(typed["alloy"])
    else:
        row = _assumed_alloy(rho, lk["E_anode_corr_V_SCE"])
        assumed.append("alloy")
    shape_text = typed.get("shape")
    if shape_text is None:
        shape = anode_method.STANDOFF
        assumed.append("shape")
    else:
        shape = SHAPE_WORDS.get(shape_text.strip().lower())
        if shape is None:
            raise ChoiceError(f"{shape_text!r} is not an anode shape.", field="anode_shape",
                              value=shape_text, allowed="stand-off, flush")
    mass = _read_anode(typed, "mass")
    if mass is None:
        demand = (lk["A_anode_eff_m2"] + lk["A_cathode_eff_m2"]) * lk["i_L_A_m2"]
        util0 = anode_data.shape("flush" if shape == anode_method.FLUSH else
                                 "standoff_long")["utilisation_fraction"]
        mass = _round_up(max(demand * a["design_life_yr"] * anode_method.HOURS_PER_YEAR
                             / (row["capacity_Ah_kg"] * util0), ANODE_LIMITS["mass"][0]))
        mass = min(mass, ANODE_LIMITS["mass"][1])
        assumed.append("mass")
    length = area = None
    if shape == anode_method.STANDOFF:
        length = _read_anode(typed, "length")
        if length is None:
            length = _round_up(anode_method.slender_length_m(mass, row["density_g_cm3"]))
            assumed.append("length")
        r = anode_method.standoff_radius_m(mass, row["density_g_cm3"], length)
        shape_id = "standoff_long" if length >= anode_method.SLENDER_RATIO * r else \
            "standoff_short"
    else:
        area = _read_anode(typed, "area")
        if area is None:
            side = (4.0 * mass / (row["density_g_cm3"] * 1000.0)) ** (1.0 / 3.0)
            area = _round_up(side * side)
            assumed.append("area")
        shape_id = "flush"
    shape_row = anode_data.shape(shape_id)
    spec = anode_method.AnodeSpec(
        anode_data.closed_circuit_V_SCE(row["id"]), row["kinetics_alloy"],
        row["capacity_Ah_kg"], row["density_g_cm3"],
        shape_row["utilisation_fraction"], mass, shape, length, area)
    return spec, {"row": row, "shape_row": shape_row, "assumed": assumed, "mass_kg": mass,
                  "shape": shape, "length_m": length, "area_m2": area}


def _anode_unavailable(vid, typed, why, status="not_computed", field=None):
    col = _unavailable(vid, MITIGATIONS["anode"], why)
    col.update({"status": status, "anode": {"typed": typed, "error_field": field,
                                             "choices": anode_data.anode_choices()}})
    return col


def anode_column(calc, base, vid):
    """The column of a sacrificial anode added to the current design (see
    :func:`anode_inputs` for what is assumed and :mod:`noblegap.methods.anode`
    for the model). Never raises for user input: a bad anode input is named in
    the column's note with the field it belongs to."""
    try:
        typed = anode_typed(vid)
    except NoblegapError as exc:
        return _anode_unavailable(vid, {}, f"Not computed: {exc}", field=exc.to_dict().get(
            "field"))
    try:
        params = api.get(calc).parse(base["inputs"])
        a = NUMBERS[calc](**params)["_assessment"]
        ok, _ = anode_method.applicable(a)
        if not ok:
            lk = a["likely"]
            spread = base["result"].get("spread_m")
            reach = (f"here the couple's own current spreads only about "
                     f"{units.fmt(spread * 1000, 'mm', 2)} from the joint"
                     if spread else "its current spreads only a short way along the film")
            return _anode_unavailable(
                vid, typed,
                "Not applicable in atmosphere: a sacrificial anode protects only as far as "
                "its current reaches through the water, and a film of moisture "
                f"({units.fmt(lk['film_m'] * 1e6, 'µm', 2)} here) carries it a few "
                f"millimetres at most ({reach}). No benefit is computed; isolate, seal or "
                "coat instead.", status="not_applicable")
        spec, info = anode_inputs(a, typed)
        res = anode_method.with_anode(a, spec)
    except NoblegapError as exc:
        d = exc.to_dict()
        return _anode_unavailable(vid, typed, f"Not computed: {d.get('message', exc)}",
                                  field=d.get("field"))
    except (ValueError, ZeroDivisionError, OverflowError) as exc:
        return _anode_unavailable(vid, typed, "Not computed: the anode's size is outside what "
                                  f"the model can compute ({type(exc).__name__}).")
    return _anode_result(vid, a, spec, info, res, typed)


def _anode_result(vid, a, spec, info, res, typed):
    row, cases = info["row"], res["cases"]
    lk = cases["likely"]
    crit = anode_data.criterion(a["anode"])
    prot = {c: anode_method.protected(cases[c]["E_anode_V_SCE"], crit,
                                      a["cases"][c]["E_anode_corr_V_SCE"])
            for c in galvanic.CASES}
    rho = a["likely"]["rho_ohm_m"]
    suits = anode_data.suits(row["id"], rho)
    cls, basis = anode_method.judge(a, res, a["design_life_yr"],
                                    all_protected=all(prot.values()), alloy_suits=suits)
    lives = [cases[c]["anode_life_yr"] for c in galvanic.CASES]
    shortest = min(lives)
    an_name = alloys.alloy(a["anode"])["name"]

    def life_words(y):
        return "as long as it is wetted" if not math.isfinite(y) else members.years_text(y)

    if crit["E_protect_V_SCE"] is not None:
        need = f"{units.fmt(crit['E_protect_V_SCE'], 'V', 3)} vs SCE"
    else:
        need = (f"{units.fmt(crit['shift_V'] * 1000, 'mV', 3)} below its free-corrosion "
                "potential")
    if all(prot.values()):
        state = "protected in every case"
    elif prot["likely"]:
        state = "protected at the likely values, not in every case"
    elif any(prot.values()):
        state = "not protected at the likely values"
    else:
        state = "not protected"
    reached = (f"{an_name} reaches {units.fmt(lk['E_anode_V_SCE'], 'V', 3)} vs SCE against "
               f"the {need} it needs: {state}.")
    notes = [reached]
    if lk["solution"].I_sacrificial_A <= 0:
        least = min(anode_data.anode_alloys(),
                    key=lambda r: anode_data.closed_circuit_V_SCE(r["id"]))
        notes.insert(0, f"{row['name']} ({units.fmt(spec.E_V, 'V', 3)} vs SCE) is not less "
                        f"noble than {an_name} where they meet: it takes current as a second "
                        "cathode and speeds the attack"
                        + (f"; {least['name']} is the least noble alloy here."
                           if least["id"] != row["id"] else
                           "; no anode alloy here is less noble."))
    if crit["E_limit_V_SCE"] is not None and lk["E_anode_V_SCE"] < crit["E_limit_V_SCE"]:
        notes.append(f"It is driven below {units.fmt(crit['E_limit_V_SCE'], 'V', 3)} vs SCE, "
                     "the most negative potential advised for it (alkaline attack of "
                     "aluminium): a smaller or less active anode suits better.")
    if not suits:
        pick = _assumed_alloy(rho, a["likely"]["E_anode_corr_V_SCE"])
        best = pick["id"] if pick["id"] != row["id"] and anode_data.suits(pick["id"], rho) \
            else None
        lo, hi = row["rho_min_ohm_m"], row["rho_max_ohm_m"]
        rng = (f"below {units.fmt(hi, 'Ω·m', 2)}" if lo is None else
               f"from {units.fmt(lo, 'Ω·m', 2)} to {units.fmt(hi, 'Ω·m', 2)}")
        why = ("passivates in water this resistive: its output falls with time, which this "
               "model does not follow" if lo is None else
               "corrodes itself fast and over-drives the joint in water this conductive")
        notes.append(f"{row['name']} {why} (it suits water {rng}; here about "
                     f"{units.fmt(rho, 'Ω·m', 2)})."
                     + (f" {anode_data.anode_alloy(best)['name']} suits this water."
                        if best else ""))
    sol = lk["solution"]
    limit_line = (f"What limits the anode: {anode_method.LIMITS[lk['limit']]}.")
    if lk["limit"] != anode_method.LIMIT_NONE:
        limit_line += (f" Of its drive, its own polarization takes "
                       f"{units.fmt(sol.eta_sacrificial_V, 'V', 2)}, its resistance "
                       f"({units.fmt(lk['R_anode_ohm'], 'Ω', 3)}) "
                       f"{units.fmt(sol.ohmic_sacrificial_V, 'V', 2)} and the cathode "
                       f"{units.fmt(sol.eta_cathode_V, 'V', 2)}.")
    if a["likely"]["spread_m"] is not None and math.isfinite(a["likely"]["spread_m"]):
        notes.append("The anode is set against the part of the joint within the spread "
                     "length; the rest of the larger member draws more from it, so its life "
                     "is shorter than shown.")
    reason = BASIS_WORDS[basis].format(
        likely=members.years_text(res["years"][1], lk["life_status"]),
        high=members.years_text(res["years"][2], cases["high"]["life_status"]),
        life=units.fmt(a["design_life_yr"], "years", 3),
        dv=units.fmt(a["rule"]["delta_V"][2], "V", 2),
        allowed=units.fmt(a["allowed_delta_V"], "V", 2),
        anode_life=life_words(shortest))
    shape_words = SHAPE_LABELS[info["shape"]]
    size = (f"{units.fmt(info['length_m'] * 1000, 'mm', 3)} long, "
            f"{units.fmt(res['radius_m'] * 2000, 'mm', 3)} across"
            if info["shape"] == anode_method.STANDOFF else
            f"{units.fmt(info['area_m2'] * 1e4, 'cm²', 3)} exposed")
    sources = [anode_data.cite(row), anode_data.cite(row, "cap_"),
               anode_data.cite(info["shape_row"]), anode_data.cite(crit["row"])]
    from_memory = any(s["confidence"] == "from-memory" for s in sources) or \
        a["from_memory"]
    col = {
        "id": vid, "title": MITIGATIONS["anode"], "available": True, "status": "computed",
        "verdict_class": cls, "verdict": verdict_label(cls), "verdict_reason": reason,
        "rate_mm_per_yr": lk["local_mm_per_yr"],
        # the range of the three cases (a weaker water can protect less, so the
        # low case of the joint need not give the lowest residual rate)
        "rate_low_mm_per_yr": min(cases[c]["local_mm_per_yr"] for c in galvanic.CASES),
        "rate_high_mm_per_yr": max(cases[c]["local_mm_per_yr"] for c in galvanic.CASES),
        "years_to_allowance": res["years"][1],
        "life_text": members.years_text(res["years"][1], lk["life_status"]),
        "note": " ".join(notes), "limit_text": limit_line,
        "from_memory_mark": members.FROM_MEMORY_MARK if from_memory else "",
        "anode": {
            "typed": typed, "assumed": info["assumed"], "error_field": None,
            "alloy": row["id"], "alloy_name": row["name"],
            "mass_kg": info["mass_kg"], "shape": info["shape"], "shape_name": shape_words,
            "length_m": info["length_m"], "area_m2": info["area_m2"],
            "radius_m": res["radius_m"], "size_text": size,
            "mass_text": units.fmt(info["mass_kg"], "kg", 3),
            "length_text": (units.fmt(info["length_m"] * 1000, "mm", 3)
                            if info["length_m"] is not None else ""),
            "area_text": (units.fmt(info["area_m2"] * 1e4, "cm²", 3)
                          if info["area_m2"] is not None else ""),
            "current_text": units.fmt(lk["current_A"], "A", 3),
            "choices": anode_data.anode_choices(),
            "utilisation": spec.utilisation, "capacity_Ah_kg": spec.capacity_Ah_kg,
            "E_cc_V_SCE": spec.E_V, "R_ohm": lk["R_anode_ohm"],
            "current_A": lk["current_A"], "current_A_high": cases["high"]["current_A"],
            "life_yr": lk["anode_life_yr"] if math.isfinite(lk["anode_life_yr"]) else None,
            "life_yr_shortest": shortest if math.isfinite(shortest) else None,
            "life_text": life_words(lk["anode_life_yr"]),
            "life_shortest_text": life_words(shortest),
            "protected": prot["likely"], "protected_all": all(prot.values()),
            "E_reached_V_SCE": lk["E_anode_V_SCE"],
            "criterion_V_SCE": crit["E_protect_V_SCE"], "criterion_shift_V": crit["shift_V"],
            "limit": lk["limit"], "suits": suits,
            "from_memory": from_memory,
            "sources": [s["text"] for s in sources],
        },
    }
    return col
