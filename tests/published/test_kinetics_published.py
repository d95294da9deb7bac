"""Cell-kinetics, electrolyte and anode-shape values against what their sources print.

Sources (ids in data/sources.csv):
- dnv_b401_tables_repo: DNV-RP-B401 (2010, amended 2011) Table 10-1 (initial and final
  design current densities, A/m², bare metal in seawater, by depth and climatic region),
  Table 10-2 (mean design current densities) and Table 10-8 (anode utilisation factors),
  as transcribed in the public repository named there (Table 10-8 also as the 2017
  edition's Table A-8).
- rfmaterials_steel_seawater: carbon steel about 0.1 mm/y in quiescent seawater, about
  0.8 mm/y at 3 m/s.
- melchers2021: longer-term rate of steel in seawater at about 20 °C, 0.06 mm/y.
- gaa_zinc_waters: zinc in sea water 15-25 µm per annum.
- marine_ecology_temps_web: seawater of salinity 35 freezes at about -1.9 °C; much
  low-latitude surface water is at 26-30 °C. physics_factbook_ocean_temp: the average
  ocean surface temperature is about 17 °C.
- defstan_01_2_seawater_table: one-year general corrosion rates in seawater (Table 7):
  gunmetal G1 0.025, cast nickel aluminium bronze AB2 0.06, high-tensile brass 0.18 mm/year;
  phosphorus deoxidised copper C106 0.04 mm/year.
  austenitic cast iron (AUS 202) 0.075 mm/year.
- mil_hdbk_1004_10: aluminium is protected by a 100 mV negative polarization shift and
  should not be driven more negative than -1.20 V against copper/copper sulfate.
- abs_gn_cp_ships_repo: ABS Guidance Notes on Cathodic Protection of Ships (2017), Section 2
  Table 1, minimum negative protection potentials vs Ag/AgCl/seawater: austenitic stainless
  steel of PRE below 40 -0.60 V; copper alloys -0.45 to -0.60 V.
- jcorr2001_cu_carbonate_chloride: anodic Tafel slope of copper in weak alkaline carbonate
  solution containing chloride, region I, 60 mV/decade (with nishikata1990_cu_carbonate_chloride,
  60 mV/decade in alkaline solution); applied to copper, copper alloys and copper-nickel.
- jsms1981_ss_pitting_stress: pitting initiation potential in 3 % NaCl without stress, SUS 316
  about +0.20 V and SUS 430 about 0.00 V vs SCE (applied to seawater by analogy).
- baugh1979_zinc_nacl: zinc in molar NaCl at pH 3.8, anodic slope approx. 25 mV per decade
  (applied to seawater by analogy).
- elaal2003_ni_hcl: nickel in hydrochloric acid solutions, anodic Tafel slope 120 ± 10 mV per
  decade (applied to seawater by analogy).
- venice_system_web: Venice system (1959) salinity classes, mesohaline 5 to 18.
- usgs_stream_temps_web: stream temperatures between 0 and 20 °C in winter, peaking around 30 °C.
- corrosion_doctors_cp_current: bare steel in fresh water at zero or low velocities needs 22 to
  65 mA/m2 of protective current.
- sato1973_al_pitting_ph: pure aluminium in 0.5 N NaCl at pH 8, second pitting potential
  -0.70 V vs SCE (applied to seawater and to the aluminium alloys by analogy).
- duan2019_316l_sea: 316L exposed one year in the sea, highest corrosion rate 0.96 µm/y; the
  3000 m rate is 3.2 times the shallow-sea rate (abstract).
- abs_gn_ships_table3_repo: ABS Guidance Notes on Cathodic Protection of Ships (2017), Section 2
  Table 3, typical design current densities of bare steel by water velocity: V <= 1 m/s with
  tidal influence 150-250 mA/m2; 1 < V < 10 m/s 220-350 mA/m2.
Values marked from memory are never checked here as values.
"""

import pytest

from g102 import rate_mm_per_yr
from noblegap.materials import anode_data, cell_data, data, references


@pytest.mark.parametrize("shape, printed", [
    # Table 10-8: long slender stand-off (L >= 4r) 0.90; short slender stand-off
    # (L < 4r) 0.85; short flush-mounted, bracelet and other types 0.80.
    ("standoff_long", "0.90"), ("standoff_short", "0.85"), ("flush", "0.80"),
])
def test_anode_utilisation_factor_dnv_table_10_8(shape, printed):
    row = anode_data.shape(shape)
    assert row["source_id"] == "dnv_b401_tables_repo"
    assert row["confidence"] == "handbook-compiled"
    assert row["utilisation_fraction"] == pytest.approx(float(printed), abs=0.005)


