"""units.py: the one registry, parsing at the edges, CODATA constants."""

import math

import pytest
from hypothesis import given, strategies as st

from noblegap import units
from noblegap.errors import InputError, UnitError


def test_codata_constants_come_from_pint_exact_definitions():
    # CODATA 2018: F = e*N_A and R = k*N_A are exact in the SI.
    assert units.faraday() == pytest.approx(96485.33212, rel=1e-10)
    assert units.gas_constant() == pytest.approx(8.314462618, rel=1e-9)


@pytest.mark.parametrize("text,kind,expected", [
    ("-800 mV", "potential", -0.8),
    ("-0.80 V", "potential", -0.8),
    ("−0.80 V", "potential", -0.8),          # typographic minus
    ("25 °C", "temperature", 298.15),
    ("25 degC", "temperature", 298.15),
    ("77 °F", "temperature", 298.15),
    ("298.15 K", "temperature", 298.15),
    ("3/8 in", "length", 0.009525),
    ("10 mm", "length", 0.010),
    ("2 mil", "length", 2 * 25.4e-6),        # mil is a length here, not an angle
    ("4 thou", "length", 4 * 25.4e-6),
    ("1 µA/cm²", "current_density", 0.01),
    ("1 uA/cm^2", "current_density", 0.01),
    ("0.1 mol/L", "molar_concentration", 100.0),
    ("5 mg/L", "mass_concentration", 5e-3),
    ("12 mpy", "rate", 12 * 25.4e-6 / (365 * 86400)),
    ("1 mm/yr", "rate", 1e-3 / (365 * 86400)),
    ("20 year", "time", 20 * 365 * 86400),
    ("1.2 m * 0.8 m", "area", 0.96),
    ("50 cm^2", "area", 50e-4),
])
def test_parse_known_quantities(text, kind, expected):
    assert units.parse(text, kind, field="x") == pytest.approx(expected, rel=1e-12)


def test_bare_number_takes_the_default_unit():
    assert units.parse("0.25", "potential", default_unit="V") == 0.25
    assert units.parse(-800, "potential", default_unit="mV") == pytest.approx(-0.8)


def test_bare_number_without_default_unit_asks_for_a_unit():
    with pytest.raises(UnitError, match="A unit is needed"):
        units.parse("5", "length", field="diameter")


def test_wrong_dimension_names_both_dimensions():
    with pytest.raises(UnitError, match="That is a mass, not a potential") as info:
        units.parse("3 kg", "potential", field="potential")
    d = info.value.to_dict()
    assert d["field"] == "potential" and d["value"] == "3 kg"
    assert "mV" in d["allowed"]


def test_unknown_unit_is_named():
    with pytest.raises(UnitError, match="Unknown unit 'furlongs'"):
        units.parse("3 furlongs", "length", field="diameter")


def test_empty_and_garbage_are_input_errors():
    with pytest.raises(InputError, match="empty"):
        units.parse("  ", "potential", field="potential")
    with pytest.raises(InputError, match="Not a number with a unit"):
        units.parse("(((", "potential", field="potential")


@given(st.floats(min_value=-1e6, max_value=1e6, allow_nan=False)
       .filter(lambda x: x == 0 or abs(x) >= 1e-6))   # below 0.1 nm: refused, see LIMITS
def test_millimetres_and_inches_agree(x):
    mm = units.parse(f"{x!r} mm", "length")
    inch = units.parse(f"{x / 25.4!r} in", "length")
    assert mm == pytest.approx(inch, rel=1e-9, abs=1e-15)


# Values within a hair of zero (5e-324 °C, 1e-306 °C) are refused by the grammar
# with their own message (tests/core for hostile input); here: real temperatures.
@given(st.one_of(st.just(0.0), st.floats(min_value=-50, max_value=150, allow_nan=False)
                 .filter(lambda c: abs(c) >= 1e-9)))
def test_celsius_fahrenheit_kelvin_agree(c):
    k = units.parse(f"{c!r} degC", "temperature")
    f = units.parse(f"{c * 9 / 5 + 32!r} degF", "temperature")
    assert k == pytest.approx(c + 273.15, abs=1e-9)
    assert f == pytest.approx(k, abs=1e-9)


def test_fmt_never_prints_nan():
    assert units.fmt(float("nan"), "V") == "beyond range"
    assert units.fmt(None, "V") == "—"
    assert units.fmt(-0.80123, "V") == "\u22120.801 V"
    assert not math.isnan(units.parse("1e-3 V", "potential"))
