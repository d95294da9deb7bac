"""What people type is read by one small grammar, echoed in their own units.

Each accepted form is checked against the value it must mean and the text
shown next to the field; each refused form must name the field and say what
is allowed. Nothing is dropped or reinterpreted silently.
"""

import math

import pytest

from noblegap import api, units
from noblegap.errors import InputError, RangeError, UnitError
from noblegap.schema import QUANTITY, Field

IN = 0.0254
FT = 0.3048
YEAR = 365 * 86400


@pytest.mark.parametrize("text,kind,si,echo", [
    ("2,5 mm", "length", 2.5e-3, "2.5 mm"),
    ("0,5 V", "potential", 0.5, "0.5 V"),
    ("0,500 mm", "length", 0.5e-3, "0.5 mm"),
    ("1 1/2 in", "length", 1.5 * IN, "1.5 in"),
    ('3/8"', "length", 0.375 * IN, "0.375 in"),
    ('0.375"', "length", 0.375 * IN, "0.375 in"),
    ('1/4"', "length", 0.25 * IN, "0.25 in"),
    ('10"', "length", 10 * IN, "10 in"),
    ("10''", "length", 10 * IN, "10 in"),
    ("2'", "length", 2 * FT, "2 ft"),
    ("5' 6\"", "length", 5.5 * FT, "5 ft 6 in"),
    ("5 ft 6 in", "length", 5.5 * FT, "5 ft 6 in"),
    ("1½\"", "length", 1.5 * IN, "1.5 in"),
    ("3⁄8 in", "length", 0.375 * IN, "0.375 in"),
    ("1200 x 800 mm", "area", 0.96, "1200 mm × 800 mm"),
    ("1200x800mm", "area", 0.96, "1200 mm × 800 mm"),
    ("4 ft x 3 ft", "area", 12 * FT ** 2, "4 ft × 3 ft"),
    ("1.2 m x 0.8 m", "area", 0.96, "1.2 m × 0.8 m"),
    ("1.2 m × 0.8 m", "area", 0.96, "1.2 m × 0.8 m"),
    ("1.2mx0.8m", "area", 0.96, "1.2 m × 0.8 m"),
    ("1.2 m * 0.8 m * 2", "area", 1.92, "1.2 m × 0.8 m × 2"),
    ("0.96 m2", "area", 0.96, "0.96 m²"),
    ("12 ft2", "area", 12 * FT ** 2, "12 ft²"),
    ("50 cm^2", "area", 50e-4, "50 cm²"),
    ("1 µA/cm²", "current_density", 0.01, "1 µA/cm²"),
    ("60 C", "temperature", 333.15, "60 °C"),
    ("25C", "temperature", 298.15, "25 °C"),
    ("77 F", "temperature", 298.15, "77 °F"),
    ("140F", "temperature", 333.15, "140 °F"),
    ("25 deg C", "temperature", 298.15, "25 °C"),
    ("25 ℃", "temperature", 298.15, "25 °C"),
    ("25 y", "time", 25 * YEAR, "25 yr"),
    ("0.01 M", "molar_concentration", 10.0, "0.01 mol/L"),
    ("5 mM", "molar_concentration", 5.0, "5 mmol/L"),
    ("−800 mV", "potential", -0.8, "−800 mV"),
    ("1e-3 V", "potential", 1e-3, "0.001 V"),
    ("12 mpy", "rate", 12 * 25.4e-6 / YEAR, "12 mpy"),
])
def test_accepted_forms_mean_what_they_say(text, kind, si, echo):
    r = units.read(text, kind, field="x")
    assert r.value == pytest.approx(si, rel=1e-12)
    assert r.text == echo


@pytest.mark.parametrize("text,match", [
    ("M10", "10 mm nominal diameter"),
    ("M10x1.5", "M10 × 1.5 thread"),
    ("M 12", "12 mm nominal diameter"),
])
def test_metric_thread_designations_read_as_nominal_diameter(text, match):
    r = units.read(text, "length", field="diameter", thread=True)
    assert match in r.text
    assert r.value == pytest.approx(float(text.replace(" ", "")[1:3]) * 1e-3)


def test_threads_only_where_the_field_is_a_nominal_diameter():
    with pytest.raises(InputError):
        units.read("M10", "length", field="thickness")
    f = Field("distance", "Nominal diameter of the stud", QUANTITY, quantity="length", unit="mm")
    assert f.read("M8")[0] == pytest.approx(8e-3)