@pytest.mark.parametrize("column, printed", [
    # Depth 0-30 m: Table 10-2 mean, tropical (> 20 °C) 0.070; Table 10-2 mean,
    # sub-tropical (12-20 °C) 0.080; Table 10-1 initial, arctic (< 7 °C) 0.250.
    ("i_L_low_A_m2", "0.070"), ("i_L_A_m2", "0.080"), ("i_L_high_A_m2", "0.250"),
])
def test_quiescent_seawater_oxygen_limit_from_design_current_densities(column, printed):
    row = data.index("electrolytes")["seawater_quiescent"]
    assert row["iL_source_id"] == "dnv_b401_tables_repo"
    assert row[column] == pytest.approx(float(printed), abs=0.0005)


@pytest.mark.parametrize("env, column, printed_mA_m2", [
    # Section 2 Table 3, bare steel: 1 < V < 10 m/s 220-350 mA/m2 (flowing seawater);
    # V <= 1 m/s with tidal influence 150-250 mA/m2 (applied to brackish estuary water).
    # The likely value is the middle of the printed band.
    ("seawater_flowing", "i_L_low_A_m2", "220"), ("seawater_flowing", "i_L_high_A_m2", "350"),
    ("seawater_flowing", "i_L_A_m2", "285"),
    ("brackish", "i_L_low_A_m2", "150"), ("brackish", "i_L_high_A_m2", "250"),
    ("brackish", "i_L_A_m2", "200"),
])
def test_moving_and_tidal_water_oxygen_limit_from_ship_design_current_densities(
        env, column, printed_mA_m2):
    row = data.index("electrolytes")[env]
    assert row["iL_source_id"] == "abs_gn_ships_table3_repo"
    assert row["iL_confidence"] == "handbook-compiled"
    assert row[column] * 1000 == pytest.approx(float(printed_mA_m2), abs=0.5)


@pytest.mark.parametrize("column, printed_mm_yr", [
    # melchers2021: 0.06 mm/y longer term; rfmaterials_steel_seawater: 0.1 mm/y
    # quiescent, 0.8 mm/y at 3 m/s.
    ("i_corr_low_A_m2", "0.06"), ("i_corr_A_m2", "0.1"), ("i_corr_high_A_m2", "0.8"),
])
def test_steel_own_rate_from_the_printed_seawater_rates(column, printed_mm_yr):
    # ASTM G102: CR = K i EW / rho, K = 3.27e-3 mm g/(uA cm yr), with the carbon_steel
    # row's EW and density. The table stores two significant figures.
    row = next(r for r in data.table("cell_kinetics") if r["id"] == "steel")
    assert row["source_id"] == "rfmaterials_steel_seawater"
    cr = rate_mm_per_yr(row[column], "carbon_steel")
    assert cr == pytest.approx(float(printed_mm_yr), rel=0.02)


@pytest.mark.parametrize("column, printed_um_yr", [
    # gaa_zinc_waters: sea water 15 - 25 µm per annum; likely the middle of the band.
    ("i_corr_low_A_m2", "15"), ("i_corr_A_m2", "20"), ("i_corr_high_A_m2", "25"),
])
def test_zinc_own_rate_from_the_printed_sea_water_band(column, printed_um_yr):
    row = next(r for r in data.table("cell_kinetics") if r["id"] == "zinc")
    assert row["source_id"] == "gaa_zinc_waters"
    cr_um = 1000 * rate_mm_per_yr(row[column], "zinc")
    assert cr_um == pytest.approx(float(printed_um_yr), rel=0.03)


@pytest.mark.parametrize("env", ["seawater_quiescent", "seawater_flowing"])
@pytest.mark.parametrize("column, printed", [
    ("T_low_degC", "-1.9"), ("T_degC", "17"), ("T_high_degC", "30"),
])
def test_natural_seawater_temperatures(env, column, printed):
    # Natural seawater, still or flowing: the temperatures only set the conductivity.
    row = data.index("electrolytes")[env]
    assert row["T_source_id"] == "marine_ecology_temps_web"
    decimals = len(printed.split(".")[1]) if "." in printed else 0
    assert row[column] == pytest.approx(float(printed), abs=0.5 * 10 ** -decimals)


def test_aluminium_protection_criterion_mil_hdbk_1004_10():
    # §3.3.1.2: 100 mV or greater negative polarization shift; precautionary note at
    # -1.20 V against saturated copper/copper sulfate.
    crit = anode_data.criterion("aluminium")
    row = crit["row"]
    assert row["source_id"] == "mil_hdbk_1004_10"
    assert crit["E_protect_V_SCE"] is None
    assert crit["shift_V"] == pytest.approx(0.100, abs=0.0005)
    assert row["reference"] == "cse"
    assert row["E_limit_V"] == pytest.approx(-1.20, abs=0.005)
    assert crit["E_limit_V_SCE"] == pytest.approx(
        references.to_scale(-1.20, "cse", "sce"), abs=1e-9)


