"""The sacrificial anode added to a joint: limits of the three-electrode cell,
the anode's resistance and life, and the compare column built from them."""

import math

import pytest
from hypothesis import given, settings, strategies as st

from noblegap import api, compare, verdicts
from noblegap.errors import ChoiceError, InputError
from noblegap.materials import anode_data
from noblegap.methods import anode, cell

STEEL = cell.Electrode(-0.70, 0.086, 0.054, 0.12, 0.1, i0_H_A_m2=1e-3)
BRONZE = cell.Electrode(-0.20, 0.02, 0.06, 0.12, 0.1)


def zinc(area=0.05, R=0.2, mass=5.0, E=-1.03):
    return anode.Anode(cell.Electrode(E, 0.013, 0.04, 0.12, 0.1), area, R, mass, 780.0, 0.9)


def fastener_case(env="seawater_quiescent", **kw):
    inputs = {**api.get("fastener").example, "environment": env, **kw}
    base = api.run("fastener", inputs)
    assert base["ok"], base
    a = compare.NUMBERS["fastener"](**api.get("fastener").parse(base["inputs"]))["_assessment"]
    return inputs, a


# --- the cell ---------------------------------------------------------------

def test_detached_anode_gives_the_two_member_cell_back():
    two = cell.solve(STEEL, BRONZE, 0.1, 1.0, 0.6)
    for S in (None, zinc(R=math.inf)):
        three = anode.solve(STEEL, BRONZE, 0.1, 1.0, 0.5, 0.1, 0.0, S)
        assert three.I_sacrificial_A == 0.0
        assert three.I_anode_A == pytest.approx(two.current_A, rel=1e-5)
        assert three.E_anode_V == pytest.approx(two.E_anode_V, abs=1e-6)
        assert three.i_dissolution_A_m2 == pytest.approx(two.i_anode_A_m2, rel=1e-5)


def test_the_star_split_keeps_the_joint_resistance():
    two = cell.solve(STEEL, BRONZE, 0.1, 1.0, 0.6)
    # a mutual part r_N carries no current without the anode: r_A + r_C alone count
    three = anode.solve(STEEL, BRONZE, 0.1, 1.0, 0.4, 0.2, 0.3)
    assert three.I_anode_A == pytest.approx(two.current_A, rel=1e-5)


def test_currents_balance_on_the_metallic_path():
    sol = anode.solve(STEEL, BRONZE, 0.1, 1.0, 0.5, 0.1, 0.05, zinc())
    total = sol.I_anode_A + sol.I_cathode_A + sol.I_sacrificial_A
    assert abs(total) < 1e-6 * sol.I_sacrificial_A
    assert sol.I_sacrificial_A > 0 and sol.I_anode_A < 0     # the steel is now a cathode
    assert sol.E_anode_V < STEEL.E_corr_V


def test_an_anode_more_noble_than_the_joint_anode_does_not_protect_it():
    bare = anode.solve(STEEL, BRONZE, 0.1, 1.0, 0.5, 0.1, 0.0)
    noble = anode.solve(STEEL, BRONZE, 0.1, 1.0, 0.5, 0.1, 0.0, zinc(E=-0.45))
    assert noble.I_sacrificial_A < 0                      # it takes current: a second cathode
    assert noble.i_dissolution_A_m2 >= bare.i_dissolution_A_m2
    assert noble.limit == anode.LIMIT_NONE
    crit = {"E_protect_V_SCE": -0.775, "shift_V": None}
    assert not anode.protected(noble.E_anode_V, crit, STEEL.E_corr_V)


@settings(max_examples=40, deadline=None)
@given(st.floats(0.001, 1.0), st.floats(1.1, 50.0), st.floats(0.01, 50.0),
       st.floats(1.01, 20.0))
def test_a_larger_anode_never_raises_the_joint_anode_rate(area, grow, R, shrink):
    small = anode.solve(STEEL, BRONZE, 0.1, 1.0, 0.5, 0.1, 0.02, zinc(area=area, R=R))
    large = anode.solve(STEEL, BRONZE, 0.1, 1.0, 0.5, 0.1, 0.02,
                        zinc(area=area * grow, R=R / shrink))
    assert large.i_dissolution_A_m2 <= small.i_dissolution_A_m2 * (1 + 1e-6)
    assert large.I_sacrificial_A >= small.I_sacrificial_A * (1 - 1e-6)


