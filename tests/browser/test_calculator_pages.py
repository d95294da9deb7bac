"""Page-specific checks for the series, Nernst, fastener and holiday pages."""

from __future__ import annotations

from urllib.parse import unquote, urlencode

from conftest import wait_live
from noblegap import api
from noblegap.materials import alloys as materials


def _chart_svg(page, index=0):
    src = page.locator("#result .chart img").nth(index).get_attribute("src")
    assert src.startswith("data:image/svg+xml")
    return unquote(src.split(",", 1)[1])


def _chart_painted(page, index=0):
    return page.locator("#result .chart img").nth(index).evaluate(
        "img => img.complete && img.naturalWidth > 0")


def test_series_view_names_every_alloy_and_the_scale_switches(page, server):
    page.goto(f"{server}/series.html")
    seq = wait_live(page)
    shown = page.eval_on_selector_all("#result .sview-name", "els => els.map(e => e.firstChild.textContent)")
    assert sorted(shown) == sorted(materials.alloy_label(row) for row in materials.alloy_table())
    assert "vs SCE" in page.inner_text("#result .sview-axis")
    # Bars are placed (through the CSSOM: the CSP allows no inline styles).
    lefts = page.eval_on_selector_all("#result .sview-bar", "els => els.map(e => e.style.left)")
    assert all(x.endswith("%") for x in lefts) and len(set(lefts)) > 10
    page.select_option("#f-reference", "cse")
    wait_live(page, seq)
    assert "CSE" in page.inner_text("#result .table-block h3")
    # filter the table as a user would
    page.fill("#result .table-filter", "zinc")
    visible = page.locator("#result tbody tr:visible").count()
    assert 1 <= visible < 10


def test_nernst_chart_updates_when_a_concentration_changes(page, server):
    page.goto(f"{server}/nernst.html")
    seq = wait_live(page)
    before = _chart_svg(page)
    e_before = page.inner_text("#result .headline")
    page.fill("#f-conc_b", "2 mg/L")
    seq = wait_live(page, seq)
    assert _chart_painted(page)
    assert _chart_svg(page) != before
    assert page.inner_text("#result .headline") != e_before
    inputs = api.get("nernst").raw_inputs(api.get("nernst").example)
    inputs["conc_b"] = "2 mg/L"
    assert page.inner_text("#result .headline") == api.run("nernst", inputs)["result"]["display"]["headline"]


def test_nernst_zero_concentration_message_keeps_text(page, server):
    page.goto(f"{server}/nernst.html")
    seq = wait_live(page)
    page.fill("#f-conc_a", "0 mol/L")
    wait_live(page, seq)
    assert "logarithm" in page.inner_text("#e-conc_a").lower()
    assert page.input_value("#f-conc_a") == "0 mol/L"


def test_fastener_alternatives_and_mitigations_render(page, server):
    page.goto(f"{server}/fastener.html")
    wait_live(page)
    text = page.inner_text("#result")
    assert page.locator("#result .verdict").count() == 1
    titles = page.locator("#result .table-block h3").all_inner_texts()
    assert any("fasteners" in t.lower() for t in titles)
    assert any("mitigation" in t.lower() for t in titles)
    assert "isolat" in text.lower() and "holiday" in text.lower()
    rows = page.locator("#result .table-block").first.locator("tbody tr").count()
    assert 1 <= rows <= 5


def test_fastener_shared_url_with_inch_diameter(page, context, server):
    calc = api.get("fastener")
    inputs = calc.raw_inputs(calc.example)
    inputs.update({"fastener": "carbon_steel", "plate": "S31600", "diameter": "3/8 in"})
    page.goto(f"{server}/fastener.html?{urlencode(inputs)}")
    wait_live(page)
    expected = api.run("fastener", inputs)["result"]
    assert page.inner_text("#result .headline") == expected["display"]["headline"]
    assert page.text_content("#result .verdict-label") == expected["display"]["verdict"]["label"]


def test_fastener_negative_count_message(page, server):
    page.goto(f"{server}/fastener.html")
    seq = wait_live(page)
    page.fill("#f-count", "-3")
    wait_live(page, seq)
    assert page.locator("#e-count").is_visible()
    assert page.input_value("#f-count") == "-3"


def test_holiday_from_inspection_and_from_specification(page, server):
    page.goto(f"{server}/holiday.html")
    seq = wait_live(page)
    # inspection entry: holidays found, no ageing model
    page.select_option("#f-coating_category", "none")
    seq = wait_live(page, seq)
    table = page.locator("#result [data-key='scenarios'] tbody tr")
    assert table.count() == 4
    inspection = page.inner_text("#result .headline")
    # specification entry: no holidays counted, DNV category ageing
    page.fill("#f-holiday_count", "0")
    page.select_option("#f-coating_category", "II-0-30")
    seq = wait_live(page, seq)
    assert page.locator("#result [data-key='scenarios'] tbody tr").count() == 4
    assert page.inner_text("#result .headline") != inspection
    assert _chart_painted(page)


def test_holiday_url_reproduces(page, server):
    calc = api.get("holiday")
    inputs = calc.raw_inputs(calc.example)
    inputs["coated_side"] = "cathode"
    page.goto(f"{server}/holiday.html?{urlencode(inputs)}")
    wait_live(page)
    assert page.inner_text("#result .headline") == \
        api.run("holiday", inputs)["result"]["display"]["headline"]


def test_joint_page_computes_and_a_shared_url_reproduces_it(page, server):
    page.goto(f"{server}/joint.html")
    wait_live(page)
    assert page.locator("#result .verdict").count() == 1
    titles = page.locator("#result .table-block h3").all_inner_texts()
    assert any("second member" in t.lower() for t in titles)
    assert any("mitigation" in t.lower() for t in titles)
    assert _chart_painted(page, 0)
    calc = api.get("joint")
    inputs = calc.raw_inputs(calc.example)
    inputs.update({"first": "carbon steel", "first_area": "50 m²", "second": "C95800",
                   "second_area": "0.2 m²", "environment": "seawater_flowing",
                   "distance": "50 mm"})
    page.goto(f"{server}/joint.html?{urlencode(inputs)}")
    wait_live(page)
    expected = api.run("joint", inputs)["result"]["display"]
    assert page.inner_text("#result .headline") == expected["headline"]
    assert page.text_content("#result .verdict-label") == expected["verdict"]["label"]


def test_old_environment_link_opens_the_fastener_page(page, server):
    calc = api.get("fastener")
    inputs = calc.raw_inputs(calc.example)
    inputs["environment"] = "marine_splash"
    page.goto(f"{server}/fastener.html?{urlencode(inputs)}")
    wait_live(page)
    expected = api.run("fastener", inputs)["result"]["display"]["headline"]
    assert page.inner_text("#result .headline") == expected
