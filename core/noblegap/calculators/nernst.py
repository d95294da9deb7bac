"""The Nernst page: a couple at real temperature and ion concentrations.

The equations and their sign convention are in :mod:`noblegap.methods.nernst`.
"""

from __future__ import annotations

import math

from .. import units
from ..errors import InputError, InputErrors, NoblegapError
from ..materials import data
from ..materials.potentials import half_reaction, metal_ids
from ..methods.nernst import (ACTIVITY_DAVIES, ACTIVITY_IDEAL, C_STANDARD_MOL_M3,
                              CODATA_CITE_ROW, COEFFICIENT_OFF, COEFFICIENT_ON,
                              DAVIES_CITE_ROW, DAVIES_LIMIT_MOL_L, T25_K,
                              cell, davies_A, davies_A_sources, davies_gamma, ion_charge, nernst_slope,
                              parse_concentration, reversal, thermal_voltage)
from ..methods.nernst import read_concentration
from ..report import Report
from ..schema import CHOICE, QUANTITY, TEXT, Calculator, Field
from ..svg import TEXT, Svg, drawings, nice_ticks, scale, text_width
from .fields import temperature_field


def _fmt_conc(c_mol_L):
    return units.fmt(c_mol_L, "mol/L", 3)


def _pow10(x):
    return 10 ** x if abs(x) <= 300 else None


def _fmt_pow10(x):
    if abs(x) < 4:
        return units.fmt(10 ** x, "", 3)
    return f"10^{x:.2f}".replace("-", "\u2212")


