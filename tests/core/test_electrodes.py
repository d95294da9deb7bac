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
    out = api.run("convert", {"potential": "-0.8 V", "from_ref": "ag_agcl_3m_kcl",
                              "to_ref": "she", "temperature": "40 °C"})
    assert out["ok"]
    assert out["result"]["missing_temperature_coefficient"] == ["ag_agcl_3m_kcl"]
    assert any("No published temperature coefficient" in w
               for w in out["result"]["display"]["warnings"])


def test_published_coefficient_is_applied():
    # SCE -0.67 mV/K (Bard & Faulkner Table C.2): at 35 degC it sits 6.7 mV lower.
    e35, used, _ = electrodes.reference_potential("sce", 308.15)
    assert used and e35 == pytest.approx(0.2412 - 0.0067, abs=1e-12)


def test_from_memory_reference_is_flagged():
    out = api.run("convert", {"potential": "-1.0 V", "from_ref": "ag_agcl_seawater",
                              "to_ref": "sce"})
    assert any("from memory" in w for w in out["result"]["display"]["warnings"])


def test_temperature_outside_liquid_water_is_refused():
    out = api.run("convert", {"temperature": "150 °C"})
    assert not out["ok"]
    assert out["error"]["field"] == "temperature"
    assert "liquid water" in out["error"]["message"]
