"""Tests of the mixed-potential solver (noblegap.kinetics).

numpy is used here only as an independent reference: a dense grid search of
the current balance, written without the solver's bisection.
"""


import numpy as np
import pytest
from hypothesis import given, settings, strategies as st

from noblegap.methods import kinetics
from noblegap.errors import InputError, MissingDataError
from noblegap.methods.kinetics import Electrode, solve_couple


def _np_net(e, E):
    """Vectorised f(E) written from the module docstring's formulas."""
    ia = e.i_corr_A_m2 * 10.0 ** ((E - e.E_corr_V) / e.b_a_V)
    ix = e.i_corr_A_m2 / (1 - e.i_corr_A_m2 / e.i_limit_A_m2)
    act = ix * 10.0 ** (-(E - e.E_corr_V) / e.b_c_V)
    ic = act / (1 + act / e.i_limit_A_m2)
    return ia - ic


def _grid_couple(electrodes, n=400001):
    lo = min(e.E_corr_V for e in electrodes) - 0.01
    hi = max(e.E_corr_V for e in electrodes) + 0.01
    E = np.linspace(lo, hi, n)
    tot = sum(e.area_m2 * _np_net(e, E) for e in electrodes)
    k = int(np.argmin(np.abs(tot)))
    return E[k], (hi - lo) / (n - 1)


electrode = st.builds(
    lambda name, E, i, ba, bc, iL_factor, A: Electrode(name, E, i, ba, bc, i * iL_factor, A),
    st.just("m"),
    st.floats(-1.6, 0.3),
    st.floats(1e-4, 0.5),
    st.floats(0.03, 0.2),
    st.floats(0.05, 0.3),
    st.floats(1.5, 1e3),
    st.floats(1e-4, 10.0),
)


def test_free_corrosion_state_balances():
    e = Electrode("steel", -0.65, 0.05, 0.054, 0.12, 0.5)
    assert e.anodic(-0.65) == pytest.approx(0.05)
    assert e.cathodic(-0.65) == pytest.approx(0.05)
    assert e.net(-0.65) == pytest.approx(0.0, abs=1e-15)


def test_cathodic_branch_never_exceeds_limit():
    e = Electrode("steel", -0.65, 0.05, 0.054, 0.12, 0.5)
    assert e.cathodic(-3.0) <= 0.5
    assert e.cathodic(-3.0) == pytest.approx(0.5, rel=1e-6)


@settings(max_examples=60, deadline=None)
@given(a=electrode, b=electrode)
def test_solver_matches_numpy_grid_search(a, b):
    s = solve_couple([a, b])
    E_grid, step = _grid_couple([a, b])
    assert abs(s.E_couple_V - E_grid) <= 2 * step + 1e-9


@settings(max_examples=60, deadline=None)
@given(a=electrode, b=electrode)
def test_couple_lies_between_free_potentials_and_balances(a, b):
    s = solve_couple([a, b])
    assert min(a.E_corr_V, b.E_corr_V) - 1e-9 <= s.E_couple_V <= max(a.E_corr_V, b.E_corr_V) + 1e-9
    scale = a.area_m2 * a.i_limit_A_m2 + b.area_m2 * b.i_limit_A_m2
    assert abs(s.residual_A) <= 1e-6 * scale


@settings(max_examples=40, deadline=None)
@given(a=electrode, b=electrode, k=st.floats(1.1, 100.0))
def test_larger_cathode_never_slows_the_anode(a, b, k):
    anode, cathode = (a, b) if a.E_corr_V <= b.E_corr_V else (b, a)
    s1 = solve_couple([anode, cathode])
    bigger = Electrode(cathode.name, cathode.E_corr_V, cathode.i_corr_A_m2, cathode.b_a_V,
                       cathode.b_c_V, cathode.i_limit_A_m2, cathode.area_m2 * k)
    s2 = solve_couple([anode, bigger])
    assert s2.anodic_A_m2[0] >= s1.anodic_A_m2[0] * (1 - 1e-9)


def test_cathode_of_zero_area_leaves_free_corrosion():
    a = Electrode("zinc", -1.0, 0.05, 0.04, 0.12, 0.5, 1.0)
    b = Electrode("steel", -0.65, 0.05, 0.054, 0.12, 0.5, 0.0)
    s = solve_couple([a, b])
    assert s.E_couple_V == pytest.approx(-1.0, abs=1e-8)
    assert s.galvanic_current_A == pytest.approx(0.0, abs=1e-9)


def test_large_cathode_drives_anode_towards_catchment_limit():
    # with the cathode at its oxygen limit, the anode's dissolution tends to
    # i_L (A_c + A_a)/A_a — the catchment rule is the limiting case
    iL = 0.5
    a = Electrode("anode", -1.0, 0.01, 0.03, 0.12, iL, 0.01)
    b = Electrode("cathode", 0.0, 1e-4, 0.1, 0.05, iL, 1.0)
    s = solve_couple([a, b])
    assert s.anodic_A_m2[0] == pytest.approx(iL * (1.0 + 0.01) / 0.01, rel=0.05)


def test_electrode_rejects_corrosion_current_above_limit():
    with pytest.raises(InputError, match="oxygen limiting current"):
        Electrode("x", -0.5, 1.0, 0.05, 0.1, 0.5)


def test_electrode_rejects_nonpositive_slope():
    with pytest.raises(InputError, match="b_a_V"):
        Electrode("x", -0.5, 0.01, 0.0, 0.1, 0.5)


def test_solver_rejects_all_zero_areas():
    with pytest.raises(InputError, match="wetted area"):
        solve_couple([Electrode("x", -0.5, 0.01, 0.05, 0.1, 0.5, 0.0)])


def test_missing_kinetics_data_names_the_alloy():
    with pytest.raises(MissingDataError, match="no-such-alloy"):
        kinetics.kinetics_row("no-such-alloy", "seawater_flowing")
