"""galvanic.py: the series chart and table, and the pair check."""

import re
from xml.sax.saxutils import escape

import pytest
from hypothesis import given, settings, strategies as st

from noblegap import api
from noblegap.materials import data
from noblegap.calculators import series as galvanic
from noblegap.materials import alloys as materials

ALLOYS = [r["id"] for r in data.table("alloys")]
ENVS = [r["id"] for r in data.table("environments")]
REFS = [r["id"] for r in data.table("reference_electrodes")]


def run(calc, **inputs):
    r = api.run(calc, inputs)
    assert r["ok"], r.get("error")
    return r["result"]


def test_series_is_ordered_noble_to_active():
    res = run("series", environment="seawater_flowing", reference="sce")
    rows = res["alloys"]
    assert len(rows) == len(ALLOYS)
    assert rows[0]["id"] == "graphite" and rows[-1]["id"] == "magnesium"
    nobles = [r["E_noble_V"] for r in rows]
    assert nobles == sorted(nobles, reverse=True)
    for r in rows:
        assert set(r) == {"id", "name", "uns", "state", "E_noble_V", "E_active_V", "source",
                          "confidence"}
        assert r["E_noble_V"] >= r["E_active_V"]


def test_series_view_names_every_alloy_and_centres_the_pair():
    res = run("series", environment="seawater_flowing", reference="sce",
              alloy_a="316", alloy_b="zinc")
    view = res["display"]["view"]
    shown = [r for g in view["groups"] for r in g["rows"]]
    assert sorted(r["label"] for r in shown) == sorted(
        materials._label(row) for row in data.table("alloys"))
    roles = {r["key"]: r["role"] for r in shown}
    assert roles["S31600"] == "cathode" and roles["zinc"] == "anode"
    # The groups holding the user's alloys come first and open.
    assert all(g["open"] for g in view["groups"][:2])
    assert {r["key"] for r in view["groups"][0]["rows"] + view["groups"][1]["rows"]} >= {
        "S31600", "zinc"}
    # The window around the cathode: 316 passive ± 0.15 V (flowing seawater).
    lo, hi = view["window"]
    assert 0 < lo < hi < 100
    assert "0.15 V" in view["window_text"]
    # Every other alloy carries the verdict it would get joined to the cathode.
    labels = {"Acceptable", "Needs care", "Avoid"}
    assert all(r["verdict"]["label"] in labels for r in shown if r["key"] != "S31600")
    assert res["highlight"] == ["S31600", "zinc"]


def test_series_view_is_not_the_printed_order():
    """Our own view: alloys grouped by family, not one list in potential order."""
    res = run("series", environment="seawater_flowing", reference="sce")
    view = res["display"]["view"]
    flat = [r["key"] for g in view["groups"] for r in g["rows"]]
    printed = [r["id"] for r in res["alloys"]]          # noble → active
    assert sorted(flat) == sorted(printed) and flat != printed
    assert not res["display"]["charts"]
    families = [g["name"] for g in view["groups"]]
    assert len(families) == len(set(families)) >= 8


def test_series_table_has_a_source_per_row():
    res = run("series", environment="atmosphere_harsh", reference="cse")
    table = res["display"]["tables"][0]
    assert table["filterable"] and len(table["rows"]) == len(table["sources"]) == len(ALLOYS)
    assert all(s["source_id"] for s in table["sources"])
    assert "V vs CSE" in table["title"]
    assert res["display"]["warnings"]      # atmospheric use is an approximation


@pytest.mark.parametrize("ref", REFS)
def test_series_on_every_reference_scale(ref):
    res = run("series", environment="seawater_flowing", reference=ref)
    zn = next(r for r in res["alloys"] if r["id"] == "zinc")
    sce = materials.potential_range("zinc", "seawater_flowing", ref)
    assert (zn["E_noble_V"], zn["E_active_V"]) == pytest.approx(sce)


def test_series_bad_highlight_is_an_input_error():
    r = api.run("series", {"alloy_a": "titanum"})
    assert not r["ok"] and r["error"]["field"] == "alloy_a"
    assert "Titanium" in r["error"]["message"]
    assert "titanium" not in r["error"]["message"].replace("titanum", "")  # a label, not the id


def test_pair_stainless_on_aluminium():
    res = run("pair", alloy_a="316 stainless", alloy_b="aluminium 5083",
              environment="marine_splash")
    assert res["anode"] == "A95083" and res["cathode"] == "S31600"
    assert res["delta_E_V_min"] == pytest.approx(0.66)       # −0.10 − (−0.76)
    assert res["delta_E_V_max"] == pytest.approx(1.00)       # 0.00 − (−1.00)
    assert res["allowed_delta_E_V"] == 0.15
    assert res["compatibility"] == "incompatible"
    assert res["display"]["verdict"]["class"] == "avoid"
    assert set(res["sources"]) == {"alloy_a", "alloy_b", "allowed"}


