"""Reference electrodes: their potentials and converting a potential between scales.

Sign convention: a potential ``E_V_X`` is the potential of the metal measured
against reference electrode X (metal minus reference), in volts. A reference
electrode's own potential is stated against the standard hydrogen electrode,
``E_ref_V_SHE``. Then

    E_V_SHE = E_V_X + E_ref_V_SHE(X)
    E_V_Y   = E_V_X + E_ref_V_SHE(X) − E_ref_V_SHE(Y)

A reference's potential at temperature T uses its published temperature
coefficient where one exists: E(T) = E(25 °C) + (dE/dT)·(T − 298.15 K).
"""

from __future__ import annotations

from . import data

T25_K = 298.15


def reference_ids():
    """Ids and names of the reference electrodes in ``data/``."""
    return [(r["id"], r["name"]) for r in data.table("reference_electrodes")]


def reference(ref_id, field="reference"):
    """Return the data row of a reference electrode (ChoiceError if unknown)."""
    return data.lookup("reference_electrodes", ref_id, field=field, what="reference electrode")


def reference_potential(ref_id, T_K=T25_K, field="reference"):
    """Potential of a reference electrode vs SHE at ``T_K``.

    Parameters
    ----------
    ref_id : str
        Id in ``data/reference_electrodes.csv`` (``sce``, ``cse``, ...).
    T_K : float
        Temperature [K].

    Returns
    -------
    tuple
        (E_V_SHE [V], coefficient_used [bool], row)

    Example
    -------
    >>> round(reference_potential("sce")[0], 4)
    0.2412
    """
    row = reference(ref_id, field)
    coef = row["dEdT_mV_per_K"]
    if coef is None:
        return row["E_V_SHE"], False, row
    return row["E_V_SHE"] + coef * 1e-3 * (T_K - T25_K), True, row


def to_scale(E_V, from_ref, to_ref, T_K=T25_K):
    """Convert a potential from one reference scale to another [V]."""
    e_from, _, _ = reference_potential(from_ref, T_K)
    e_to, _, _ = reference_potential(to_ref, T_K)
    return E_V + e_from - e_to


