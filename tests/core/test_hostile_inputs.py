"""api.run answers anything it is given, fast, in strict JSON, naming the field to change.

A fixed corpus of the nastiest entries goes into every field of every
calculator; a property test throws thousands of generated requests (any
types, nested values, bytes, random text) at every calculator. Calculators
and fields are taken from the schema, so new ones are covered for free.
"""

import json
import math
import time

import pytest
from hypothesis import HealthCheck, given, settings, strategies as st

from noblegap import api

CALCS = list(api.calculators())
CASES = [(name, f.key) for name, calc in api.calculators().items() for f in calc.fields]

#: Each must be refused, in the field it was typed in, with a message.
CORPUS = [
    "10**10**10 V", "9**9**9", "(10**8)**(10**8)", "10**10**7 mm", "2**2**2**2**2 m",
    "x" * 100_000, "9" * 100_000, "1e-320 mm", "5e-324 year", "1e-320 mol/L", "1e-308",
    "5e-324", "{{7*7}} mV", "${7*7} mV", "<%= 7*7 %>", "#{7*7}", "10 mm 5", "10 🔩 mV",
    "10\x00 mV", "10\u202e mV", "\u202d10 mm", "1\u0301 mV", "٣ mm", "१० mm", "３ mm",
    "1,5,5 mm", "__import__('os')", "10 mm; DROP", "1e99999 mm", "-1e99999 V",
]


def _field_keys(name):
    return {f.key for f in api.get(name).fields}


def _check(out, name):
    text = json.dumps(out, allow_nan=False)           # strict JSON: no NaN, no infinity
    assert "Traceback" not in text
    assert isinstance(out, dict) and out["ok"] in (True, False)
    if out["ok"]:
        return
    err = out["error"]
    assert err["type"] != "InternalError", err
    assert err["message"].strip()
    allowed = _field_keys(name) if name in api.calculators() else set()
    for e in [err] + err.get("errors", []):
        assert e["field"] in allowed | {None, "calc"}, e     # never an internal variable


@pytest.mark.parametrize("name,key", CASES)
def test_corpus_is_refused_in_its_own_field(name, key):
    calc = api.get(name)
    for text in CORPUS:
        inputs = calc.raw_inputs(calc.example)
        inputs[key] = text
        t0 = time.perf_counter()
        out = api.run(name, inputs)
        elapsed = time.perf_counter() - t0
        _check(out, name)
        assert elapsed < 1.0, (text[:40], elapsed)
        assert out["inputs"][key] == text                      # nothing typed is lost
        assert not out["ok"], (key, text[:40], out.get("inputs_read"))
        fields = [e["field"] for e in out["error"].get("errors", [out["error"]])]
        assert key in fields, (key, text[:40], out["error"]["message"])


@pytest.mark.parametrize("inputs", [
    "abc", b"potential=1", 5, 1.5, None, ["potential", "1 V"], ("a", "b"), {1: "x"},
    {"potential": b"1 V"}, {"potential": ["1 V"]}, {"potential": {"a": 1}},
    {"potential": float("nan")}, {"potential": float("inf")}, {"potential": 10 ** 400},
    {"potential": True}, {"potential": object()}, {"potential": [[[[[]]]]]},
])
@pytest.mark.parametrize("name", CALCS)
def test_any_request_shape_is_answered(name, inputs):
    _check(api.run(name, inputs), name)


@pytest.mark.parametrize("calc", [None, 5, b"convert", ["convert"], {"a": 1}, "nope", ""])
def test_any_calculator_name_is_answered(calc):
    out = api.run(calc, {})
    _check(out, calc if isinstance(calc, str) else "")
    assert not out["ok"]


def test_deeply_nested_value_does_not_recurse():
    deep = []
    for _ in range(100_000):
        deep = [deep]
    _check(api.run("convert", {"potential": deep}), "convert")


_pieces = st.sampled_from([
    "1", "2,5", "0.375", "1/2", "3/8", "1e-3", "1e308", "1e-320", "-", "+", " ", "x", "×",
    "*", "/", "^2", "**", "2", "mm", "m", "in", '"', "'", "ft", "°C", "C", "F", "K", "V",
    "mV", "mol/L", "M", "mg/L", "year", "y", "m2", "%", "ppm", "M10", "(", ")", "{{", "}}",
    "e", ",", ".", "\u202e", "\u0301", "٣", "🔩", "\x00", "µ", "²", "½", "316L", "A4-70",
])
_texty = st.one_of(st.lists(_pieces, max_size=8).map("".join), st.text(max_size=30))
_values = st.one_of(_texty, _texty, _texty, st.none(), st.booleans(), st.integers(),
                    st.floats(), st.binary(max_size=8), st.lists(st.integers(), max_size=2),
                    st.dictionaries(st.text(max_size=3), st.integers(), max_size=2))


@st.composite
def _requests(draw):
    name = draw(st.sampled_from(CALCS))
    calc = api.get(name)
    inputs = dict(calc.raw_inputs(calc.example))
    for f in calc.fields:
        if draw(st.integers(0, 3)) == 0:
            inputs[f.key] = draw(_values)
    if draw(st.integers(0, 9)) == 0:
        inputs[draw(st.text(max_size=6))] = draw(_values)
    return name, inputs


@settings(max_examples=1500, deadline=None,
          suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large])
@given(_requests())
def test_generated_requests_to_every_calculator(req):
    name, inputs = req
    t0 = time.perf_counter()
    out = api.run(name, inputs)
    assert time.perf_counter() - t0 < 1.0
    _check(out, name)
    if out["ok"]:
        for key, text in out["inputs_read"].items():
            assert isinstance(text, str) and "nan" not in text.lower()
        _no_non_finite(out["result"])


def _no_non_finite(obj):
    if isinstance(obj, float):
        assert math.isfinite(obj)
    elif isinstance(obj, dict):
        for v in obj.values():
            _no_non_finite(v)
    elif isinstance(obj, list):
        for v in obj:
            _no_non_finite(v)
