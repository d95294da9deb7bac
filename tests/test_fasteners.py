"""Tests of the fastener-versus-plate calculator (noblegap.fasteners)."""

import pytest
from hypothesis import given, settings, strategies as st

from noblegap import api
from noblegap.materials import data
from noblegap.calculators import fastener as fasteners
from noblegap.materials import alloys as materials
from noblegap.methods import faraday as rates
from noblegap.errors import MissingDataError

from fastener_cases import CASES

BASE = dict(fastener="S31600", plate="A95083", environment="marine_splash",
            fastener_kind="bolt", diameter="10 mm", count="12", plate_area="1.2 m * 0.8 m",
            thickness="6 mm", design_life="25 year", method="catchment")


def run(**kw):
    inputs = dict(BASE)
    inputs.update(kw)
    out = api.run("fastener", inputs)
    assert out["ok"], out.get("error")
    return out["result"]


def err(**kw):
    inputs = dict(BASE)
    inputs.update(kw)
    out = api.run("fastener", inputs)
    assert not out["ok"]
    return out["error"]


def geometry(**kw):
    g = dict(kind="bolt", diameter_m=0.010, count=12, plate_area_m2=1.0, thickness_m=0.006,
             design_life_yr=25.0, method="catchment")
    g.update(kw)
    return g


# ---- the table of cases --------------------------------------------------

@pytest.mark.parametrize("case_id, inputs, member, anode, cls, band", CASES,
                         ids=[c[0] for c in CASES])
def test_case_table(case_id, inputs, member, anode, cls, band):
    r = run(**inputs)
    assert r["anode_member"] == member
    assert r["anode"] == anode
    assert r["verdict"] == cls
    lo, hi = band
    assert lo <= r["penetration_mm_per_yr"] <= hi   # regression band, see fastener_cases.py


# ---- outputs and their consistency ---------------------------------------

def test_example_runs_and_has_every_output():
    calc = api.get("fastener")
    out = api.run("fastener", calc.example)
    assert out["ok"], out.get("error")
    r = out["result"]
    for key in ("anode", "cathode", "delta_E_V_min", "delta_E_V_max", "allowed_delta_E_V",
                "area_ratio", "anode_current_density_A_m2", "penetration_mm_per_yr",
                "penetration_mpy", "years_to_allowance", "verdict", "alternatives",
                "mitigations", "data_used", "sources"):
        assert key in r
    assert r["display"]["charts"] and r["display"]["charts"][0]["svg"].startswith("<svg")
    assert r["display"]["verdict"]["label"] in ("Acceptable", "Needs care", "Avoid")  # verdicts.py


def test_schema_keys_are_exactly_the_issue_keys():
    keys = [f.key for f in api.get("fastener").fields]
    assert keys == ["fastener", "plate", "environment", "fastener_kind", "diameter", "count",
                    "fastener_area", "plate_area", "thickness", "band_width", "allowance",
                    "design_life", "method"]


def test_penetration_follows_faraday_from_the_current_density():
    r = run(environment="seawater_quiescent", plate_area="1 m**2")
    row = materials.alloy(r["anode"])
    expected = rates.penetration_mm_per_yr(r["anode_current_density_A_m2"],
                                           row["equivalent_weight_g_mol"], row["density_g_cm3"])
    assert r["penetration_mm_per_yr"] == pytest.approx(expected, rel=1e-12)
    assert r["penetration_mpy"] == pytest.approx(r["penetration_mm_per_yr"] / 0.0254)


def test_catchment_current_density_in_immersion():
    r = run(environment="seawater_quiescent", plate_area="1 m**2")
    i_L = materials.environment("seawater_quiescent")["i_limit_A_m2"]
    assert r["anode_current_density_A_m2"] == pytest.approx(
        i_L * (r["A_cathode_m2"] + r["A_anode_m2"]) / r["A_anode_m2"])
    assert r["A_anode_m2"] == pytest.approx(1.0)   # immersion: the whole plate


def test_every_data_value_has_a_source_that_resolves():
    r = run(method="catchment")
    for key, cite in r["sources"].items():
        assert cite["text"], key
    for row in r["display"]["rows"]:
        assert row["source"], row["label"]


# ---- the area rule ---------------------------------------------------------

def test_small_anode_large_cathode_is_worst_and_reverse_is_mild():
    bad = run(fastener="carbon steel", plate="S31600", environment="seawater_quiescent",
              fastener_kind="screw", diameter="6 mm", count="20", plate_area="1 m**2")
    mild = run(fastener="S31600", plate="carbon steel", environment="seawater_quiescent",
               fastener_kind="screw", diameter="6 mm", count="20", plate_area="1 m**2")
    assert bad["verdict"] == "reject"
    assert mild["verdict"] in ("watch", "sound")
    assert bad["penetration_mm_per_yr"] > 50 * mild["penetration_mm_per_yr"]
    assert bad["area_ratio"] > 1 > mild["area_ratio"]


