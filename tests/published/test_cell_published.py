"""The galvanic-cell model's parts against published values.

Sources (data/sources.csv):
``pss78`` — Lewis (1980), the Practical Salinity Scale 1978 (UNESCO Tech. Pap. Mar.
Sci. 36/37, 1981): C(35, 15 °C, 0) = 42.914 mS/cm defines the scale.
``fofonoff_millard1983`` — Fofonoff & Millard, UNESCO Tech. Pap. Mar. Sci. 44 (1983),
check values of the salinity algorithm: R = 1, t68 = 15 °C, p = 0 → S = 35.000;
R = 1.2, t68 = 20 °C, p = 2000 dbar → S = 37.245 (37.246 in other reproductions;
printed to 3 decimals, so ±0.0015 admits both).
``newman1966`` — Newman, J. Electrochem. Soc. 113 (1966) 501: R = ρ/(4r) for a disk
electrode in an insulating plane (equivalently, the disk's conductance is 4κr).
``astm_g102`` — ASTM G102: CR = K·i·EW/ρ; at 1 µA/cm² iron (EW 27.92, ρ 7.87) loses
0.0116 mm/yr, so a galvanic current density of 1 A/m² = 100 µA/cm² gives 1.16 mm/yr.
"""

import pytest

from noblegap.methods import electrolyte, faraday, galvanic


def test_pss78_check_value_R_1_t_15_p_0_gives_S_35():
    # Fofonoff & Millard (1983), salinity check value: S = 35.000
    assert electrolyte.salinity_from_ratio(1.0, 15.0, 0.0) == pytest.approx(35.000, abs=0.0005)


def test_pss78_check_value_R_1_2_t_20_p_2000_gives_S_37_245():
    # Fofonoff & Millard (1983), salinity check value: S = 37.245 at R = 1.2, 20 °C, 2000 dbar
    assert electrolyte.salinity_from_ratio(1.2, 20.0, 2000.0) == pytest.approx(37.245,
                                                                               abs=0.0015)


def test_pss78_reference_conductivity_42_914_mS_cm():
    # PSS-78 definition: S = 35 at 15 °C (IPTS-68), p = 0 has C = 42.914 mS/cm = 4.2914 S/m
    t90 = 15.0 / 1.00024
    assert electrolyte.seawater_conductivity(35.0, t90) == pytest.approx(4.2914, abs=0.00005)


def test_newman_disk_resistance_rho_over_4r():
    # Newman (1966): R = ρ/(4r); a 10 mm disk (r = 5 mm) in ρ = 0.2 Ω·m seawater → 10 Ω
    assert electrolyte.disk_resistance_ohm(0.2, 0.005) == pytest.approx(10.0, rel=1e-12)
    # and its conductance is 4κr for any size
    for r in (1e-4, 1e-2, 1.0):
        assert 1 / electrolyte.disk_resistance_ohm(1 / 5.0, r) == pytest.approx(4 * 5.0 * r)


def test_faraday_1_A_m2_on_iron_is_1_16_mm_per_yr_in_the_cell_path():
    # ASTM G102: 0.0116 mm/yr per µA/cm² for iron → 1.16 mm/yr at 1 A/m²; the cell
    # model's own conversion (galvanic._rate) must reproduce it
    row = {"equivalent_weight_g_mol": 27.92, "density_g_cm3": 7.87}
    assert galvanic._rate(1.0, row) == pytest.approx(1.16, abs=0.005)
    assert faraday.penetration_mm_per_yr(1.0, 27.92, 7.87) == pytest.approx(1.16, abs=0.005)