@pytest.mark.parametrize("text,kind,match", [
    ("1,5,5 mm", "length", "not one number"),
    ("1,000 mm", "length", "ambiguous"),
    ("10 mm 5", "length", "A number after the unit"),
    ("10 5 mm", "length", "Two numbers in a row"),
    ("{{7*7}} mV", "potential", "not read here"),
    ("${7*7} mV", "potential", "not read here"),
    ("10**10**10 V", "potential", "small power only"),
    ("9**9**9", "potential", "powers of powers"),
    ("(10**8)**(10**8)", "potential", "not read here"),
    ("10**10**7 mm", "length", "small power only"),
    ("10^3 mm", "length", "belongs directly after a unit"),
    ("m^22", "area", "small power only"),
    ("10 🔩 mV", "potential", "NUT AND BOLT"),
    ("10\x00 mV", "potential", "control character"),
    ("10\u202e mV", "potential", "RIGHT-TO-LEFT OVERRIDE"),
    ("1\u0301 mV", "potential", "combining mark"),
    ("٣ mm", "length", "Only the digits 0–9"),
    ("３ mm", "length", "Only the digits 0–9"),
    ("10-12 mm", "length", "range"),
    ("1/0 mm", "length", "zero below the line"),
    ("25°", "temperature", "°C or °F"),
    ("mm", "length", "number is missing"),
    ("5 x", "length", "ends with an operator"),
    ("10 mm mm", "length", "Two units in a row"),
])
def test_refused_forms_say_why(text, kind, match):
    with pytest.raises(InputError, match=match) as info:
        units.read(text, kind, field="f")
    assert info.value.field == "f" and info.value.allowed


def test_every_unicode_digit_family_is_refused_not_misread():
    import sys
    import unicodedata
    digits = [chr(c) for c in range(sys.maxunicode + 1)
              if unicodedata.category(chr(c)) == "Nd" and not "0" <= chr(c) <= "9"]
    assert len(digits) > 500
    for d in digits:
        with pytest.raises(InputError, match="Only the digits 0–9"):
            units.read(f"{d} mm", "length", field="f")


def test_long_text_is_refused_fast_with_its_own_message():
    import time
    for text in ("x" * 100_000, "1" * 100_000 + " mm", "m" * 201, "9" * 201):
        t0 = time.perf_counter()
        with pytest.raises(InputError, match="characters long"):
            units.read(text, "length", field="f")
        assert time.perf_counter() - t0 < 0.05
    assert units.read("1" + " " * 190 + "mm", "length").value == pytest.approx(1e-3)


@pytest.mark.parametrize("text,kind", [
    ("1e-320 mm", "length"), ("5e-324 year", "time"), ("1e-320 mol/L", "molar_concentration"),
    ("1e-308 m^2", "area"), ("1e300 mol/L", "molar_concentration"), ("1000 mol/L",
                                                                      "molar_concentration"),
    ("1e6 V", "potential"), ("1e-400 mm", "length"), ("1e400 mm", "length"),
])
def test_physical_limits(text, kind):
    with pytest.raises(RangeError, match="real value|range of numbers") as info:
        units.read(text, kind, field="f")
    assert info.value.allowed


def test_concentration_limit_is_stated():
    with pytest.raises(RangeError, match="25 mol/L"):
        units.read("30 mol/L", "molar_concentration", field="conc")


def test_letters_mean_what_the_field_needs():
    assert units.read("60 C", "temperature").value == pytest.approx(333.15)
    with pytest.raises(UnitError, match="not a potential"):
        units.read("60 C", "potential")        # a charge, not a potential


def test_a_new_kind_gets_the_grammar_and_generic_limits(monkeypatch):
    monkeypatch.setitem(units.KINDS, "conductivity",
                        ("A/(V*m)", "[current] ** 2 * [time] ** 3 / [mass] / [length] ** 3",
                         "S/m, mS/cm"))
    f = Field("conductivity", "Conductivity", QUANTITY, quantity="conductivity",
              unit="A/(V*m)")
    assert f.read("5 A/V/m")[0] == pytest.approx(5.0)
    with pytest.raises(InputError):
        f.read("1e-320 A/V/m")
    with pytest.raises(InputError):
        f.read("10**10**10 A/V/m")


@pytest.mark.parametrize("calc,inputs,key,echo", [
    ("convert", {"potential": "2,5 mV"}, "potential", "2.5 mV = 0.0025 V"),
    ("fastener", {"diameter": "M10"}, "diameter", "M10 thread: 10 mm nominal diameter"),
    ("fastener", {"diameter": '3/8"'}, "diameter", "0.375 in = 9.525 mm"),
    ("fastener", {"plate_area": "1200 x 800 mm"}, "plate_area", "1200 mm × 800 mm = 0.96 m²"),
    ("fastener", {"design_life": "25 y"}, "design_life", "25 yr"),
    ("convert", {"temperature": "77 F"}, "temperature", "77 °F = 25 °C"),
    ("nernst", {"conc_a": "0.5 mM"}, "conc_a", "0.5 mmol/L"),
    ("nernst", {"ionic_strength": "0.01 M", "activity": "davies"}, "ionic_strength",
     "0.01 mol/L"),
])
def test_api_echoes_each_value_read(calc, inputs, key, echo):
    out = api.run(calc, inputs)
    assert out["ok"], out.get("error")
    assert out["inputs_read"][key] == echo


def test_one_and_a_half_inches_is_not_half_an_inch():
    a = api.run("fastener", {"diameter": "1 1/2 in"})
    b = api.run("fastener", {"diameter": "38.1 mm"})
    assert a["ok"] and b["ok"]
    assert a["result"]["local_mm_per_yr"] == pytest.approx(
        b["result"]["local_mm_per_yr"])


def test_ten_inches_is_not_ten_millimetres():
    out = api.run("fastener", {"diameter": '10"'})
    assert not out["ok"] or out["inputs_read"]["diameter"].startswith("10 in")
    assert math.isclose(units.read('10"', "length").value, 0.254)