@settings(max_examples=25, deadline=None)
@given(area=st.floats(0.05, 20.0), extra=st.floats(0.01, 20.0))
def test_larger_cathode_plate_never_lowers_fastener_anode_rate(area, extra):
    g1, g2 = geometry(plate_area_m2=area), geometry(plate_area_m2=area + extra)
    r1 = fasteners.evaluate("carbon_steel", "S31600", "seawater_quiescent", **g1)["governing"]
    r2 = fasteners.evaluate("carbon_steel", "S31600", "seawater_quiescent", **g2)["governing"]
    assert r2["penetration_mm_per_yr"] >= r1["penetration_mm_per_yr"] * (1 - 1e-12)


@settings(max_examples=25, deadline=None)
@given(n=st.integers(1, 200), more=st.integers(1, 200))
def test_more_cathode_fasteners_never_lower_plate_anode_rate(n, more):
    r1 = fasteners.evaluate("S31600", "carbon_steel", "seawater_quiescent",
                            **geometry(count=n))["governing"]
    r2 = fasteners.evaluate("S31600", "carbon_steel", "seawater_quiescent",
                            **geometry(count=n + more))["governing"]
    assert r2["penetration_mm_per_yr"] >= r1["penetration_mm_per_yr"] * (1 - 1e-12)


@settings(max_examples=20, deadline=None)
@given(pair=st.sampled_from([("carbon_steel", "S31600"), ("zinc", "copper"),
                             ("A96061", "C70600"), ("galvanized_steel", "N04400")]),
       env=st.sampled_from(["seawater_flowing", "seawater_quiescent"]))
def test_swapping_fastener_and_plate_follows_the_area_rule(pair, env):
    active, noble = pair
    g = geometry()
    small_anode = fasteners.evaluate(active, noble, env, **g)["governing"]
    large_anode = fasteners.evaluate(noble, active, env, **g)["governing"]
    assert small_anode["anode"] == large_anode["anode"] == active
    assert small_anode["area_ratio"] > large_anode["area_ratio"]
    assert small_anode["anode_current_density_A_m2"] > large_anode["anode_current_density_A_m2"]
    assert (fasteners.VERDICT_RANK[small_anode["verdict"]]
            >= fasteners.VERDICT_RANK[large_anode["verdict"]])


@settings(max_examples=20, deadline=None)
@given(pair=st.sampled_from([("carbon_steel", "S31600"), ("S31600", "A95083"),
                             ("zinc", "copper")]),
       env=st.sampled_from(["seawater_quiescent", "marine_splash", "atmosphere_normal"]))
def test_isolation_gives_zero_galvanic_current(pair, env):
    ev = fasteners.evaluate(pair[0], pair[1], env, isolated=True, **geometry())
    for case in ev["cases"]:
        assert case["galvanic_current_A"] == 0.0
        assert case["galvanic_penetration_mm_per_yr"] == 0.0


def test_inches_and_millimetres_give_the_same_result():
    a = run(diameter="3/8 in", thickness="0.25 in")
    b = run(diameter="9.525 mm", thickness="6.35 mm")
    for key in ("penetration_mm_per_yr", "area_ratio", "years_to_allowance"):
        assert a[key] == pytest.approx(b[key], rel=1e-12)
    assert a["verdict"] == b["verdict"]


def test_plate_area_accepts_a_product_expression():
    a = run(plate_area="1.2 m * 0.8 m * 2", environment="seawater_quiescent")
    b = run(plate_area="1.92 m**2", environment="seawater_quiescent")
    assert a["A_cathode_m2"] == pytest.approx(b["A_cathode_m2"])
    assert a["penetration_mm_per_yr"] == pytest.approx(b["penetration_mm_per_yr"])


# ---- geometry ----------------------------------------------------------------

def test_fastener_area_estimates():
    d = 0.010
    assert fasteners.fastener_area_estimate_m2("bolt", d) == pytest.approx(17.03 * d * d, rel=0.01)
    assert fasteners.fastener_area_estimate_m2("screw", d) == pytest.approx(5.94 * d * d, rel=0.01)
    assert fasteners.fastener_area_estimate_m2("rivet", d) == pytest.approx(7.07 * d * d, rel=0.01)


def test_entered_fastener_area_overrides_the_estimate():
    r = run(fastener_area="25 cm**2")
    assert r["A_fastener_each_m2"] == pytest.approx(25e-4)
    assert r["fastener_area_estimated"] is False


