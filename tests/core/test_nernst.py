"""Tests of noblegap.nernst: physics properties, units, the cell bookkeeping and errors."""

import math

import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from noblegap import api
from noblegap.calculators import nernst as nernst_page
from noblegap.materials import data
from noblegap.materials.potentials import half_reaction, metal_ids
from noblegap.methods import nernst
from noblegap.errors import (ChoiceError, InputErrors, MissingDataError, RangeError,
                             UnitError)

METALS = [mid for mid, _ in metal_ids()]
metal = st.sampled_from(METALS)
conc = st.floats(min_value=1e-12, max_value=5.0, allow_nan=False, allow_infinity=False)
temp_K = st.floats(min_value=273.15, max_value=373.15)
coef = st.sampled_from(["on", "off"])


def run_cell(a, b, ca, cb, T_K=298.15, use_coef=True, g_a=1.0, g_b=1.0):
    return nernst.cell(half_reaction(a), half_reaction(b), ca, cb, T_K, g_a, g_b, use_coef)


# --- properties the physics guarantees -------------------------------------

@given(metal, metal, temp_K, coef)
def test_unit_activities_give_standard_potentials(a, b, T_K, c):
    out = nernst_page.compute_nernst(a, b, "1 mol/L", "1 mol/L", temperature=T_K,
                                temperature_coefficient=c)
    assert out["E_cell_V"] == pytest.approx(out["E0_cell_V"], abs=1e-12)
    assert out["E_a_V_SHE"] == pytest.approx(out["E0_a_V_SHE"], abs=1e-12)
    assert out["E_b_V_SHE"] == pytest.approx(out["E0_b_V_SHE"], abs=1e-12)


@given(metal, metal, conc, conc, temp_K)
def test_swapping_the_half_cells_flips_the_sign(a, b, ca, cb, T_K):
    ab = run_cell(a, b, ca, cb, T_K)
    ba = run_cell(b, a, cb, ca, T_K)
    assert ab["E_cell_V"] == pytest.approx(-ba["E_cell_V"], abs=1e-12)


@given(metal, metal, conc, conc, st.floats(min_value=1.001, max_value=1e3), temp_K)
def test_cell_potential_is_monotonic_in_each_concentration(a, b, ca, cb, k, T_K):
    base = run_cell(a, b, ca, cb, T_K)["E_cell_V"]
    assert run_cell(a, b, ca, cb * k, T_K)["E_cell_V"] > base     # more cathode ions
    assert run_cell(a, b, ca * k, cb, T_K)["E_cell_V"] < base     # more anode ions


@given(metal, metal, conc, temp_K, st.floats(min_value=0.0, max_value=0.5))
def test_at_the_reversal_ratio_the_cell_potential_is_zero(a, b, ca, T_K, I):
    ra, rb = half_reaction(a), half_reaction(b)
    g_a = nernst.davies_gamma(nernst.ion_charge(ra["ion"]), I)
    g_b = nernst.davies_gamma(nernst.ion_charge(rb["ion"]), I)
    res = run_cell(a, b, ca, 1.0, T_K, g_a=g_a, g_b=g_b)
    x_rev, log10_cb = nernst.reversal(res["E_a_V_SHE"], res["E0_b_V_SHE"], rb["n"],
                                      res["nu_b"], g_b, ca, T_K)
    assume(abs(log10_cb) < 300)
    at = run_cell(a, b, ca, 10 ** log10_cb, T_K, g_a=g_a, g_b=g_b)
    assert abs(at["E_cell_V"]) < 1e-9
    assert log10_cb - math.log10(ca) == pytest.approx(x_rev, abs=1e-12)


@settings(max_examples=50)
@given(metal, metal, st.floats(min_value=1e-6, max_value=1.0),
       st.floats(min_value=1e-6, max_value=1.0))
