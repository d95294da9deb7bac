"""The standard-potential table (EMF series): half-reaction rows by metal.

Sign convention: E° is the standard reduction potential of the metal's
half-reaction ``M^n+ + n e- = M`` against SHE at 25 °C and unit activity. In a
couple the half-cell of lower E° is the anode (it oxidises, corrodes and
gives electrons); the other is the cathode. ``delta_E_V = E°(cathode) −
E°(anode) ≥ 0``. Electrons flow through the metallic path from anode to
cathode.
"""

from __future__ import annotations

from ..report import chem
from . import data


def metal_ids():
    """Half-reactions usable as metals (hydrogen excluded)."""
    return [(r["id"], f"{r['metal']} ({chem(r['reaction'])})")
            for r in data.table("half_reactions")]


def half_reaction(metal_id, field="metal"):
    """Return the half-reaction row for ``metal_id`` (ChoiceError if unknown)."""
    return data.lookup("half_reactions", metal_id, field=field, what="half-reaction")