def compute_nernst(metal_a, metal_b, conc_a, conc_b, temperature=T25_K,
                   activity=ACTIVITY_IDEAL, ionic_strength=None,
                   temperature_coefficient=COEFFICIENT_ON):
    """Nernst-corrected cell ``metal_a | ion_a || ion_b | metal_b``.

    ``conc_a``/``conc_b`` are raw text (see :func:`parse_concentration`);
    ``temperature`` [K]; ``ionic_strength`` [mol/m³] or None.
    """
    T_K = temperature
    ra, rb = half_reaction(metal_a, "metal_a"), half_reaction(metal_b, "metal_b")
    errors, parsed = [], {}
    for key, row, raw in (("conc_a", ra, conc_a), ("conc_b", rb, conc_b)):
        try:
            parsed[key] = parse_concentration(raw, row.get("ion_molar_mass_g_mol"),
                                              field=key, ion=row["ion"])
        except NoblegapError as exc:
            errors.append(exc)
    I_mol_L = None if ionic_strength is None else ionic_strength / C_STANDARD_MOL_M3
    if activity == ACTIVITY_DAVIES and I_mol_L is None:
        errors.append(InputError("The Davies activity model needs the ionic strength of "
                                 "the water.", field="ionic_strength", value="",
                                 allowed="≥ 0 mol/L, e.g. 0.01 mol/L for fresh water"))
    if errors:
        raise InputErrors(errors)
    (c_a, basis_a), (c_b, basis_b) = parsed["conc_a"], parsed["conc_b"]
    use_coef = temperature_coefficient == COEFFICIENT_ON
    z_a, z_b = ion_charge(ra["ion"]), ion_charge(rb["ion"])
    if activity == ACTIVITY_DAVIES:
        A_T = davies_A(T_K)
        g_a, g_b = davies_gamma(z_a, I_mol_L, A_T), davies_gamma(z_b, I_mol_L, A_T)
    else:
        g_a = g_b = 1.0
    res = cell(ra, rb, c_a, c_b, T_K, g_a, g_b, use_coef)
    E_cell, E0_cell = res["E_cell_V"], res["E0_cell_V"]
    same = ra["id"] == rb["id"]

    # Who corrodes, now and at unit activity (same temperature, same E° choice).
    if abs(E_cell) < 1e-12:
        anode = cathode = None
    else:
        anode, cathode = (ra["id"], rb["id"]) if E_cell > 0 else (rb["id"], ra["id"])
    if same or E0_cell == 0:
        std_anode = std_cathode = None
    else:
        std_anode, std_cathode = ((ra["id"], rb["id"]) if E0_cell > 0
                                  else (rb["id"], ra["id"]))
    is_reversed = std_anode is not None and anode is not None and anode != std_anode

    x_rev, log10_cb_rev = reversal(res["E_a_V_SHE"], res["E0_b_V_SHE"], rb["n"],
                                   res["nu_b"], g_b, c_a, T_K)
    x_user = math.log10(c_b / c_a)
    one_ion_per_litre = 1.0 / units.convert(1.0, "avogadro_constant", "1/mol")
    if log10_cb_rev < math.log10(one_ion_per_litre):
        feasible, why = False, "less than one ion per litre"
    elif log10_cb_rev > 1.0:
        feasible, why = False, "more than 10 mol/L, far beyond dilute water"
    else:
        feasible, why = True, ""
    in_chart = abs(x_rev - x_user) <= 6.0

    ln_Q = res["ln_Q"]
    log10_Q = ln_Q / math.log(10)
    Q = math.exp(ln_Q) if abs(ln_Q) < 700 else None
    slope = nernst_slope(T_K)
    tC = T_K - 273.15
    off_25 = abs(T_K - T25_K) > 0.05
    missing = [r["id"] for r, used in ((ra, res["coef_a"]), (rb, res["coef_b"]))
               if not used and off_25 and use_coef]
    missing = list(dict.fromkeys(missing))

    rep = Report()
    name = {ra["id"]: ra["metal"], rb["id"]: rb["metal"]}
    cell_text = f"{ra['metal']} | {ra['ion']} || {rb['ion']} | {rb['metal']}"
    if anode is None:
        rep.headline(f"{cell_text}: E_cell = 0 V — no driving force at these "
                     "concentrations.")
        finding = "Balanced: the two half-cells sit at the same potential."
    else:
        rep.headline(f"{name[anode]} is the anode and corrodes: E_cell = "
                     f"{units.fmt(E_cell, 'V', 4)} for {cell_text} at "
                     f"{units.fmt(tC, '°C', 3)}.")
        rep.summary(f"E_cell = {units.fmt(E_cell, 'V', 4)}; {name[anode]} corrodes")
        # A finding about the cell, not a verdict on a joint: the verdict
        # vocabulary (verdicts.py) judges joints on the joint pages.
        if same:
            finding = (f"Concentration cell: the {ra['metal'].lower()} in the more dilute "
                       "solution corrodes.")
        elif is_reversed:
            finding = ""
            rep.warn(f"Order reversed: the concentrations make {name[anode]} the anode, "
                     "unlike the standard series.")
        else:
            finding = (f"Same order as the standard series: {name[anode]} is the anode "
                       "here as at unit activity.")
    rep.para(_plain_words(ra, rb, res, anode, std_anode, is_reversed, same, c_a, c_b,
                          x_rev, log10_cb_rev, feasible, why, T_K))
    if finding:
        rep.para(finding)
    rep.para("The equation assumes each metal is in contact with a solution of its own "
             "ions. On a real structure in natural water the cathode reaction is usually "
             "oxygen reduction, not metal deposition, and films and alloying shift the "
             "potentials; use this page to see how far ion concentrations and temperature "
             "move the standard series, not as a service potential.")

    rep.row("E_cell (as written, b − a)", units.fmt(E_cell, "V", 4),
            "computed: E_cell = E_b − E_a = E°cell − (RT/nF)·ln Q", key="E_cell_V")
    rep.row("E°cell at this temperature", units.fmt(E0_cell, "V", 4),
            "computed: E°cell = E°_b(T) − E°_a(T)", key="E0_cell_V")
    for tag, row, E, E0, used in (("a", ra, res["E_a_V_SHE"], res["E0_a_V_SHE"],
                                   res["coef_a"]),
                                  ("b", rb, res["E_b_V_SHE"], res["E0_b_V_SHE"],
                                   res["coef_b"])):
        rep.row(f"E_{tag}: {row['reaction']}, corrected", units.fmt(E, "V vs SHE", 4),
                "computed: E = E° − (RT/nF)·ln(1/a^ν)", key=f"E_{tag}_V_SHE")
        rep.row(f"E° {row['reaction']} (25 °C)", units.fmt(row["E0_V_SHE"], "V vs SHE", 4),
                data.cite(row))
        if used and row.get("dE0dT_mV_per_K") is not None:
            rep.row(f"dE°/dT {row['ion']}/{row['metal']}",
                    f"{row['dE0dT_mV_per_K']:+g} mV/K", data.cite(row, "dEdT_"))
    rep.row("Electrons in the balanced reaction, n", str(res["n"]),
            "computed: n = lcm(n_a, n_b)", key="n")
    rep.row("Reaction quotient Q", _fmt_pow10(log10_Q),
            f"computed: Q = a_a^{res['p_a']} / a_b^{res['p_b']}", key="Q")
    rep.row("Reversal ratio c_b/c_a (c_a fixed)", _fmt_pow10(x_rev),
            "computed in closed form: E_b(c_b) = E_a", key="reversal_ratio")
    rep.row("ln(10)·RT/F at this temperature", units.fmt(slope * 1e3, "mV", 5),
            data.cite(CODATA_CITE_ROW))

    rep.table("Half-cells", ["", "a (left, anode as written)", "b (right, cathode as written)"],
              [["Ion", ra["ion"], rb["ion"]],
               ["Concentration", _fmt_conc(c_a), _fmt_conc(c_b)],
               ["Entered as", f"{conc_a} ({basis_a})", f"{conc_b} ({basis_b})"],
               ["Activity coefficient γ", units.fmt(g_a, "", 4), units.fmt(g_b, "", 4)],
               ["Activity a", units.fmt(res["a_a"], "", 4), units.fmt(res["a_b"], "", 4)],
               ["E°(T) V vs SHE", units.fmt(res["E0_a_V_SHE"], "", 4),
                units.fmt(res["E0_b_V_SHE"], "", 4)],
               ["Temperature coefficient used", "yes" if res["coef_a"] else "no",
                "yes" if res["coef_b"] else "no"],
               ["E corrected, V vs SHE", units.fmt(res["E_a_V_SHE"], "", 4),
                units.fmt(res["E_b_V_SHE"], "", 4)]],
              note=("Balanced reaction: "
                    f"{_balanced_text(ra, rb, res)}."), key="half_cells")

    svg, alt = _chart(ra, rb, res, c_a, T_K, x_user, x_rev, in_chart)
    rep.chart("Cell potential against the concentration ratio", svg, alt)

    if basis_a != "molar" or basis_b != "molar":
        rep.note("Assumed for dilute water: density 1 kg/L, so mol/kg ≈ mol/L and ppm by "
                 "mass ≈ mg/kg ≈ mg/L; mass units are converted with the ion's molar mass.")
    if activity == ACTIVITY_DAVIES:
        rep.row("Activity model", f"Davies, I = {units.fmt(I_mol_L, 'mol/L', 3)}",
                data.cite(DAVIES_CITE_ROW))
        if I_mol_L > DAVIES_LIMIT_MOL_L:
            rep.warn(f"Ionic strength {units.fmt(I_mol_L, 'mol/L', 3)} is above the Davies "
                     f"equation's validity limit of about {DAVIES_LIMIT_MOL_L} mol/L: the "
                     "activity coefficients, and so the result, are rough.")
        A_T = davies_A(T_K)
        rep.row(f"Davies constant A at {units.fmt(tC, '°C', 3)}", f"{A_T:.4f}",
                {"source_id": "llnl_thermo", "confidence": "published",
                 "text": "computed: A = 0.509 · A(T)/A(25 °C), A(T) interpolated in "
                         "the Debye–Hückel table — " +
                         "; ".join(c["text"] for c in davies_A_sources(T_K))})
    else:
        if ionic_strength is not None:
            rep.note("Ideal activities (γ = 1): the ionic strength entered is not used.")
        if max(c_a, c_b) > 0.1:
            rep.warn("Above about 0.1 mol/L, activities differ noticeably from "
                     "concentrations; choose the Davies model with the ionic strength.")
    if missing:
        rep.warn("No published temperature coefficient for " +
                 " and ".join(f"{name[m]} ({m})" for m in missing) +
                 ": its 25 °C standard potential is used at "
                 f"{units.fmt(tC, '°C', 3)}.")
    if not use_coef and off_25:
        rep.note("Temperature coefficients switched off: every E° is its 25 °C value; "
                 "only the RT/nF term follows the temperature.")
    for row, used in ((ra, res["coef_a"]), (rb, res["coef_b"])):
        if used and row.get("dEdT_confidence") == "from-memory":
            rep.warn(f"The temperature coefficient for {row['metal']} is from memory, not "
                     "confirmed against a published source.")
    if ra["id"] == "H2" or rb["id"] == "H2":
        rep.note("The hydrogen half-cell assumes H₂ at 1 atm.")

    sources = {"metal_a": data.cite(ra), "metal_b": data.cite(rb),
               "constants": data.cite(CODATA_CITE_ROW)}
    for tag, row, used in (("a", ra, res["coef_a"]), ("b", rb, res["coef_b"])):
        if used and row.get("dEdT_source_id"):
            sources[f"dEdT_{tag}"] = data.cite(row, "dEdT_")
    if activity == ACTIVITY_DAVIES:
        sources["activity"] = data.cite(DAVIES_CITE_ROW)

    return {
        "cell": f"{ra['id']} | {ra['ion']} || {rb['ion']} | {rb['id']}",
        "E_cell_V": E_cell,
        "E_a_V_SHE": res["E_a_V_SHE"], "E_b_V_SHE": res["E_b_V_SHE"],
        "E0_a_V_SHE": res["E0_a_V_SHE"], "E0_b_V_SHE": res["E0_b_V_SHE"],
        "E0_cell_V": E0_cell,
        "n": res["n"], "Q": Q, "log10_Q": log10_Q,
        "Q_exponents": {"a": res["p_a"], "b": res["p_b"]},
        "anode": anode, "cathode": cathode,
        "standard_anode": std_anode, "standard_cathode": std_cathode,
        "reversed": is_reversed,
        "reversal_ratio": _pow10(x_rev),
        "reversal_log10_ratio": x_rev,
        "reversal_ratio_definition": "conc_b/conc_a (mol/L) at which E_cell = 0, conc_a fixed",
        "reversal_conc_b_mol_L": _pow10(log10_cb_rev),
        "reversal_feasible": feasible,
        "reversal_in_chart": in_chart,
        "log10_ratio": x_user,
        "conc_a_mol_L": c_a, "conc_b_mol_L": c_b,
        "gamma_a": g_a, "gamma_b": g_b,
        "activity_a": res["a_a"], "activity_b": res["a_b"],
        "activity_model": activity,
        "ionic_strength_mol_L": I_mol_L,
        "davies_limit_exceeded": bool(activity == ACTIVITY_DAVIES and
                                      I_mol_L > DAVIES_LIMIT_MOL_L),
        "temperature_K": T_K,
        "nernst_slope_V_per_decade": slope,
        "temperature_coefficient_used": {"metal_a": res["coef_a"], "metal_b": res["coef_b"]},
        "missing_temperature_coefficient": missing,
        "sources": sources,
        "display": rep.to_dict(),
    }


