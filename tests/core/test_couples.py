"""couples.py: the EMF-series couple."""

import pytest

from noblegap import api
from noblegap.calculators import couple as couples

METALS = [m for m, _ in couples.metal_ids()]


def test_at_least_twenty_half_reactions():
    assert len(METALS) >= 20
    for m in ("Zn", "Cu", "Fe", "Al", "Mg", "Ni", "Ag", "Au"):
        assert m in METALS


@pytest.mark.parametrize("a", METALS[::3])
@pytest.mark.parametrize("b", METALS[1::3])
def test_order_does_not_matter(a, b):
    r1 = api.run("couple", {"metal_a": a, "metal_b": b})["result"]
    r2 = api.run("couple", {"metal_a": b, "metal_b": a})["result"]
    assert r1["anode"] == r2["anode"] and r1["cathode"] == r2["cathode"]
    assert r1["delta_E_V"] == r2["delta_E_V"] >= 0


def test_same_metal_is_valid_and_zero():
    r = api.run("couple", {"metal_a": "Fe", "metal_b": "Fe"})
    assert r["ok"]
    assert r["result"]["delta_E_V"] == 0 and not r["result"]["galvanic_couple"]
    assert "no galvanic couple" in r["result"]["display"]["headline"]


def test_reading_says_who_corrodes_and_deposits():
    r = api.run("couple", {"metal_a": "Cu", "metal_b": "Mg"})["result"]
    assert r["corrodes"] == "Mg" and r["deposits"] == "Cu"
    assert r["electron_flow"] == "Mg -> Cu"
    text = " ".join(r["display"]["paragraphs"])
    assert "Magnesium" in text and "deposits" in text


def test_case_insensitive_and_did_you_mean():
    assert api.run("couple", {"metal_a": "zn", "metal_b": "cu"})["result"]["anode"] == "Zn"
    out = api.run("couple", {"metal_a": "Zx", "metal_b": "Cu"})
    # Suggestions are the labels a person reads, never the ids.
    assert out["error"]["errors"][0]["suggestions"][0] == "Zinc (Zn²⁺ + 2e⁻ ⇌ Zn)"
