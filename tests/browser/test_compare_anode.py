"""The "sacrificial anode added" column of the compare block, in the browser:
computed on the fastener and joint pages, its assumed values shown and editable,
kept in the link and in a saved job, and readable on a phone and a tablet."""

from __future__ import annotations

from urllib.parse import parse_qs, urlparse

from conftest import wait_live
from test_job_records import _jobs, _open_job, _pdf_text, _save_check, _squash

SEAWATER = "environment=seawater_quiescent"


def _ready(page, variants_part=None):
    sel = "#compare-block[data-state='ready']"
    if variants_part:
        sel = f"#compare-block[data-variants*='{variants_part}'][data-state='ready']"
    page.wait_for_selector(sel, timeout=60_000)


def _anode_cell(page, row):
    """Text of the anode column's cell in the row whose header starts with ``row``."""
    heads = page.locator("#compare-block thead th").all_text_contents()
    col = heads.index("Sacrificial anode added")
    tr = page.locator("#compare-block tbody tr", has=page.locator(f"th:text-is('{row}')"))
    return tr.locator("td").nth(col - 1).inner_text()


def test_fastener_anode_column_computed_assumed_edited_linked_and_saved(page, server):
    page.goto(f"{server}/fastener.html?{SEAWATER}")
    wait_live(page)
    assert page.locator("#compare-anode").is_hidden()
    page.check("input[data-variant='anode']")
    _ready(page, "anode")
    assert page.locator("#compare-anode").is_visible()
    verdict = _anode_cell(page, "Verdict")
    assert verdict in ("Acceptable", "Needs care", "Avoid")
    rate = _anode_cell(page, "Local rate, mm/yr")
    assert " to " in rate and "NaN" not in rate
    assert _anode_cell(page, "Years to the allowance") not in ("", "—")
    anode = _anode_cell(page, "Anode")
    assert "Aluminium-zinc-indium" in anode and anode.count("(assumed)") == 4
    life = _anode_cell(page, "Anode current and life")
    assert "lasts" in life and "A;" in life
    assert _anode_cell(page, "What limits it").startswith("What limits the anode:")
    assert "vs SCE" in _anode_cell(page, "Note")
    # the assumed values are shown beside the inputs, which stay empty
    assert page.inner_text("#compare-anode-mass-hint").startswith("assumed: ")
    assert page.input_value("#compare-anode-mass") == ""
    assert parse_qs(urlparse(page.url).query)["compare"] == ["anode"]

    # typing a value: used, no longer assumed, and in the link
    page.select_option("#compare-anode-alloy", "zinc")
    page.fill("#compare-anode-mass", "2,5 kg")
    page.locator("#compare-anode-mass").blur()
    _ready(page, "mass=")
    anode = _anode_cell(page, "Anode")
    assert "Zinc" in anode and "2.50 kg net" in anode and anode.count("(assumed)") == 2
    want = "anode:alloy=zinc;mass=2%2C5%20kg"
    assert parse_qs(urlparse(page.url).query)["compare"] == [want]

    # a bad value stays as typed, is marked and explained; nothing else is lost
    page.fill("#compare-anode-length", "40 furlongs")
    page.locator("#compare-anode-length").blur()
    _ready(page, "furlongs")
    assert page.get_attribute("#compare-anode-length", "aria-invalid") == "true"
    assert "furlongs" in page.inner_text("#compare-anode .compare-anode-error")
    assert page.input_value("#compare-anode-length") == "40 furlongs"
    assert _anode_cell(page, "Verdict") == "not computed"
    page.fill("#compare-anode-length", "")
    page.locator("#compare-anode-length").blur()
    page.wait_for_selector("#compare-block:not([data-variants*='furlongs'])[data-state='ready']")

    # the link reopens the same column
    link = page.url
    page.goto(link)
    wait_live(page)
    _ready(page, "anode")
    assert page.input_value("#compare-anode-mass") == "2,5 kg"
    assert page.input_value("#compare-anode-alloy") == "zinc"
    assert "2.50 kg net" in _anode_cell(page, "Anode")

    # saved into a job and reopened from it
    _save_check(page, new_name="Anode job", label="with zinc")
    _jobs(page, server)
    _open_job(page, "Anode job")
    href = page.get_attribute("#check-rows a", "href")
    assert parse_qs(urlparse(href).query)["compare"] == [want]
    page.click("#check-rows a")
    _ready(page, "anode")
    assert "Zinc" in _anode_cell(page, "Anode")
    assert page.input_value("#compare-anode-mass") == "2,5 kg"


def test_joint_anode_column_printed_and_atmosphere_not_applicable(page, server, tmp_path):
    page.goto(f"{server}/joint.html?{SEAWATER}&compare=anode")
    wait_live(page)
    _ready(page, "anode")
    assert _anode_cell(page, "Verdict") in ("Acceptable", "Needs care", "Avoid")
    assert "(assumed)" in _anode_cell(page, "Anode")
    # the browser's print gives the sheet with the compared anode and its sources in full
    _, text = _pdf_text(page, tmp_path / "joint-anode.pdf", "A4")
    flat = _squash(text)
    assert "Sacrificialanodeadded" in flat and "(assumed)" in text
    # the assumed alloy (aluminium-zinc-indium) and the anode shape cite these two
    assert _squash("Roberge, P. R., Corrosion Engineering: Principles and Practice") in flat
    assert _squash("DNV-RP-B401, Cathodic Protection Design") in flat
    # the joint's own example is a C5 atmosphere: said so, nothing computed
    page.goto(f"{server}/joint.html?compare=anode")
    wait_live(page)
    _ready(page, "anode")
    assert _anode_cell(page, "Verdict") == "not applicable"
    assert _anode_cell(page, "Note").startswith("Not applicable in atmosphere:")


def test_anode_column_fits_phone_and_tablet(page, server, tmp_path):
    for width in (390, 800):
        page.set_viewport_size({"width": width, "height": 1400})
        page.goto(f"{server}/fastener.html?{SEAWATER}&compare=anode:alloy%3Dzinc,isolate")
        wait_live(page)
        _ready(page, "anode")
        # the page itself never pans sideways; the table scrolls inside its own box
        overflow = page.evaluate("() => document.documentElement.scrollWidth - window.innerWidth")
        assert overflow <= 0, f"{width} px: the page is {overflow} px too wide"
        box = page.locator("#compare-anode").bounding_box()
        assert box["x"] >= 0 and box["x"] + box["width"] <= width + 0.5
        page.locator("#compare-block").screenshot(path=str(tmp_path / f"compare-{width}.png"))
