"""The EMF-series page: which metal of a pair corrodes at standard conditions.

Sign convention: E° is the standard reduction potential of the metal's
half-reaction ``M^n+ + n e- = M`` against SHE at 25 °C and unit activity. In a
couple the half-cell of lower E° is the anode (it oxidises, corrodes and
gives electrons); the other is the cathode. ``delta_E_V = E°(cathode) −
E°(anode) ≥ 0``. Electrons flow through the metallic path from anode to
cathode.
"""

from __future__ import annotations

from .. import units
from ..materials import data
from ..materials.potentials import half_reaction, metal_ids
from ..report import Report
from ..schema import CHOICE, Calculator, Field


def order(row_a, row_b, E_a, E_b):
    """Return (anode_row, cathode_row) by potential; ties keep a as anode."""
    return (row_a, row_b) if E_a <= E_b else (row_b, row_a)


def compute_couple(metal_a, metal_b):
    ra, rb = half_reaction(metal_a, "metal_a"), half_reaction(metal_b, "metal_b")
    anode, cathode = order(ra, rb, ra["E0_V_SHE"], rb["E0_V_SHE"])
    dE = cathode["E0_V_SHE"] - anode["E0_V_SHE"]
    rep = Report()
    same = ra["id"] == rb["id"]
    if same:
        rep.headline(f"{ra['metal']} against itself: ΔE° = 0 V, no galvanic couple.")
        rep.para("The same metal on both sides drives no galvanic current at standard "
                 "conditions. Differences in concentration, oxygen or temperature can "
                 "still make a concentration cell (see the Nernst page).")
        direction = "none"
    else:
        rep.headline(f"{anode['metal']} is the anode and corrodes; {cathode['metal']} is "
                     f"the cathode. ΔE° = {units.fmt(dE, 'V', 3)}.")
        rep.para(f"{anode['metal']} ({units.fmt(anode['E0_V_SHE'], 'V', 4)} vs SHE) is "
                 f"more active than {cathode['metal']} "
                 f"({units.fmt(cathode['E0_V_SHE'], 'V', 4)}): it oxidises "
                 f"({anode['metal']} → {anode['ion']} + {anode['n']} e⁻) and goes into "
                 f"solution. Electrons flow through the metal contact from "
                 f"{anode['metal']} to {cathode['metal']}, where "
                 f"{cathode['ion']} is reduced and {cathode['metal']} deposits "
                 "(or, in natural water, oxygen is reduced).")
        direction = f"{anode['id']} -> {cathode['id']}"
    rep.para("Standard potentials hold at 25 °C and unit activity of the metal ions. In "
             "service waters, alloys and surface films change the order: use the "
             "galvanic series for engineering alloys.")
    for r in (ra, rb) if not same else (ra,):
        rep.row(f"E° {r['reaction']}", units.fmt(r["E0_V_SHE"], "V vs SHE", 4), data.cite(r))
    rep.row("ΔE° (cathode − anode)", units.fmt(dE, "V", 4),
            "computed: ΔE° = E°(cathode) − E°(anode)", key="delta_E_V")
    return {
        "anode": anode["id"], "cathode": cathode["id"],
        "delta_E_V": dE,
        "E0_a_V_SHE": ra["E0_V_SHE"], "E0_b_V_SHE": rb["E0_V_SHE"],
        "E0_anode_V_SHE": anode["E0_V_SHE"], "E0_cathode_V_SHE": cathode["E0_V_SHE"],
        "electron_flow": direction,
        "galvanic_couple": not same,
        "corrodes": None if same else anode["id"],
        "deposits": None if same else cathode["id"],
        "sources": {"metal_a": data.cite(ra), "metal_b": data.cite(rb)},
        "display": rep.to_dict(),
    }


CALCULATORS = [
    Calculator(
        name="couple",
        title="EMF-series couple",
        summary="Which of two metals corrodes at standard conditions, and by how much.",
        intro=("The electromotive-force series ranks pure metals by their standard "
               "reduction potential. Pick two to see which one gives up electrons."),
        fields=[
            Field("metal_a", "Metal A", CHOICE, default="Zn", choices=metal_ids,
                  help="Half-reaction from the standard-potential table.",
                  source="data/half_reactions.csv"),
            Field("metal_b", "Metal B", CHOICE, default="Cu", choices=metal_ids,
                  help="Half-reaction from the standard-potential table.",
                  source="data/half_reactions.csv"),
        ],
        compute=compute_couple,
        example={"metal_a": "Zn", "metal_b": "Cu"},
    ),
]
