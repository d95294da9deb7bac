"""Checks of the coating and holiday-test helpers against published values.

Each check names its source beside it. Regression pins are in
tests/test_holidays.py and say so.
"""

import pytest

from noblegap.methods import coatings
from noblegap import units


# DNV-RP-B401, §6.4 (mean and final coating breakdown factors): with
# a = 0.05, b = 0.025 and tf = 20 years the standard's formulas give
# fcm = 0.30 and fcf = 0.55 (printed to two decimals → tolerance 0.005).
# The constants are given directly (their category lookup is checked below
# against Table 10-4).
def test_dnv_rp_b401_mean_breakdown_a005_b0025_20yr():
    assert coatings.mean_breakdown(0.05, 0.025, 20) == pytest.approx(0.30, abs=0.005)


def test_dnv_rp_b401_final_breakdown_a005_b0025_20yr():
    assert coatings.final_breakdown(0.05, 0.025, 20) == pytest.approx(0.55, abs=0.005)


# DNV-RP-B401, Table 10-4: coating category I, 0–30 m: a = 0.10, b = 0.10
# (printed to two decimals).
def test_dnv_rp_b401_table_10_4_category_I_0_30m_constants():
    row = coatings.category("I-0-30")
    assert row["a_fraction"] == pytest.approx(0.10, abs=0.005)
    assert row["b_per_yr"] == pytest.approx(0.10, abs=0.005)
    assert row["confidence"] == "published"
    assert row["source_id"] == "dnv_rp_b401"


# DNV-RP-B401, §6.4: fc reaching 1 before the design life uses
# fcm = 1 − (1 − a)²/(2·b·tf). Category I, 0–30 m (a = b = 0.10, Table 10-4),
# tf = 20 yr: fc = 1 at 9 yr, fcm = 1 − 0.81/4 = 0.7975; fcf capped at 1.
def test_dnv_rp_b401_capped_mean_category_I_20yr():
    assert coatings.capped(0.10, 0.10, 20)
    assert coatings.mean_breakdown(0.10, 0.10, 20) == pytest.approx(0.7975, abs=5e-5)
    assert coatings.final_breakdown(0.10, 0.10, 20) == 1.0


# NACE SP0274 (test voltage V = 1250·√T, T in mil): the sheet's check value
# 11.18 kV (printed to 0.01 kV) is 1250·√80 — "2 mm" taken as the nominal
# 80 mil. Exactly 2 mm is 78.74 mil and gives 11.09 kV.
def test_nace_sp0274_voltage_80_mil_11_18_kV():
    v = coatings.spark_voltage_V(units.convert(80, "mil", "m"))
    assert v / 1000 == pytest.approx(11.18, abs=0.005)


def test_nace_sp0274_voltage_exact_2_mm_is_1250_sqrt_78_74_mil():
    # Same formula (NACE SP0274) evaluated at exactly 2 mm = 78.74 mil: 11.09 kV.
    assert coatings.spark_voltage_V(2e-3) / 1000 == pytest.approx(11.09, abs=0.005)


# ASTM D5162, Sections 1 and 6: low-voltage wet sponge for a total dry film
# up to 0.5 mm (20 mil), high-voltage spark above.
@pytest.mark.parametrize("text, method", [
    ("0.2 mm", coatings.LOW_VOLTAGE),
    ("0.5 mm", coatings.LOW_VOLTAGE),
    ("20 mil", coatings.LOW_VOLTAGE),
    ("0.51 mm", coatings.HIGH_VOLTAGE),
    ("21 mil", coatings.HIGH_VOLTAGE),
    ("2 mm", coatings.HIGH_VOLTAGE),
])
def test_astm_d5162_method_threshold_0_5_mm(text, method):
    assert coatings.test_method(units.parse(text, "length")) == method


# The two spark-voltage formulas and the rule that picks one by film thickness.
# Thick films: NACE SP0274, V = 1250·√T (T in mil) — a published value, checked
# above at 11.18 kV for 80 mil. Thin films (up to 0.5 mm / 20 mil, e.g.
# fusion-bonded epoxy): V = 525·√T, attributed to NACE SP0490 but NOT read —
# it is labelled from memory and only its labelling and the rule are checked,
# never the coefficient as a published value.
def test_thick_film_formula_is_nace_sp0274_published():
    row = coatings.holiday_test_rows()[coatings.HIGH_VOLTAGE]
    assert row["source_id"] == "nace_sp0274" and row["confidence"] == "published"
    assert row["k_V"] == pytest.approx(1250, abs=0.5)          # printed as 1250
    assert coatings.spark_formula(units.parse("2 mm", "length")) == coatings.HIGH_VOLTAGE


def test_thin_film_formula_is_labelled_from_memory_and_picked_for_thin_films():
    row = coatings.holiday_test_rows()[coatings.THIN_FILM_SPARK]
    assert row["source_id"] == "nace_sp0490" and row["confidence"] == "from-memory"
    for text in ("0.25 mm", "16 mil", "20 mil"):
        assert coatings.spark_formula(units.parse(text, "length")) == coatings.THIN_FILM_SPARK
    assert coatings.spark_formula(units.parse("21 mil", "length")) == coatings.HIGH_VOLTAGE
    opts = coatings.holiday_test(units.parse("16 mil", "length"))["spark_options"]
    picked = [o for o in opts if o["applies"]]
    assert [o["id"] for o in picked] == [coatings.THIN_FILM_SPARK]
    assert "from memory" in picked[0]["source"]["text"]


# nace_rp0274_scope: NACE RP0274-2004 §1.3 (scope as printed on the publisher's
# store page): the thick-film voltages do not apply to thin-film (fusion-bonded)
# coatings, "generally applied to a dry-film thickness less than 0.5 mm (20 mils)".
# The split between the two spark formulas is that printed limit (0.5 mm or
# 20 mil = 0.508 mm; both printed values must fall on the thin-film side).
def test_thin_film_split_is_nace_rp0274_scope_0_5_mm_20_mil():
    row = coatings.holiday_test_rows()[coatings.THIN_FILM_SPARK]
    assert row["split_source_id"] == "nace_rp0274_scope"
    assert row["split_confidence"] == "published"
    assert 0.5 <= row["max_thickness_mm"] <= 0.508 + 1e-9
    for text in ("0.5 mm", "20 mil"):
        assert coatings.spark_formula(units.parse(text, "length")) == coatings.THIN_FILM_SPARK
    assert coatings.spark_formula(units.parse("0.51 mm", "length")) == coatings.HIGH_VOLTAGE


# DNV-RP-B401, Table 10-4 (2017: Table A-4; 2021: Table 8-4) as transcribed in
# github.com/vamseeachanta/digitalmodel (source id dnv_b401_coating_ab_repo):
# constants a and b for coating categories I-III by depth, printed to two or
# three decimals (tolerance half the last printed digit).
@pytest.mark.parametrize("row_id, a, b, tol", [
    ("I-30+", 0.10, 0.05, 0.005),
    ("II-0-30", 0.05, 0.025, 0.0005),
    ("II-30+", 0.05, 0.015, 0.0005),
    ("III-0-30", 0.02, 0.012, 0.0005),
    ("III-30+", 0.02, 0.008, 0.0005),
])
def test_dnv_rp_b401_table_10_4_constants_by_category_and_depth(row_id, a, b, tol):
    row = coatings.category(row_id)
    assert row["a_fraction"] == pytest.approx(a, abs=0.005)
    assert row["b_per_yr"] == pytest.approx(b, abs=tol)
    assert row["source_id"] == "dnv_b401_coating_ab_repo"
    assert row["confidence"] == "handbook-compiled"