@pytest.mark.parametrize("column, printed_mm_yr", [
    # Table 7 general corrosion, mm/year: gunmetal G1 0.025; nickel aluminium bronze AB2
    # 0.06; high-tensile brass CZ115 / HTB1 0.18.
    ("i_corr_low_A_m2", "0.025"), ("i_corr_A_m2", "0.06"), ("i_corr_high_A_m2", "0.18"),
])
def test_copper_alloy_own_rate_from_the_one_year_raft_table(column, printed_mm_yr):
    row = next(r for r in data.table("cell_kinetics") if r["id"] == "copper_alloy")
    assert row["source_id"] == "defstan_01_2_seawater_table"
    cr = rate_mm_per_yr(row[column], "C95800")
    assert cr == pytest.approx(float(printed_mm_yr), rel=0.03)


@pytest.mark.parametrize("column", ["i_corr_low_A_m2", "i_corr_A_m2", "i_corr_high_A_m2"])
def test_copper_own_rate_from_the_one_year_raft_table(column):
    # Table 7 general corrosion, mm/year: phosphorus deoxidised copper C106 0.04, the
    # table's only unalloyed copper (one rate, so low, likely and high alike).
    row = cell_data.kinetics_row("copper")
    assert row["id"] == "copper"
    assert row["source_id"] == "defstan_01_2_seawater_table"
    assert row["confidence"] == "handbook-compiled"
    cr = rate_mm_per_yr(row[column], "copper")
    assert cr == pytest.approx(0.04, rel=0.03)


@pytest.mark.parametrize("alloy, printed", [
    # Section 2 Table 1, minimum negative potential vs Ag/AgCl/seawater: austenitic stainless
    # steel, PRE < 40, -0.60 V; copper alloys -0.45 to -0.60 V (the less negative end applied).
    ("S31600", "-0.60"), ("C95800", "-0.45"),
])
def test_protection_potentials_abs_ship_guidance_table(alloy, printed):
    crit = anode_data.criterion(alloy)
    row = crit["row"]
    assert row["source_id"] == "abs_gn_cp_ships_repo"
    assert row["confidence"] == "handbook-compiled"
    assert row["reference"] == "ag_agcl_seawater"
    assert row["E_protect_V"] == pytest.approx(float(printed), abs=0.005)
    assert crit["E_protect_V_SCE"] == pytest.approx(
        references.to_scale(float(printed), "ag_agcl_seawater", "sce"), abs=1e-9)


@pytest.mark.parametrize("row_id", ["copper", "copper_alloy", "copper_nickel"])
def test_copper_anodic_slope_weak_alkaline_chloride_carbonate(row_id):
    # Abstract: region I (Cu(I) dissolution) Tafel slope 60 mV/decade.
    row = data.index("cell_kinetics")[row_id]
    assert row["ba_source_id"] == "jcorr2001_cu_carbonate_chloride"
    assert row["ba_confidence"] == "handbook-compiled"
    assert row["b_a_mV_per_decade"] == pytest.approx(60, abs=0.5)


def test_316_breakdown_potential_3pct_nacl():
    # Abstract, result (1): SUS 316 about +0.20 V (vs. S.C.E.) under no stress.
    row = cell_data.kinetics_row("S31600")
    assert row["id"] == "stainless_molybdenum"
    assert row["eb_source_id"] == "jsms1981_ss_pitting_stress"
    assert row["eb_confidence"] == "handbook-compiled"
    assert row["E_b_V_SCE"] == pytest.approx(0.20, abs=0.005)
    assert "breakdown potential: " in cell_data.kinetics_cite(row)["text"]


@pytest.mark.parametrize("alloy_id", ["S43000", "S41000"])
def test_ferritic_breakdown_potential_3pct_nacl(alloy_id):
    # Abstract, result (1): SUS 430 about 0.00 V (vs. S.C.E.) under no stress; the row
    # of 430 also holds the 13 % Cr grades.
    row = cell_data.kinetics_row(alloy_id)
    assert row["id"] == "stainless_ferritic"
    assert row["eb_source_id"] == "jsms1981_ss_pitting_stress"
    assert row["eb_confidence"] == "handbook-compiled"
    assert row["E_b_V_SCE"] == pytest.approx(0.00, abs=0.005)


