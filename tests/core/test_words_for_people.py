"""What a person reads: one verdict vocabulary, labels not ids, units that follow the user.

Every page's text comes from the core's ``display`` structure, so these checks
run on CPython over every calculator's example and every parity case.
"""

from __future__ import annotations

import csv
import json
import re
from pathlib import Path

import pytest

from noblegap import api, units, verdicts
from noblegap.report import Report, chem

ROOT = Path(__file__).resolve().parents[2]
CASES = json.loads((ROOT / "core" / "noblegap" / "cases.json").read_text("utf-8"))
RUNS = [(c.name, dict(c.example)) for c in api.calculators().values()] + [
    (c["calc"], c["inputs"]) for c in CASES if api.run(c["calc"], c["inputs"])["ok"]]
# Our own files, which a page never names (a citation may name another
# repository's file, e.g. a published table extracted to CSV elsewhere).
OWN_PATHS = ["core/noblegap", "site_src/", "site_build/"] + [
    name for path in (ROOT / "data").glob("*.csv") for name in (f"data/{path.name}", path.name)]
IDS = sorted({row["id"] for path in (ROOT / "data").glob("*.csv")
              for row in csv.DictReader(path.open(encoding="utf-8"))
              if "_" in (row.get("id") or "")})
# Pages whose words this suite owns; the fastener and holiday reports are being
# rewritten on the galvanic-cell model and get the same checks there.
OWN = ("convert", "couple", "series", "pair", "nernst")


def _texts(obj, key=None):
    """Every string a page shows from a display structure (not ids, links or SVG)."""
    if isinstance(obj, str):
        if key not in ("svg", "key", "class", "page", "source_id", "confidence"):
            yield obj
    elif isinstance(obj, list):
        for x in obj:
            yield from _texts(x, key)
    elif isinstance(obj, dict):
        for k, v in obj.items():
            if k != "inputs":
                yield from _texts(v, k)


def _display(name, inputs):
    out = api.run(name, inputs)
    assert out["ok"], out.get("error")
    return out["result"]["display"]


@pytest.mark.parametrize("name,inputs", RUNS, ids=[f"{n}-{i}" for i, (n, _) in enumerate(RUNS)])
def test_every_verdict_comes_from_the_one_vocabulary(name, inputs):
    d = _display(name, inputs)
    found = []
    if d["verdict"]:
        found.append(d["verdict"])
    for group in (d.get("view") or {}).get("groups", []):
        found += [r["verdict"] for r in group["rows"] if r["verdict"]]
    for v in found:
        assert v["class"] in verdicts.CLASSES
        assert v["label"] == verdicts.label(v["class"])


@pytest.mark.parametrize("name", OWN)
def test_no_other_verdict_words_on_the_pages(name):
    text = " ".join(_texts(_display(name, api.get(name).example)))
    for word in ("Incompatible", "Marginal", "REJECT", "Reject", "Sound", "Watch"):
        assert not re.search(rf"\b{word}\b", text), word


def test_report_takes_the_label_from_verdicts_only():
    v = Report().verdict("caution", "watch", "Inspect yearly.").to_dict()["verdict"]
    assert v == {"class": "caution", "label": "Needs care", "reason": "Inspect yearly."}
    v = Report().verdict("ok", "No perforation within 1000 years", "Coat the cathode.").d["verdict"]
    assert v["label"] == "Acceptable" and v["reason"].startswith("No perforation")
    with pytest.raises(KeyError):
        Report().verdict("fine", "All good.")


@pytest.mark.parametrize("name,inputs", [r for r in RUNS if r[0] in OWN],
                         ids=[f"{n}-{i}" for i, (n, _) in enumerate(RUNS) if n in OWN])
def test_no_internal_id_or_repository_path_in_what_a_page_shows(name, inputs):
    for text in _texts(_display(name, inputs)):
        for path in OWN_PATHS:
            assert path not in text, (path, text)
        for i in IDS:
            assert not re.search(rf"(?<!\w){re.escape(i)}(?!\w)", text), (i, text)


def test_choice_errors_offer_labels_not_ids():
    err = api.run("series", {"environment": "indoors"})["error"]
    assert "Indoor, controlled temperature and humidity" in err["message"]
    assert "seawater_flowing" not in err["message"]
    err = api.run("convert", {"to_ref": "agcl"})["error"]
    assert "ag_agcl" not in err["message"] and "Silver/silver chloride" in err["message"]


