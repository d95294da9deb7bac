"""The joint page: any two members (noblegap.calculators.joint)."""

import inspect
import json

import pytest

from noblegap import api, verdicts
from noblegap.calculators import joint
from noblegap.errors import InputErrors

CALC = joint.CALCULATORS[0]


def run(**changes):
    inputs = CALC.raw_inputs(CALC.example)
    inputs.update(changes)
    return CALC.compute(**CALC.parse(inputs))


def test_joint_is_a_page_with_url_keys_from_its_schema():
    assert "joint" in api.calculators()
    keys = [f.key for f in CALC.fields]
    assert keys == list(inspect.signature(joint.compute_joint).parameters)


def test_example_runs_with_verdict_alternatives_and_mitigations():
    out = api.run("joint", CALC.example)
    assert out["ok"], out
    res = out["result"]
    assert res["anode"] == "galvanized_steel" and res["anode_member"] == "first"
    assert res["verdict_class"] in verdicts.CLASSES
    assert res["alternatives"] and res["mitigations"]
    titles = [t["title"] for t in res["display"]["tables"]]
    assert any("Mitigations" in t for t in titles)
    json.dumps(res, allow_nan=False)


def test_member_order_does_not_change_the_anode_or_rate():
    a = run()
    b = run(first="316 stainless", first_area="0.02 m²", first_thickness="5 mm",
            second="galvanized steel", second_area="0.5 m²", second_thickness="4 mm")
    assert a["anode"] == b["anode"]
    assert a["local_mm_per_yr"] == pytest.approx(b["local_mm_per_yr"], rel=1e-9)


def test_distance_lowers_the_current():
    for env in ("seawater_flowing", "C5", "freshwater"):
        touching = run(environment=env)
        apart = run(environment=env, distance="200 mm")
        assert apart["galvanic_current_A"] <= touching["galvanic_current_A"] * (1 + 1e-9), env


def test_fitting_in_a_hull_in_seawater():
    res = run(first="carbon steel", first_area="50 m²", first_thickness="12 mm",
              second="C95800", second_area="0.2 m²", environment="seawater_flowing")
    assert res["anode"] == "carbon_steel"
    assert 0 < res["local_mm_per_yr"] < 5


def test_allowance_thicker_than_a_wall_is_refused():
    out = api.run("joint", {**CALC.example, "allowance": "10 mm"})
    assert not out["ok"] and out["error"]["field"] == "allowance"


def test_recalled_wetness_and_film_mark_the_rate_from_memory(monkeypatch):
    # The atmosphere's time of wetness and film are recalled (data/atmospheres.csv);
    # even with every kinetics row and alloy graded published, a rate built on them
    # is marked from memory. (The row-level grade now belongs to the ISO 9223 copper
    # and aluminium bands, which were read, so it can no longer stand in for them.)
    from noblegap.materials import cell_data
    from noblegap.methods import galvanic as method
    real_row, real_alloy = cell_data.kinetics_row, method.alloys.alloy
    monkeypatch.setattr(cell_data, "kinetics_row",
                        lambda a: dict(real_row(a), confidence="published"))
    monkeypatch.setattr(method.alloys, "alloy",
                        lambda a: dict(real_alloy(a), confidence="published"))
    assert cell_data.environment("C5")["confidence"] == "published"
    assert run()["from_memory"] is True
    wet = cell_data.cite_env("C5", "galvanized_steel")["wetness"]
    assert wet["confidence"] == "from-memory"