def test_assessment_with_the_anode_detached_is_the_current_design():
    _, a = fastener_case("seawater_quiescent", fastener="carbon steel", plate="316")
    spec, _ = compare.anode_inputs(a, {})
    res = anode.with_anode(a, spec, R_extra_ohm=math.inf)
    for case in ("low", "likely", "high"):
        assert res["cases"][case]["local_mm_per_yr"] == pytest.approx(
            a["cases"][case]["local_mm_per_yr"], rel=1e-4)
        assert res["cases"][case]["current_A"] == 0.0


def test_joint_split_sums_to_the_case_resistance():
    inputs = {**api.get("joint").example, "environment": "seawater_quiescent",
              "distance": "50 mm"}
    base = api.run("joint", inputs)
    a = compare.NUMBERS["joint"](**api.get("joint").parse(base["inputs"]))["_assessment"]
    ra, rc, rn = anode.joint_resistances(a, "likely")
    assert rn > 0                                          # two disks apart interact
    assert ra + rc == pytest.approx(a["likely"]["R_ohm"], rel=1e-9)


# --- the anode itself ---------------------------------------------------------

def test_anode_life_by_faraday_hand_computed():
    # 10 kg zinc, 780 A·h/kg, u = 0.90, 0.2 A: 10·780·0.9 / (0.2·8760) = 4.00685 years
    assert anode.life_yr(10.0, 780.0, 0.9, 0.2) == pytest.approx(7020.0 / 1752.0, rel=1e-12)
    assert anode.life_yr(10.0, 780.0, 0.9, 0.0) == math.inf


def test_resistance_forms_hand_computed():
    # long slender: ρ/(2πL)·(ln(4L/r) − 1) with ρ 0.3 Ω·m, L 1 m, r 0.05 m
    assert anode.standoff_resistance_ohm(0.3, 1.0, 0.05) == pytest.approx(
        0.3 / (2 * math.pi) * (math.log(80.0) - 1.0), rel=1e-12)
    # short slender, L = 2r: q = r/2L = 0.25
    L, r = 0.1, 0.05
    q = 0.25
    want = 0.3 / (2 * math.pi * L) * (math.log(2 * L / r * (1 + math.sqrt(1 + q * q)))
                                      + q - math.sqrt(1 + q * q))
    assert anode.standoff_resistance_ohm(0.3, L, r) == pytest.approx(want, rel=1e-12)
    assert anode.flush_resistance_ohm(0.2, 0.04) == pytest.approx(0.315 * 0.2 / 0.2)
    # longer and larger anodes reach the water through less resistance
    assert anode.standoff_resistance_ohm(0.3, 2.0, 0.05) < anode.standoff_resistance_ohm(
        0.3, 1.0, 0.05)
    assert anode.flush_resistance_ohm(0.2, 0.08) < anode.flush_resistance_ohm(0.2, 0.04)


def test_years_count_the_anode_running_out():
    # 0.1 mm used in 10 years under the anode, then 0.9 mm at 0.5 mm/yr: 11.8 years
    assert anode.years_to_allowance(0.001, 0.01, 0.5, 10.0) == (pytest.approx(11.8), "finite")
    years, status = anode.years_to_allowance(0.001, 0.01, 0.5, math.inf)
    assert years == pytest.approx(100.0) and status == "finite"


# --- the compare column ---------------------------------------------------------

def test_column_in_seawater_is_computed_with_everything_assumed_shown():
    inputs, _ = fastener_case()
    col = compare.compare("fastener", inputs, ["anode"])["columns"][1]
    assert col["available"] and col["status"] == "computed"
    an = col["anode"]
    assert set(an["assumed"]) == {"alloy", "mass", "shape", "length"}
    assert an["alloy"] == "al_zn_in"                # seawater: the first alloy that suits
    assert an["mass_kg"] > 0 and an["current_A"] > 0 and an["life_yr"] > 0
    assert col["verdict_class"] in verdicts.CLASSES
    assert col["rate_low_mm_per_yr"] <= col["rate_mm_per_yr"] <= col["rate_high_mm_per_yr"]
    assert col["limit_text"].startswith("What limits the anode:")
    assert "vs SCE" in col["note"]
    # the assumed mass lasts the design life at the demand it was sized for
    assert an["life_yr"] == pytest.approx(
        an["mass_kg"] * an["capacity_Ah_kg"] * an["utilisation"] / (an["current_A"] * 8760))


