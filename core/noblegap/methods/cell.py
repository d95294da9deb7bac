"""The galvanic cell: two polarised electrodes joined through the electrolyte.

Every rate on the site comes from :func:`solve`. Pure Python floats, no numpy.

Sign convention: potentials are electrode potentials (metal against the
solution next to it) in volts on one scale, the data's SCE (``_V``). Current
densities are magnitudes (A/m²); a *net* current density is positive when the
surface gives up metal (anodic). The **anode** is the member of lower
free-corrosion potential, ΔV = E_corr,c − E_corr,a ≥ 0.

Polarization laws of one member (:class:`Electrode`)
----------------------------------------------------
* Dissolution, active metal (Tafel):  i_d(E) = i_corr · 10^((E − E_corr)/b_a)
* Dissolution, passive metal: the passive current i_corr while E stays below
  the breakdown (pitting) potential E_b; above it the metal is active:
  i_d(E) = i_corr · 10^((E − E_b)/b_a).
* Oxygen reduction with activation and a diffusion limit i_L:
  i_act = i_x · 10^(−(E − E_corr)/b_c),  i_O2 = i_act / (1 + i_act/i_L),
  with i_x chosen so that i_O2(E_corr) = i_corr: the member's own free
  corrosion is the balance of its own two reactions (mixed-potential theory),
  so the own corrosion rate comes from the member's own kinetics and never
  from i_L alone.
* Hydrogen evolution where the potential is driven below E_corr:
  i_H = i0_H · (10^(−(E − E_H)/b_H) − 10^(−(E_corr − E_H)/b_H)) for E < E_corr.

The net current density n(E) = i_d(E) − i_O2(E) − i_H(E) rises strictly with
E and is zero at E_corr.

The cell (:func:`solve`)
------------------------
With the galvanic current I through the metallic path and the electrolyte's
resistance R between the two wetted surfaces:

    A_a · n_a(E_a) = I = −A_c · n_c(E_c),      E_c − E_a = I · R

One bracketed root on E_a ∈ [E_corr,a, E_corr,c]: for a trial E_a the
anode gives I, the ohmic drop gives E_c, and the cathode's balance
h(E_a) = −A_c·n_c(E_a + I·R) − I falls strictly with E_a, from ≥ 0 at
E_corr,a to ≤ 0 at E_corr,c. So the root is unique and always found.
Brent's method (inverse quadratic and secant steps, bisection whenever they
do not shrink the bracket fast enough) keeps it bracketed until both
electrode potentials are pinned to ``tol_V``; the last step interpolates h
on the final bracket. A guess (the previous solution of a nearby cell, as in
the spread iteration) starts from a small bracket around it.

The driving voltage divides into the anode's polarization η_a = E_a − E_corr,a,
the ohmic drop I·R and the cathode's polarization η_c = E_corr,c − E_c; the
largest share names the limit that governs (:data:`LIMITS`).

Limits (tested): R → 0 with a fast active anode whose own corrosion is
oxygen-limited gives the catchment rule i_a = i_L·(A_c + A_a)/A_a
(:func:`noblegap.methods.faraday.catchment_current_density`, kept as the upper
bound); R → ∞ gives I → 0; equal free-corrosion potentials give I = 0.

Where the current spreads
-------------------------
Galvanic current leaves the anode mostly within a distance λ of the joint.
λ is where the ohmic drop in the electrolyte, going out from the joint,
reaches the member's softness β = n/(dn/dE) (Wagner's criterion,
:func:`spread_length_m`); the calculators take the member's effective area
within λ and iterate (a fixed point of a few solves).

Validity and what is left out: one uniform potential per electrode (a
secondary current distribution is only represented by λ), steady state of a
fresh bare surface (no corrosion products, no calcareous deposits, no
biofilm ageing), the galvanic-series potential ranges as E_corr, kinetic
parameters from ``data/cell_kinetics.csv``.

References
----------
.. [1] Wagner, C. and Traud, W., Z. Elektrochem. 44 (1938) 391 (mixed
   potentials); Jones, D. A., Principles and Prevention of Corrosion, 2nd ed.
   (1996), Ch. 6 (galvanic couples on polarization diagrams).
.. [2] Newman, J., J. Electrochem. Soc. 113 (1966) 501 (disk resistance).
.. [3] Wagner, C., J. Electrochem. Soc. 98 (1951) 116 (the Wagner number and
   the throwing length κ·dE/di).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from ..errors import InputError

_LOG10 = math.log(10.0)
_MAX_EXP = 300.0

#: Names of the governing limit.
LIMIT_CATHODE = "cathode"
LIMIT_RESISTANCE = "resistance"
LIMIT_ANODE = "anode"
LIMIT_NONE = "none"
LIMITS = {
    LIMIT_CATHODE: "oxygen supply to the cathode: the cathode takes up most of the "
                   "driving voltage while oxygen reaches it at or near its diffusion limit",
    LIMIT_RESISTANCE: "the electrolyte's resistance: most of the driving voltage is lost "
                      "as ohmic drop between the two metals",
    LIMIT_ANODE: "the anode's own kinetics: the anode takes up most of the driving "
                 "voltage (a passive film, or a slow dissolution reaction)",
    LIMIT_NONE: "no driving voltage: no galvanic current",
}


_MAX_LN = _MAX_EXP * _LOG10


def _exp(x):
    """e**x, clipped far from any operating point so it never overflows."""
    if x > _MAX_LN:
        x = _MAX_LN
    elif x < -_MAX_LN:
        x = -_MAX_LN
    return math.exp(x)


def _net_law(i_corr, E_corr, ka, kc, ix, i_L, start, passive, i0_H, E_H, kH, H0):
    """The net current density n(E) of one electrode as one closure.

    The same three laws as :meth:`Electrode.dissolution`, :meth:`Electrode.oxygen`
    and :meth:`Electrode.hydrogen` (tests/core/test_cell.py checks that they
    agree), written out once without method calls: the cell solver evaluates it
    some ten thousand times per page.
    """
    exp, M = math.exp, _MAX_LN
    flat = passive and start is None
    if i0_H > 0:
        def net(E):
            x = (E - E_corr)
            if flat or (passive and E <= start):
                d = i_corr
            else:
                z = (E - start) * ka if passive else x * ka
                d = i_corr * exp(z if -M < z < M else (M if z > 0 else -M))
            y = -x * kc
            act = ix * exp(y if -M < y < M else (M if y > 0 else -M))
            c = act / (1.0 + act / i_L)
            if x < 0:
                z = -(E - E_H) * kH
                c += i0_H * exp(z if -M < z < M else (M if z > 0 else -M)) - H0
            return d - c
    else:
        def net(E):
            x = (E - E_corr)
            if flat or (passive and E <= start):
                d = i_corr
            else:
                z = (E - start) * ka if passive else x * ka
                d = i_corr * exp(z if -M < z < M else (M if z > 0 else -M))
            y = -x * kc
            act = ix * exp(y if -M < y < M else (M if y > 0 else -M))
            return d - act / (1.0 + act / i_L)
    return net


@dataclass(frozen=True)
class Electrode:
    """Polarization laws of one wetted member (SI floats, potentials on one scale).

    Parameters
    ----------
    E_corr_V : float
        Free-corrosion potential [V].
    i_corr_A_m2 : float
        Own dissolution current density at E_corr [A/m²] (the passive current
        for a passive metal), 0 < i_corr < i_L.
    b_a_V : float or None
        Anodic Tafel slope of active dissolution [V/decade]. None only for a
        passive metal without a breakdown potential, whose dissolution stays at
        the passive current and so never uses it.
    b_c_V : float
        Oxygen-reduction activation Tafel slope [V/decade].
    i_L_A_m2 : float
        Oxygen diffusion-limited current density [A/m²].
    passive : bool
        Dissolution at the passive current up to ``E_b_V``.
    E_b_V : float or None
        Breakdown (pitting) potential [V]; None = no breakdown in range.
    i0_H_A_m2, E_H_V, b_H_V : float
        Hydrogen evolution: exchange current density [A/m²], equilibrium
        potential [V], Tafel slope [V/decade].
    """

    E_corr_V: float
    i_corr_A_m2: float
    b_a_V: float | None
    b_c_V: float
    i_L_A_m2: float
    passive: bool = False
    E_b_V: float | None = None
    i0_H_A_m2: float = 0.0
    E_H_V: float = -0.72
    b_H_V: float = 0.12

    def __post_init__(self):
        flat = self.passive and self.E_b_V is None
        if self.b_a_V is None and not flat:
            raise InputError("b_a_V is missing: an active metal, or a passive one with a "
                             "breakdown potential, needs its anodic Tafel slope.",
                             field="b_a_V", value=None, allowed="a positive number")
        for key in ("E_corr_V", "i_corr_A_m2", "b_a_V", "b_c_V", "i_L_A_m2"):
            v = getattr(self, key)
            if key == "b_a_V" and v is None:
                continue
            if not isinstance(v, (int, float)) or not math.isfinite(v):
                raise InputError(f"{key} is not a finite number.", field=key, value=v,
                                 allowed="a finite number")
        for key in ("i_corr_A_m2", "b_a_V", "b_c_V", "i_L_A_m2"):
            if key == "b_a_V" and self.b_a_V is None:
                continue
            if getattr(self, key) <= 0:
                raise InputError(f"{key} must be positive.", field=key,
                                 value=getattr(self, key), allowed="> 0")
        if self.i_corr_A_m2 >= self.i_L_A_m2:
            raise InputError("The own corrosion current density must be below the oxygen "
                             "limiting current density that sustains it.",
                             field="i_corr_A_m2", value=self.i_corr_A_m2,
                             allowed=f"< i_L = {self.i_L_A_m2:g} A/m²")

        # constants of the three laws, computed once (the solver calls them often)
        set_ = object.__setattr__
        # a flat passive metal never uses the anodic slope (dissolution = i_corr)
        set_(self, "_ka", 0.0 if self.b_a_V is None else _LOG10 / self.b_a_V)
        set_(self, "_kc", _LOG10 / self.b_c_V)
        set_(self, "_ix", self.i_corr_A_m2 / (1.0 - self.i_corr_A_m2 / self.i_L_A_m2))
        start = None
        if self.passive and self.E_b_V is not None:
            start = max(self.E_b_V, self.E_corr_V)
        set_(self, "_start", start)
        kH = _LOG10 / self.b_H_V
        set_(self, "_kH", kH)
        set_(self, "_H0", self.i0_H_A_m2 * _exp(-(self.E_corr_V - self.E_H_V) * kH)
             if self.i0_H_A_m2 > 0 else 0.0)
        set_(self, "_net", _net_law(self.i_corr_A_m2, self.E_corr_V, self._ka, self._kc,
                                    self._ix, self.i_L_A_m2, start, self.passive,
                                    self.i0_H_A_m2, self.E_H_V, kH, self._H0))

    # -- the three reactions -------------------------------------------
    def dissolution(self, E):
        """Metal dissolution current density at E [A/m²]."""
        if self.passive:
            if self._start is None or E <= self._start:
                return self.i_corr_A_m2
            return self.i_corr_A_m2 * _exp((E - self._start) * self._ka)
        return self.i_corr_A_m2 * _exp((E - self.E_corr_V) * self._ka)

    def oxygen(self, E):
        """Oxygen-reduction current density at E, magnitude [A/m²]."""
        act = self._ix * _exp(-(E - self.E_corr_V) * self._kc)
        return act / (1.0 + act / self.i_L_A_m2)

    def hydrogen(self, E):
        """Extra hydrogen evolution below E_corr, magnitude [A/m²]."""
        if self.i0_H_A_m2 <= 0 or E >= self.E_corr_V:
            return 0.0
        return self.i0_H_A_m2 * _exp(-(E - self.E_H_V) * self._kH) - self._H0

    def cathodic(self, E):
        return self.oxygen(E) + self.hydrogen(E)

    def net(self, E):
        """Net current density, anodic positive [A/m²]: dissolution − cathodic."""
        return self._net(E)

    def slope_ohm_m2(self, E, dE=1e-4):
        """Polarization resistance r_p = dE/dn at E [Ω·m²] (central difference)."""
        dn = self.net(E + dE) - self.net(E - dE)
        return 2 * dE / dn if dn > 0 else math.inf


@dataclass(frozen=True)
class Solution:
    """Operating point of the cell (see :func:`solve`).

    ``i_anode_A_m2`` is the anode's total dissolution density; it splits
    exactly into ``i_galvanic_A_m2`` (= I/A_a, the current crossing to the
    cathode) and ``i_local_A_m2`` (oxygen and hydrogen reduced on the anode
    itself): i_anode = i_galvanic + i_local.
    """

    current_A: float
    E_anode_V: float
    E_cathode_V: float
    i_anode_A_m2: float
    i_galvanic_A_m2: float
    i_local_A_m2: float
    i_cathode_A_m2: float
    eta_anode_V: float
    eta_cathode_V: float
    ohmic_V: float
    driving_V: float
    limit: str
    cathode_fraction_of_iL: float

    @property
    def limit_text(self):
        return LIMITS[self.limit]


def solve(anode, cathode, A_anode_m2, A_cathode_m2, R_ohm, *, tol_V=1e-9, max_iter=200,
          guess_V=None, step_V=3e-3):
    """Galvanic current and electrode potentials of a two-member cell.

    Parameters
    ----------
    anode, cathode : Electrode
        The member of lower and of higher free-corrosion potential.
    A_anode_m2, A_cathode_m2 : float
        Wetted (kinetically active) areas [m²]; A_anode > 0, A_cathode ≥ 0.
    R_ohm : float
        Electrolyte resistance between the two surfaces [Ω], ≥ 0 (math.inf:
        no ionic path).
    tol_V : float
        Both electrode potentials are bracketed to this [V] before the last
        interpolation.
    guess_V : float, optional
        A likely anode potential [V] (a nearby cell's solution); the result
        is the same to within ``tol_V``, found with fewer evaluations.
    step_V : float
        How far from ``guess_V`` the root likely lies [V]: the first bracket's
        width (widened eightfold at a time until it holds the root).

    Returns
    -------
    Solution

    Example
    -------
    >>> st = Electrode(-0.66, 0.086, 0.054, 0.12, 1.0, i0_H_A_m2=1e-3)
    >>> br = Electrode(-0.18, 0.02, 0.06, 0.12, 1.0)
    >>> s = solve(st, br, 1e-4, 10.0, 10.0)          # 11 mm holiday, 10 m² bronze
    >>> s.current_A < (br.E_corr_V - st.E_corr_V) / 10.0   # below the ohmic limit
    True
    >>> s.limit
    'resistance'
    >>> abs(solve(st, br, 1e-4, 10.0, 10.0, guess_V=s.E_anode_V + 0.01).current_A
    ...     - s.current_A) < 1e-9 * s.current_A
    True
    """
    if not A_anode_m2 > 0:
        raise InputError("The anode needs a wetted area.", field="A_anode_m2",
                         value=A_anode_m2, allowed="> 0")
    if A_cathode_m2 < 0 or R_ohm < 0:
        raise InputError("Areas and resistances cannot be negative.", field="R_ohm",
                         value=R_ohm, allowed="≥ 0")
    lo, hi = anode.E_corr_V, cathode.E_corr_V
    driving = hi - lo
    own = anode.dissolution(lo)
    if driving <= 0 or A_cathode_m2 == 0 or math.isinf(R_ohm):
        return Solution(0.0, lo, hi, own, 0.0, own, 0.0, 0.0, 0.0, 0.0, max(driving, 0.0),
                        LIMIT_NONE, 0.0)
    Ea, I = _root(anode._net, cathode._net, A_anode_m2, A_cathode_m2, R_ohm, lo, hi,
                  tol_V, max_iter, guess_V, max(step_V, 10.0 * tol_V))
    Ec = min(Ea + I * R_ohm, cathode.E_corr_V)
    i_d = anode.dissolution(Ea)
    i_g = I / A_anode_m2
    eta_a = Ea - anode.E_corr_V
    eta_c = cathode.E_corr_V - Ec
    ohmic = I * R_ohm
    i_c = cathode.cathodic(Ec)
    frac = cathode.oxygen(Ec) / cathode.i_L_A_m2
    parts = {LIMIT_ANODE: eta_a, LIMIT_CATHODE: eta_c, LIMIT_RESISTANCE: ohmic}
    limit = max(parts, key=parts.get)
    return Solution(I, Ea, Ec, i_d, i_g, max(i_d - i_g, 0.0), i_c, eta_a, eta_c, ohmic,
                    driving, limit, frac)


def _root(net_a, net_c, A_a, A_c, R, lo, hi, tol_V, max_iter, guess, step):
    """(E_a, I) where h(E_a) = −A_c·n_c(E_a + I·R) − I = 0, I = A_a·max(n_a(E_a), 0).

    Brent's method on the bracket [lo, hi] (h(lo) ≥ 0 ≥ h(hi)). It stops when
    both E_a and E_c = E_a + I·R are bracketed to ``tol_V`` and interpolates h
    on the final bracket (near an ohmic limit the current is steep in E_a, so
    the bracket's midpoint alone would leave I·R off).
    """
    def h(Ea):
        n = net_a(Ea)
        I = A_a * n if n > 0.0 else 0.0
        return -A_c * net_c(Ea + I * R) - I, I

    # the bracket: [lo, hi], or a small one around a guess, widened until it holds
    a = None
    if guess is not None and lo < guess < hi:
        g, (fg, Ig) = guess, h(guess)
        if fg > 0:                       # root above the guess
            a, fa, Ia = g, fg, Ig
            while True:
                x = g + step
                if x >= hi:
                    b, (fb, Ib) = hi, h(hi)
                    break
                fb, Ib = h(x)
                b = x
                if fb <= 0:
                    break
                a, fa, Ia = x, fb, Ib
                step *= 8.0
        else:                            # root at or below the guess
            b, fb, Ib = g, fg, Ig
            while True:
                x = g - step
                if x <= lo:
                    a, (fa, Ia) = lo, h(lo)
                    break
                fa, Ia = h(x)
                a = x
                if fa > 0:
                    break
                b, fb, Ib = x, fa, Ia
                step *= 8.0
    if a is None:
        a, (fa, Ia) = lo, h(lo)
        b, (fb, Ib) = hi, h(hi)
    # Brent (zeroin): b is the best estimate, [b, c] brackets the root
    c, fc, Ic = a, fa, Ia
    d = e = b - a
    for _ in range(max_iter):
        if (fb > 0) == (fc > 0):
            c, fc, Ic = a, fa, Ia
            d = e = b - a
        if abs(fc) < abs(fb):
            a, fa, Ia = b, fb, Ib
            b, fb, Ib = c, fc, Ic
            c, fc, Ic = a, fa, Ia
        w = abs(c - b)
        if fb == 0 or (w <= tol_V and abs(Ic - Ib) * R <= tol_V):
            break
        # a step in E_a moves E_c by (1 + R·dI/dE_a) times as much
        tol1 = 0.5 * tol_V / (1.0 + R * abs(Ic - Ib) / w)
        m = 0.5 * (c - b)
        if abs(e) >= tol1 and abs(fa) > abs(fb):
            s = fb / fa
            if a == c:
                p, q = 2.0 * m * s, 1.0 - s
            else:
                q, r = fa / fc, fb / fc
                p = s * (2.0 * m * q * (q - r) - (b - a) * (r - 1.0))
                q = (q - 1.0) * (r - 1.0) * (s - 1.0)
            if p > 0:
                q = -q
            else:
                p = -p
            if 2.0 * p < min(3.0 * m * q - abs(tol1 * q), abs(e * q)):
                e, d = d, p / q
            else:
                d = e = m
        else:
            d = e = m
        a, fa, Ia = b, fb, Ib
        b += d if abs(d) > tol1 else (tol1 if m > 0 else -tol1)
        fb, Ib = h(b)
    if fb == 0:
        return b, Ib
    x0, f0, x1, f1 = (b, fb, c, fc) if b < c else (c, fc, b, fb)
    Ea = x0 + (x1 - x0) * f0 / (f0 - f1) if f0 > 0 > f1 else 0.5 * (x0 + x1)
    n = net_a(Ea)
    return Ea, (A_a * n if n > 0.0 else 0.0)


def softness_V(electrode, E):
    """β = n / (dn/dE) at E [V]: how far the potential must move to change the
    net current by a factor e (b/ln 10 on a Tafel line; large on a plateau).

    >>> el = Electrode(-0.66, 0.086, 0.054, 0.12, 1.0)
    >>> round(softness_V(el, -0.40), 4)          # ≈ b_a / ln 10 far up the anodic line
    0.0235
    """
    n = abs(electrode.net(E))
    dE = 1e-4
    dn = abs(electrode.net(E + dE) - electrode.net(E - dE)) / (2 * dE)
    if dn <= 0:
        return math.inf
    return n / dn if n > 0 else math.inf


def spread_length_m(beta_V, current_A, resistivity_ohm_m, r0_m, film_m=None):
    """Distance from a site's edge over which its galvanic current leaves the
    surrounding member [m] (``current_A`` is the current of one site face).

    The ohmic drop in the electrolyte between the site's edge (r₀) and r₀ + λ
    equals the member's softness β (Wagner's criterion: the distribution is
    set by the ratio of the kinetic to the ohmic potential variation):

    * bulk (point source on an insulating plane, Φ(r) = I·ρ/(2π·r)):
      I·ρ/(2π)·(1/r₀ − 1/(r₀+λ)) = β; λ = ∞ when I·ρ/(2π·r₀) ≤ β;
    * thin film of thickness h (radial flow, Φ = I·ρ/(2π·h)·ln r):
      λ = r₀·(exp(2π·h·β/(I·ρ)) − 1).

    >>> round(spread_length_m(0.026, 1e-4, 3.3, 0.01, film_m=3e-5) * 1000, 3)   # mm
    0.15
    >>> spread_length_m(0.026, 1e-3, 0.2, 0.01)                  # bulk seawater: all of it
    inf
    """
    if current_A <= 0 or resistivity_ohm_m <= 0 or math.isinf(beta_V):
        return math.inf
    if film_m is None:
        k = 1.0 / r0_m - 2.0 * math.pi * beta_V / (current_A * resistivity_ohm_m)
        return math.inf if k <= 0 else 1.0 / k - r0_m
    x = 2.0 * math.pi * film_m * beta_V / (current_A * resistivity_ohm_m)
    return math.inf if x > 700 else r0_m * math.expm1(x)


def with_limit(electrode, i_L_A_m2):
    """The same electrode in an electrolyte of a different oxygen limit."""
    return replace(electrode, i_L_A_m2=i_L_A_m2,
                   i_corr_A_m2=min(electrode.i_corr_A_m2, 0.999 * i_L_A_m2))


def curve(electrode, E_values):
    """Sampled (E, dissolution, cathodic) for the polarization diagram."""
    return [(E, electrode.dissolution(E), electrode.cathodic(E)) for E in E_values]
