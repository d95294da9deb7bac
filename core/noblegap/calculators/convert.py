"""The reference-scale converter page: a measured potential on another scale.

The conversion itself, and its sign convention, is in
:mod:`noblegap.materials.references`.
"""

from __future__ import annotations

import re

from .. import units
from ..materials import data
from ..materials.references import T25_K, reference_potential
from ..report import Report
from ..schema import QUANTITY, Calculator, Field
from .fields import reference_field, temperature_field


def _abbr(row):
    """``SCE``, ``CSE``: the abbreviation a reference's name gives, else its name."""
    m = re.search(r"\(([A-Z]{2,5})\)", row["name"])
    return m.group(1) if m else row["name"]


def compute_convert(potential, from_ref, to_ref, temperature):
    """Convert ``potential`` [V vs from_ref] to the ``to_ref`` scale."""
    T_K = temperature
    e_from, coef_from, row_from = reference_potential(from_ref, T_K, "from_ref")
    e_to, coef_to, row_to = reference_potential(to_ref, T_K, "to_ref")
    out = potential + e_from - e_to
    off_25 = abs(T_K - T25_K) > 0.05
    rep = Report()
    rep.headline(f"{units.fmt(potential, 'V', 4)} vs {row_from['name']} is "
                 f"{units.fmt(out, 'V', 4)} vs {row_to['name']}.")
    rep.row("Potential on the target scale", units.fmt(out, "V", 4),
            f"computed: E(vs {_abbr(row_to)}) = E(vs {_abbr(row_from)}) + "
            f"E({_abbr(row_from)}) − E({_abbr(row_to)})",
            key="potential_V")
    missing = []
    for role, row, e, coef in (("From", row_from, e_from, coef_from),
                               ("To", row_to, e_to, coef_to)):
        rep.row(f"{role}: {row['name']} vs SHE at {units.fmt(T_K - 273.15, '°C', 3)}",
                units.fmt(e, "V", 4), data.cite(row))
        if coef:
            if row["dEdT_mV_per_K"]:
                rep.row(f"{row['name']} temperature coefficient",
                        f"{row['dEdT_mV_per_K']:+g} mV/K", data.cite(row, "dEdT_"))
        elif off_25:
            missing.append(row["name"])
    if missing:
        rep.warn("No published temperature coefficient for " + " and ".join(missing) +
                 ": its 25 °C value is used, so the result carries extra uncertainty "
                 "away from 25 °C.")
    for row in (row_from, row_to):
        if row["confidence"] == "from-memory":
            rep.warn(f"The potential of {row['name']} is from memory, not confirmed "
                     "against a published source; measure it against a calibrated "
                     "reference before relying on it.")
    rep.note("Reference potentials assume the electrode's filling solution as named; a "
             "contaminated or diluted filling shifts the reading.")
    return {
        "potential_V": out,
        "from_ref": from_ref, "to_ref": to_ref,
        "temperature_K": T_K,
        "from_ref_V_SHE": e_from, "to_ref_V_SHE": e_to,
        "temperature_coefficient_used": {"from_ref": coef_from, "to_ref": coef_to},
        "missing_temperature_coefficient": [r["id"] for r, c in
                                            ((row_from, coef_from), (row_to, coef_to))
                                            if not c and off_25],
        "sources": {"from_ref": data.cite(row_from), "to_ref": data.cite(row_to)},
        "display": rep.to_dict(),
    }


CALCULATORS = [
    Calculator(
        name="convert",
        title="Reference scale converter",
        summary="Convert a measured potential between reference-electrode scales.",
        intro=("A potential means nothing without the electrode it was read against. "
               "Convert a reading (say −0.80 V against a silver/silver chloride "
               "seawater cell) to the scale of a table or a specification."),
        fields=[
            Field("potential", "Measured potential", QUANTITY, default="-0.80 V",
                  quantity="potential", unit="V", min=-5.0, max=5.0,
                  help="Metal minus reference, e.g. −0.80 V or −800 mV."),
            reference_field("from_ref", "Measured against", "sce"),
            reference_field("to_ref", "Convert to", "she",
                            help="Reference scale to express the potential on."),
            temperature_field(),
        ],
        compute=compute_convert,
        example={"potential": "-0.80 V", "from_ref": "sce", "to_ref": "she",
                 "temperature": "25 °C"},
    ),
]
