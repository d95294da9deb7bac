"""Tests of noblegap.coatings and noblegap.holidays (regression pins say so).

Published checks are in tests/published/test_holiday_published.py.
"""

import json
import math

import numpy as np
import pytest
from hypothesis import given, settings, strategies as st

from noblegap import api
from noblegap.methods import coatings
from noblegap.materials import data
from noblegap.calculators import holiday as holidays
from noblegap.methods import faraday as rates
from noblegap import units
from noblegap.materials import validate
from noblegap.errors import ChoiceError, InputError, InputErrors, RangeError

CALC = holidays.CALCULATORS[0]

BASE = {
    "coated": "carbon steel", "other": "C95800", "environment": "seawater_flowing",
    "coated_side": "anode", "holiday_count": "12", "inspected_area": "1.5 m²",
    "holiday_diameter": "3 mm", "coating_category": "II-0-30",
    "coated_area": "3 m²", "other_area": "1.2 m²", "thickness": "8 mm",
    "design_life": "25 year", "coating_thickness": "0.45 mm",
}


def run(**changes):
    inputs = dict(BASE)
    inputs.update(changes)
    return CALC.compute(**CALC.parse(inputs))


def by_side(result):
    return {s["side"]: s for s in result["scenarios"]}


def life(s):
    """Years to perforation as a comparable number (no attack / beyond → inf)."""
    if s["perforation_status"] == holidays.LIFE_UNBOUNDED:
        return 0.0
    return math.inf if s["years_to_perforation"] is None else s["years_to_perforation"]


# ---------------------------------------------------------------- data tables

def test_tables_validate_and_rows_are_pinned():
    validate.validate_tables(("coatings", "holiday_tests"))
    # row counts pinned so that edits are deliberate
    assert len(data.table("coatings")) == 6
    assert len(data.table("holiday_tests")) == 3


def test_every_coating_row_cites_a_known_source_and_sane_constants():
    for row in data.table("coatings"):
        assert data.cite(row)["source_id"] == "dnv_rp_b401"
        assert 0 <= row["a_fraction"] <= 1 and 0 < row["b_per_yr"] <= 1
        assert row["confidence"] in data.CONFIDENCE


def test_only_the_confirmed_category_is_published():
    published = [r["id"] for r in data.table("coatings") if r["confidence"] == "published"]
    assert published == ["I-0-30"]


def test_unknown_category_suggests():
    with pytest.raises(ChoiceError, match="Unknown coating category"):
        coatings.category("IV-0-30")


# ---------------------------------------------------------------- breakdown

def test_mean_breakdown_matches_numerical_average_numpy_reference():
    for a, b, tf in ((0.05, 0.025, 20), (0.10, 0.10, 20), (0.02, 0.008, 40), (0.3, 0.2, 2)):
        t = np.linspace(0, tf, 200001)
        ref = np.trapezoid(np.minimum(1.0, a + b * t), t) / tf
        assert coatings.mean_breakdown(a, b, tf) == pytest.approx(ref, rel=1e-6)


def test_mean_breakdown_is_continuous_at_the_cap():
    a, b = 0.1, 0.05
    t1 = (1 - a) / b
    assert coatings.mean_breakdown(a, b, t1 * (1 - 1e-9)) == pytest.approx(
        coatings.mean_breakdown(a, b, t1 * (1 + 1e-9)), rel=1e-6)


@given(a=st.floats(0, 1), b=st.floats(0, 1), tf=st.floats(1e-3, 1000))
def test_fc_never_exceeds_one(a, b, tf):
    assert coatings.breakdown(a, b, tf) <= 1.0
    assert coatings.final_breakdown(a, b, tf) <= 1.0
    assert coatings.mean_breakdown(a, b, tf) <= 1.0 + 1e-12
    assert coatings.mean_breakdown(a, b, tf) >= a - 1e-12


@pytest.mark.parametrize("a, b, field", [(1.5, 0.1, "breakdown_a"), (0.1, -0.1, "breakdown_b"),
                                         (-0.01, 0.1, "breakdown_a"), (0.1, 1.2, "breakdown_b")])
def test_constants_outside_0_1_are_refused(a, b, field):
    with pytest.raises(RangeError, match="between 0 and 1") as exc:
        coatings.check_constants(a, b)
    assert exc.value.field == field


def test_mean_breakdown_refuses_zero_life():
    with pytest.raises(RangeError, match="longer than zero"):
        coatings.mean_breakdown(0.05, 0.025, 0)