def _balanced_text(ra, rb, res):
    N = res["n"]
    k_a, k_b = N // ra["n"], N // rb["n"]

    def term(k, s):
        return s if k == 1 else f"{k} {s}"
    ion_b = term(k_b * res["nu_b"], rb["ion"])
    ion_a = term(k_a * res["nu_a"], ra["ion"])
    prod_b = term(k_b, rb["reaction"].split("=")[-1].strip())
    prod_a = term(k_a, ra["reaction"].split("=")[-1].strip())
    return f"{ion_b} + {prod_a} → {prod_b} + {ion_a} (n = {N})"


def _plain_words(ra, rb, res, anode, std_anode, is_reversed, same, c_a, c_b, x_rev,
                 log10_cb_rev, feasible, why, T_K):
    name = {ra["id"]: ra["metal"], rb["id"]: rb["metal"]}
    shift_mV = (res["E_cell_V"] - res["E0_cell_V"]) * 1e3
    tC = units.fmt(T_K - 273.15, "°C", 3)
    rev_conc = (_fmt_conc(10 ** log10_cb_rev) if abs(log10_cb_rev) < 300
                else f"10^{log10_cb_rev:.0f} mol/L")
    if same:
        if anode is None:
            return (f"Both sides hold the same {ra['ion']} activity, so this "
                    f"{ra['metal'].lower()} concentration cell has no driving force.")
        dilute = "a" if res["a_a"] < res["a_b"] else "b"
        return (f"This is a concentration cell: the same metal on both sides, so the "
                f"standard series predicts nothing. The {ra['metal'].lower()} in the more "
                f"dilute solution (side {dilute}) is the anode: it dissolves to raise its "
                f"ion concentration, while {ra['ion']} deposits on the other side. "
                f"E_cell = {units.fmt(res['E_cell_V'] * 1e3, 'mV', 3)} at {tC}.")
    if anode is None:
        return (f"At these concentrations the two half-cells sit at the same potential: "
                f"neither {ra['metal'].lower()} nor {rb['metal'].lower()} is driven to "
                "corrode by the couple.")
    other = rb["id"] if anode == ra["id"] else ra["id"]
    shift = f"{shift_mV:+.1f} mV".replace("-", "\u2212")
    text = (f"Under these conditions {name[anode]} is the anode and corrodes, and "
            f"{name[other]} is the cathode. The ion concentrations and temperature move "
            f"the cell potential by {shift} from E°cell = "
            f"{units.fmt(res['E0_cell_V'], 'V', 4)}. ")
    if is_reversed:
        text += (f"That is enough to reverse the standard series, in which "
                 f"{name[std_anode]} would corrode: scarce {name[anode].lower()} ions "
                 f"(or plentiful {name[other].lower()} ions) pull the potentials across. ")
    else:
        text += "That is the same order as the standard series. "
    if feasible:
        text += (f"The couple reverses when c_b/c_a = {_fmt_pow10(x_rev)} "
                 f"(c_b = {rev_conc} with c_a held at {_fmt_conc(c_a)}).")
    else:
        text += (f"Reversing it would need c_b/c_a = {_fmt_pow10(x_rev)}, i.e. "
                 f"c_b = {rev_conc}: {why}, so concentration alone cannot reverse "
                 "this couple.")
    return text


