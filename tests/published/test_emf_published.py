"""Published checks: EMF series and reference electrodes at 25 °C."""

import pytest

from noblegap import api


def test_daniell_cell_standard_emf_cu_zn_1_10_V():
    # OpenStax Chemistry 2e, Appendix L / Example 17 (Daniell cell): E°cell = 1.10 V
    # (printed to 2 decimals), from E°(Cu2+/Cu) = +0.3419 V and E°(Zn2+/Zn) = -0.7618 V.
    r = api.run("couple", {"metal_a": "Zn", "metal_b": "Cu"})["result"]
    assert r["anode"] == "Zn" and r["cathode"] == "Cu"
    assert r["delta_E_V"] == pytest.approx(1.10, abs=0.005)


@pytest.mark.parametrize("from_ref,to_ref,E_in,E_out", [
    # Bard & Faulkner, Electrochemical Methods 2nd ed., Table C.2: SCE = +0.2412 V vs SHE.
    ("sce", "she", -0.800, -0.5588),
    # Same table: Ag/AgCl (saturated KCl) = +0.197 V vs SHE.
    ("ag_agcl_sat_kcl", "she", -0.800, -0.603),
    # Sawyer, Electrochemistry for Chemists 2nd ed.: CSE = +0.316 V vs SHE.
    ("cse", "she", -0.850, -0.534),
    # SCE to CSE at 25 °C: 0.2412 - 0.316 = -0.0748 V offset.
    ("sce", "cse", -0.800, -0.8748),
])
def test_reference_conversions_at_25C(from_ref, to_ref, E_in, E_out):
    r = api.run("convert", {"potential": f"{E_in} V", "from_ref": from_ref,
                            "to_ref": to_ref, "temperature": "25 °C"})
    assert r["result"]["potential_V"] == pytest.approx(E_out, abs=5e-5)
