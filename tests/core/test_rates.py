"""Unit and property tests of noblegap.rates (regression pins say so)."""

import math

import pytest
from hypothesis import given, strategies as st

from noblegap.methods import faraday as rates
from noblegap.errors import InputError

pos = st.floats(min_value=1e-6, max_value=1e3, allow_nan=False, allow_infinity=False)
nonneg = st.floats(min_value=0.0, max_value=1e3, allow_nan=False, allow_infinity=False)


def test_k_is_recomputed_from_codata_not_typed():
    # regression pin: 3.2685e-3 from F = 96485.33212 C/mol and a 365-day year
    assert rates.k_mm_per_yr() == pytest.approx(3.2685e-3, rel=1e-4)


def test_mm_per_yr_equals_g102_form():
    i_uA_cm2, EW, rho = 3.7, 27.92, 7.87
    expected = rates.k_mm_per_yr() * i_uA_cm2 * EW / rho
    got = rates.penetration_mm_per_yr(rates.uA_cm2_to_A_m2(i_uA_cm2), EW, rho)
    assert got == pytest.approx(expected, rel=1e-12)


def test_mpy_conversion():
    assert rates.mm_per_yr_to_mpy(0.0254) == pytest.approx(1.0)


def test_current_density_conversions_round_trip():
    assert rates.A_m2_to_uA_cm2(rates.uA_cm2_to_A_m2(2.5)) == pytest.approx(2.5)


def test_equivalent_weight_weighted_form():
    # 70/30 mixture, each element's n f / W summed (G102 weighted form)
    ew = rates.equivalent_weight([(0.7, 63.546, 2), (0.3, 58.693, 2)])
    assert ew == pytest.approx(1 / (2 * 0.7 / 63.546 + 2 * 0.3 / 58.693))


def test_equivalent_weight_needs_a_dissolving_element():
    with pytest.raises(InputError, match="No dissolving element"):
        rates.equivalent_weight([(0.0, 55.845, 2)])


@pytest.mark.parametrize("args, name", [
    ((-0.1, 27.92, 7.87), "i_A_m2"),
    ((0.1, 0.0, 7.87), "EW_g_mol"),
    ((0.1, 27.92, -1.0), "density_g_cm3"),
    ((math.nan, 27.92, 7.87), "i_A_m2"),
])
def test_penetration_rejects_bad_inputs(args, name):
    with pytest.raises(InputError, match=name):
        rates.penetration_rate_m_per_s(*args)


def test_catchment_rule_formula():
    # i_a = i_L (A_c + A_a) / A_a
    assert rates.catchment_current_density(0.1, 9.0, 1.0) == pytest.approx(1.0)


def test_catchment_no_cathode_gives_own_rate():
    assert rates.catchment_current_density(0.1, 0.0, 2.0) == pytest.approx(0.1)
    assert rates.galvanic_current_A(0.1, 0.0) == 0.0


def test_catchment_rejects_zero_anode_area():
    with pytest.raises(InputError, match="A_anode_m2"):
        rates.catchment_current_density(0.1, 1.0, 0.0)


def test_catchment_rejects_negative_cathode_area():
    with pytest.raises(InputError, match="A_cathode_m2"):
        rates.catchment_current_density(0.1, -1.0, 1.0)


@given(iL=pos, Ac=nonneg, Aa=pos, extra=pos)
def test_larger_cathode_never_lowers_anode_rate(iL, Ac, Aa, extra):
    assert (rates.catchment_current_density(iL, Ac + extra, Aa)
            >= rates.catchment_current_density(iL, Ac, Aa))


@given(iL=pos, Ac=nonneg, Aa=pos)
def test_charge_balance_of_catchment(iL, Ac, Aa):
    # anode dissolution = galvanic current + oxygen collected on the anode itself
    total = rates.catchment_current_density(iL, Ac, Aa) * Aa
    assert total == pytest.approx(rates.galvanic_current_A(iL, Ac) + iL * Aa, rel=1e-9)


@given(i=nonneg, EW=pos, rho=st.floats(min_value=0.5, max_value=23))
def test_rate_is_linear_in_current(i, EW, rho):
    one = rates.penetration_rate_m_per_s(1.0, EW, rho)
    assert rates.penetration_rate_m_per_s(i, EW, rho) == pytest.approx(i * one, rel=1e-12)


def test_years_to_consume_finite():
    life = rates.years_to_consume(1e-3, 1e-4)
    assert life.status == rates.LIFE_FINITE and life.years == pytest.approx(10.0)


def test_years_to_consume_zero_rate_is_no_attack():
    life = rates.years_to_consume(1e-3, 0.0)
    assert life.years is None and life.status == rates.LIFE_NO_ATTACK
    assert "no galvanic attack" in life.text


def test_years_to_consume_beyond_1000_years_is_flagged():
    life = rates.years_to_consume(1e-3, 1e-7)
    assert life.years is None and life.status == rates.LIFE_BEYOND
    assert "beyond 1000" in life.text


def test_years_to_consume_rejects_zero_allowance():
    with pytest.raises(InputError, match="allowance_m"):
        rates.years_to_consume(0.0, 1e-4)
