"""Nernst correction: a couple at real temperature and ion concentrations.

Sign convention. Each half-cell is written as a reduction, ``ν Ion^z+ + n e- =
M`` (metal, or hydrogen at 1 atm, at unit activity), and its potential against
SHE at temperature T is

    E = E°(T) − (RT / nF) · ln(1 / a_ion^ν)

The cell is written ``metal_a | ion_a || ion_b | metal_b``: a on the left is the
anode *as written* (oxidised), b on the right the cathode *as written*
(reduced). Balancing the electrons with N = lcm(n_a, n_b):

    (N/n_b)·ν_b Ion_b + (N/n_a) M_a → (N/n_b) M_b + (N/n_a)·ν_a Ion_a
    Q      = a_a^(ν_a·N/n_a) / a_b^(ν_b·N/n_b)
    E_cell = E_b − E_a = E°cell − (RT / NF) · ln Q,   E°cell = E°_b − E°_a

``E_cell_V > 0`` means the cell runs spontaneously as written (a corrodes);
``E_cell_V < 0`` means it runs the other way (b corrodes). For Al | Al³⁺ ||
Cu²⁺ | Cu this gives N = 6 and Q = [Al³⁺]² / [Cu²⁺]³.

Concentration ratio. The chart and :func:`reversal` vary ``conc_b`` with
``conc_a`` held at the user's value; ``x = log10(conc_b / conc_a)``.
``reversal_ratio`` is the value of ``conc_b / conc_a`` (both in mol/L) at which
E_cell = 0 with ``conc_a`` fixed, solved in closed form. When n_a/ν_a ≠
n_b/ν_b a plain ratio alone does not fix E_cell, which is why conc_a is held.

Activities are ``a = γ · c / (1 mol/L)``; ``γ = 1`` (``ideal``) or from the
Davies equation at a stated ionic strength (``davies``).
"""

from __future__ import annotations

import math
import re

from .. import units
from ..errors import InputError, MissingDataError, NoblegapError, RangeError
from ..materials import data

T25_K = 298.15
C_STANDARD_MOL_M3 = 1000.0          # standard concentration c° = 1 mol/L
WATER_DENSITY_KG_M3 = 1000.0        # stated assumption for dilute water: 1 kg/L

ACTIVITY_IDEAL = "ideal"
ACTIVITY_DAVIES = "davies"
ACTIVITY_METHODS = (ACTIVITY_IDEAL, ACTIVITY_DAVIES)

# Davies (1962), Ion Association, p. 41: log10 γ = −A z² (√I/(1+√I) − 0.3 I).
# A is the Debye–Hückel constant of water, 0.509 at 25 °C in Davies's book; its
# temperature dependence (from the density and dielectric constant of water) is
# taken from the tabulated A(T) in data/debye_huckel.csv, see davies_A.
DAVIES_A_25C = 0.509
DAVIES_LINEAR = 0.3
DAVIES_LIMIT_MOL_L = 0.5
DAVIES_CITE_ROW = {"source_id": "davies1962", "confidence": "published",
                   "locator": "p. 41 (equation with the 0.3·I term); A = 0.509 at 25 °C"}
CODATA_CITE_ROW = {"source_id": "codata2018", "confidence": "published", "locator": ""}

COEFFICIENT_ON, COEFFICIENT_OFF = "on", "off"

CONC_ALLOWED = ("a positive concentration: mol/L, mmol/L, µmol/L, M, mM, mol/kg, "
                "mg/L, µg/L, g/L, or ppm / mg/kg by mass (a bare number means mol/L)")



# --------------------------------------------------------------------------
# The equations, on plain floats
# --------------------------------------------------------------------------

def thermal_voltage(T_K):
    """RT/F [V] at ``T_K``, with F and R from CODATA (via pint).

    Example
    -------
    >>> round(thermal_voltage(298.15) * math.log(10) * 1e3, 3)
    59.159
    """
    return units.gas_constant() * T_K / units.faraday()


def nernst_slope(T_K, n=1):
    """Volts per decade of activity, ln(10)·RT/(nF) [V]."""
    return math.log(10) * thermal_voltage(T_K) / n