def test_atmospheric_plate_area_is_limited_to_the_band():
    r = run()
    env = materials.environment("marine_splash")
    band = 12 * fasteners.band_area_m2("bolt", 0.010, env["band_width_mm"] / 1000)
    assert r["A_anode_m2"] == pytest.approx(band)
    assert r["band_width_m"] == pytest.approx(env["band_width_mm"] / 1000)


def test_band_width_input_changes_the_atmospheric_result():
    narrow, wide = run(band_width="5 mm"), run(band_width="30 mm")
    assert wide["A_anode_m2"] > narrow["A_anode_m2"]
    assert wide["anode_current_density_A_m2"] < narrow["anode_current_density_A_m2"]


def test_band_width_is_ignored_in_immersion_with_a_note():
    r = run(environment="seawater_quiescent", band_width="5 mm")
    assert r["band_width_m"] is None
    assert any("band width applies to atmospheric" in n for n in r["display"]["notes"])


def test_default_allowance_is_stated():
    plate_anode = run()
    assert plate_anode["allowance_m"] == pytest.approx(0.1 * 0.006)
    assert "plate thickness" in plate_anode["allowance_default"]
    fast_anode = run(fastener="carbon steel", plate="S31600", environment="seawater_quiescent")
    assert fast_anode["allowance_m"] == pytest.approx(0.1 * 0.010)
    assert "fastener diameter" in fast_anode["allowance_default"]
    given_ = run(allowance="2 mm")
    assert given_["allowance_m"] == pytest.approx(0.002) and given_["allowance_default"] is None


# ---- overlap, same alloy, missing data, bad input ------------------------------

def test_overlapping_ranges_show_both_cases():
    r = run(fastener="S30400", plate="S31600", environment="seawater_flowing")
    assert r["overlap"] is True and r["delta_E_V_min"] == 0.0
    assert {c["anode_role"] for c in r["cases"]} == {"fastener", "plate"}
    assert r["delta_E_V_max"] == pytest.approx(0.10)


def test_same_alloy_is_valid_with_no_galvanic_attack():
    r = run(fastener="S31600", plate="S31600")
    assert r["galvanic_couple"] is False and r["anode"] is None
    assert r["verdict"] == "sound" and r["penetration_mm_per_yr"] == 0.0
    assert r["years_to_allowance"] is None and r["life_status"] == rates.LIFE_NO_ATTACK


def test_fastener_area_larger_than_plate_warns_but_computes():
    r = run(plate_area="10 cm**2", environment="seawater_quiescent")
    assert any("larger than the plate" in w for w in r["display"]["warnings"])
    assert r["penetration_mm_per_yr"] > 0


@pytest.mark.parametrize("field, value", [
    ("diameter", "0 mm"), ("diameter", "-3 mm"), ("count", "0"), ("count", "-2"),
    ("plate_area", "0 m**2"), ("plate_area", "-1 m**2"), ("fastener_area", "-1 mm**2"),
    ("thickness", "0 mm"), ("design_life", "0 year"), ("band_width", "-5 mm"),
])
def test_zero_or_negative_inputs_are_refused_with_the_field(field, value):
    e = err(**{field: value})
    assert e["type"] == "InputErrors"
    assert [x["field"] for x in e["errors"]] == [field]
    assert "out of range" in e["message"]


def test_unknown_alloy_suggests():
    e = err(fastener="unobtainium")
    assert e["errors"][0]["field"] == "fastener"


def test_unknown_range_names_the_missing_data(monkeypatch):
    row = dict(materials.alloy("S31600"), E_noble_V_SCE=None)
    real = materials.alloy
    monkeypatch.setattr(materials, "alloy", lambda a: row if a == "S31600" else real(a))
    with pytest.raises(MissingDataError, match="E_noble_V_SCE"):
        fasteners.evaluate("S31600", "A95083", "marine_splash", **geometry())


def test_mixed_method_without_data_says_what_is_missing():
    e = err(method="mixed")   # marine splash: no polarization data
    assert e["type"] == "MissingDataError"
    assert "polarization data" in e["message"] and "catchment" in e["message"]


def test_mixed_method_alloy_without_data_names_it():
    with pytest.raises(MissingDataError, match="C70600|carbon_steel|N04400"):
        fasteners.evaluate("N04400", "carbon_steel", "seawater_flowing",
                           **geometry(method="mixed"))


# ---- mixed method --------------------------------------------------------------

