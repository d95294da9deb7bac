"""Fastener against plate: which member corrodes, how fast near the joint,
whether it lasts the design life, and which fasteners and measures do better.

Parse (the schema below) → compute (:func:`evaluate`, numbers only) → report
(:func:`report`, the words). The rate comes from the galvanic-cell model
(:func:`noblegap.methods.galvanic.assess`): the anode rule, the polarization
laws of both alloys, the electrolyte's resistance and, for atmospheres, the
time of wetness.

Geometry: the fasteners are the ``sites`` (each a disk of the fastener's
wetted area for the resistance; the joint radius r₀ is the bearing radius),
the plate the surrounding member, which carries current only within the
spread length λ of each fastener (each exposed face counts). Which of the
two is the anode is the galvanic series' decision, not the page's.

Sign convention: rates and currents are magnitudes; potentials in V vs SCE.
"""

from __future__ import annotations

import math

from .. import units
from ..errors import InputError
from ..materials import alloys
from ..methods import faraday, galvanic
from ..report import Report
from ..schema import CHOICE, INTEGER, QUANTITY, Calculator, Field
from . import members

#: Default corrosion allowance as a fraction of the anode member's size.
ALLOWANCE_FRACTION = 0.10

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
    1702
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


def layout(rule, fastener_id, kind, diameter_m, count, fastener_area_m2, plate_area_m2):
    """The :class:`galvanic.Layout` of the joint once the anode is known."""
    a_one = fastener_area_m2 if fastener_area_m2 is not None else \
        fastener_area_estimate_m2(kind, diameter_m)
    role = "anode" if rule["anode"] == fastener_id and rule["galvanic"] else "cathode"
    if rule["anode"] == rule["cathode"]:
        role = "cathode"
    return galvanic.Layout(role, count, count * a_one, plate_area_m2,
                           KINDS[kind]["bearing_radius"] * diameter_m, KINDS[kind]["faces"])


def evaluate(fastener, plate, environment, *, fastener_kind, diameter, count,
             fastener_area, plate_area, thickness, allowance, design_life_yr,
             conductivity_S_m=None, **options):
    """One assessment (numbers only) of a fastener alloy in the plate."""
    first, second = fastener, plate

    def allowance_of(anode_id):
        if allowance is not None:
            return allowance, None
        if anode_id == fastener and anode_id != plate:
            return ALLOWANCE_FRACTION * diameter, "10 % of the fastener diameter"
        return ALLOWANCE_FRACTION * thickness, "10 % of the plate thickness"

    return galvanic.assess(
        first, second, environment,
        lambda rule: layout(rule, fastener, fastener_kind, diameter, count, fastener_area,
                            plate_area),
        conductivity_S_m=conductivity_S_m, allowance_of=allowance_of,
        design_life_yr=design_life_yr,
        field_of=lambda role: "plate" if first == plate else "fastener", **options)


def compute_numbers(fastener, plate, environment, fastener_kind, diameter, count,
                    fastener_area, plate_area, thickness, allowance, design_life,
                    conductivity, resistivity, *, page=True):
    """Numbers of the fastener check: the joint, alternatives, mitigations
    (``page=False``: the joint only, for a schedule's row)."""
    kappa = members.conductivity_from(conductivity, resistivity)
    geometry = dict(fastener_kind=fastener_kind, diameter=diameter, count=count,
                    fastener_area=fastener_area, plate_area=plate_area, thickness=thickness,
                    allowance=allowance, design_life_yr=design_life / faraday.SECONDS_PER_YEAR,
                    conductivity_S_m=kappa)
    a_one = fastener_area if fastener_area is not None else \
        fastener_area_estimate_m2(fastener_kind, diameter)
    if count * a_one >= plate_area:
        raise InputError("The fasteners' wetted area is not smaller than the plate's.",
                         field="plate_area", value=units.fmt(plate_area, "m²", 3),
                         allowed=f"more than the fasteners' {units.fmt(count * a_one, 'm²', 3)}")
    a = evaluate(fastener, plate, environment, **geometry)
    alts = members.alternatives(lambda fid, **o: evaluate(fid, plate, environment, **geometry,
                                                           **o),
                                fastener) if page else None
    mits = members.mitigations(lambda **o: evaluate(fastener, plate, environment,
                                                    **geometry, **o)) if page else None
    out = members.result_numbers(a)
    out.update({"fastener": fastener, "plate": plate,
                "anode_member": ("fastener" if a["anode"] == fastener and a["galvanic"]
                                 else "plate"),
                "fastener_kind": fastener_kind, "A_fastener_each_m2": a_one, "fastener_area_estimated": fastener_area is None,
                "alternatives": alts, "mitigations": mits,
                "_assessment": a})
    return out


