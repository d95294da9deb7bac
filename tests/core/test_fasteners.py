"""The fastener page on the galvanic-cell model (noblegap.calculators.fastener)."""

import json

import pytest
from hypothesis import example, given, settings, strategies as st

from noblegap import api, verdicts
from noblegap.calculators import fastener
from noblegap.methods import galvanic
from noblegap.errors import InputError, InputErrors

CALC = fastener.CALCULATORS[0]


def run(**changes):
    inputs = CALC.raw_inputs(CALC.example)
    inputs.update(changes)
    return CALC.compute(**CALC.parse(inputs))


def test_example_runs_and_has_every_output():
    out = api.run("fastener", CALC.example)
    assert out["ok"], out
    res = out["result"]
    for key in ("anode", "cathode", "anode_member", "local_mm_per_yr", "local_mm_per_yr_low",
                "local_mm_per_yr_high", "average_mm_per_yr", "galvanic_mm_per_yr",
                "own_mm_per_yr", "years_to_allowance", "governing_limit", "verdict",
                "verdict_class", "alternatives", "mitigations", "cases"):
        assert key in res, key
    assert res["verdict_class"] in verdicts.CLASSES
    assert res["verdict"] == verdicts.label(res["verdict_class"])
    assert len(res["display"]["charts"]) == 2
    json.dumps(res, allow_nan=False)


def test_url_keys_are_the_compute_parameters():
    import inspect
    keys = [f.key for f in CALC.fields]
    assert keys == list(inspect.signature(fastener.compute_fastener).parameters)


def test_headline_is_the_local_rate_with_its_range_and_memory_mark():
    res = run()
    head = res["display"]["headline"]
    assert "range" in head and fastener.members.FROM_MEMORY_MARK in head
    assert res["local_mm_per_yr_low"] <= res["local_mm_per_yr"] <= res["local_mm_per_yr_high"]
    assert res["local_mm_per_yr"] >= res["average_mm_per_yr"]


def test_own_corrosion_of_passive_aluminium_is_small():
    # issue 16: 2.25 mm/yr of "own corrosion" of passive 5083 came from i_L; the model's own
    # rate is the passive current, bounded by the ISO 9223 aluminium band in atmospheres
    for env in ("seawater_flowing", "CX", "C3"):
        res = run(environment=env)
        assert res["own_mm_per_yr"] < 0.01, env


def test_alternatives_that_leave_the_plate_the_anode_depend_on_their_potential():
    # issue 16: carbon steel, low-alloy steel, naval brass, silicon bronze all gave the same
    # 2.04 mm/yr whatever their ΔV; the cell model puts the potential back in
    res = run(environment="seawater_flowing")
    rates = {}
    for fid in ("carbon_steel", "low_alloy_steel", "C46400", "C65500"):
        r = run(environment="seawater_flowing", fastener=fid)
        assert r["anode"] == "A95083"
        rates[fid] = r["local_mm_per_yr"]
    assert len({round(v, 6) for v in rates.values()}) == 4
    assert rates["C46400"] > rates["carbon_steel"]
    assert res["anode"] == "A95083"


def test_no_mitigation_is_acceptable_while_the_anode_loses_its_allowance():
    for env in ("CX", "C3", "seawater_flowing", "freshwater"):
        res = run(environment=env, design_life="25 year")
        for m in res["mitigations"]:
            y = m["years_to_allowance"]
            if y is not None and y < 25:
                assert m["verdict_class"] != verdicts.OK, (env, m["id"])


def test_isolation_leaves_only_own_corrosion():
    res = run(environment="seawater_flowing")
    iso = next(m for m in res["mitigations"] if m["id"] == "isolate")
    assert iso["galvanic_mm_per_yr"] == 0.0
    assert iso["local_mm_per_yr"] < res["local_mm_per_yr"]


def test_old_environment_links_still_open():
    for old, new in (("marine_splash", "CX"), ("atmosphere_harsh", "C5"),
                     ("atmosphere_normal", "C3"), ("indoor_controlled", "C1")):
        assert run(environment=old)["environment"] == new


