"""The reference-scale converter page: a measured potential on another scale.

The conversion itself, its sign convention and the thermal/isothermal
temperature coefficients are in :mod:`noblegap.materials.references`.
"""

from __future__ import annotations

import re

from .. import units
from ..materials import data
from ..materials.references import (COEF_THERMAL, T25_K, isothermal_coefficient, reference,
                                    reference_potential)
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
    rep.summary(f"{units.fmt(out, 'V', 4)} vs {_abbr(row_to)}")
    rep.row("Potential on the target scale", units.fmt(out, "V", 4),
            f"computed: E(vs {_abbr(row_to)}) = E(vs {_abbr(row_from)}) + "
            f"E({_abbr(row_from)}) − E({_abbr(row_to)})",
            key="potential_V")
    rep.row("Temperature of both electrodes",
            f"{units.fmt(T_K - 273.15, '°C', 3)} (measuring electrode and reference alike)",
            "stated: both reference potentials are on the hydrogen scale at this temperature")
    missing = []
    she = reference("she")
    for role, row, e, coef in (("From", row_from, e_from, coef_from),
                               ("To", row_to, e_to, coef_to)):
        rep.row(f"{role}: {row['name']} vs SHE at {units.fmt(T_K - 273.15, '°C', 3)}",
                units.fmt(e, "V", 4), data.cite(row))
        if coef and row["id"] != "she":
            iso = isothermal_coefficient(row)
            if row["dEdT_kind"] == COEF_THERMAL:
                rep.row(f"{row['name']} thermal temperature coefficient",
                        f"{row['dEdT_mV_per_K']:+g} mV/K", data.cite(row, "dEdT_"))
                rep.row("Thermal temperature coefficient of the hydrogen electrode",
                        f"{she['dEdT_mV_per_K']:+g} mV/K", data.cite(she, "dEdT_"))
                rep.row(f"{row['name']} isothermal coefficient used",
                        f"{iso:+.3f} mV/K",
                        "computed: (dE/dT)iso = (dE/dT)thermal − (dE/dT)thermal of the SHE")
            else:
                rep.row(f"{row['name']} isothermal temperature coefficient",
                        f"{iso:+g} mV/K", data.cite(row, "dEdT_"))
        elif not coef and off_25:
            missing.append(row["name"])
    if missing:
        rep.warn("No published temperature coefficient for " + " and ".join(missing) +
                 ": its 25 °C value is used, so the result carries extra uncertainty "
                 "away from 25 °C.")
    extrapolated = []
    for row, coef in ((row_from, coef_from), (row_to, coef_to)):
        lo, hi = row["dEdT_T_min_degC"], row["dEdT_T_max_degC"]
        if coef and lo is not None and hi is not None and not lo <= T_K - 273.15 <= hi:
            extrapolated.append(row["id"])
            rep.warn(f"The temperature coefficient of {row['name']} comes from readings "
                     f"between {lo:g} and {hi:g} °C; at {units.fmt(T_K - 273.15, '°C', 3)} "
                     "it is extrapolated, so its potential carries extra uncertainty.")
    for row in (row_from, row_to):
        if row["T_max_degC"] is not None and T_K - 273.15 > row["T_max_degC"]:
            rep.warn(f"{row['name']} is normally used only up to about "
                     f"{row['T_max_degC']:g} °C; above that its potential drifts. Keep the "
                     "reference outside the hot zone (with a salt bridge) or use a "
                     "silver/silver chloride electrode.")
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
        "isothermal_coefficient_mV_per_K": {"from_ref": isothermal_coefficient(row_from),
                                            "to_ref": isothermal_coefficient(row_to)},
        "coefficient_extrapolated": extrapolated,
        "reference_above_normal_range": [r["id"] for r in (row_from, row_to)
                                         if r["T_max_degC"] is not None
                                         and T_K - 273.15 > r["T_max_degC"]],
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
            temperature_field(help="Temperature of the measuring electrode and of the "
                                   "reference electrode, taken to be the same; both "
                                   "potentials are put on the hydrogen scale at this "
                                   "temperature. Liquid water at 1 atm: 0 to 100 °C."),
        ],
        compute=compute_convert,
        example={"potential": "-0.80 V", "from_ref": "sce", "to_ref": "she",
                 "temperature": "25 °C"},
    ),
]