def test_holiday_test_helper_fields():
    low = coatings.holiday_test(0.3e-3)
    assert low["test_method"] == coatings.LOW_VOLTAGE and low["test_voltage_V"] is None
    high = coatings.holiday_test(1.0e-3)
    assert high["test_method"] == coatings.HIGH_VOLTAGE
    assert high["test_voltage_V"] == pytest.approx(1250 * math.sqrt(1.0 / 0.0254))
    with pytest.raises(RangeError, match="larger than zero"):
        coatings.test_method(0.0)


# ---------------------------------------------------------------- calculator

def test_example_runs_and_has_the_outputs():
    out = api.run("holiday", CALC.example)
    assert out["ok"], out
    res = out["result"]
    for key in ("fc_initial", "fc_mean", "fc_final", "anode_current_density_A_m2",
                "penetration_mm_per_yr_initial", "years_to_perforation", "scenarios",
                "test_method", "test_voltage_V"):
        assert key in res
    assert [s["side"] for s in res["scenarios"]] == list(holidays.SIDES)
    assert sorted(s["rank"] for s in res["scenarios"]) == [1, 2, 3, 4]
    assert res["display"]["charts"] and res["display"]["charts"][0]["svg"].startswith("<svg")
    json.dumps(res, allow_nan=False)


def test_example_regression_pin():
    # regression pin (not a published value): the worked example's numbers
    res = api.run("holiday", CALC.example)["result"]
    assert res["anode"] == "carbon_steel" and res["cathode"] == "C95800"
    assert res["ranking"] == ["cathode", "both", "none", "anode"]
    assert res["years_to_perforation"] == pytest.approx(0.1647, rel=2e-3)


def test_page_states_the_single_holiday_rule():
    paras = " ".join(run()["display"]["paragraphs"])
    assert "a single holiday in the anode's coating perforates sooner than each of many" in paras


def test_catchment_rule_reused_for_the_initial_rate():
    res = run(environment="seawater_flowing")
    s = by_side(res)["anode"]
    A_a = res["exposed_anode_area_initial_m2"]
    i = rates.catchment_current_density(res["i_limit_A_m2"], res["cathode_area_m2"], A_a)
    assert s["i_initial_A_m2"] == pytest.approx(i)
    assert res["penetration_mm_per_yr_initial"] == pytest.approx(
        rates.penetration_mm_per_yr(i, 27.92, 7.87), rel=1e-9)


def test_cumulative_penetration_matches_the_closed_form():
    # independent reference: P(t) = k·i_L·[t + A_c/(A_a·b)·ln((f0 + b t)/f0)] before the cap
    res = run(holiday_count="40", coating_category="II-0-30", design_life="20 year")
    s = by_side(res)["anode"]
    k = rates.penetration_mm_per_yr(1.0, 27.92, 7.87)
    f0, b = res["breakdown_a_used"], res["breakdown_b_per_yr_used"]
    A_a, A_c, iL = res["anode_area_m2"], res["cathode_area_m2"], res["i_limit_A_m2"]
    t = 20.0
    ref = k * iL * (t + A_c / (A_a * b) * math.log((f0 + b * t) / f0))
    assert s["penetration_at_design_life_mm"] == pytest.approx(ref, rel=1e-4)


def test_capped_breakdown_branch_is_used():
    res = run(holiday_count="", holiday_diameter="", inspected_area="",
              coating_category="I-0-30", design_life="20 year")
    assert res["fc_capped_before_design_life"]
    assert res["fc_mean"] == pytest.approx(1 - 0.9 ** 2 / (2 * 0.1 * 20))
    assert res["fc_final"] == 1.0
    assert res["fc_reaches_1_at_years"] == pytest.approx(9.0)


def test_breakdown_constants_entered_directly_override_the_category():
    res = run(holiday_count="", holiday_diameter="", inspected_area="",
              breakdown_a="0.05", breakdown_b="0.025", coating_category="III-0-30",
              design_life="20 year")
    assert res["fc_mean"] == pytest.approx(0.30)
    assert res["fc_final"] == pytest.approx(0.55)
    assert any("instead of coating category" in n for n in res["display"]["notes"])


def test_coated_member_that_is_the_cathode_is_explained():
    # the same holiday fraction: 4 holidays on 0.6 m² = 10 holidays on 1.5 m²
    res = run(coated="C95800", other="carbon steel", coated_side="anode",
              coated_area="1.2 m²", other_area="3 m²", holiday_count="4",
              inspected_area="0.6 m²")
    assert res["coated_member_role"] == "cathode"
    assert res["anode"] == "carbon_steel"
    assert any("what-if" in w for w in res["display"]["warnings"])
    # the same physical couple: the scenarios do not depend on which member was typed first
    ref = by_side(run(holiday_count="10"))
    for side, s in by_side(res).items():
        assert s["initial_rate_mm_per_yr"] == pytest.approx(ref[side]["initial_rate_mm_per_yr"])