def test_fresh_water_ignores_conductivity_no_more():
    low = run(environment="freshwater", conductivity="50 µS/cm")
    high = run(environment="freshwater", conductivity="1000 µS/cm")
    assert low["galvanic_current_A"] < high["galvanic_current_A"]


def test_atmospheres_are_wet_only_part_of_the_year():
    res = run(environment="C3")
    assert 0 < res["wet_fraction"] < 1
    assert any("wet about" in p for p in res["display"]["paragraphs"])


def test_inches_and_millimetres_give_the_same_result():
    a = run(diameter="3/8 in", thickness="1/4 in")
    b = run(diameter="9.525 mm", thickness="6.35 mm")
    assert a["local_mm_per_yr"] == pytest.approx(b["local_mm_per_yr"], rel=1e-9)


def test_same_alloy_is_valid_with_no_galvanic_attack():
    res = run(fastener="A95083")
    assert not res["galvanic_couple"] and res["galvanic_current_A"] == 0.0
    assert res["verdict_class"] == verdicts.OK


def test_fastener_area_not_smaller_than_the_plate_is_refused():
    with pytest.raises(InputError, match="not smaller than the plate"):
        run(plate_area="0.001 m²")


def test_conductivity_and_resistivity_together_are_refused():
    with pytest.raises(InputError, match="not both"):
        run(environment="freshwater", conductivity="200 µS/cm", resistivity="50 ohm*m")


@pytest.mark.parametrize("field, value", [("diameter", "0 mm"), ("count", "-3"),
                                          ("plate_area", "-1 m²")])
def test_zero_or_negative_inputs_are_refused_with_the_field(field, value):
    out = api.run("fastener", {**CALC.example, field: value})
    assert not out["ok"] and out["error"]["field"] == field


@settings(max_examples=6, deadline=None)
@given(area=st.floats(0.2, 5.0), extra=st.floats(0.1, 5.0),
       env=st.sampled_from(["seawater_flowing", "freshwater", "C5"]))
@example(area=1.125, extra=0.25, env="seawater_flowing")   # the spread steps used to cycle
def test_larger_cathode_plate_never_lowers_a_fastener_anode_rate(area, extra, env):
    a = run(fastener="carbon_steel", plate="S31600", plate_area=f"{area} m²", environment=env)
    b = run(fastener="carbon_steel", plate="S31600", plate_area=f"{area + extra} m²",
            environment=env)
    # to the precision of the spread length's fixed point (galvanic.SPREAD_TOLERANCE)
    assert b["local_mm_per_yr"] >= a["local_mm_per_yr"] * (1 - galvanic.SPREAD_TOLERANCE)


@settings(max_examples=6, deadline=None)
@given(n=st.integers(1, 60), more=st.integers(1, 60),
       env=st.sampled_from(["seawater_flowing", "freshwater", "CX"]))
def test_more_cathode_fasteners_never_lower_the_plate_current(n, more, env):
    a = run(count=str(n), environment=env)
    b = run(count=str(n + more), environment=env)
    assert b["galvanic_current_A"] >= a["galvanic_current_A"] * (1 - galvanic.SPREAD_TOLERANCE)


@pytest.mark.parametrize("env", ["CX", "C5", "seawater_quiescent", "seawater_flowing"])
def test_each_added_fastener_raises_the_plate_current_and_keeps_its_rate(env):
    # 316 bolts in a 5083 plate: the passive plate can settle passive over a wide
    # band or pitting next to the bolts; the result takes the pitting state
    # wherever it is consistent, so adding a bolt never drops the plate from one
    # state to the other (it once did between 3 and 4 bolts in CX).
    out = [run(count=str(n), environment=env) for n in range(1, 13)]
    for a, b in zip(out, out[1:]):
        assert b["galvanic_current_A"] >= a["galvanic_current_A"] * (1 - galvanic.SPREAD_TOLERANCE)
        assert b["local_mm_per_yr"] >= a["local_mm_per_yr"] * (1 - galvanic.SPREAD_TOLERANCE)
