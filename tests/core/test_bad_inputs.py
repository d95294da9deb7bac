"""Any text in any field gives a result or a clear error — never an internal one.

For every calculator and every field, nasty entries (empty, zero, negative,
huge, wrong dimension, unknown unit, garbage, a tampered choice id) must come
back as ``ok`` or as an input/data error that names a field or says what is
allowed; the output is strict JSON (no NaN) and echoes what was typed.
"""

import json

import pytest
from hypothesis import HealthCheck, given, settings, strategies as st

from noblegap import api

NASTY = ["", " ", "0", "-1", "-0", "1e308", "1e-308", "nan", "inf", "-inf", "3 kg",
         "5 furlongs", "abc(", "1/0", "0 m", "-5 mm", "1e6 m^2", "∞", "10 mV",
         "25 °C", "400 K", "-300 degC", "0.5", "1,5", "12345678901234567890",
         "<script>", "Zn", "S31600", "bogus", "1 mol/L", "0 mol/L", "2 year", "0 year"]

CASES = [(name, f.key) for name, calc in api.calculators().items() for f in calc.fields]


def _check(out, typed=None, key=None):
    text = json.dumps(out, allow_nan=False)
    assert "Traceback" not in text
    if not out["ok"]:
        err = out["error"]
        assert err["type"] != "InternalError", err
        assert err["message"].strip()
    if typed is not None:
        assert out["inputs"][key] == typed


@pytest.mark.parametrize("name,key", CASES)
def test_nasty_entries_in_each_field(name, key):
    calc = api.get(name)
    for text in NASTY:
        inputs = calc.raw_inputs(calc.example)
        inputs[key] = text
        _check(api.run(name, inputs), text, key)


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.sampled_from(CASES), st.text(max_size=20))
def test_random_text_in_any_field(case, text):
    name, key = case
    calc = api.get(name)
    inputs = calc.raw_inputs(calc.example)
    inputs[key] = text
    _check(api.run(name, inputs), text, key)
