"""The pages as a user tries them: example first, live results, URLs, bad input."""

from __future__ import annotations

from urllib.parse import urlencode

import pytest

from conftest import wait_for, wait_live
from noblegap import api

CALCS = list(api.calculators())


def _headline(result):
    return result["result"]["display"]["headline"]


def test_index_states_the_job_and_the_cautions(page, server):
    page.goto(f"{server}/index.html")
    text = page.inner_text("body")
    assert "Screening tool" in text and "qualified corrosion engineer" in text
    assert "licensed engineer" in text
    for name in CALCS:
        assert page.locator(f"a[href='{name}.html']").count() >= 1


def test_prerendered_example_without_javascript(browser, server):
    ctx = browser.new_context(java_script_enabled=False)
    try:
        pg = ctx.new_page()
        pg.goto(f"{server}/convert.html")
        expected = _headline(api.run("convert", api.get("convert").example))
        assert pg.inner_text("#result .headline") == expected
        assert "Worked example" in pg.inner_text("#example-label")
        assert "Screening tool" in pg.inner_text("body")
    finally:
        ctx.close()


def test_example_visible_before_engine_then_live(page, server):
    page.goto(f"{server}/convert.html")
    # Right after load the engine is still starting; the worked example is on screen.
    assert page.get_attribute("body", "data-engine") != "ready"
    assert page.get_attribute("#result", "data-state") == "example"
    assert page.inner_text("#result .headline").strip()
    wait_live(page)
    expected = _headline(api.run("convert", api.get("convert").example))
    assert page.inner_text("#result .headline") == expected


def test_live_result_after_editing(page, server):
    page.goto(f"{server}/convert.html")
    seq = wait_live(page)
    page.fill("#f-potential", "-900 mV")
    wait_live(page, seq)
    value = page.inner_text("#result [data-key='potential_V'] .value")
    assert value == "\u22120.6588 V"       # -0.900 V vs SCE + 0.2412 V
    assert "potential=-900+mV" in page.url


@pytest.mark.parametrize("name", CALCS)
def test_every_page_computes_live_and_matches_cpython(page, server, name):
    calc = api.get(name)
    page.goto(f"{server}/{name}.html")
    wait_live(page)
    assert page.get_attribute("#result", "data-state") == "live"
    assert page.inner_text("#result .headline") == _headline(api.run(name, calc.example))
    assert "Screening tool" in page.inner_text("body")


@pytest.mark.parametrize("name", CALCS)
def test_url_with_inputs_reproduces_the_result(page, server, name):
    calc = api.get(name)
    inputs = calc.raw_inputs(calc.example)
    page.goto(f"{server}/{name}.html?{urlencode(inputs)}")
    wait_live(page)
    for key, value in inputs.items():
        assert page.input_value(f"#f-{key}") == str(value)
    assert page.inner_text("#result .headline") == _headline(api.run(name, inputs))


def test_shared_link_of_edited_inputs_reproduces(page, context, server):
    page.goto(f"{server}/couple.html")
    seq = wait_live(page)
    page.select_option("#f-metal_b", "Mg")
    wait_live(page, seq)
    link = page.url
    shown = page.inner_text("#result .headline")
    other = context.new_page()
    other.goto(link)
    wait_live(other)
    assert other.inner_text("#result .headline") == shown
    assert "Magnesium" in shown


def test_bad_unit_message_keeps_the_text(page, server):
    page.goto(f"{server}/convert.html")
    seq = wait_live(page)
    page.fill("#f-potential", "3 kg")
    wait_live(page, seq)
    msg = page.inner_text("#e-potential")
    assert "not a potential" in msg and "mV" in msg
    assert page.input_value("#f-potential") == "3 kg"
    body = page.inner_text("#result")
    assert "NaN" not in body and "Traceback" not in body


@pytest.mark.parametrize("text,expect", [
    ("", "empty"), ("-0.8 furlong", "Unknown unit"), ("abc(", "Not a number"),
])
def test_other_bad_inputs(page, server, text, expect):
    page.goto(f"{server}/convert.html")
    seq = wait_live(page)
    page.fill("#f-potential", text)
    wait_live(page, seq)
    assert expect in page.inner_text("#e-potential")
    assert page.input_value("#f-potential") == text


def test_tampered_url_reference_id(page, server):
    page.goto(f"{server}/convert.html?potential=-0.8+V&from_ref=bogus&to_ref=she")
    wait_live(page)
    msg = page.inner_text("#e-from_ref")
    assert "'bogus'" in msg and "Saturated calomel electrode (SCE)" in msg
    assert page.input_value("#f-from_ref") == "bogus"


def test_offline_reload_still_computes(page, context, server):
    page.goto(f"{server}/convert.html")
    wait_live(page)
    # Wait until the service worker has precached the whole site.
    wait_for(page, "async () => { const r = await navigator.serviceWorker.ready;"
                   " return !!r.active && (await caches.keys()).length > 0; }", 60_000)
    context.set_offline(True)
    page.goto(f"{server}/convert.html?potential=-1.0+V&from_ref=sce&to_ref=she")
    wait_live(page)
    assert page.inner_text("#result [data-key='potential_V'] .value") == "\u22120.7588 V"
    context.set_offline(False)