def report(n, page=True):
    """The page text and charts from :func:`compute_numbers`' numbers
    (``page=False``: without the alternatives, mitigations and charts)."""
    a = n["_assessment"]
    lk = a["likely"]
    rep = Report()
    where = ("around the fasteners" if n["anode_member"] == "plate" else
             "at the fasteners")
    rep.headline(members.headline(a, f"({n['anode_member']}) {where}"))
    rep.summary(members.short_headline(a))
    rep.verdict(n["verdict_class"], n["verdict"], members.verdict_reason(a))
    an, ca = alloys.alloy(a["anode"]), alloys.alloy(a["cathode"])
    if a["galvanic"]:
        rep.para(f"The {n['anode_member']} ({an['name']}) is the anode: it sits lower in the "
                 f"galvanic series than the {'plate' if n['anode_member'] == 'fastener' else 'fasteners'}"
                 f" ({ca['name']}), by {units.fmt(lk['delta_V'], 'V', 2)} at the midpoints.")
        rep.para(members.limit_sentence(a))
        rep.para(members.breakdown_sentence(a))
        if n["anode_member"] == "plate" and n["spread_m"] is not None:
            rep.para(f"The plate's loss concentrates within about "
                     f"{units.fmt(n['spread_m'] * 1000, 'mm', 2)} of each fastener (the spread "
                     "length); the headline is the rate there, the member average is the "
                     "same current spread over the whole wetted plate.")
    members.add_caveats(rep, a)
    rep.note("Geometry: each fastener is taken as a disk of its wetted area in the plate's "
             "plane for the electrolyte's resistance (R = ρ/(4r)); the plate takes part "
             "within the spread length of each fastener face.")
    rep.note(members.SCREENING_NOTE)
    rep.row("Fastener wetted area (each)", units.fmt(n["A_fastener_each_m2"] * 1e6, "mm²", 3),
            "as entered" if not n["fastener_area_estimated"] else
            f"computed (approximation): {KINDS[n['fastener_kind']]['proportions']}",
            key="fastener_area")
    members.common_rows(rep, a, n["_conductivity_entered"])
    if not page:
        return rep
    members.alternatives_table(rep, n["alternatives"], "Better fasteners for this plate here",
                               "fastener")
    members.mitigations_table(rep, n["mitigations"])
    members.next_steps(rep, a, "fastener.html", n["plate"], n["fastener"],
                       n["_conductivity_entered"], alternatives=n["alternatives"],
                       alternative_key="fastener", alternative_word="fastener",
                       mitigations=n["mitigations"])
    if a["galvanic"]:
        rep.chart("Polarization diagram", members.polarization_svg(a),
                  "Potential against log current: the anode's curve rising, the cathode's "
                  "falling to its oxygen limit, the operating current with the ohmic drop "
                  "between the two electrode potentials, and the limit that governs.")
        if n["anode_member"] == "plate":
            rep.chart("Local rate against distance from a fastener",
                      members.falloff_svg(members.spread_points(a),
                                          "distance from the fastener's edge, mm",
                                          "Local rate against distance"),
                      "The plate's loss rate falls off with distance from the fastener's "
                      "edge over the spread length.")
    return rep


def _result(params, page):
    return members.page_result(compute_numbers, report, params, page)


