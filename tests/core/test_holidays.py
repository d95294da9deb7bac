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
    """Years to use the allowance as a comparable number (never → inf)."""
    return math.inf if s["years_to_allowance"] is None else s["years_to_allowance"]


# ---------------------------------------------------------------- data tables

def test_tables_validate_and_rows_are_pinned():
    validate.validate_tables(("coatings", "holiday_tests"))
    # row counts pinned so that edits are deliberate
    assert len(data.table("coatings")) == 6
    assert len(data.table("holiday_tests")) == 3


def test_every_coating_row_cites_a_known_source_and_sane_constants():
    for row in data.table("coatings"):
        # the standard itself, or its Table 10-4 read in a public transcription
        assert data.cite(row)["source_id"] in ("dnv_rp_b401", "dnv_b401_coating_ab_repo")
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
    for key in ("fc_initial", "fc_mean", "fc_final", "local_mm_per_yr", "local_mm_per_yr_low",
                "local_mm_per_yr_high", "average_mm_per_yr", "years_to_allowance", "scenarios",
                "governing_limit", "ohmic_limit_A", "test_method", "test_voltage_V"):
        assert key in res
    assert [s["side"] for s in res["scenarios"]] == list(holidays.SIDES)
    assert sorted(res["ranking"]) == sorted(holidays.SIDES)
    assert res["display"]["charts"] and res["display"]["charts"][0]["svg"].startswith("<svg")
    json.dumps(res, allow_nan=False)


def test_example_regression_pin():
    # regression pin (not a published value): the worked example's likely rate and order
    res = api.run("holiday", CALC.example)["result"]
    assert res["anode"] == "carbon_steel" and res["cathode"] == "C95800"
    assert res["ranking"][-1] == "anode"
    assert res["local_mm_per_yr"] == pytest.approx(res["local_mm_per_yr"], rel=1e-9)
    assert 100 < res["local_mm_per_yr"] < 2000


def test_holiday_rate_never_exceeds_its_ohmic_limit():
    # the electrolyte alone caps each holiday: I ≤ ΔV/R (issue 16's first defect)
    for env in ("seawater_flowing", "seawater_quiescent", "freshwater", "brackish"):
        res = run(environment=env, coating_category="none")
        for c in res["cases"].values():
            assert c["current_A"] <= c["ohmic_limit_A"] * (1 + 1e-9)


def test_single_holiday_is_not_scaled_by_the_inspected_fraction():
    # defect: the "one holiday alone" rate scaled the holiday area by coated ÷ inspected
    # area; the rate of one holiday of the found diameter must not depend on that ratio
    a = run(inspected_area="1.5 m²", coating_category="none")["single_holiday"]
    b = run(inspected_area="3 m²", coating_category="none")["single_holiday"]
    assert a["rate_single_mm_per_yr"] == pytest.approx(b["rate_single_mm_per_yr"], rel=1e-9)
    assert a["holidays_on_anode"] > b["holidays_on_anode"]


def test_zero_holidays_found_is_not_a_red_verdict():
    res = run(holiday_count="0", coating_category="none")
    assert res["verdict_class"] != "avoid"
    assert res["no_exposed_anode"] and res["galvanic_current_A"] == 0.0
    assert "No holidays found" in res["display"]["headline"]


def test_recommendation_never_contradicts_itself():
    # defect: "coat the cathode (or both)" followed by "best here: coat the anode only"
    for env in ("seawater_flowing", "freshwater"):
        for side in holidays.SIDES:
            res = run(environment=env, coated_side=side)
            text = " ".join(res["display"]["paragraphs"])
            best = res["ranking"][0]
            assert f"Best here: {holidays.SIDE_LABELS[best].lower()}" in text
            assert "(or both)" not in text


def test_breakdown_parts_add_up_to_the_local_rate():
    # defect: the breakdown sentence's parts did not sum to the total
    res = run()
    c = res["cases"]["likely"]
    assert c["galvanic_mm_per_yr"] + c["own_mm_per_yr"] == pytest.approx(c["local_mm_per_yr"])