def _chart(ra, rb, res, c_a, T_K, x_user, x_rev, in_chart):
    """E_cell against x = log10(conc_b/conc_a), conc_a fixed, ±6 decades; one
    drawing per width class (:data:`noblegap.svg.SIZES`)."""
    x_lo, x_hi = x_user - 6.0, x_user + 6.0
    slope = res["nu_b"] * thermal_voltage(T_K) * math.log(10) / rb["n"]

    def E_at(x):
        return res["E_cell_V"] + slope * (x - x_user)
    e_lo, e_hi = E_at(x_lo), E_at(x_hi)
    y_lo, y_hi = min(e_lo, e_hi, 0.0), max(e_lo, e_hi, 0.0)
    pad = 0.08 * (y_hi - y_lo or 0.1)
    y_lo, y_hi = y_lo - pad, y_hi + pad
    axis = f"log10(c_b / c_a), {ra['ion']} held at {_fmt_conc(c_a)}"

    def draw(size):
        W = size["width"]
        y_ticks = [0.0 if abs(t) < 1e-12 else t for t in nice_ticks(y_lo, y_hi, size["ticks"])]
        y_labels = [f"{t:.3g}".replace("-", "\u2212") for t in y_ticks]
        L = max(text_width(t) for t in y_labels) + 34
        R, T = 16, 30
        lines = [axis] if text_width(axis) <= W - 8 else [
            "log10(c_b / c_a),", f"{ra['ion']} held at {_fmt_conc(c_a)}"]
        B = 44 + 16 * len(lines)
        H = (360 if W >= 600 else 300) + 16 * (len(lines) - 1)
        sx, sy = scale(x_lo, x_hi, L, W - R), scale(y_lo, y_hi, H - B, T)
        svg = Svg(W, H, title="Cell potential against log10 of the concentration ratio")
        svg.rect(L, T, W - L - R, H - T - B, fill="#f7f6f2", stroke="#bbb")
        for tx in nice_ticks(x_lo, x_hi, 2 * size["ticks"] - 4):
            svg.line(sx(tx), T, sx(tx), H - B, stroke="#e2e0d8")
            svg.text(sx(tx), H - B + 18, f"{tx:g}".replace("-", "\u2212"), size=TEXT,
                     anchor="middle")
        for ty, label in zip(y_ticks, y_labels):
            svg.line(L, sy(ty), W - R, sy(ty), stroke="#e2e0d8")
            svg.text(L - 6, sy(ty) + 4, label, size=TEXT, anchor="end")
        svg.line(L, sy(0.0), W - R, sy(0.0), stroke="#555", width=1.2, dash="5,3")
        svg.text(L + 4, sy(0.0) - 5, "E_cell = 0", size=TEXT, fill="#555")
        svg.polyline([(sx(x_lo), sy(e_lo)), (sx(x_hi), sy(e_hi))], stroke="#1f5f8b",
                     width=2.5)
        svg.circle(sx(x_user), sy(res["E_cell_V"]), 5, fill="#c0392b", stroke="#fff")
        # The line always rises to the right, so text above-left of a point is clear of it.
        svg.text(sx(x_user) - 8, sy(res["E_cell_V"]) - 8, "your conditions", size=TEXT,
                 anchor="end", fill="#c0392b")
        if in_chart:
            svg.circle(sx(x_rev), sy(0.0), 5, fill="#fff", stroke="#1f5f8b")
            label = f"reversal at {x_rev:.2f}".replace("-", "\u2212")
            if sx(x_rev) + 8 + text_width(label) > W - R:
                svg.text(sx(x_rev) - 8, sy(0.0) - 8, label, size=TEXT, anchor="end",
                         fill="#1f5f8b")
            else:
                svg.text(sx(x_rev) + 8, sy(0.0) + 18, label, size=TEXT, fill="#1f5f8b")
        else:
            side = "left" if x_rev < x_lo else "right"
            svg.text(L + 6 if side == "left" else W - R - 6, T + 16,
                     f"reversal at {x_rev:.1f}: off the chart".replace("-", "\u2212"),
                     size=TEXT, anchor="start" if side == "left" else "end", fill="#1f5f8b")
        for k, line in enumerate(lines):
            svg.text(W / 2, H - 10 - 16 * (len(lines) - 1 - k), line, size=TEXT,
                     anchor="middle")
        svg.add("text", "E_cell (V)", x=16, y=(T + H - B) / 2, font_size=TEXT,
                text_anchor="middle", font_family=Svg.FONT,
                transform=f"rotate(-90 16 {(T + H - B) / 2:.1f})")
        svg.text(L + 6, T - 10, f"{ra['metal']} | {ra['ion']} || {rb['ion']} | {rb['metal']}",
                 size=TEXT, weight="600")
        return str(svg)

    if in_chart:
        rev_note = f"the couple reverses at log10 ratio {x_rev:.2f}"
    else:
        side = "left" if x_rev < x_lo else "right"
        rev_note = (f"the reversal point (log10 ratio {x_rev:.1f}) is off the chart to "
                    f"the {side}")
    alt = (f"Straight line of E_cell against log10(c_b/c_a) from {x_lo:.1f} to "
           f"{x_hi:.1f}, slope {slope * 1e3:.1f} mV per decade; your point at "
           f"{x_user:.2f} gives {res['E_cell_V']:.4f} V; {rev_note}.")
    return drawings(draw), alt