def test_zinc_anodic_slope_molar_nacl():
    # Introduction, Figure 2: the anodic curves have an identical slope (approx. 25 mV per
    # decade) in NH4Cl and in NaCl at pH 3.8.
    row = data.index("cell_kinetics")["zinc"]
    assert row["ba_source_id"] == "baugh1979_zinc_nacl"
    assert row["ba_confidence"] == "handbook-compiled"
    assert row["b_a_mV_per_decade"] == pytest.approx(25, abs=0.5)


@pytest.mark.parametrize("column, printed", [
    # Venice system: mesohaline from 5 to 18 (the class bounds); likely the middle.
    ("salinity_low_psu", "5"), ("salinity_high_psu", "18"),
])
def test_brackish_salinity_venice_system(column, printed):
    row = data.index("electrolytes")["brackish"]
    assert row["salinity_source_id"] == "venice_system_web"
    assert row[column] == pytest.approx(float(printed), abs=0.5)
    assert row["salinity_psu"] == pytest.approx((5 + 18) / 2, abs=0.05)


@pytest.mark.parametrize("env", ["freshwater", "brackish"])
def test_fresh_and_brackish_water_temperatures_usgs_streams(env):
    # Stream temperatures between 0 and 20 °C in winter, peaking around 30 °C in summer;
    # likely the middle of the band.
    row = data.index("electrolytes")[env]
    assert row["T_source_id"] == "usgs_stream_temps_web"
    assert row["T_low_degC"] == pytest.approx(0, abs=0.5)
    assert row["T_high_degC"] == pytest.approx(30, abs=0.5)
    assert row["T_degC"] == pytest.approx(15, abs=0.05)


@pytest.mark.parametrize("column, printed_mA_m2", [
    # 22 to 65 mA/m2 for fresh water at zero or low velocities; likely the middle.
    ("i_L_low_A_m2", "22"), ("i_L_high_A_m2", "65"), ("i_L_A_m2", "43.5"),
])
def test_fresh_water_oxygen_limit_from_protective_current(column, printed_mA_m2):
    row = data.index("electrolytes")["freshwater"]
    assert row["iL_source_id"] == "corrosion_doctors_cp_current"
    assert 1000 * row[column] == pytest.approx(float(printed_mA_m2), abs=0.05)


def test_aluminium_breakdown_potential_half_normal_nacl_ph8():
    # Abstract, result (3): at pH 8 the 2nd pitting potential was -0.70 V (vs. S.C.E.).
    row = cell_data.kinetics_row("A95083")
    assert row["id"] == "aluminium"
    assert row["eb_source_id"] == "sato1973_al_pitting_ph"
    assert row["eb_confidence"] == "handbook-compiled"
    assert row["E_b_V_SCE"] == pytest.approx(-0.70, abs=0.005)


@pytest.mark.parametrize("column, printed_um_yr", [
    # Abstract: highest corrosion rate 0.96 µm/y; the 3000 m rate is 3.2 times the
    # shallow-sea rate (0.96 / 3.2 = 0.30 µm/y, taken as the low and likely cases).
    ("i_corr_low_A_m2", 0.96 / 3.2), ("i_corr_A_m2", 0.96 / 3.2), ("i_corr_high_A_m2", 0.96),
])
def test_316_own_current_one_year_sea_exposure(column, printed_um_yr):
    row = cell_data.kinetics_row("S31600")
    assert row["id"] == "stainless_molybdenum"
    assert row["source_id"] == "duan2019_316l_sea"
    assert row["confidence"] == "handbook-compiled"
    cr_mm = rate_mm_per_yr(row[column], "S31600")
    assert cr_mm * 1000 == pytest.approx(printed_um_yr, rel=0.02)


@pytest.mark.parametrize("column", ["i_corr_low_A_m2", "i_corr_A_m2", "i_corr_high_A_m2"])
def test_austenitic_cast_iron_own_rate_from_the_one_year_raft_table(column):
    # Table 7 general corrosion, cast alloys: austenitic cast iron (AUS 202) 0.075 mm/year,
    # the one rate printed (so the three cases are equal).
    row = next(r for r in data.table("cell_kinetics") if r["id"] == "austenitic_cast_iron")
    assert row["source_id"] == "defstan_01_2_seawater_table"
    assert row["confidence"] == "handbook-compiled"
    cr = rate_mm_per_yr(row[column], "austenitic_cast_iron")
    assert cr == pytest.approx(0.075, rel=0.03)


def test_nickel_anodic_slope_acid_chloride():
    # Abstract: an anodic Tafel slope equal to 120 +/- 10 mV per decade, nickel dissolving
    # galvanostatically in hydrochloric acid solutions.
    row = data.index("cell_kinetics")["nickel"]
    assert row["ba_source_id"] == "elaal2003_ni_hcl"
    assert row["ba_confidence"] == "handbook-compiled"
    assert row["b_a_mV_per_decade"] == pytest.approx(120, abs=0.5)