def test_no_initial_holidays_on_a_coated_anode_is_unbounded_not_a_crash():
    res = run(holiday_count="", holiday_diameter="", inspected_area="",
              coating_category="none", breakdown_a="0", breakdown_b="0.02")
    s = by_side(res)["anode"]
    assert s["perforation_status"] == holidays.LIFE_UNBOUNDED
    assert s["years_to_perforation"] is None and s["rank"] == 4
    json.dumps(api.run("holiday", {**BASE, "holiday_count": "", "holiday_diameter": "",
                                   "inspected_area": "", "coating_category": "none",
                                   "breakdown_a": "0", "breakdown_b": "0.02"}),
               allow_nan=False)


def test_zero_holidays_and_no_growth_means_no_attack_on_a_coated_anode():
    res = run(holiday_count="0", coating_category="none")
    assert res["perforation_status"] == rates.LIFE_NO_ATTACK
    assert res["penetration_mm_per_yr_initial"] == 0.0


def test_perforation_beyond_1000_years_is_said_not_numbered():
    res = run(environment="indoor_controlled", coated_side="cathode", thickness="200 mm",
              coating_category="III-30+")
    assert res["perforation_status"] == rates.LIFE_BEYOND
    assert res["years_to_perforation"] is None
    assert res["perforation_text"] == "beyond 1000 years"
    assert res["perforation_beyond_1000_years"] is True


def test_spark_voltage_reported_for_thick_films():
    res = run(coating_thickness="80 mil")
    assert res["test_method"] == coatings.HIGH_VOLTAGE
    assert res["test_voltage_V"] == pytest.approx(11180, abs=5)
    assert any("manufacturer" in n for n in res["display"]["notes"])


# ---------------------------------------------------------------- bad input

def test_holidays_larger_than_the_inspected_area():
    with pytest.raises(RangeError, match="more than the"):
        run(holiday_count="1000", holiday_diameter="100 mm", inspected_area="1 m²")


def test_exposed_area_larger_than_the_coated_area():
    with pytest.raises(RangeError, match="larger than the coated area"):
        run(holiday_count="", holiday_diameter="", inspected_area="", exposed_area="4 m²")


def test_inspected_area_larger_than_the_coated_area():
    with pytest.raises(RangeError, match="inspected area is larger"):
        run(inspected_area="5 m²")


def test_negative_count_is_refused_by_the_schema():
    with pytest.raises(InputErrors, match="Holidays found is out of range"):
        run(holiday_count="-3")


@pytest.mark.parametrize("key, value", [("breakdown_a", "1.5"), ("breakdown_b", "-0.2"),
                                        ("breakdown_b", "2")])
def test_breakdown_constants_outside_0_1(key, value):
    other = "breakdown_b" if key == "breakdown_a" else "breakdown_a"
    out = api.run("holiday", {**BASE, key: value, other: "0.05"})
    assert not out["ok"]
    assert out["error"]["field"] == key and "out of range" in out["error"]["message"]


def test_design_life_of_zero():
    out = api.run("holiday", {**BASE, "design_life": "0 year"})
    assert not out["ok"] and out["error"]["field"] == "design_life"
    assert "longer than zero" in out["error"]["message"]
    with pytest.raises(RangeError, match="longer than zero"):
        CALC.compute(**{**CALC.parse(BASE), "design_life": 0.0})


def test_count_and_exposed_area_together_are_refused():
    with pytest.raises(InputError, match="not both"):
        run(exposed_area="200 mm²")


def test_count_without_a_diameter():
    with pytest.raises(InputError, match="needs the holidays' diameter"):
        run(holiday_diameter="")


def test_a_without_b():
    with pytest.raises(InputError, match="come in a pair"):
        run(breakdown_a="0.05")


def test_no_coating_state_at_all():
    with pytest.raises(InputError, match="Describe the coating"):
        run(holiday_count="", holiday_diameter="", inspected_area="", coating_category="none")


# ---------------------------------------------------------------- properties

areas = st.floats(min_value=0.01, max_value=100.0)
fractions = st.floats(min_value=1e-6, max_value=0.5)
growth = st.floats(min_value=0.0, max_value=0.2).filter(lambda x: x == 0 or x >= 1e-12)  # tiny: refused


@settings(max_examples=40, deadline=None)
@given(A_coated=areas, A_other=areas, a=fractions, b=growth,
       tf=st.floats(min_value=1, max_value=60), th=st.floats(min_value=0.5, max_value=50))
