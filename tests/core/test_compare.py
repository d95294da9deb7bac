"""Alternatives side by side: the columns come from the calculator's own runs and mitigations."""

import doctest
import json

import pytest

from noblegap import api, compare
from noblegap.errors import ChoiceError, InputError

EXAMPLE = api.get("fastener").example


def test_current_column_is_the_check_itself():
    out = compare.compare("fastener", EXAMPLE, [])
    single = api.run("fastener", EXAMPLE)["result"]
    (cur,) = out["columns"]
    assert cur["rate_mm_per_yr"] == single["local_mm_per_yr"]
    assert cur["years_to_allowance"] == single["years_to_allowance"]
    assert cur["verdict_class"] == single["display"]["verdict"]["class"]


def test_alloy_variant_is_a_full_run_with_only_the_fastener_changed():
    out = compare.compare("fastener", EXAMPLE, "alloy:A96061")
    col = out["columns"][1]
    other = api.run("fastener", {**api.run("fastener", EXAMPLE)["inputs"], "fastener": "A96061"})["result"]
    assert col["rate_mm_per_yr"] == other["local_mm_per_yr"]
    assert col["verdict_class"] == other["verdict_class"]
    assert "6061" in col["title"]


def test_isolation_removes_the_galvanic_part_and_never_speeds_the_anode():
    out = compare.compare("fastener", EXAMPLE, ["isolate", "coat_cathode"])
    cur, iso, coated = out["columns"]
    assert iso["rate_mm_per_yr"] <= cur["rate_mm_per_yr"]
    assert coated["rate_mm_per_yr"] <= cur["rate_mm_per_yr"]
    mitig = {m["id"]: m for m in api.run("fastener", EXAMPLE)["result"]["mitigations"]}
    assert iso["rate_mm_per_yr"] == mitig["isolate"]["local_mm_per_yr"]
    assert mitig["isolate"]["galvanic_mm_per_yr"] == 0.0


def test_the_anode_variant_is_not_applicable_in_an_atmosphere():
    # the example is a CX atmosphere: a thin film carries an anode's current millimetres
    out = compare.compare("fastener", EXAMPLE, ["anode"])
    col = out["columns"][1]
    assert col["available"] is False and col["status"] == "not_applicable"
    assert col["note"].startswith("Not applicable in atmosphere:")
    assert col["rate_mm_per_yr"] is None and col["verdict"] == ""


def test_an_unknown_alloy_stays_in_its_column():
    out = compare.compare("fastener", EXAMPLE, ["alloy:unobtainium", "isolate"])
    assert out["ok"]
    assert out["columns"][1]["available"] is False and "unobtainium" in out["columns"][1]["note"]
    assert out["columns"][2]["available"] is True


def test_variant_list_checks():
    with pytest.raises(ChoiceError, match="not a variant"):
        compare.parse_variants("explode")
    with pytest.raises(InputError, match="Too many variants"):
        compare.parse_variants("isolate,coat_cathode,anode,alloy:A96061")
    assert compare.parse_variants("current, isolate,isolate") == ["isolate"]
    assert compare.compare("couple", {}, [])["ok"] is False
    bad = compare.compare("fastener", {**EXAMPLE, "diameter": "3 kg"}, ["isolate"])
    assert bad["ok"] is False and bad["error"]["errors"][0]["field"] == "diameter"


def test_handle_is_json_both_ways():
    out = json.loads(compare.handle(json.dumps({"calc": "fastener", "inputs": EXAMPLE,
                                                "variants": ["isolate"]})))
    assert [c["id"] for c in out["columns"]] == ["current", "isolate"]
    assert json.loads(compare.handle("[1,"))["ok"] is False


def test_doctests():
    assert doctest.testmod(compare).failed == 0
