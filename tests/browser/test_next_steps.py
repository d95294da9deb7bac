"""Every next-step link opens its page with what it carries, and that page
computes the person's result for it.

For each page that offers next steps (the pair, the series, the fastener, the
joint and the holiday pages; mitigations and alternatives are among them), on
its worked example and on one case a person typed: every link is followed; the
page it opens must show the link's values in its fields (no "not recognised"
entry), be in the "your result" state with no error, and show the core's
headline for those inputs.
"""

from __future__ import annotations

from urllib.parse import parse_qsl, urlencode, urlsplit

import pytest

from conftest import wait_for, wait_live
from noblegap import api

USER_CASES = {
    "series": {"alloy_a": "copper", "alloy_b": "galvanized steel", "environment": "freshwater"},
    "pair": {"alloy_a": "C12200", "alloy_b": "zinc-plated steel", "environment": "atmosphere_normal"},
    "fastener": {"fastener": "A4-70", "plate": "6061", "environment": "seawater_flowing",
                 "diameter": "M8", "count": "20", "design_life": "40 y", "conductivity": "4.5 S/m"},
    "holiday": {"coated": "carbon steel", "other": "316L", "environment": "C4",
                "coated_side": "both", "design_life": "30 year"},
    "joint": {"first": "aluminium 5083", "second": "C12200", "environment": "brackish",
              "design_life": "15 year"},
}
CASES = [(name, case) for name in USER_CASES for case in ("example", "typed")]

FIELDS = """(keys) => Object.fromEntries(keys.map((k) => {
  const c = document.getElementById('f-' + k);
  return [k, c ? c.value : null];
}))"""
PANEL = """() => ({
  state: document.getElementById('result').dataset.state,
  errors: document.querySelectorAll('#result .result-error, .field-error:not([hidden])').length,
  unknown: document.querySelectorAll('#inputs option[data-unknown]').length,
  headline: document.querySelector('#result .headline')?.textContent ?? null,
})"""


def _inputs(name, case):
    ex = dict(api.get(name).example)
    return ex if case == "example" else {**ex, **USER_CASES[name]}


def _expected_links(name, inputs):
    out = api.run(name, inputs)
    assert out["ok"], out
    return out["result"]["display"].get("links") or []


@pytest.mark.parametrize("name,case", CASES)
def test_every_next_step_opens_its_page_prefilled_and_computes_it(page, server, name, case):
    inputs = _inputs(name, case)
    expected = _expected_links(name, inputs)
    assert expected, f"{name} offers no next steps"
    page.goto(f"{server}/{name}.html?{urlencode(inputs)}")
    wait_live(page)
    assert page.evaluate(PANEL)["state"] == "live"
    hrefs = page.eval_on_selector_all("#result .next-steps a", "as => as.map(a => a.getAttribute('href'))")
    labels = page.eval_on_selector_all("#result .next-steps a", "as => as.map(a => a.textContent)")
    assert labels == [link["label"] for link in expected]
    problems = []
    for label, href in zip(labels, hrefs):
        target = href.split("?")[0].removesuffix(".html")
        carried = dict(parse_qsl(urlsplit(href).query, keep_blank_values=True))
        page.goto(f"{server}/{href}")
        wait_live(page)
        wait_for(page, "() => document.getElementById('result').dataset.state !== 'pending'")
        shown = page.evaluate(FIELDS, list(carried))
        panel = page.evaluate(PANEL)
        want = api.run(target, {**api.get(target).example, **carried})
        headline = want["result"]["display"]["headline"] if want["ok"] else None
        if shown != carried:
            problems.append((label, "fields", {k: (carried[k], shown[k]) for k in carried
                                               if shown[k] != carried[k]}))
        if panel["state"] != "live" or panel["errors"] or panel["unknown"]:
            problems.append((label, "panel", panel))
        elif panel["headline"] != headline:
            problems.append((label, "headline", panel["headline"], headline))
    assert not problems, problems


def test_a_link_that_keeps_the_inputs_carries_the_edits_on_screen(page, server):
    # An alternative fastener keeps everything else the person typed, edits included.
    page.goto(f"{server}/fastener.html")
    seq = wait_live(page)
    page.fill("#f-count", "30")
    wait_live(page, seq)
    href = page.get_attribute("#result .next-steps a[href^='fastener.html']", "href")
    carried = dict(parse_qsl(urlsplit(href).query, keep_blank_values=True))
    assert carried["count"] == "30" and carried["fastener"] != "316 stainless"
    page.click("#result .next-steps a[href^='fastener.html']")
    wait_live(page)
    assert page.input_value("#f-count") == "30"
    assert page.input_value("#f-fastener") == carried["fastener"]
