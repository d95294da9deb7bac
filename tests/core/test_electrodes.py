"""electrodes.py: conversions between reference scales."""

import pytest
from hypothesis import given, strategies as st

from noblegap import api
from noblegap.materials import references as electrodes

REFS = [r for r, _ in electrodes.reference_ids()]


@given(st.floats(-2, 2), st.sampled_from(REFS), st.sampled_from(REFS),
       st.floats(273.15, 373.15))
def test_round_trip(E, a, b, T):
    there = electrodes.to_scale(E, a, b, T)
    assert electrodes.to_scale(there, b, a, T) == pytest.approx(E, abs=1e-12)


def test_missing_coefficient_is_said_away_from_25C():
    out = api.run("convert", {"potential": "-0.8 V", "from_ref": "ag_agcl_01m_kcl",
                              "to_ref": "she", "temperature": "40 °C"})
    assert out["ok"]
    assert out["result"]["missing_temperature_coefficient"] == ["ag_agcl_01m_kcl"]
    assert any("No published temperature coefficient" in w
               for w in out["result"]["display"]["warnings"])


def test_isothermal_coefficient_is_applied_as_printed():
    # SCE -0.676 mV/K (isothermal, data/reference_electrodes.csv): 6.76 mV lower at 35 degC.
    e35, used, _ = electrodes.reference_potential("sce", 308.15)
    assert used and e35 == pytest.approx(0.2412 - 0.00676, abs=1e-12)


def test_thermal_coefficient_is_made_isothermal_first():
    # CSE prints a thermal +0.9 mV/K; on the hydrogen scale at the same temperature
    # it moves by 0.9 - 0.871 = +0.029 mV/K, not by +0.9.
    row = electrodes.reference("cse")
    assert row["dEdT_kind"] == "thermal"
    assert electrodes.isothermal_coefficient(row) == pytest.approx(0.029, abs=1e-12)
    e50, used, _ = electrodes.reference_potential("cse", 323.15)
    assert used and e50 == pytest.approx(0.316 + 0.029e-3 * 25, abs=1e-12)


def test_cse_to_sce_at_50C_is_about_minus_0_758():
    # -0.850 V CSE with both electrodes at 50 degC: 0.3167 - 0.2243 V apart.
    out = api.run("convert", {"potential": "-0.850 V", "from_ref": "cse", "to_ref": "sce",
                              "temperature": "50 °C"})
    assert out["result"]["potential_V"] == pytest.approx(-0.7576, abs=5e-5)
    labels = [r["label"] for r in out["result"]["display"]["rows"]]
    assert "Temperature of both electrodes" in labels
    assert any("thermal temperature coefficient" in lab for lab in labels)


def test_calomel_above_its_range_is_warned():
    hot = api.run("convert", {"potential": "-0.8 V", "from_ref": "sce", "to_ref": "she",
                              "temperature": "80 °C"})["result"]
    warm = api.run("convert", {"potential": "-0.8 V", "from_ref": "sce", "to_ref": "she",
                               "temperature": "60 °C"})["result"]
    assert hot["reference_above_normal_range"] == ["sce"]
    assert any("up to about 70 °C" in w for w in hot["display"]["warnings"])
    assert warm["reference_above_normal_range"] == []


def test_three_and_a_half_molar_filling_is_offered():
    assert "ag_agcl_35m_kcl" in REFS
    e35, used, _ = electrodes.reference_potential("ag_agcl_35m_kcl", 308.15)
    assert used and e35 == pytest.approx(0.205 - 0.0074, abs=1e-12)


def test_temperature_outside_liquid_water_is_refused():
    out = api.run("convert", {"temperature": "150 °C"})
    assert not out["ok"]
    assert out["error"]["field"] == "temperature"
    assert "liquid water" in out["error"]["message"]


def test_coefficient_outside_its_measured_range_is_said():
    inside = api.run("convert", {"potential": "-0.8 V", "from_ref": "ag_agcl_35m_kcl",
                                 "to_ref": "she", "temperature": "30 °C"})["result"]
    outside = api.run("convert", {"potential": "-0.8 V", "from_ref": "ag_agcl_35m_kcl",
                                  "to_ref": "she", "temperature": "60 °C"})["result"]
    assert inside["coefficient_extrapolated"] == []
    assert outside["coefficient_extrapolated"] == ["ag_agcl_35m_kcl"]
    assert any("extrapolated" in w for w in outside["display"]["warnings"])
