"""api.py and schema.py: JSON in, JSON out; one schema per calculator."""

import json
import math

import pytest

from noblegap import api


def _walk(obj):
    if isinstance(obj, dict):
        for v in obj.values():
            yield from _walk(v)
    elif isinstance(obj, list):
        for v in obj:
            yield from _walk(v)
    else:
        yield obj


@pytest.mark.parametrize("name", list(api.calculators()))
def test_every_example_runs_and_is_strict_json(name):
    calc = api.get(name)
    out = api.run(name, calc.example)
    assert out["ok"], out.get("error")
    text = json.dumps(out, allow_nan=False)          # raises on NaN/inf
    assert json.loads(text)["calc"] == name
    assert out["result"]["display"]["headline"]


@pytest.mark.parametrize("name", list(api.calculators()))
def test_example_keys_are_schema_keys(name):
    calc = api.get(name)
    assert set(calc.example) <= {f.key for f in calc.fields}


@pytest.mark.parametrize("name", list(api.calculators()))
def test_defaults_alone_compute(name):
    out = api.run(name, {})
    assert out["ok"], out.get("error")


def test_unknown_calculator_suggests():
    out = api.run("conver", {})
    assert not out["ok"]
    assert out["error"]["type"] == "ChoiceError"
    assert "convert" in out["error"]["suggestions"]


def test_every_bad_field_is_reported_and_inputs_echoed():
    out = api.run("convert", {"potential": "3 kg", "from_ref": "nope"})
    assert not out["ok"]
    fields = {e["field"] for e in out["error"]["errors"]}
    assert fields == {"potential", "from_ref"}
    assert out["inputs"]["potential"] == "3 kg"      # nothing the user typed is lost


def test_describe_lists_schemas():
    d = api.describe()
    names = [c["name"] for c in d["calculators"]]
    assert names[:2] == ["convert", "couple"]
    conv = api.describe("convert")["calculator"]
    assert [f["key"] for f in conv["fields"]] == ["potential", "from_ref", "to_ref", "temperature"]
    ids = [c["id"] for c in conv["fields"][1]["choices"]]
    for ref in ("she", "sce", "ag_agcl_sat_kcl", "ag_agcl_3m_kcl", "ag_agcl_seawater", "cse"):
        assert ref in ids


def test_internal_failure_becomes_message_not_traceback(monkeypatch):
    calc = api.get("couple")

    def boom(**_):
        raise ZeroDivisionError("x")
    monkeypatch.setattr(calc, "compute", boom)
    out = api.run("couple", {"metal_a": "Zn", "metal_b": "Cu"})
    assert not out["ok"] and out["error"]["type"] == "InternalError"
    assert "Traceback" not in out["error"]["message"]


def test_non_finite_floats_never_leave_run(monkeypatch):
    calc = api.get("couple")
    monkeypatch.setattr(calc, "compute", lambda **_: {"x": math.inf, "display": {"headline": "h"}})
    out = api.run("couple", {})
    assert out["result"]["x"] is None