def test_pair_anodic_index_cross_check_only_from_sourced_indexes():
    # Both indexes sourced (copper 0.35, 316 0.50 V): the difference is a row.
    res = run("pair", alloy_a="copper", alloy_b="S31600", environment="atmosphere_normal")
    assert res["anodic_index_difference_V"] == pytest.approx(0.15)
    labels = [r["label"] for r in res["display"]["rows"]]
    assert "Anodic-index difference (cross-check)" in labels
    # 5083 has no sourced index: no number, and a note that says why.
    res = run("pair", alloy_a="316 stainless", alloy_b="aluminium 5083",
              environment="marine_splash")
    assert res["anodic_index_difference_V"] is None
    labels = [r["label"] for r in res["display"]["rows"]]
    assert "Anodic-index difference (cross-check)" not in labels
    notes = [n for n in res["display"]["notes"] if "anodic-index cross-check" in n]
    assert len(notes) == 1 and "5083" in notes[0]
    # Neither side has one (titanium, 5083): nothing is said about the index.
    res = run("pair", alloy_a="titanium", alloy_b="aluminium 5083",
              environment="marine_splash")
    assert not [n for n in res["display"]["notes"] if "anodic-index" in n]


def test_pair_overlap():
    # 304 passive (−0.04..−0.10) and 316 passive (0.00..−0.10) overlap
    res = run("pair", alloy_a="S30400", alloy_b="S31600", environment="seawater_flowing")
    assert res["anode"] == res["cathode"] == "overlap"
    assert res["delta_E_V_min"] == 0.0
    assert res["delta_E_V_max"] == pytest.approx(0.10)
    assert res["likely_anode"] == "S30400"
    assert res["compatibility"] == "compatible"
    assert "overlap" in res["display"]["headline"]


def test_pair_marginal():
    # copper (−0.30..−0.37) and 316 passive (0.00..−0.10): ΔE 0.20..0.37, allowed 0.25
    res = run("pair", alloy_a="copper", alloy_b="S31600", environment="atmosphere_normal")
    assert res["anode"] == "copper"
    assert res["delta_E_V_min"] == pytest.approx(0.20)
    assert res["delta_E_V_max"] == pytest.approx(0.37)
    assert res["compatibility"] == "marginal"


def test_same_alloy_twice_is_valid():
    res = run("pair", alloy_a="zinc", alloy_b="Zn", environment="seawater_flowing")
    assert res["anode"] == res["cathode"] == "none"
    assert res["delta_E_V_min"] == res["delta_E_V_max"] == 0.0
    assert res["compatibility"] == "compatible"


def test_state_inputs_select_active_rows():
    res = run("pair", alloy_a="316", state_a="active", alloy_b="316",
              environment="seawater_quiescent")
    assert res["alloy_a"] == "S31600_active" and res["anode"] == "S31600_active"
    assert res["delta_E_V_min"] == pytest.approx(0.23)
    r = api.run("pair", {"alloy_a": "S32100", "state_a": "active", "alloy_b": "zinc"})
    assert not r["ok"] and r["error"]["type"] == "MissingDataError"
    assert r["error"]["field"] == "state_a"


def test_freshwater_warns_plainly():
    res = run("pair", alloy_a="zinc", alloy_b="carbon steel", environment="freshwater")
    assert any("does NOT apply" in w for w in res["display"]["warnings"])
    assert res["applicability"]


@settings(max_examples=150, deadline=None)
@given(a=st.sampled_from(ALLOYS), b=st.sampled_from(ALLOYS), env=st.sampled_from(ENVS))
def test_pair_order_does_not_matter(a, b, env):
    r1 = galvanic.couple(a, b, env)
    r2 = galvanic.couple(b, a, env)
    for k in ("anode", "cathode", "likely_anode", "compatibility"):
        assert r1[k] == r2[k]
    assert r1["delta_E_V_min"] == pytest.approx(r2["delta_E_V_min"])
    assert r1["delta_E_V_max"] == pytest.approx(r2["delta_E_V_max"])
    assert 0 <= r1["delta_E_V_min"] <= r1["delta_E_V_max"]


@settings(max_examples=60, deadline=None)
@given(a=st.sampled_from(ALLOYS), b=st.sampled_from(ALLOYS))
def test_anode_sits_lower_in_the_series(a, b):
    c = galvanic.couple(a, b)
    if c["anode"] not in ("overlap", "none"):
        an = materials.potential_range(c["anode"], "seawater_flowing")
        ca = materials.potential_range(c["cathode"], "seawater_flowing")
        assert an[0] <= ca[1]


def test_classify_boundaries():
    assert galvanic.classify(0.0, 0.15, 0.15) == "compatible"
    assert galvanic.classify(0.15, 0.2, 0.15) == "marginal"
    assert galvanic.classify(0.16, 0.2, 0.15) == "incompatible"


@pytest.mark.parametrize("calc", ["series", "pair"])
def test_examples_run(calc):
    c = api.get(calc)
    r = api.run(calc, c.example)
    assert r["ok"], r.get("error")
    assert r["result"]["display"]["headline"]


def test_state_on_a_metal_without_states_is_noted():
    res = run("pair", alloy_a="copper", state_a="active", alloy_b="zinc")
    assert res["alloy_a"] == "copper"
    assert any("no passive/active distinction" in n for n in res["display"]["notes"])


def test_reference_labels_on_the_view():
    axis = run("series", reference="ag_agcl_sat_kcl")["display"]["view"]["axis"]
    assert "vs Silver/silver chloride, saturated KCl" in axis
    assert "vs CSE" in run("series", reference="cse")["display"]["view"]["axis"]