def test_typed_anode_values_are_used_and_not_marked_assumed():
    inputs, _ = fastener_case()
    vid = "anode:alloy=zinc;mass=2%2C5%20kg;shape=flush;area=200%20cm2"
    col = compare.compare("fastener", inputs, [vid])["columns"][1]
    an = col["anode"]
    assert col["id"] == vid
    assert an["assumed"] == [] and an["alloy"] == "zinc" and an["mass_kg"] == 2.5
    assert an["area_m2"] == pytest.approx(0.02) and an["shape"] == "flush"
    assert an["utilisation"] == anode_data.shape("flush")["utilisation_fraction"]


def test_an_anode_that_runs_out_inside_the_design_life_is_never_acceptable():
    inputs, _ = fastener_case()
    col = compare.compare("fastener", inputs, ["anode:alloy=zinc;mass=0.2 kg"])["columns"][1]
    assert col["anode"]["life_yr_shortest"] < 25
    assert col["verdict_class"] != verdicts.OK


def test_fresh_water_names_magnesium_and_caps_zinc():
    inputs, _ = fastener_case("freshwater")
    auto = compare.compare("fastener", inputs, ["anode"])["columns"][1]
    assert auto["anode"]["alloy"] == "magnesium" and auto["anode"]["suits"]
    zn = compare.compare("fastener", inputs, ["anode:alloy=zinc"])["columns"][1]
    assert zn["anode"]["suits"] is False
    assert "passivates" in zn["note"] and "Magnesium suits this water" in zn["note"]
    assert zn["verdict_class"] != verdicts.OK


def test_bad_anode_input_stays_in_its_column_and_names_its_field():
    inputs, _ = fastener_case()
    out = compare.compare("fastener", inputs, ["anode:mass=3 parsecs", "isolate"])
    col = out["columns"][1]
    assert out["ok"] and col["available"] is False
    assert col["anode"]["error_field"] == "anode_mass"
    assert col["anode"]["typed"] == {"mass": "3 parsecs"}          # nothing typed is lost
    assert "parsecs" in col["note"]
    assert out["columns"][2]["available"]
    big = compare.compare("fastener", inputs, ["anode:mass=50000 kg"])["columns"][1]
    assert big["anode"]["error_field"] == "anode_mass" and "10 t" in big["note"]
    with pytest.raises(ChoiceError, match="colour"):
        compare.anode_typed("anode:colour=red")
    with pytest.raises(InputError, match="has no value"):
        compare.anode_typed("anode:mass")
    alloy = compare.compare("fastener", inputs, ["anode:alloy=unobtainium"])["columns"][1]
    assert alloy["anode"]["error_field"] == "anode_alloy"
    assert "Aluminium-zinc-indium, Zinc, Magnesium" in alloy["note"]     # names, not ids


def test_one_anode_column_at_most():
    assert compare.parse_variants("anode,anode:mass=2 kg,isolate") == ["anode", "isolate"]


def test_joint_page_anode_column():
    inputs = {**api.get("joint").example, "environment": "seawater_quiescent",
              "first": "carbon steel", "second": "C95800"}
    col = compare.compare("joint", inputs, ["anode"])["columns"][1]
    assert col["available"]
    cur = compare.compare("joint", inputs, [])["columns"][0]
    assert col["rate_mm_per_yr"] < cur["rate_mm_per_yr"]


def test_column_with_an_anode_more_noble_than_the_member_says_it_speeds_the_attack():
    inputs = {**api.get("fastener").example, "environment": "seawater_flowing",
              "fastener": "titanium", "plate": "magnesium"}
    cur, auto, zn = compare.compare("fastener", inputs, ["anode"])["columns"][0], *(
        compare.compare("fastener", inputs, [v])["columns"][1]
        for v in ("anode", "anode:alloy=zinc"))
    assert auto["anode"]["alloy"] == "magnesium"          # the only alloy below magnesium's
    assert zn["anode"]["current_A"] == 0.0
    assert zn["rate_mm_per_yr"] > cur["rate_mm_per_yr"]
    assert "second cathode" in zn["note"] and zn["verdict_class"] == verdicts.AVOID
