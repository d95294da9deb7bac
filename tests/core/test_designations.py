"""Alloy designations people write map to the series row they belong to, and say so."""

import pytest

from noblegap import api
from noblegap.errors import ChoiceError
from noblegap.materials import alloys


@pytest.mark.parametrize("text,series_id", [
    ("316L", "S31600"), ("S31603", "S31600"), ("SS316", "S31600"), ("AISI 316", "S31600"),
    ("SS 316L", "S31600"), ("UNS S31603", "S31600"), ("A4-70", "S31600"),
    ("A4-80", "S31600"), ("A2-70", "S30400"), ("1.4401", "S31600"), ("1.4404", "S31600"),
    ("1.4301", "S30400"), ("1.4307", "S30400"), ("1.4541", "S32100"),
    ("5083-H116", "A95083"), ("AA5083", "A95083"), ("AA5083-H321", "A95083"),
    ("EN AW-5083", "A95083"), ("6061-T6", "A96061"), ("C12200", "copper"),
    ("C10100", "copper"), ("A36", "carbon_steel"), ("S235", "carbon_steel"),
    ("S355", "carbon_steel"), ("AH36", "carbon_steel"),
    ("zinc-plated steel", "galvanized_steel"), ("zinc plated", "galvanized_steel"),
    ("pre-galvanized", "galvanized_steel"), ("pre-galvanised steel", "galvanized_steel"),
    ("type 304", "S30400"),
])
def test_designation_maps_to_its_series_row(text, series_id):
    assert alloys.resolve_alloy(text, "alloy") == series_id
    hit = alloys.resolve_alloy_note(text, "alloy")
    assert isinstance(hit, tuple) and text in hit[1] and "taken as" in hit[1]


def test_plain_ids_and_uns_need_no_note():
    for text in ("S31600", "zinc", "316", "galvanized steel"):
        assert isinstance(alloys.resolve_alloy_note(text, "alloy"), str)


@pytest.mark.parametrize("text,must", [
    ("bronze", ("tin_bronze", "C65500", "aluminium_bronze", "C95800")),
    ("brass", ("C27000", "C44300")),
])
def test_ambiguous_names_ask_which(text, must):
    with pytest.raises(ChoiceError, match="matches several alloys") as info:
        alloys.resolve_alloy(text, "fastener")
    assert set(must) <= set(info.value.suggestions)
    assert info.value.field == "fastener"


def test_the_result_says_how_the_designation_was_taken():
    out = api.run("fastener", {"fastener": "316L", "plate": "5083-H116"})
    assert out["ok"], out.get("error")
    paras = " ".join(out["result"]["display"]["paragraphs"])
    assert "316L is taken as 316 in the seawater galvanic series" in paras
    assert "5083-H116 is taken as Aluminium alloy 5083" in paras
    assert out["inputs_read"]["fastener"].startswith("Stainless steel 316")


def test_electroplated_zinc_is_not_hot_dip_galvanizing():
    out = api.run("fastener", {"fastener": "zinc-plated steel"})
    assert out["ok"], out.get("error")
    warn = " ".join(out["result"]["display"]["warnings"])
    assert "not hot-dip galvanizing" in warn and "8 µm assumed" in warn
    assert "from-memory" in warn        # the assumed thickness carries its confidence


def test_bronze_on_a_page_asks_with_the_choices():
    out = api.run("fastener", {"plate": "bronze"})
    assert not out["ok"]
    err = out["error"]["errors"][0]
    assert err["field"] == "plate" and "pick one" in err["message"]
    assert "Silicon bronze" in err["message"]
