"""Nernst correction against published worked examples.

Each check names its source beside it and asserts the published value with a
tolerance set by the precision the source prints (half a unit of the last
printed digit). Regression pins of our own table-based results are separate
tests and say so.
"""

import math

import pytest

from noblegap.calculators import nernst as nernst_page
from noblegap.methods import nernst


# OpenStax Chemistry 2e, Example 17.8: Zn | Zn2+ (0.10 M) || Zn2+ (0.50 M) | Zn
# at 25 °C -> +0.021 V (printed to 3 decimals: tolerance 0.0005 V).
def test_openstax_chem2e_example_17_8_zinc_concentration_cell():
    out = nernst_page.compute_nernst("Zn", "Zn", "0.10 M", "0.50 M", temperature=298.15)
    assert out["E_cell_V"] == pytest.approx(0.021, abs=0.0005)
    assert out["n"] == 2
    assert out["anode"] == "Zn"          # the dilute side corrodes


# General chemistry worked example (Daniell cell): [Zn2+] = 0.1 M,
# [Cu2+] = 0.01 M, E° = 1.10 V, 25 °C -> 1.0704 V (4 decimals: tolerance 5e-5 V).
# The published arithmetic uses E° = 1.10 V, so it is checked with E° given.
def test_general_chemistry_daniell_cell_published_arithmetic():
    Q = 0.1 / 0.01                       # [Zn2+] / [Cu2+]
    assert nernst.cell_potential(1.10, 2, Q, 298.15) == pytest.approx(1.0704, abs=5e-5)


# OpenStax Chemistry 2e, Example 17.7: Co | Co2+ (0.15 M) || Fe2+ (1.94 M) | Fe,
# E°cell = -0.17 V, 25 °C -> -0.137 V (the book's own arithmetic; 3 decimals:
# tolerance 0.0005 V). Our table's E° differ (Co -0.28, Fe -0.447), so the
# published E°cell is passed directly.
def test_openstax_chem2e_example_17_7_cobalt_iron_cell():
    Q = 0.15 / 1.94                      # [Co2+] / [Fe2+]
    assert nernst.cell_potential(-0.17, 2, Q, 298.15) == pytest.approx(-0.137, abs=0.0005)


# CODATA 2018 (exact F = e·N_A and R = k·N_A): ln(10)·RT/F at 298.15 K = 59.159 mV
# (printed to 3 decimals in mV: tolerance 0.0005 mV).
def test_codata2018_nernst_slope_at_298_15_K():
    assert nernst.nernst_slope(298.15) * 1e3 == pytest.approx(59.159, abs=0.0005)
    assert nernst.thermal_voltage(298.15) * math.log(10) * 1e3 == pytest.approx(
        59.159, abs=0.0005)


# REGRESSION PIN (not a published value): the Daniell cell above computed from
# our table (CRC/OpenStax Appendix L: Cu 0.3419 V, Zn -0.7618 V, E° = 1.1037 V),
# temperature coefficients off. Pins the table-based result so edits are deliberate.
def test_regression_pin_daniell_cell_from_table():
    out = nernst_page.compute_nernst("Zn", "Cu", "0.1 mol/L", "0.01 mol/L", temperature=298.15,
                                temperature_coefficient="off")
    assert out["E0_cell_V"] == pytest.approx(1.1037, abs=1e-12)
    assert out["E_cell_V"] == pytest.approx(1.074120, abs=1e-6)
    assert out["Q"] == pytest.approx(10.0, rel=1e-12)
