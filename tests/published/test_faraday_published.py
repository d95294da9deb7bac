"""Faraday's law against published values.

Sources (data/sources.csv): ``astm_g102`` — ASTM G102, Eq. 1–3 and Table 1
(K constants, CR = K·i·EW/ρ); ``openstax_chem2e`` — OpenStax Chemistry 2e,
Example 17.9 (silver plating). Tolerances follow the printed precision: a
value printed as 0.0116 is checked to ±0.00005.
"""

import pytest

from noblegap.methods import faraday as rates

I_1_UA_CM2 = rates.uA_cm2_to_A_m2(1.0)   # 1 µA/cm² = 0.01 A/m²


def test_astm_g102_K_mm_per_yr_printed_3_27e_3():
    # ASTM G102 Table 1 prints K = 3.27e-3 mm·g/(µA·cm·yr)
    assert rates.k_mm_per_yr() == pytest.approx(3.27e-3, abs=0.005e-3)


def test_astm_g102_K_mpy_printed_0_1288():
    # ASTM G102 Table 1 prints K = 0.1288 mpy·g/(µA·cm); recomputed 0.12868
    assert rates.k_mpy() == pytest.approx(0.1288, abs=0.00025)


@pytest.mark.parametrize("metal, EW, rho, mm_per_yr", [
    # ASTM G102 worked rates at i = 1 µA/cm² (published-values §4; EW and ρ as printed)
    ("iron", 27.92, 7.87, 0.0116),
    ("zinc", 32.69, 7.13, 0.0150),
    ("aluminium", 8.99, 2.70, 0.0109),
    ("copper", 31.77, 8.96, 0.0116),
])
def test_astm_g102_rate_at_1_uA_cm2(metal, EW, rho, mm_per_yr):
    got = rates.penetration_mm_per_yr(I_1_UA_CM2, EW, rho)
    assert got == pytest.approx(mm_per_yr, abs=0.00005), metal


def test_astm_g102_iron_at_1_uA_cm2_is_0_457_mpy():
    # ASTM G102: iron, 1 µA/cm² → 0.457 mpy
    mpy = rates.mm_per_yr_to_mpy(rates.penetration_mm_per_yr(I_1_UA_CM2, 27.92, 7.87))
    assert mpy == pytest.approx(0.457, abs=0.0005)


def test_openstax_chem2e_example_17_9_moles_of_electrons():
    # OpenStax Chemistry 2e, Example 17.9: 10.23 A for 1.00 h → 0.3817 mol e-
    q = rates.charge_C(10.23, 3600.0)
    assert rates.moles_electrons(q) == pytest.approx(0.3817, abs=0.00005)


def test_openstax_chem2e_example_17_9_silver_mass():
    # OpenStax Chemistry 2e, Example 17.9: → 41.19 g Ag. The example works with
    # the molar mass of silver rounded to 107.9 g/mol; that is used here (with
    # 107.868 g/mol the same charge gives 41.17 g). The example also rounds
    # its intermediate to 0.3817 mol e-; unrounded, the chain gives 41.185 g,
    # so the tolerance is one unit of the last printed digit.
    q = rates.charge_C(10.23, 3600.0)
    assert rates.mass_from_charge_g(q, 107.9, 1) == pytest.approx(41.19, abs=0.01)