def test_same_quantity_in_different_units_gives_the_same_answer(a, b, ca, cb):
    M_b = half_reaction(b)["ion_molar_mass_g_mol"]
    ref = nernst_page.compute_nernst(a, b, f"{ca!r} mol/L", f"{cb!r} mol/L")["E_cell_V"]
    for text_a, text_b in ((f"{ca * 1e3!r} mmol/L", f"{cb * M_b * 1e3!r} mg/L"),
                           (f"{ca!r} M", f"{cb * 1e6!r} µmol/L"),
                           (f"{ca!r}", f"{cb * M_b * 1e3!r} ppm"),
                           (f"{ca!r} mol/kg", f"{cb * M_b!r} g/L")):
        got = nernst_page.compute_nernst(a, b, text_a, text_b)["E_cell_V"]
        assert got == pytest.approx(ref, abs=1e-9)


@given(metal, metal, conc, conc, temp_K)
def test_half_cell_sum_matches_the_balanced_reaction_quotient(a, b, ca, cb, T_K):
    res = run_cell(a, b, ca, cb, T_K)
    Q_form = res["E0_cell_V"] - nernst.thermal_voltage(T_K) / res["n"] * res["ln_Q"]
    assert res["E_cell_V"] == pytest.approx(Q_form, abs=1e-12)


def test_independent_reference_with_numpy():
    np = pytest.importorskip("numpy")
    F, R = 96485.33212, 8.314462618          # CODATA 2018, typed here as a reference only
    T = 310.0
    out = nernst_page.compute_nernst("Al", "Cu", "2e-3 mol/L", "3e-4 mol/L", temperature=T,
                                temperature_coefficient="off")
    E0 = 0.3419 - (-1.662)
    E_ref = E0 - R * T / (6 * F) * np.log(2e-3 ** 2 / 3e-4 ** 3)
    assert out["E_cell_V"] == pytest.approx(float(E_ref), abs=1e-9)


# --- the cell bookkeeping ----------------------------------------------------

def test_aluminium_copper_balances_six_electrons():
    out = nernst_page.compute_nernst("Al", "Cu", "0.01 mol/L", "0.1 mol/L")
    assert out["n"] == 6
    assert out["Q_exponents"] == {"a": 2, "b": 3}
    assert out["Q"] == pytest.approx(0.01 ** 2 / 0.1 ** 3, rel=1e-12)
    note = out["display"]["tables"][0]["note"]
    assert "3 Cu²⁺ + 2 Al → 3 Cu + 2 Al³⁺" in note   # chemistry written properly


def test_electron_balance():
    assert nernst.electron_balance(3, 2) == (6, 2, 3)
    assert nernst.electron_balance(1, 2) == (2, 2, 1)
    assert nernst.electron_balance(2, 2, 2, 1) == (2, 2, 1)


def test_hydrogen_half_cell_uses_two_ions():
    out = nernst_page.compute_nernst("H2", "Cu", "0.1 mol/L", "1 mol/L")
    # 2H+ + 2e- = H2: E = 0 + (2RT/2F) ln 0.1 = -59.16 mV
    assert out["E_a_V_SHE"] == pytest.approx(-nernst.nernst_slope(298.15), abs=1e-12)


def test_reversed_couple_copper_silver():
    out = nernst_page.compute_nernst("Cu", "Ag", "1 M", "1e-12 M")
    assert out["standard_anode"] == "Cu"
    assert out["anode"] == "Ag" and out["cathode"] == "Cu"
    assert out["reversed"] is True
    assert out["E_cell_V"] < 0
    assert out["reversal_feasible"] is True and out["reversal_in_chart"] is True


def test_daniell_cell_does_not_reverse_and_says_why():
    out = nernst_page.compute_nernst("Zn", "Cu", "0.1 M", "0.01 M")
    assert out["reversed"] is False
    assert out["anode"] == "Zn"
    assert out["reversal_feasible"] is False
    assert out["reversal_in_chart"] is False
    assert "less than one ion per litre" in out["display"]["paragraphs"][0]


