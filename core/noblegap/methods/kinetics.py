"""Mixed-potential (couple-potential) solver for two or more joined metals.

Sign convention: potentials are in volts on one stated scale (the data use
SCE, ``E_V_SCE``); a net current density is positive when anodic (metal
dissolving, electrons leaving into the metal) and negative when cathodic.

Model of one electrode k (uniform potential, no IR drop between members):

    anodic (metal dissolution, Tafel):
        i_a,k(E) = i_corr,k · 10^((E − E_corr,k) / b_a,k)
    cathodic (oxygen reduction, Tafel activation with diffusion limit):
        i_act,k(E) = i_x,k · 10^(−(E − E_corr,k) / b_c,k)
        i_c,k(E)   = i_act,k / (1 + i_act,k / i_L)
    with i_x,k = i_corr,k / (1 − i_corr,k / i_L), so that i_a,k = i_c,k = i_corr,k
    at E = E_corr,k (the electrode's free-corrosion state).
    net: f_k(E) = i_a,k(E) − i_c,k(E)

Every f_k increases strictly with E, is ≤ 0 below E_corr,k and ≥ 0 above it.
The couple potential E_couple solves Σ A_k · f_k(E) = 0; it lies between the
lowest and highest E_corr and is unique, so bisection on that bracket always
converges (pure Python, no numpy, runs unchanged in Pyodide).

Notes
-----
The model needs i_corr < i_L on each member. It ignores the solution's
resistance (an upper bound on the coupling, right for seawater immersion and
closely spaced members, too severe for high-resistivity waters) and treats a
passive metal's anodic branch as Tafel (it matters little while the passive
metal is the cathode). Data come from ``data/kinetics.csv``; a metal with no
row there cannot be solved and raises :class:`MissingDataError`.

References
----------
.. [1] Wagner, C. and Traud, W., mixed-potential theory (Z. Elektrochem. 44
   (1938) 391), as set out in corrosion textbooks, e.g. Jones, D. A.,
   Principles and Prevention of Corrosion, 2nd ed. (1996), Ch. 6 (galvanic
   couples by polarization diagrams).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..errors import InputError, MissingDataError
from ..materials import data

_LOG10 = math.log(10.0)
_MAX_EXP = 300.0


def _pow10(x):
    """10**x clipped to avoid overflow far from the bracket."""
    return math.exp(min(x, _MAX_EXP) * _LOG10)


@dataclass(frozen=True)
class Electrode:
    """Kinetic description of one metal in one environment (SI floats).

    Parameters
    ----------
    name : str
        Label (alloy id).
    E_corr_V : float
        Free-corrosion potential [V] on the scale of the whole calculation.
    i_corr_A_m2 : float
        Free-corrosion current density [A/m²], 0 < i_corr < i_L.
    b_a_V : float
        Anodic Tafel slope [V/decade], > 0.
    b_c_V : float
        Cathodic (oxygen-reduction activation) Tafel slope [V/decade], > 0.
    i_limit_A_m2 : float
        Oxygen diffusion-limited current density [A/m²].
    area_m2 : float
        Wetted area [m²], ≥ 0.
    """

    name: str
    E_corr_V: float
    i_corr_A_m2: float
    b_a_V: float
    b_c_V: float
    i_limit_A_m2: float
    area_m2: float = 1.0

    def __post_init__(self):
        for key in ("E_corr_V", "i_corr_A_m2", "b_a_V", "b_c_V", "i_limit_A_m2", "area_m2"):
            v = getattr(self, key)
            if not isinstance(v, (int, float)) or not math.isfinite(v):
                raise InputError(f"{key} of {self.name} is not a finite number.",
                                 field=key, value=v, allowed="a finite number")
        for key in ("i_corr_A_m2", "b_a_V", "b_c_V", "i_limit_A_m2"):
            if getattr(self, key) <= 0:
                raise InputError(f"{key} of {self.name} must be positive.", field=key,
                                 value=getattr(self, key), allowed="> 0")
        if self.area_m2 < 0:
            raise InputError(f"area of {self.name} must not be negative.", field="area_m2",
                             value=self.area_m2, allowed="≥ 0")
        if self.i_corr_A_m2 >= self.i_limit_A_m2:
            raise InputError(
                f"The corrosion current of {self.name} is not below the oxygen limiting "
                "current, so oxygen reduction cannot sustain it.", field="i_corr_A_m2",
                value=self.i_corr_A_m2, allowed=f"< i_L = {self.i_limit_A_m2:g} A/m²")

    def anodic(self, E_V):
        """Metal-dissolution current density at ``E_V`` [A/m², ≥ 0]."""
        return self.i_corr_A_m2 * _pow10((E_V - self.E_corr_V) / self.b_a_V)

    def cathodic(self, E_V):
        """Oxygen-reduction current density at ``E_V`` as a magnitude [A/m², ≥ 0]."""
        i_x = self.i_corr_A_m2 / (1.0 - self.i_corr_A_m2 / self.i_limit_A_m2)
        act = i_x * _pow10(-(E_V - self.E_corr_V) / self.b_c_V)
        if math.isinf(act):
            return self.i_limit_A_m2
        return act / (1.0 + act / self.i_limit_A_m2)

    def net(self, E_V):
        """Net current density, anodic positive [A/m²]."""
        return self.anodic(E_V) - self.cathodic(E_V)


@dataclass(frozen=True)
class CoupleSolution:
    """Result of :func:`solve_couple`.

    ``net_A_m2`` / ``anodic_A_m2`` per electrode (same order as given);
    ``galvanic_current_A`` is the current through the metallic path, the sum
    of the positive net currents A_k·f_k(E) (equal to minus the sum of the
    negative ones).
    """

    E_couple_V: float
    net_A_m2: tuple
    anodic_A_m2: tuple
    galvanic_current_A: float
    iterations: int
    residual_A: float


def solve_couple(electrodes, *, tol_V=1e-10, max_iter=200):
    """Couple potential of joined electrodes: bisection of Σ A_k f_k(E) = 0.

    Parameters
    ----------
    electrodes : sequence of Electrode
        At least one with area > 0.
    tol_V : float
        Bracket width at which bisection stops [V].
    max_iter : int
        Safety cap on iterations (60 suffice for a 3 V bracket to 1e-10 V).

    Returns
    -------
    CoupleSolution

    Raises
    ------
    InputError
        No electrode, or all areas zero.

    Example
    -------
    >>> zn = Electrode("zinc", -1.00, 0.05, 0.04, 0.12, 0.5, 1.0)
    >>> fe = Electrode("steel", -0.65, 0.05, 0.054, 0.12, 0.5, 1.0)
    >>> s = solve_couple([zn, fe])
    >>> -1.00 < s.E_couple_V < -0.65
    True
    """
    electrodes = list(electrodes)
    wetted = [e for e in electrodes if e.area_m2 > 0]
    if not wetted:
        raise InputError("The couple needs at least one electrode with a wetted area.",
                         field="area_m2", value=0, allowed="an area > 0")

    def total(E):
        return sum(e.area_m2 * e.net(E) for e in wetted)

    lo = min(e.E_corr_V for e in wetted)
    hi = max(e.E_corr_V for e in wetted)
    it = 0
    if hi - lo <= tol_V:
        E = 0.5 * (lo + hi)
    else:
        # total(lo) ≤ 0 ≤ total(hi) by construction
        while hi - lo > tol_V and it < max_iter:
            mid = 0.5 * (lo + hi)
            if total(mid) > 0:
                hi = mid
            else:
                lo = mid
            it += 1
        E = 0.5 * (lo + hi)
    nets = tuple(e.net(E) if e.area_m2 > 0 else 0.0 for e in electrodes)
    anodics = tuple(e.anodic(E) for e in electrodes)
    I_g = sum(e.area_m2 * n for e, n in zip(electrodes, nets) if n > 0)
    return CoupleSolution(E, nets, anodics, I_g, it, total(E))


def polarization_curve(electrode, E_values):
    """Sampled branches for a chart: list of (E, i_anodic, i_cathodic, i_net)."""
    return [(E, electrode.anodic(E), electrode.cathodic(E), electrode.net(E))
            for E in E_values]


# --------------------------------------------------------------------------
# Data access: data/kinetics.csv
# --------------------------------------------------------------------------

KINETICS_TABLE = "kinetics"


def kinetics_row(alloy_id, env_id):
    """Return the ``data/kinetics.csv`` row for an alloy in an environment.

    A row applies to the environment ids listed (``;``-separated) in its
    ``environments`` column.

    Raises
    ------
    MissingDataError
        No sourced row for that alloy in that environment (the message names
        what is missing and which alloys have data).
    """
    rows = data.table(KINETICS_TABLE)
    for r in rows:
        if r["alloy_id"] == alloy_id and env_id in r["environments"].split(";"):
            return r
    have = sorted({r["alloy_id"] for r in rows if env_id in r["environments"].split(";")})
    where = (f"the table holds no polarization data for {env_id!r} at all" if not have
             else "alloys with data here: " + ", ".join(have))
    raise MissingDataError(
        f"No polarization data (corrosion current, Tafel slopes) for {alloy_id!r} in "
        f"{env_id!r}, so the mixed-potential method cannot be used for this pair; "
        "use method 'catchment'.",
        field="method", value="mixed", allowed=f"catchment ({where})")


def electrode_from_data(alloy_id, env_id, i_limit_A_m2, area_m2, E_corr_V=None):
    """Build an :class:`Electrode` from ``data/kinetics.csv``.

    ``E_corr_V`` (V vs SCE) overrides the table's free-corrosion potential,
    e.g. with the midpoint of the alloy's galvanic-series range.

    Returns
    -------
    (Electrode, row)
    """
    row = kinetics_row(alloy_id, env_id)
    E = row["E_corr_V_SCE"] if E_corr_V is None else E_corr_V
    if E is None:
        raise MissingDataError(f"No free-corrosion potential for {alloy_id!r}.",
                               field="method", value="mixed", allowed="catchment")
    e = Electrode(alloy_id, E, row["i_corr_A_m2"], row["b_a_mV_per_decade"] / 1000.0,
                  row["b_c_mV_per_decade"] / 1000.0, i_limit_A_m2, area_m2)
    return e, row
