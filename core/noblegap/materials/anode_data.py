"""Tables of sacrificial anodes: anode alloys, anode shapes, protection potentials.

* ``data/anodes.csv`` — anode alloys (aluminium-zinc-indium, zinc, magnesium):
  closed-circuit potential with the reference it was printed against,
  electrochemical capacity [A·h/kg], density, ``kinetics_alloy`` (the alloy
  whose row of ``data/cell_kinetics.csv`` gives the anode's polarization in
  the cell model: zinc's for zinc and for the activated aluminium alloy, whose
  working potential is about zinc's) and the range of water resistivity the
  alloy suits (outside it zinc and aluminium passivate, magnesium wastes itself).
* ``data/anode_shapes.csv`` — the utilisation factor of each anode shape (the
  fraction of the net mass consumed before the anode stops delivering).
* ``data/protection_potentials.csv`` — the potential to which a metal must be
  polarized to be protected, by alloy family (``match`` as in
  ``data/cell_kinetics.csv``), with a most negative limit where one applies;
  the row ``any`` is the 100 mV shift criterion for families without a row.

Potentials come out on the SCE scale (``_V_SCE``), converted with
:func:`noblegap.materials.references.to_scale` at 25 °C.

>>> round(closed_circuit_V_SCE("zinc"), 3)       # −1.03 V vs Ag/AgCl in seawater
-1.025
>>> anode_alloy("magnesium")["name"]
'Magnesium'
"""

from __future__ import annotations

from . import alloys, cell_data, data, references
from ..errors import DataError, NoblegapError

SCE = "sce"
_validated = False


def _ensure_valid():
    global _validated
    if not _validated:
        from . import validate
        validate.validate_tables(("anodes", "anode_shapes", "protection_potentials"))
        for r in data.table("anodes"):
            try:
                cell_data.kinetics_row(r["kinetics_alloy"])
            except NoblegapError:
                raise DataError(f"kinetics_alloy {r['kinetics_alloy']!r} has no row in "
                                "cell_kinetics.csv", file="anodes.csv", row=r["_row"],
                                column="kinetics_alloy") from None
        _validated = True


def anode_alloys():
    """Every anode alloy row, in table order."""
    _ensure_valid()
    return data.table("anodes")


def anode_alloy(anode_id, field="anode_alloy"):
    """The row of one anode alloy (ChoiceError with suggestions if unknown)."""
    _ensure_valid()
    return data.lookup("anodes", anode_id, field=field, what="anode alloy")


def anode_choices():
    return [(r["id"], r["name"]) for r in anode_alloys()]


def closed_circuit_V_SCE(anode_id):
    """The anode alloy's closed-circuit potential on the SCE scale [V]."""
    row = anode_alloy(anode_id)
    return references.to_scale(row["E_cc_V"], row["reference"], SCE)


def suits(anode_id, rho_ohm_m):
    """Whether the alloy suits water of resistivity ``rho_ohm_m`` (its row's range)."""
    row = anode_alloy(anode_id)
    lo, hi = row["rho_min_ohm_m"], row["rho_max_ohm_m"]
    return (lo is None or rho_ohm_m >= lo) and (hi is None or rho_ohm_m <= hi)


def suited_alloy(rho_ohm_m):
    """The first anode alloy of the table that suits the water, or None."""
    for r in anode_alloys():
        if suits(r["id"], rho_ohm_m):
            return r["id"]
    return None


def shape(shape_id, field="anode_shape"):
    _ensure_valid()
    return data.lookup("anode_shapes", shape_id, field=field, what="anode shape")


def criterion(alloy_id):
    """Protection criterion of an alloy (the joint's anode member).

    Returns
    -------
    dict
        ``row`` (the table row), ``E_protect_V_SCE`` (None for the shift
        criterion), ``E_limit_V_SCE`` (None where no limit applies),
        ``shift_V`` (None for a tabulated potential).
    """
    _ensure_valid()
    fam = alloys.alloy(alloy_id)["family"]
    rows = data.table("protection_potentials")
    hit = None
    for r in rows:
        keys = r["match"].split(";")
        if alloy_id in keys or f"family:{fam}" in keys:
            hit = r
            break
    if hit is None:
        hit = next(r for r in rows if r["match"] == "*")

    def sce(value):
        return None if value is None else references.to_scale(value, hit["reference"], SCE)

    return {"row": hit, "E_protect_V_SCE": sce(hit["E_protect_V"]),
            "E_limit_V_SCE": sce(hit["E_limit_V"]), "shift_V": hit["shift_V"]}


def cite(row, prefix=""):
    return data.cite(row, prefix)