def test_equal_concentration_cell_has_no_anode():
    out = nernst_page.compute_nernst("Zn", "Zn", "0.1 M", "0.1 M")
    assert out["E_cell_V"] == 0
    assert out["anode"] is None and out["reversed"] is False
    assert out["reversal_log10_ratio"] == pytest.approx(0.0, abs=1e-12)


def test_temperature_coefficient_on_and_off():
    on = nernst_page.compute_nernst("Zn", "Ti", "1 M", "1 M", temperature=308.15)
    off = nernst_page.compute_nernst("Zn", "Ti", "1 M", "1 M", temperature=308.15,
                                temperature_coefficient="off")
    assert on["E0_a_V_SHE"] == pytest.approx(-0.7618 + 0.119e-3 * 10, abs=1e-12)
    assert off["E0_a_V_SHE"] == pytest.approx(-0.7618, abs=1e-12)
    assert on["temperature_coefficient_used"] == {"metal_a": True, "metal_b": False}
    assert on["missing_temperature_coefficient"] == ["Ti"]
    assert any("Titanium" in w for w in on["display"]["warnings"])


def test_every_metal_in_common_use_has_a_coefficient():
    # Only Mo3+/Mo and Ti2+/Ti lack an entropy in the compilation read.
    E0 = data.index("half_reactions")
    assert sorted(k for k, r in E0.items() if r["dE0dT_mV_per_K"] is None) == ["Mo", "Ti"]
    for r in E0.values():
        if r["dE0dT_mV_per_K"] is not None:
            assert r["dEdT_source_id"] and r["dEdT_confidence"] and r["dEdT_locator"]


def test_al_cu_at_80C_moves_with_both_coefficients():
    # E°cell(T) = E°cell(25) + (k_Cu − k_Al)·ΔT: about 32 mV less at 80 °C.
    r = nernst_page.compute_nernst("Al", "Cu", "1 M", "1 M", temperature=353.15)
    E0 = data.index("half_reactions")
    k = (E0["Cu"]["dE0dT_mV_per_K"] - E0["Al"]["dE0dT_mV_per_K"]) * 1e-3
    assert r["E0_cell_V"] == pytest.approx(0.3419 + 1.662 + k * 55, abs=1e-12)
    assert r["E0_cell_V"] < 0.3419 + 1.662 - 0.025


def test_davies_activity_coefficients():
    # log10 γ = -0.509·z²·(√I/(1+√I) − 0.3 I), at I = 0.01 mol/L
    s = 0.1
    expect_z2 = 10 ** (-0.509 * 4 * (s / (1 + s) - 0.3 * 0.01))
    assert nernst.davies_gamma(2, 0.01) == pytest.approx(expect_z2, rel=1e-12)
    assert nernst.davies_gamma(1, 0.0) == 1.0
    out = nernst_page.compute_nernst("Zn", "Cu", "0.1 M", "0.01 M", activity="davies",
                                ionic_strength=10.0)
    assert out["gamma_a"] == pytest.approx(expect_z2, rel=1e-12)
    assert out["activity_a"] == pytest.approx(0.1 * expect_z2, rel=1e-12)


def test_concentration_parsing_units_and_assumptions():
    M = 65.38
    assert nernst.parse_concentration("0.1 M", M) == (pytest.approx(0.1), "molar")
    assert nernst.parse_concentration("100 mM", M)[0] == pytest.approx(0.1)
    assert nernst.parse_concentration("0.1", M)[0] == pytest.approx(0.1)
    assert nernst.parse_concentration("0.1 mol/kg", M) == (pytest.approx(0.1), "molal")
    c_mgL = nernst.parse_concentration("6.538 mg/L", M)[0]
    assert c_mgL == pytest.approx(1e-4)
    assert nernst.parse_concentration("6.538 ppm", M)[0] == pytest.approx(c_mgL)
    assert nernst.parse_concentration("6.538 mg/kg", M)[0] == pytest.approx(c_mgL)