def compute_fastener(fastener, plate, environment, fastener_kind, diameter, count,
                     fastener_area, plate_area, thickness, allowance, design_life,
                     conductivity, resistivity):
    """Parse → compute → report for the page: numbers plus ``display``."""
    return _result(dict(fastener=fastener, plate=plate, environment=environment,
                        fastener_kind=fastener_kind, diameter=diameter, count=count,
                        fastener_area=fastener_area, plate_area=plate_area,
                        thickness=thickness, allowance=allowance, design_life=design_life,
                        conductivity=conductivity, resistivity=resistivity), page=True)


def headline_fastener(**params):
    """The compute-only path of a schedule's row: :func:`compute_fastener`'s
    numbers, headline, verdict and warnings without alternatives, mitigations
    and charts."""
    return _result(params, page=False)


def _kind_choices():
    return [(k, v["label"]) for k, v in KINDS.items()]


_POS = {"min": 0.0, "min_inclusive": False}

CALCULATORS = [
    Calculator(
        name="fastener",
        title="Fastener against plate",
        summary=("Which member of a fastened joint corrodes, how fast near the joint, whether "
                 "it lasts the design life, and which fasteners and measures do better."),
        intro=("Pick the fastener and plate alloys and the service environment and give the "
               "joint's size. The rate comes from a galvanic cell: both alloys' polarization, "
               "the water's or film's resistance and, outdoors, how long the surface is wet. "
               "The example: the deck hatch of the invented survey launch Grey Heron, 316 "
               "bolts through a 5083 plate in the splash zone."),
        fields=[
            alloys.alloy_field("fastener", "Fastener alloy", "S31600",
                               help="Generic name or UNS number, e.g. 316 stainless, "
                                    "S31600, carbon steel, galvanized. For a stainless "
                                    "in a crevice pick its active row from the list."),
            alloys.alloy_field("plate", "Plate alloy", "A95083"),
            members.environment_field(default="CX"),
            Field("fastener_kind", "Fastener kind", CHOICE, default="bolt",
                  choices=_kind_choices,
                  help="Sets the estimated wetted area and the plate faces it bears on."),
            Field("diameter", "Nominal diameter", QUANTITY, default="10 mm",
                  quantity="length", unit="mm", min=1e-4, max=1.0,
                  help="e.g. 10 mm or 3/8 in.", range_note="From 0.1 mm to 1 m."),
            Field("count", "Number of fasteners", INTEGER, default=12, min=1, max=1e6,
                  range_note="At least one fastener."),
            Field("fastener_area", "Wetted area per fastener (optional)", QUANTITY,
                  quantity="area", unit="mm**2", optional=True,
                  help="Leave empty to estimate it from the diameter (approximate "
                       "proportions, stated with the result).", min=1e-8,
                  range_note="At least 0.01 mm²."),
            Field("plate_area", "Wetted plate area", QUANTITY, default="1.2 m * 0.8 m",
                  quantity="area", unit="m**2",
                  help="An area (0.96 m²) or a product such as 1.2 m * 0.8 m * 2 (both "
                       "faces wetted).", range_note="It must be positive.", **_POS),
            Field("thickness", "Plate thickness", QUANTITY, default="6 mm", quantity="length",
                  unit="mm", help="Sets the default allowance when the plate is the anode.",
                  range_note="It must be positive.", **_POS),
            Field("allowance", "Corrosion allowance (optional)", QUANTITY, quantity="length",
                  unit="mm", optional=True,
                  help="Thickness the anode may lose; empty = 10 % of the fastener "
                       "diameter (fastener anode) or of the plate thickness (plate anode).",
                  range_note="It must be positive.", **_POS),
            Field("design_life", "Design life", QUANTITY, default="25 year", quantity="time",
                  unit="year", max=1000 * faraday.SECONDS_PER_YEAR,
                  range_note="Between 0 and 1000 years.", **_POS),
        ] + members.electrolyte_fields(),
        compute=compute_fastener,
        headline=headline_fastener,
        example={"fastener": "316 stainless", "plate": "5083", "environment": "CX",
                 "fastener_kind": "bolt", "diameter": "10 mm", "count": "12",
                 "fastener_area": "", "plate_area": "1.2 m * 0.8 m", "thickness": "6 mm",
                 "allowance": "", "design_life": "25 year", "conductivity": "",
                 "resistivity": ""},
    ),
]