def _temperature_field():
    f = temperature_field(help="0 to 100 °C: the equation's data are for liquid water at 1 atm.")
    f.range_note = ("Outside 0–100 °C the equation's data (liquid water at 1 atm) do not "
                    "apply.")
    return f


def _conc_field(key, label, default, which):
    return Field(key, label, TEXT, default=default,
                 help=(f"Concentration of the {which} metal's ions: mol/L, mmol/L, M, "
                       "mol/kg, mg/L, µg/L or ppm by mass (dilute water, 1 kg/L)."),
                 source="data/half_reactions.csv (ion molar mass)",
                 reader=lambda text, key: read_concentration(text, key).text)


CALCULATORS = [
    Calculator(
        name="nernst",
        title="Nernst correction",
        summary=("A couple at real temperature and ion concentrations, and the ratio at "
                 "which it reverses."),
        intro=("The standard series assumes 1 mol/L of each metal's ions at 25 °C. Enter "
               "the real concentrations and temperature to see each half-cell's potential, "
               "the cell potential, and how far the concentrations would have to move for "
               "the other metal to corrode. The reversal ratio c_b/c_a is solved "
               "exactly (closed form) with c_a held at your value."),
        fields=[
            Field("metal_a", "Metal a (left, anode as written)", CHOICE, default="Zn",
                  choices=metal_ids, help="Half-reaction from the standard-potential table.",
                  source="data/half_reactions.csv"),
            _conc_field("conc_a", "Ion concentration at a, c_a", "0.1 mol/L", "left"),
            Field("metal_b", "Metal b (right, cathode as written)", CHOICE, default="Cu",
                  choices=metal_ids, help="Half-reaction from the standard-potential table.",
                  source="data/half_reactions.csv"),
            _conc_field("conc_b", "Ion concentration at b, c_b", "0.01 mol/L", "right"),
            _temperature_field(),
            Field("activity", "Activity model", CHOICE, default=ACTIVITY_IDEAL,
                  choices=[(ACTIVITY_IDEAL, "ideal (activity = concentration)"),
                           (ACTIVITY_DAVIES, "Davies (needs ionic strength)")],
                  help="Davies is valid to an ionic strength of about 0.5 mol/L."),
            Field("ionic_strength", "Ionic strength", QUANTITY, default="",
                  quantity="molar_concentration", unit="mol/L", min=0.0, optional=True,
                  help="Only for the Davies model: about 0.001–0.02 mol/L for fresh water."),
            Field("temperature_coefficient", "Temperature coefficient of E°", CHOICE,
                  default=COEFFICIENT_ON,
                  choices=[(COEFFICIENT_ON, "on: use dE°/dT where published"),
                           (COEFFICIENT_OFF, "off: E° at 25 °C")],
                  help="Half-cells without a published dE°/dT keep their 25 °C E°."),
        ],
        compute=compute_nernst,
        example={"metal_a": "Zn", "conc_a": "0.5 mg/L", "metal_b": "Cu",
                 "conc_b": "0.02 mg/L", "temperature": "12 °C", "activity": "davies",
                 "ionic_strength": "0.005 mol/L", "temperature_coefficient": "on"},
    ),
]