def half_cell_potential(E0_V_SHE, n, activity, T_K=T25_K, nu=1):
    """Potential of one reduction half-cell, E = E° − (RT/nF)·ln(1/a^ν).

    Parameters
    ----------
    E0_V_SHE : float
        Standard reduction potential at ``T_K`` [V vs SHE].
    n : int
        Electrons in the half-reaction.
    activity : float
        Activity of the ion (dimensionless, > 0).
    T_K : float
        Temperature [K].
    nu : int
        Stoichiometric coefficient of the ion (2 for 2H⁺ + 2e⁻ = H₂).

    Returns
    -------
    float
        E [V vs SHE].

    Raises
    ------
    RangeError
        Activity zero or negative (the logarithm is undefined).
    """
    if not activity > 0:
        raise RangeError("The logarithm of a zero or negative activity is undefined.",
                         field="activity", value=activity, allowed="an activity > 0")
    return E0_V_SHE + nu * thermal_voltage(T_K) / n * math.log(activity)


def cell_potential(E0_cell_V, n, Q, T_K=T25_K):
    """E_cell = E°cell − (RT/nF)·ln Q [V], for a cell whose E°cell is given.

    Example
    -------
    Daniell cell, [Zn²⁺] = 0.1 M, [Cu²⁺] = 0.01 M with E° = 1.10 V:

    >>> round(cell_potential(1.10, 2, 0.1 / 0.01), 4)
    1.0704
    """
    if not Q > 0:
        raise RangeError("The logarithm of a zero or negative reaction quotient is "
                         "undefined.", field="Q", value=Q, allowed="Q > 0")
    return E0_cell_V - thermal_voltage(T_K) / n * math.log(Q)


def electron_balance(n_a, n_b, nu_a=1, nu_b=1):
    """Electrons N = lcm(n_a, n_b) and the exponents of Q = a_a^p_a / a_b^p_b.

    >>> electron_balance(3, 2)
    (6, 2, 3)
    """
    N = n_a * n_b // math.gcd(n_a, n_b)
    return N, nu_a * N // n_a, nu_b * N // n_b


def davies_A(T_K):
    """Debye–Hückel constant A of water at ``T_K`` for the Davies equation.

    A(T) = 0.509 · A_tab(T) / A_tab(25 °C): Davies's own 25 °C value, carried to
    other temperatures by the ratio of the tabulated A(T) of
    ``data/debye_huckel.csv`` (piecewise linear between its rows, 0–100 °C).

    Parameters
    ----------
    T_K : float
        Temperature [K], 273.15 to 373.15.

    Returns
    -------
    float
        A [(kg/mol)^1/2, log10 basis].

    Example
    -------
    >>> round(davies_A(298.15), 3)
    0.509
    >>> round(davies_A(333.15), 4)
    0.5439

    References
    ----------
    Davies, C. W., Ion Association (1962), p. 41; tabulated A(T): LLNL
    thermo.com.V8.R6.230 as database/llnl.dat of PHREEQC (see data/sources.csv).
    """
    pts = sorted((r["T_degC"] + 273.15, r["A_sqrt_kg_per_mol"])
                 for r in data.table("debye_huckel"))
    a25 = dict((round(t, 2), a) for t, a in pts)[298.15]
    T = min(max(T_K, pts[0][0]), pts[-1][0])
    for (t0, a0), (t1, a1) in zip(pts, pts[1:]):
        if t0 <= T <= t1:
            return DAVIES_A_25C * (a0 + (a1 - a0) * (T - t0) / (t1 - t0)) / a25
    return DAVIES_A_25C * pts[-1][1] / a25


def davies_A_sources(T_K):
    """Citations of the A(T) rows :func:`davies_A` interpolates between."""
    rows = sorted(data.table("debye_huckel"), key=lambda r: r["T_degC"])
    tC = T_K - 273.15
    used = [r for r in rows if abs(r["T_degC"] - 25) < 1e-9]
    for r0, r1 in zip(rows, rows[1:]):
        if r0["T_degC"] <= tC <= r1["T_degC"]:
            used += [r0, r1]
            break
    return [data.cite(r) for r in {r["id"]: r for r in used}.values()]