def test_a_label_picked_from_the_list_is_accepted():
    out = api.run("pair", {"alloy_a": "Stainless steel 316 (S31600), active",
                           "environment": "Fresh water"})
    assert out["ok"] and out["result"]["alloy_a"] == "S31600_active"
    assert out["result"]["environment"] == "freshwater"


def test_chemistry_is_written_properly():
    assert chem("Zn2+ + 2e- = Zn") == "Zn²⁺ + 2e⁻ ⇌ Zn"
    assert chem("Fe3+ + 3e- = Fe") == "Fe³⁺ + 3e⁻ ⇌ Fe"
    assert chem("316L and A4-70 bolts, E = E° − x") == "316L and A4-70 bolts, E = E° − x"
    text = " ".join(_texts(_display("couple", api.get("couple").example)))
    assert "Zn²⁺ + 2e⁻ ⇌ Zn" in text and "Zn2+" not in text


@pytest.mark.parametrize("name", OWN)
def test_true_minus_signs_and_no_e_notation(name):
    for text in _texts(_display(name, api.get(name).example)):
        # a citation may name a repository commit (hex digits such as 9e8): not a number
        text = re.sub(r"\bcommit [0-9a-f]{7,40}\b", "commit", text)
        assert not re.search(r"\d[eE][-+−]?\d", text), text
        assert not re.search(r"(?<![\w/])-\d", text), text


# ---------- units follow the user ----------

def _row(d, key):
    return next(r["value"] for r in d["rows"] if r.get("key") == key or r["label"] == key)


def test_fmt_in_us_customary_and_back():
    token = units.set_system(units.US)
    try:
        assert units.fmt(6.0, "mm") == "0.236 in"
        assert units.fmt(0.5, "mm") == "19.7 mil"
        assert units.fmt(0.96, "m²") == "10.3 ft²"
        assert units.fmt(0.127, "mm/yr") == "5.00 mpy"
        assert units.fmt(5.0, "mpy") == "0.127 mm/yr"      # both rates stay available
        assert units.fmt(25.0, "°C") == "77.0 °F"
    finally:
        units.reset_system(token)
    assert units.fmt(6.0, "mm") == "6.00 mm"
    assert units.fmt(0.0042, "A") == "4.20 mA" and units.fmt(4.2e-6, "A") == "4.20 µA"


def test_the_units_option_sets_every_length_and_area_of_a_report():
    ex = dict(api.get("fastener").example)
    si = _display("fastener", {**ex, "units": "si"})
    us = _display("fastener", {**ex, "units": "us"})
    assert "mm/yr (" in si["headline"] and "mpy (" in us["headline"]
    si_text, us_text = " ".join(_texts(si)), " ".join(_texts(us))
    assert " mm²" in si_text and " in²" in us_text and " mm²" not in us_text
    # The option does not leak into the next call.
    assert _display("fastener", ex)["headline"] == si["headline"]


def test_a_user_who_types_inches_gets_inches_back():
    ex = dict(api.get("fastener").example)
    typed = _display("fastener", {**ex, "diameter": "3/8 in", "thickness": "1/4 in"})
    assert "mpy (" in typed["headline"]
    chosen = _display("fastener", {**ex, "diameter": "3/8 in", "units": "si"})
    assert "mm/yr (" in chosen["headline"]
    assert units.typed_system(["10 mm", "25 °C", "316"]) == units.SI
    assert units.typed_system(['3/8"', "M10"]) == units.US


def test_an_unknown_units_choice_names_the_field():
    err = api.run("convert", {"units": "furlongs"})["error"]
    assert err["field"] == "units" and "US customary" in err["message"]


def test_charts_state_the_width_that_keeps_text_readable():
    from noblegap.report import _min_width
    assert _min_width('<svg viewBox="0 0 600 9" width="600" height="9">'
                      '<text font-size="10">a</text><text font-size="12">b</text></svg>') == 720
    for c in _display("nernst", api.get("nernst").example)["charts"]:
        assert c["min_width"] >= 300


def test_fractions_read_as_percent_or_ppm():
    assert units.fmt_fraction(5.66e-05) == "56.6 ppm"
    assert units.fmt_fraction(0.3126) == "31.3 %"
    assert units.fmt_fraction(0.0012) == "0.120 %"
