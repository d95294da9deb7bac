"""Coating breakdown over a design life, and holiday-test practice.

Breakdown (DNV-RP-B401, section 6.4): the fraction of a coated surface that is
bare, ``fc``, grows linearly with time and cannot exceed 1,

    fc(t) = min(1, a + b·t)                       t in years

with ``a`` the initial breakdown (a fraction, 0–1) and ``b`` its growth per
year. Over a design life ``tf`` the mean and final factors are

    fcm = a + b·tf/2                              while a + b·tf ≤ 1
    fcm = 1 − (1 − a)²/(2·b·tf)                   when fc reaches 1 before tf
    fcf = min(1, a + b·tf)

(the second form is the mean of the capped line: fc reaches 1 at
``t1 = (1 − a)/b`` and stays there).

Holiday testing (ASTM D5162): a low-voltage wet sponge for a total dry film up
to 0.5 mm (20 mil), a high-voltage spark above it. Two spark voltages, one rule
(:func:`spark_formula`): a thick film (over 0.5 mm) is tested at
``V = 1250·√T`` (NACE SP0274); a thin film (up to 0.5 mm, e.g. fusion-bonded
epoxy) that a specification wants spark-tested is tested at ``V = 525·√T``
(the thin-film practice; its coefficient is marked from memory). T is the dry
film in mil. The bands and coefficients are rows of ``data/holiday_tests.csv``;
the breakdown constants by coating category and depth are rows of
``data/coatings.csv``.

Times here are in years (``_yr``) because the standard's constants are per
year; thicknesses are in metres (SI), converted to mil only for the formula.
"""

from __future__ import annotations

import math

from .. import units
from ..errors import RangeError
from ..materials import data

LOW_VOLTAGE = "low_voltage_sponge"
HIGH_VOLTAGE = "high_voltage_spark"
THIN_FILM_SPARK = "thin_film_spark"
SPARK_FORMULAS = (HIGH_VOLTAGE, THIN_FILM_SPARK)


def category_ids():
    """Ids and labels of the coating categories in ``data/coatings.csv``."""
    return [(r["id"], f"Category {r['category']}, {r['depth_band']}")
            for r in data.table("coatings")]


def category(cat_id, field="coating_category"):
    """Return the ``data/coatings.csv`` row of a category id (ChoiceError if unknown).

    Example
    -------
    >>> row = category("I-0-30")
    >>> row["a_fraction"], row["b_per_yr"]
    (0.1, 0.1)
    """
    return data.lookup("coatings", cat_id, field=field, what="coating category")


def check_constants(a, b, field_a="breakdown_a", field_b="breakdown_b"):
    """Raise :class:`RangeError` unless 0 ≤ a ≤ 1 and 0 ≤ b ≤ 1 (per year)."""
    for value, field, what in ((a, field_a, "initial breakdown a"),
                               (b, field_b, "breakdown growth b")):
        if value is None or not (0.0 <= value <= 1.0) or not math.isfinite(value):
            raise RangeError(f"The {what} must lie between 0 and 1.", field=field,
                             value=value, allowed="0 to 1 (a: a fraction; b: per year)")


def breakdown(a, b, t_yr):
    """Coating breakdown factor fc(t) = min(1, a + b·t) [fraction].

    Parameters
    ----------
    a : float
        Initial breakdown [fraction, 0–1].
    b : float
        Growth of the breakdown [1/yr].
    t_yr : float
        Time in service [yr], ≥ 0.

    Example
    -------
    >>> breakdown(0.05, 0.025, 20)
    0.55
    """
    return min(1.0, a + b * t_yr)


def cap_time_yr(a, b):
    """Years until fc reaches 1, ``(1 − a)/b``; 0 if a ≥ 1, None if it never does."""
    if a >= 1.0:
        return 0.0
    if b <= 0.0:
        return None
    return (1.0 - a) / b


def final_breakdown(a, b, tf_yr):
    """Final breakdown factor fcf = min(1, a + b·tf) [fraction] (DNV-RP-B401 §6.4)."""
    return breakdown(a, b, tf_yr)


def mean_breakdown(a, b, tf_yr):
    """Mean breakdown factor over the design life (DNV-RP-B401 §6.4).

    ``fcm = a + b·tf/2``; when fc reaches 1 before ``tf`` the mean of the
    capped line, ``fcm = 1 − (1 − a)²/(2·b·tf)``.

    Parameters
    ----------
    a, b : float
        Breakdown constants [fraction], [1/yr].
    tf_yr : float
        Design life [yr], > 0.

    Raises
    ------
    RangeError
        Design life not positive.

    Example
    -------
    >>> round(mean_breakdown(0.05, 0.025, 20), 6)
    0.3
    >>> round(mean_breakdown(0.10, 0.10, 20), 6)
    0.7975
    """
    if not tf_yr > 0:
        raise RangeError("The design life must be longer than zero.", field="design_life",
                         value=tf_yr, allowed="a time > 0, e.g. 20 year")
    t1 = cap_time_yr(a, b)
    if t1 is not None and t1 < tf_yr:
        if a >= 1.0:
            return 1.0
        return 1.0 - (1.0 - a) ** 2 / (2.0 * b * tf_yr)
    return a + 0.5 * b * tf_yr