def davies_gamma(z, I_mol_L, A=DAVIES_A_25C):
    """Activity coefficient of an ion of charge ``z`` by the Davies equation.

    log10 γ = −A·z²·(√I/(1+√I) − 0.3·I), I [mol/L]. Valid to about 0.5 mol/L.

    References
    ----------
    Davies, C. W., Ion Association, Butterworths, London (1962), p. 41.
    """
    if I_mol_L < 0:
        raise RangeError("Ionic strength cannot be negative.", field="ionic_strength",
                         value=I_mol_L, allowed="≥ 0 mol/L")
    s = math.sqrt(I_mol_L)
    return 10 ** (-A * z * z * (s / (1 + s) - DAVIES_LINEAR * I_mol_L))


def ion_charge(ion):
    """Charge number of an ion written like ``Zn2+``, ``Ag+`` (positive ions)."""
    m = re.search(r"(\d*)\+$", ion.strip())
    if not m:
        raise MissingDataError(f"Cannot read the charge of ion {ion!r}.", field="ion",
                               value=ion, allowed="a cation written like Zn2+ or Ag+")
    return int(m.group(1) or 1)


def ion_coefficient(row):
    """Stoichiometric coefficient of the ion in the row's reaction (2 for 2H+)."""
    m = re.match(r"\s*(\d*)\s*" + re.escape(row["ion"]), row["reaction"])
    return int(m.group(1)) if m and m.group(1) else 1


def standard_potential(row, T_K, use_coefficient=True):
    """E°(T) = E°(25 °C) + (dE°/dT)·(T − 298.15 K) where a coefficient exists.

    Returns
    -------
    tuple
        (E0_V_SHE at T, coefficient_used [bool])
    """
    coef = row.get("dE0dT_mV_per_K")
    if not use_coefficient or coef is None:
        return row["E0_V_SHE"], False
    return row["E0_V_SHE"] + coef * 1e-3 * (T_K - T25_K), True


def parse_concentration(text, molar_mass_g_mol=None, *, field="conc", ion=""):
    """Read an ion concentration typed in any of several units; return mol/L.

    Accepted: molar (mol/L, mmol/L, µmol/L, M, mM, µM), molal (mol/kg), mass per
    volume (mg/L, µg/L, g/L) and mass fraction (ppm, mg/kg, %). A bare number
    is mol/L. Stated assumptions for dilute water: density 1 kg/L, so mol/kg ≈
    mol/L and ppm by mass ≈ mg/kg ≈ mg/L. Mass units use the ion's molar mass.

    Returns
    -------
    tuple
        (c_mol_L, basis) where basis is one of ``molar``, ``molal``, ``mass``.

    Raises
    ------
    UnitError
        A unit that is not a concentration.
    RangeError
        Zero or negative (the logarithm is undefined).
    MissingDataError
        A mass unit for an ion without a molar mass in the table.
    """
    if text is None or (isinstance(text, str) and not text.strip()):
        raise InputError("This field is empty.", field=field, value="", allowed=CONC_ALLOWED)
    raw = str(text).strip()
    reading = read_concentration(raw, field)
    value, kind = reading.value, reading.kind
    if not value > 0:
        raise RangeError("A concentration must be above zero: the logarithm in the Nernst "
                         "equation is undefined for zero or a negative amount.",
                         field=field, value=raw, allowed=CONC_ALLOWED)
    if kind == "molar_concentration":
        return value / C_STANDARD_MOL_M3, "molar"
    if kind == "molality":
        return value * WATER_DENSITY_KG_M3 / C_STANDARD_MOL_M3, "molal"
    if molar_mass_g_mol is None:
        raise MissingDataError(
            f"No molar mass for {ion or 'this ion'} in the standard-potential table, so a mass "
            "concentration cannot be turned into mol/L.", field=field, value=raw,
            allowed="a molar concentration (mol/L, mmol/L) or a molality (mol/kg)")
    kg_m3 = value if kind == "mass_concentration" else value * WATER_DENSITY_KG_M3
    mol_m3 = kg_m3 / (molar_mass_g_mol * 1e-3)
    units.check_limits(mol_m3, "molar_concentration", field=field, raw=raw)
    return mol_m3 / C_STANDARD_MOL_M3, "mass"