def test_api_example_runs_and_has_a_chart():
    calc = api.get("nernst")
    out = api.run("nernst", calc.example)
    assert out["ok"], out
    res = out["result"]
    assert res["anode"] == "Zn"
    assert res["display"]["charts"][0]["svg"].startswith("<svg")
    for key in ("E_cell_V", "E_a_V_SHE", "E_b_V_SHE", "E0_cell_V", "n", "Q", "anode",
                "cathode", "reversed", "reversal_ratio", "sources"):
        assert key in res


# --- bad input ------------------------------------------------------------

def test_zero_concentration_is_refused():
    with pytest.raises(RangeError, match="logarithm"):
        nernst.parse_concentration("0 mol/L", 65.38, field="conc_a")


def test_negative_concentration_is_refused():
    with pytest.raises(RangeError, match="above zero"):
        nernst.parse_concentration("-2 mg/L", 65.38, field="conc_b")


def test_wrong_dimension_is_refused():
    with pytest.raises(UnitError, match="potential, not a concentration"):
        nernst.parse_concentration("3 V", 65.38, field="conc_a")


def test_unknown_unit_is_refused():
    with pytest.raises(UnitError, match="Unknown unit"):
        nernst.parse_concentration("3 furlong", 65.38, field="conc_a")


def test_mass_unit_without_molar_mass_is_refused():
    with pytest.raises(MissingDataError, match="No molar mass"):
        nernst.parse_concentration("5 mg/L", None, field="conc_a", ion="X2+")
    # a molar unit needs no molar mass
    assert nernst.parse_concentration("5 mmol/L", None)[0] == pytest.approx(0.005)


def test_compute_collects_both_concentration_errors():
    with pytest.raises(InputErrors, match="2 inputs need attention") as info:
        nernst_page.compute_nernst("Zn", "Cu", "0 M", "3 V")
    assert [e.field for e in info.value.errors] == ["conc_a", "conc_b"]


def test_half_cell_refuses_zero_activity():
    with pytest.raises(RangeError, match="logarithm"):
        nernst.half_cell_potential(-0.76, 2, 0.0)
    with pytest.raises(RangeError, match="reaction quotient"):
        nernst.cell_potential(1.1, 2, -1.0)


def test_unknown_metal_is_a_choice_error():
    with pytest.raises(ChoiceError, match="Unknown half-reaction"):
        nernst_page.compute_nernst("Zinc-ish", "Cu", "1 M", "1 M")


@pytest.mark.parametrize("inputs, field, words", [
    ({"conc_a": "0 mol/L"}, "conc_a", "logarithm"),
    ({"conc_b": "-1 mM"}, "conc_b", "above zero"),
    ({"conc_b": "2 kg"}, "conc_b", "not a concentration"),
    ({"temperature": "120 °C"}, "temperature", "liquid water at 1 atm"),
    ({"temperature": "-10 °C"}, "temperature", "liquid water at 1 atm"),
    ({"activity": "davies"}, "ionic_strength", "ionic strength"),
    ({"ionic_strength": "-0.1 mol/L"}, "ionic_strength", "out of range"),
    ({"activity": "debye"}, "activity", "not one of the choices"),
    ({"metal_b": "Unobtainium"}, "metal_b", "not one of the choices"),
])
def test_api_returns_structured_errors(inputs, field, words):
    out = api.run("nernst", inputs)
    assert out["ok"] is False
    err = out["error"]
    assert err["field"] == field
    assert words.lower() in err["message"].lower()
    assert err["allowed"]


def test_ionic_strength_above_davies_limit_warns_but_computes():
    out = api.run("nernst", {"activity": "davies", "ionic_strength": "0.7 mol/L"})
    assert out["ok"] is True
    res = out["result"]
    assert res["davies_limit_exceeded"] is True
    assert any("validity limit" in w for w in res["display"]["warnings"])
    assert math.isfinite(res["E_cell_V"])
