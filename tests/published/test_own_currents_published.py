"""Own (uncoupled) corrosion currents in seawater against the rates their sources print.

Each current is checked back to the printed rate by Faraday's law as ASTM G102 writes
it (g102.py), using the EW and density
of the alloy the row's locator names.

Sources (ids in data/sources.csv):
- efc_al_seawater_chapter: 5000-series aluminium alloys in stagnant and low-flow
  seawater, uniform corrosion rate below 1 µm/y (a ceiling, taken as low and likely).
- duan2022_5a06_deepsea: Al-Mg alloy 5A06, one year in the deep sea, highest average
  corrosion rate 13.8 µm/a (1200 m), taken as aluminium's high case.
- atrens2022_mg_progress: intrinsic Mg corrosion rate 0.3 mm/y in a chloride solution
  (weight loss); many Mg alloys 0.3-1.0 mm/y (abstract).
Values marked from memory are never checked here as values.
"""

import pytest

from g102 import rate_mm_per_yr
from noblegap.materials import cell_data


@pytest.mark.parametrize("column, printed_um_yr", [
    # Chapter summary: uniform corrosion rate lies below 1 µm/y (low and likely);
    # Duan et al. 2022 abstract: highest value 13.8 µm a-1 (high).
    ("i_corr_low_A_m2", "1"), ("i_corr_A_m2", "1"), ("i_corr_high_A_m2", "13.8"),
])
def test_aluminium_own_current_from_printed_seawater_rates(column, printed_um_yr):
    row = cell_data.kinetics_row("A95083")
    assert row["id"] == "aluminium"
    assert row["source_id"] == "efc_al_seawater_chapter"
    assert row["confidence"] == "handbook-compiled"
    rate_um = 1000 * rate_mm_per_yr(row[column], "A95083")
    assert rate_um == pytest.approx(float(printed_um_yr), rel=0.03)


@pytest.mark.parametrize("column, printed_mm_yr", [
    # Abstract (iii): intrinsic Mg corrosion rate 0.3 mm/y (low and likely);
    # (iv): many Mg alloys with corrosion rates between 0.3 and 1.0 mm/y (high).
    ("i_corr_low_A_m2", "0.3"), ("i_corr_A_m2", "0.3"), ("i_corr_high_A_m2", "1.0"),
])
def test_magnesium_own_current_from_printed_chloride_rates(column, printed_mm_yr):
    row = cell_data.kinetics_row("magnesium")
    assert row["id"] == "magnesium"
    assert row["source_id"] == "atrens2022_mg_progress"
    assert row["confidence"] == "handbook-compiled"
    assert rate_mm_per_yr(row[column], "magnesium") == pytest.approx(float(printed_mm_yr), rel=0.03)