CONC_KINDS = ("molar_concentration", "molality", "mass_concentration", "fraction")


def read_concentration(text, field="conc"):
    """Read a concentration as typed (see :func:`parse_concentration`): a
    :class:`noblegap.units.Reading` whose ``kind`` is one of :data:`CONC_KINDS`.

    >>> read_concentration("0.5 mM").text
    '0.5 mmol/L'
    """
    try:
        return units.read(text, CONC_KINDS[0], kinds=CONC_KINDS, field=field,
                          default_unit="mol/L", what="a concentration")
    except NoblegapError as exc:
        exc.field, exc.value = field, text
        exc.allowed = exc.allowed if isinstance(exc, RangeError) else CONC_ALLOWED
        raise


def cell(row_a, row_b, c_a_mol_L, c_b_mol_L, T_K=T25_K, gamma_a=1.0, gamma_b=1.0,
         use_coefficient=True):
    """The cell ``a | ion_a || ion_b | b`` on plain floats.

    Parameters
    ----------
    row_a, row_b : dict
        Half-reaction rows (``n``, ``ion``, ``reaction``, ``E0_V_SHE``, ...).
    c_a_mol_L, c_b_mol_L : float
        Ion concentrations [mol/L], > 0.
    T_K : float
        Temperature [K].
    gamma_a, gamma_b : float
        Activity coefficients.
    use_coefficient : bool
        Apply dE°/dT where the table has one.

    Returns
    -------
    dict
        E_a_V_SHE, E_b_V_SHE, E0_a_V_SHE, E0_b_V_SHE, E0_cell_V, E_cell_V, n,
        ln_Q, p_a, p_b, nu_a, nu_b, a_a, a_b, coef_a, coef_b.
    """
    E0_a, coef_a = standard_potential(row_a, T_K, use_coefficient)
    E0_b, coef_b = standard_potential(row_b, T_K, use_coefficient)
    nu_a, nu_b = ion_coefficient(row_a), ion_coefficient(row_b)
    a_a, a_b = gamma_a * c_a_mol_L, gamma_b * c_b_mol_L
    E_a = half_cell_potential(E0_a, row_a["n"], a_a, T_K, nu_a)
    E_b = half_cell_potential(E0_b, row_b["n"], a_b, T_K, nu_b)
    N, p_a, p_b = electron_balance(row_a["n"], row_b["n"], nu_a, nu_b)
    return {
        "E_a_V_SHE": E_a, "E_b_V_SHE": E_b, "E0_a_V_SHE": E0_a, "E0_b_V_SHE": E0_b,
        "E0_cell_V": E0_b - E0_a, "E_cell_V": E_b - E_a, "n": N,
        "ln_Q": p_a * math.log(a_a) - p_b * math.log(a_b), "p_a": p_a, "p_b": p_b,
        "nu_a": nu_a, "nu_b": nu_b, "a_a": a_a, "a_b": a_b,
        "coef_a": coef_a, "coef_b": coef_b,
    }


def reversal(E_a_V_SHE, E0_b_V_SHE, n_b, nu_b, gamma_b, c_a_mol_L, T_K):
    """log10(conc_b/conc_a) at which E_cell = 0 with conc_a fixed (closed form).

    E_b(c_b*) = E_a  ⇒  ln a_b* = (E_a − E°_b)·n_b F / (ν_b R T),
    c_b* = a_b* / γ_b (mol/L). Returns (log10 ratio, log10 c_b* [mol/L]).
    """
    ln_ab = (E_a_V_SHE - E0_b_V_SHE) * n_b / (nu_b * thermal_voltage(T_K))
    log10_cb = (ln_ab - math.log(gamma_b)) / math.log(10)
    return log10_cb - math.log10(c_a_mol_L), log10_cb


# --------------------------------------------------------------------------
# The calculator
# --------------------------------------------------------------------------