def capped(a, b, tf_yr):
    """True when fc reaches 1 before the end of the design life."""
    t1 = cap_time_yr(a, b)
    return t1 is not None and t1 < tf_yr


def holiday_test_rows():
    """``{id: row}`` of ``data/holiday_tests.csv``."""
    return data.index("holiday_tests")


def test_method(thickness_m):
    """Holiday-test method id for a total dry film thickness [m] (ASTM D5162).

    Up to and including 0.5 mm: low-voltage wet sponge; above: high-voltage
    spark.

    Example
    -------
    >>> test_method(0.3e-3), test_method(2e-3)
    ('low_voltage_sponge', 'high_voltage_spark')
    """
    if not thickness_m > 0:
        raise RangeError("The coating thickness must be larger than zero.",
                         field="coating_thickness", value=thickness_m,
                         allowed="a dry film thickness > 0, e.g. 0.4 mm or 16 mil")
    low = holiday_test_rows()[LOW_VOLTAGE]
    limit_m = low["max_thickness_mm"] * 1e-3
    return LOW_VOLTAGE if thickness_m <= limit_m * (1 + 1e-12) else HIGH_VOLTAGE


def spark_formula(thickness_m):
    """Which spark-voltage formula applies to a dry film of ``thickness_m`` [m].

    The rule: a film thicker than the thin-film band (0.5 mm / 20 mil) takes
    the thick-film formula 1250·√T; a film inside the band takes the thin-film
    formula 525·√T.

    Example
    -------
    >>> spark_formula(0.4e-3), spark_formula(2e-3)
    ('thin_film_spark', 'high_voltage_spark')
    """
    if not thickness_m > 0:
        raise RangeError("The coating thickness must be larger than zero.",
                         field="coating_thickness", value=thickness_m,
                         allowed="a dry film thickness > 0, e.g. 0.4 mm or 16 mil")
    thin = holiday_test_rows()[THIN_FILM_SPARK]
    limit_m = thin["max_thickness_mm"] * 1e-3
    return THIN_FILM_SPARK if thickness_m <= limit_m * (1 + 1e-12) else HIGH_VOLTAGE


def spark_voltage_V(thickness_m, formula=HIGH_VOLTAGE):
    """Spark test voltage V = k·√T, T in mil [V].

    Parameters
    ----------
    thickness_m : float
        Total dry film thickness [m].
    formula : str
        ``high_voltage_spark`` (thick films, k = 1250, NACE SP0274) or
        ``thin_film_spark`` (thin films, k = 525); :func:`spark_formula` picks
        one by thickness.

    Example
    -------
    >>> round(spark_voltage_V(units.convert(80, "mil", "m")))
    11180
    >>> round(spark_voltage_V(units.convert(16, "mil", "m"), THIN_FILM_SPARK))
    2100
    """
    if not thickness_m > 0:
        raise RangeError("The coating thickness must be larger than zero.",
                         field="coating_thickness", value=thickness_m,
                         allowed="a dry film thickness > 0, e.g. 0.4 mm or 16 mil")
    if formula not in SPARK_FORMULAS:
        raise RangeError(f"Unknown spark-voltage formula {formula!r}.", field="formula",
                         value=formula, allowed=", ".join(SPARK_FORMULAS))
    k_V = holiday_test_rows()[formula]["k_V"]
    return k_V * math.sqrt(units.convert(thickness_m, "m", "mil"))


def holiday_test(thickness_m):
    """The inspector's helper: method, voltage where it applies, and sources.

    Returns
    -------
    dict
        ``test_method`` (id), ``test_method_name``, ``test_voltage_V`` (None for
        the low-voltage sponge), ``thickness_mil``, ``sources`` (citations).
    """
    method = test_method(thickness_m)
    rows = holiday_test_rows()
    row = rows[method]
    voltage = spark_voltage_V(thickness_m) if method == HIGH_VOLTAGE else None
    picked = spark_formula(thickness_m)
    options = [{"id": f, "name": rows[f]["name"], "k_V": rows[f]["k_V"],
                "voltage_V": spark_voltage_V(thickness_m, f), "applies": f == picked,
                "source": data.cite(rows[f])} for f in SPARK_FORMULAS]
    return {
        "spark_formula": picked,
        "spark_voltage_V": spark_voltage_V(thickness_m, picked),
        "spark_options": options,
        "test_method": method,
        "test_method_name": row["name"],
        "test_voltage_V": voltage,
        "thickness_mil": units.convert(thickness_m, "m", "mil"),
        "threshold_mm": rows[LOW_VOLTAGE]["max_thickness_mm"],
        "sources": {"method": data.cite(rows[LOW_VOLTAGE]),
                    "voltage": data.cite(rows[HIGH_VOLTAGE]) if voltage is not None else None},
    }