def test_mixed_method_runs_and_draws_the_polarization_chart():
    r = run(method="mixed", fastener="S31600", plate="carbon steel",
            environment="seawater_flowing", plate_area="1 m**2", thickness="10 mm")
    assert r["E_couple_V_SCE"] is not None
    assert -0.72 <= r["E_couple_V_SCE"] <= 0.0
    assert len(r["display"]["charts"]) == 2
    assert "anode_kinetics" in r["sources"] and "anode_b_a" in r["sources"]


@settings(max_examples=20, deadline=None)
@given(pair=st.sampled_from([("carbon_steel", "S31600"), ("S31600", "carbon_steel"),
                             ("zinc", "copper"), ("A96061", "C70600"),
                             ("galvanized_steel", "R50400")]),
       env=st.sampled_from(["seawater_flowing", "seawater_quiescent"]),
       area=st.floats(0.01, 10.0))
def test_mixed_never_exceeds_the_catchment_bound(pair, env, area):
    # total dissolution balances oxygen reduction, which is at most i_L on every m²
    g = geometry(plate_area_m2=area)
    m = fasteners.evaluate(pair[0], pair[1], env, **dict(g, method="mixed"))["governing"]
    c = fasteners.evaluate(pair[0], pair[1], env, **g)["governing"]
    assert m["anode_current_density_A_m2"] <= c["anode_current_density_A_m2"] * (1 + 1e-9)


# ---- alternatives and mitigations -------------------------------------------------

def test_alternatives_are_ranked_fastener_alloys_with_reasons():
    r = run()
    alts = r["alternatives"]
    assert 0 < len(alts) <= 5
    assert all(a["fastener"] in materials.fastener_alloys() for a in alts)
    ranks = [(fasteners.VERDICT_RANK[a["verdict_class"]], a["galvanic_penetration_mm_per_yr"])
             for a in alts]
    assert ranks == sorted(ranks)
    assert all(a["reason"] for a in alts)
    assert alts[0]["verdict"] == "sound"   # aluminium fasteners in an aluminium plate


def test_mitigations_have_computed_effects():
    r = run(fastener="carbon steel", plate="S31600", environment="seawater_quiescent",
            plate_area="1 m**2")
    m = {x["id"]: x for x in r["mitigations"]}
    assert m["isolate"]["galvanic_penetration_mm_per_yr"] == 0.0
    assert "sleeve" in m["isolate"]["how"] and "washer" in m["isolate"]["how"]
    assert m["coat_cathode"]["penetration_mm_per_yr"] < r["penetration_mm_per_yr"]
    assert m["coat_anode_only"]["penetration_mm_per_yr"] > r["penetration_mm_per_yr"]
    assert "holiday.html" in m["coat_anode_only"]["how"]
    assert m["seal"]["galvanic_penetration_mm_per_yr"] == 0.0
    assert "change_fastener" in m and "coat_both" in m


def test_kinetics_table_sources_resolve_and_values_are_physical():
    for row in data.table("kinetics"):
        data.cite(row)
        data.cite(row, "ba_")
        assert 0 < row["i_corr_A_m2"] < 1.0
        assert 20 <= row["b_a_mV_per_decade"] <= 400
        assert 20 <= row["b_c_mV_per_decade"] <= 400
        materials.alloy(row["alloy_id"])
        for env in row["environments"].split(";"):
            materials.environment(env)
    assert len(data.table("kinetics")) == 15   # pinned: edits are deliberate


# ---- the verdict rule ---------------------------------------------------------

def _life(years):
    return rates.years_to_consume(1e-3, 1e-3 / years) if years else rates.years_to_consume(1e-3, 0.0)


@pytest.mark.parametrize("dE, g_years, cls", [
    (0.10, 100.0, fasteners.SOUND),    # within the limit, slow attack
    (0.50, 5.0, fasteners.REJECT),     # beyond the limit, fast attack
    (0.50, 100.0, fasteners.WATCH),    # beyond the limit, area ratio spreads it
    (0.10, 5.0, fasteners.WATCH),      # within the limit, pessimistic catchment bound
    (0.50, None, fasteners.WATCH),     # beyond the limit, no galvanic rate at all
])
def test_judge_classes(dE, g_years, cls):
    got, reason = fasteners.judge(dE, 0.15, _life(50.0), _life(g_years), 25.0)
    assert got == cls and reason


def test_judge_isolated_is_sound_and_flags_short_own_life():
    cls, reason = fasteners.judge(0.5, 0.15, _life(2.0), _life(None), 25.0, isolated=True)
    assert cls == fasteners.SOUND and "own corrosion" in reason


def test_isolation_mitigation_is_sound():
    r = run()
    m = {x["id"]: x for x in r["mitigations"]}
    assert m["isolate"]["verdict"] == "sound"
    assert m["isolate"]["galvanic_life_text"] == "no galvanic attack"