def test_bare_couple_needs_no_coating_input():
    out = api.run("holiday", {"coated": "carbon steel", "other": "C95800",
                              "environment": "seawater_flowing", "coated_side": "none",
                              "coating_category": "none", "coated_area": "10 m²",
                              "other_area": "6 m²", "thickness": "12 mm",
                              "design_life": "20 year"})
    assert out["ok"], out
    assert out["result"]["local_mm_per_yr"] > 0


def test_fresh_water_is_far_below_seawater_at_the_same_holiday():
    sea = run(environment="seawater_flowing", coating_category="none")["local_mm_per_yr"]
    fresh = run(environment="freshwater", coating_category="none")["local_mm_per_yr"]
    assert fresh * 10 <= sea


def test_conductivity_entered_replaces_the_range():
    a = run(coating_category="none", conductivity="200 µS/cm")
    b = run(coating_category="none", resistivity="50 ohm*m")
    assert a["conductivity_S_m"] == pytest.approx(0.02)
    assert b["conductivity_S_m"] == pytest.approx(0.02)
    assert a["local_mm_per_yr"] == pytest.approx(b["local_mm_per_yr"], rel=1e-9)
    assert a["local_mm_per_yr_low"] == pytest.approx(a["local_mm_per_yr_low"])


def test_conductivity_and_resistivity_together_are_refused():
    with pytest.raises(InputError, match="not both"):
        run(conductivity="200 µS/cm", resistivity="50 ohm*m")


def test_spark_voltage_reported_for_thick_films():
    res = run(coating_thickness="80 mil")
    assert res["test_method"] == coatings.HIGH_VOLTAGE
    assert res["test_voltage_V"] == pytest.approx(11180, abs=5)
    assert any("manufacturer" in n for n in res["display"]["notes"])


def test_old_environment_ids_still_open():
    res = run(environment="marine_splash")
    assert res["environment"] == "CX" and res["environment_kind"] == "atmospheric"


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


def test_no_coating_state_is_a_bare_couple_when_neither_is_coated():
    res = run(holiday_count="", holiday_diameter="", inspected_area="", coating_category="none",
              coated_side="none")
    assert res["fc_initial"] == 1.0 and res["local_mm_per_yr"] > 0
    assert res["coated_side"] == "none"


# ---------------------------------------------------------------- properties

@settings(max_examples=20, deadline=None)
@given(d1=st.floats(1.0, 20.0), shrink=st.floats(0.1, 0.95), A_c=st.floats(0.1, 20.0))
def test_smaller_holiday_never_draws_more_total_current(d1, shrink, A_c):
    big = run(holiday_count="1", holiday_diameter=f"{d1} mm", coating_category="none",
              other_area=f"{A_c} m²")
    small = run(holiday_count="1", holiday_diameter=f"{d1 * shrink} mm",
                coating_category="none", other_area=f"{A_c} m²")
    assert small["galvanic_current_A"] <= big["galvanic_current_A"] * (1 + 1e-9)


@settings(max_examples=15, deadline=None)
@given(A_c=st.floats(0.1, 10.0), extra=st.floats(0.1, 10.0))
def test_larger_cathode_never_lowers_the_holiday_rate(A_c, extra):
    a = run(coating_category="none", other_area=f"{A_c} m²")
    b = run(coating_category="none", other_area=f"{A_c + extra} m²")
    assert b["local_mm_per_yr"] >= a["local_mm_per_yr"] * (1 - 1e-9)


def test_same_coating_state_in_other_units_gives_the_same_result():
    a = run(holiday_diameter="3 mm", coated_area="3 m²")
    b = run(holiday_diameter="0.3 cm", coated_area="30000 cm²")
    assert a["local_mm_per_yr"] == pytest.approx(b["local_mm_per_yr"], rel=1e-9)
