"""Two joined members: a pipe on a bracket, plate on plate, a fitting in a hull.

Parse (the schema) → compute (:func:`compute_numbers`, numbers only) →
report (:func:`report`, the words). The rate comes from the galvanic-cell
model (:func:`noblegap.methods.galvanic.assess`); verdict, alternatives and
mitigations are those of the fastener page (:mod:`.members`).

Geometry: the smaller wetted member is the site, a disk of its own area
(R = ρ/(4r), Newman 1966); the larger surrounds it and takes part within the
spread length λ of the joint. ``distance`` separates the two (edge to edge):
in a bulk electrolyte the two disks interact through the point-source term
ρ/(π·D), D the distance between centres; in a thin film the extra path adds
ρ/(2π·h)·ln((r₀ + d)/r₀). Empty distance = in contact.
"""

from __future__ import annotations

import math

from .. import units
from ..errors import InputError
from ..materials import alloys
from ..methods import faraday, galvanic
from ..report import Report
from ..schema import QUANTITY, Calculator, Field
from . import members

#: Default corrosion allowance: this fraction of the anode member's thickness.
ALLOWANCE_FRACTION = 0.10


def layout(rule, first, first_area, second_area, distance_m):
    """The joint's :class:`galvanic.Layout` once the anode is known."""
    first_is_anode = rule["anode"] == first
    A_an = first_area if first_is_anode else second_area
    A_ca = second_area if first_is_anode else first_area
    role = "anode" if A_an <= A_ca else "cathode"
    small = min(A_an, A_ca)
    return galvanic.Layout(role, 1, small, max(A_an, A_ca), math.sqrt(small / math.pi), 1,
                           distance_m or 0.0)


def evaluate(first, second, environment, *, first_area, second_area, first_thickness,
             second_thickness, distance, allowance, design_life_yr, conductivity_S_m=None,
             **options):
    """One assessment (numbers only) of the two members."""
    def allowance_of(anode_id):
        if allowance is not None:
            return allowance, None
        if anode_id == first and first != second:
            return ALLOWANCE_FRACTION * first_thickness, "10 % of the first member's thickness"
        return ALLOWANCE_FRACTION * second_thickness, "10 % of the second member's thickness"

    return galvanic.assess(
        first, second, environment,
        lambda rule: layout(rule, first, first_area, second_area, distance),
        conductivity_S_m=conductivity_S_m, allowance_of=allowance_of,
        design_life_yr=design_life_yr, field_of=lambda role: "first", **options)


def compute_numbers(first, first_area, first_thickness, second, second_area,
                    second_thickness, environment, distance, allowance, design_life,
                    conductivity, resistivity, *, page=True):
    """Numbers of the joint check: the couple, alternatives for the second member,
    mitigations (``page=False``: the couple only, for a schedule's row)."""
    kappa = members.conductivity_from(conductivity, resistivity)
    geometry = dict(first_area=first_area, second_area=second_area,
                    first_thickness=first_thickness, second_thickness=second_thickness,
                    distance=distance, allowance=allowance,
                    design_life_yr=design_life / faraday.SECONDS_PER_YEAR,
                    conductivity_S_m=kappa)
    a = evaluate(first, second, environment, **geometry)
    alts = members.alternatives(
        lambda aid, **o: evaluate(first, aid, environment, **geometry, **o), second) \
        if page else None
    mits = members.mitigations(lambda **o: evaluate(first, second, environment, **geometry,
                                                    **o)) if page else None
    out = members.result_numbers(a)
    out.update({"first": first, "second": second,
                "anode_member": "first" if a["anode"] == first else "second",
                "distance_m": distance, "alternatives": alts, "mitigations": mits,
                "_assessment": a})
    return out


def report(n, page=True):
    """The page text and charts from :func:`compute_numbers`' numbers
    (``page=False``: without the alternatives, mitigations and charts)."""
    a = n["_assessment"]
    lk = a["likely"]
    rep = Report()
    rep.headline(members.headline(a, f"({n['anode_member']} member) near the joint"))
    rep.summary(members.short_headline(a))
    rep.verdict(n["verdict_class"], n["verdict"], members.verdict_reason(a))
    an, ca = alloys.alloy(a["anode"]), alloys.alloy(a["cathode"])
    if a["galvanic"]:
        rep.para(f"The {n['anode_member']} member ({an['name']}) is the anode: it sits lower "
                 f"in the galvanic series than {ca['name']}, by "
                 f"{units.fmt(lk['delta_V'], 'V', 2)} at the midpoints.")
        rep.para(members.limit_sentence(a))
        rep.para(members.breakdown_sentence(a))
        if n["spread_m"] is not None:
            rep.para(f"The larger member's share of the current concentrates within about "
                     f"{units.fmt(n['spread_m'] * 1000, 'mm', 2)} of the joint (the spread "
                     "length).")
    members.add_caveats(rep, a)
    rep.note("Geometry: the smaller member is taken as a disk of its wetted area in an "
             "insulating plane (R = ρ/(4r)), the larger takes part within the spread length "
             "of the joint" + ("; the distance between them enters as the interaction of two "
                               "point sources." if n["distance_m"] is not None else "."))
    rep.note(members.SCREENING_NOTE)
    rep.row("Distance between the members", "in contact" if n["distance_m"] is None else
            units.fmt(n["distance_m"] * 1000, "mm", 3), "as entered", key="distance")
    members.common_rows(rep, a, n["_conductivity_entered"])
    if not page:
        return rep
    members.alternatives_table(rep, n["alternatives"],
                               "Other alloys for the second member here", "second member")
    members.mitigations_table(rep, n["mitigations"])
    members.next_steps(rep, a, "joint.html", n["first"], n["second"], n["_conductivity_entered"],
                       alternatives=n["alternatives"], alternative_key="second",
                       alternative_word="second member", mitigations=n["mitigations"])
    if a["galvanic"]:
        rep.chart("Polarization diagram", members.polarization_svg(a),
                  "Potential against log current: anode and cathode curves, the ohmic drop "
                  "at the operating current, and the limit that governs.")
        if n["spread_m"] is not None and a["layout"].site_role == "cathode":
            rep.chart("Local rate against distance from the joint",
                      members.falloff_svg(members.spread_points(a),
                                          "distance from the joint, mm",
                                          "Local rate against distance"),
                      "The anode's loss rate falls off with distance from the joint over the "
                      "spread length.")
    return rep