def test_coating_the_anode_is_never_better_than_coating_the_cathode(A_coated, A_other, a, b,
                                                                    tf, th):
    res = run(holiday_count="", holiday_diameter="", inspected_area="", coating_category="none",
              breakdown_a=str(a), breakdown_b=str(b), coated_area=f"{A_coated} m²",
              other_area=f"{A_other} m²", design_life=f"{tf} year", thickness=f"{th} mm")
    s = by_side(res)
    assert s["anode"]["initial_rate_mm_per_yr"] >= s["cathode"]["initial_rate_mm_per_yr"] * (1 - 1e-12)
    assert (s["anode"]["rate_at_design_life_mm_per_yr"]
            >= s["cathode"]["rate_at_design_life_mm_per_yr"] * (1 - 1e-12))
    assert life(s["anode"]) <= life(s["cathode"]) * (1 + 1e-9)
    assert s["anode"]["rank"] > s["cathode"]["rank"]


@settings(max_examples=40, deadline=None)
@given(n1=st.integers(1, 50), extra=st.integers(1, 200), d_mm=st.floats(0.5, 20),
       A_cathode=areas, b=growth)
def test_one_holiday_perforates_sooner_than_each_of_many(n1, extra, d_mm, A_cathode, b):
    n2 = n1 + extra
    common = dict(coating_category="none", inspected_area="", holiday_diameter=f"{d_mm} mm",
                  other_area=f"{A_cathode} m²", coated_area="10 m²", thickness="6 mm",
                  breakdown_a="", breakdown_b="")
    if b > 0:
        common.update(breakdown_a="0.01", breakdown_b=str(b))  # a replaced by the holidays
    few = by_side(run(holiday_count=str(n1), **common))["anode"]
    many = by_side(run(holiday_count=str(n2), **common))["anode"]
    assert few["initial_rate_mm_per_yr"] > many["initial_rate_mm_per_yr"]
    assert life(few) <= life(many) * (1 + 1e-9)


@settings(max_examples=25, deadline=None)
@given(n=st.integers(1, 100), d_mm=st.floats(0.5, 10), A_m2=st.floats(0.5, 20),
       A_other=st.floats(0.1, 20), tf=st.floats(1, 50))
def test_same_coating_state_in_other_units_gives_the_same_result(n, d_mm, A_m2, A_other, tf):
    si = run(holiday_count=str(n), holiday_diameter=f"{d_mm} mm", inspected_area="",
             coated_area=f"{A_m2} m²", other_area=f"{A_other} m²", design_life=f"{tf} year",
             thickness="8 mm")
    ft2 = units.convert(1, "m**2", "ft**2")
    us = run(holiday_count=str(n), holiday_diameter=f"{d_mm / 25.4!r} in", inspected_area="",
             coated_area=f"{A_m2 * ft2!r} ft²", other_area=f"{A_other * ft2!r} ft^2",
             design_life=f"{tf * 365!r} day", thickness=f"{8 / 0.0254!r} mil")
    for key in ("fc_initial", "fc_mean", "fc_final", "anode_current_density_A_m2",
                "penetration_mm_per_yr_initial", "penetration_at_design_life_mm"):
        assert us[key] == pytest.approx(si[key], rel=1e-9)
    for a, b in zip(si["scenarios"], us["scenarios"]):
        assert life(a) == pytest.approx(life(b), rel=1e-6)


@settings(max_examples=25, deadline=None)
@given(a=fractions, b=growth, tf=st.floats(1, 100))
def test_exposed_fraction_never_exceeds_one_in_results(a, b, tf):
    res = run(holiday_count="", holiday_diameter="", inspected_area="", coating_category="none",
              breakdown_a=str(a), breakdown_b=str(b), design_life=f"{tf} year")
    assert 0 <= res["fc_initial"] <= res["fc_final"] <= 1.0
    assert res["fc_initial"] <= res["fc_mean"] <= res["fc_final"] + 1e-12


def test_same_alloy_on_both_sides_counts_no_cathode():
    res = run(coated="C95800", other="C95800", holiday_count="", holiday_diameter="",
              inspected_area="")
    assert res["delta_E_V"] == 0 and res["cathode_area_m2"] == 0.0
    assert res["anode_current_density_A_m2"] == pytest.approx(res["i_limit_A_m2"])
    assert any("no galvanic driving force" in w for w in res["display"]["warnings"])


def test_timeline_runs_over_the_design_life():
    res = run(design_life="20 year")
    times = [p["t_yr"] for p in res["timeline"]]
    assert times[0] == 0 and times[-1] == pytest.approx(20.0)
    pens = [p["penetration_mm"] for p in res["timeline"]]
    assert pens == sorted(pens)
