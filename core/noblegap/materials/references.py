"""Reference electrodes: their potentials and converting a potential between scales.

Sign convention: a potential ``E_V_X`` is the potential of the metal measured
against reference electrode X (metal minus reference), in volts. A reference
electrode's own potential is stated against the standard hydrogen electrode,
``E_ref_V_SHE``. Then

    E_V_SHE = E_V_X + E_ref_V_SHE(X)
    E_V_Y   = E_V_X + E_ref_V_SHE(X) − E_ref_V_SHE(Y)

Temperature: the measuring electrode and the reference electrode are both
taken to be at the same temperature T, and every potential is stated on the
hydrogen scale at that temperature (the SHE is zero at every temperature by
convention). On that scale a reference moves with its *isothermal* coefficient:
E(T) = E(25 °C) + (dE/dT)_iso·(T − 298.15 K). Some sources print a *thermal*
coefficient instead (the electrode warmed against an identical one held at the
base temperature); the two differ by the thermal coefficient of the hydrogen
electrode, (dE/dT)_iso = (dE/dT)_th − (dE/dT)_th,SHE. ``dEdT_kind`` in
``data/reference_electrodes.csv`` says which one each source printed.
"""

from __future__ import annotations

from . import data

T25_K = 298.15

COEF_ISOTHERMAL = "isothermal"
COEF_THERMAL = "thermal"


def reference_ids():
    """Ids and names of the reference electrodes in ``data/``."""
    return [(r["id"], r["name"]) for r in data.table("reference_electrodes")]


def reference(ref_id, field="reference"):
    """Return the data row of a reference electrode (ChoiceError if unknown)."""
    return data.lookup("reference_electrodes", ref_id, field=field, what="reference electrode")


def isothermal_coefficient(row):
    """Isothermal temperature coefficient of a reference electrode [mV/K].

    A thermal coefficient (``dEdT_kind`` = ``thermal``) is turned into an
    isothermal one by subtracting the thermal coefficient of the hydrogen
    electrode; the SHE itself is 0 by definition. None if the table has none.

    Example
    -------
    >>> round(isothermal_coefficient(reference("cse")), 3)
    0.029
    """
    if row["id"] == "she":
        return 0.0
    coef = row["dEdT_mV_per_K"]
    if coef is None:
        return None
    if row["dEdT_kind"] == COEF_THERMAL:
        return coef - reference("she")["dEdT_mV_per_K"]
    return coef


def reference_potential(ref_id, T_K=T25_K, field="reference"):
    """Potential of a reference electrode vs SHE, both at ``T_K``.

    Parameters
    ----------
    ref_id : str
        Id in ``data/reference_electrodes.csv`` (``sce``, ``cse``, ...).
    T_K : float
        Temperature of the reference electrode and of the hydrogen electrode
        it is stated against [K].

    Returns
    -------
    tuple
        (E_V_SHE [V], coefficient_used [bool], row)

    Example
    -------
    >>> round(reference_potential("sce")[0], 4)
    0.2412
    >>> round(reference_potential("sce", 308.15)[0], 4)
    0.2344
    """
    row = reference(ref_id, field)
    coef = isothermal_coefficient(row)
    if coef is None:
        return row["E_V_SHE"], False, row
    return row["E_V_SHE"] + coef * 1e-3 * (T_K - T25_K), True, row


def to_scale(E_V, from_ref, to_ref, T_K=T25_K):
    """Convert a potential from one reference scale to another [V]."""
    e_from, _, _ = reference_potential(from_ref, T_K)
    e_to, _, _ = reference_potential(to_ref, T_K)
    return E_V + e_from - e_to