def _result(params, page):
    return members.page_result(compute_numbers, report, params, page)


def compute_joint(first, first_area, first_thickness, second, second_area, second_thickness,
                  environment, distance, allowance, design_life, conductivity, resistivity):
    """Parse → compute → report for the page: numbers plus ``display``."""
    return _result(dict(first=first, first_area=first_area, first_thickness=first_thickness,
                        second=second, second_area=second_area,
                        second_thickness=second_thickness, environment=environment,
                        distance=distance, allowance=allowance, design_life=design_life,
                        conductivity=conductivity, resistivity=resistivity), page=True)


def headline_joint(**params):
    """The compute-only path of a schedule's row: :func:`compute_joint`'s numbers,
    headline, verdict and warnings without alternatives, mitigations and charts."""
    return _result(params, page=False)


def _check(p):
    if p["allowance"] is not None:
        for key in ("first_thickness", "second_thickness"):
            if p[key] is not None and p["allowance"] > p[key]:
                raise InputError("The allowance is thicker than a member's wall.",
                                 field="allowance", value=units.fmt(p["allowance"] * 1000, "mm"),
                                 allowed=f"at most {units.fmt(p[key] * 1000, 'mm')}")


_POS = {"min": 0.0, "min_inclusive": False}

CALCULATORS = [
    Calculator(
        name="joint",
        title="Two joined members",
        summary=("Any two metals joined in service — a pipe on its bracket, plate on plate, a "
                 "fitting in a hull: which corrodes, how fast near the joint, what instead."),
        intro=("Give both members' alloys and wetted areas, how far apart they sit (or leave "
               "it empty for contact), the environment, the allowance and the life. The "
               "example: the invented Kestrel Point jetty, a 316 stainless clamp on a "
               "galvanized steel handrail post in a marine (C5) atmosphere."),
        fields=[
            alloys.alloy_field("first", "First member alloy", "galvanized_steel",
                               help="Generic name or UNS number, e.g. galvanized steel, "
                                    "C95800, 6061."),
            Field("first_area", "First member wetted area", QUANTITY, default="0.5 m²",
                  quantity="area", unit="m**2", range_note="It must be positive.", **_POS),
            Field("first_thickness", "First member thickness", QUANTITY, default="4 mm",
                  quantity="length", unit="mm", range_note="It must be positive.",
                  help="Sets the default allowance when this member is the anode.", **_POS),
            alloys.alloy_field("second", "Second member alloy", "S31600"),
            Field("second_area", "Second member wetted area", QUANTITY, default="0.02 m²",
                  quantity="area", unit="m**2", range_note="It must be positive.", **_POS),
            Field("second_thickness", "Second member thickness", QUANTITY, default="5 mm",
                  quantity="length", unit="mm", range_note="It must be positive.", **_POS),
            members.environment_field(default="C5"),
            Field("distance", "Distance between them (optional)", QUANTITY, optional=True,
                  quantity="length", unit="mm", min=0.0, max=1000.0,
                  help="Edge to edge through the electrolyte; empty = in contact.",
                  range_note="From 0 to 1000 m."),
            Field("allowance", "Corrosion allowance (optional)", QUANTITY, quantity="length",
                  unit="mm", optional=True,
                  help="Thickness the anode may lose; empty = 10 % of its thickness.",
                  range_note="It must be positive.", **_POS),
            Field("design_life", "Design life", QUANTITY, default="25 year", quantity="time",
                  unit="year", max=1000 * faraday.SECONDS_PER_YEAR,
                  range_note="Between 0 and 1000 years.", **_POS),
        ] + members.electrolyte_fields(),
        compute=compute_joint,
        headline=headline_joint,
        check=_check,
        example={"first": "galvanized steel", "first_area": "0.5 m²", "first_thickness": "4 mm",
                 "second": "316 stainless", "second_area": "0.02 m²",
                 "second_thickness": "5 mm", "environment": "C5", "distance": "",
                 "allowance": "", "design_life": "25 year", "conductivity": "",
                 "resistivity": ""},
    ),
]
