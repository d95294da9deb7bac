"""Fits a phone and a tablet: no sideways panning, the verdict in view, readable charts,
and no internal id or repository path in what a person sees."""

from __future__ import annotations

import csv
import re
from pathlib import Path

import pytest

from conftest import wait_for, wait_live
from noblegap import api

ROOT = Path(__file__).resolve().parents[2]
PAGES = ["index"] + list(api.calculators())
SIZES = {"phone": (360, 740), "tablet": (800, 1280)}
IDS = sorted({row["id"] for path in (ROOT / "data").glob("*.csv")
              for row in csv.DictReader(path.open(encoding="utf-8"))
              if "_" in (row.get("id") or "")})

# An element may reach past the screen's edge only inside a box that scrolls
# (or clips) on its own and itself fits: a wide table, a chart, the phone menu.
OVERFLOW = """() => {
  const w = document.documentElement.clientWidth;
  const boxed = (e) => {
    for (let a = e.parentElement; a && a !== document.body; a = a.parentElement) {
      const o = getComputedStyle(a).overflowX;
      if (o !== 'visible' && a.getBoundingClientRect().right <= w + 1) return true;
    }
    return false;
  };
  const out = [];
  for (const e of document.querySelectorAll('body *')) {
    if (e.closest('[hidden]')) continue;
    const r = e.getBoundingClientRect();
    if (r.width && r.right > w + 1 && !boxed(e)) out.push(`${e.tagName}.${e.className} ${Math.round(r.right)}`);
  }
  return {scroll: document.documentElement.scrollWidth, width: w, out: out.slice(0, 5)};
}"""


def _open(page, name):
    page.goto(f"{page.base}/{name}.html")
    if name != "index":
        wait_live(page)


@pytest.fixture
def sized(browser, server, request):
    w, h = SIZES[request.param]
    ctx = browser.new_context(viewport={"width": w, "height": h})
    ctx.route(re.compile(r"^(?!http://127\.0\.0\.1).*"), lambda route: route.abort())
    pg = ctx.new_page()
    pg.base = server
    yield pg
    ctx.close()


@pytest.mark.parametrize("sized", list(SIZES), indirect=True)
@pytest.mark.parametrize("name", PAGES)
def test_no_sideways_panning(sized, name):
    _open(sized, name)
    # Open every fold and source note: their contents must fit too.
    sized.evaluate("() => document.querySelectorAll('details').forEach(d => d.open = true)")
    got = sized.evaluate(OVERFLOW)
    assert got["scroll"] <= got["width"] and not got["out"], got


@pytest.mark.parametrize("sized", list(SIZES), indirect=True)
@pytest.mark.parametrize("name", PAGES)
def test_no_internal_id_or_repository_path_on_screen(sized, name):
    _open(sized, name)
    sized.evaluate("() => document.querySelectorAll('details').forEach(d => d.open = true)")
    text = sized.inner_text("body")
    options = " ".join(sized.eval_on_selector_all(
        "option, datalist option", "els => els.map(o => o.textContent + ' ' + (o.closest('datalist') ? o.value : ''))"))
    for shown in (text, options):
        assert "data/" not in shown and ".csv" not in shown
        for i in IDS:
            assert not re.search(rf"(?<![\w]){re.escape(i)}(?![\w])", shown), i


@pytest.mark.parametrize("sized", ["phone"], indirect=True)
@pytest.mark.parametrize("name", [n for n in api.calculators() if n != "series"])
def test_chart_text_is_at_least_12_px_on_a_phone(sized, name):
    _open(sized, name)
    for img in sized.query_selector_all("#result .chart img"):
        shown = img.bounding_box()["width"]
        need = float(img.get_attribute("data-min-width"))
        assert shown >= need - 1, (shown, need)


@pytest.mark.parametrize("sized", list(SIZES), indirect=True)
def test_verdict_stays_in_view_while_editing(sized):
    _open(sized, "pair")
    seq = int(sized.get_attribute("#result", "data-result-seq"))
    sized.locator("#f-environment").scroll_into_view_if_needed()
    sized.select_option("#f-environment", "freshwater")
    wait_live(sized, seq)
    wait_for(sized, "() => document.getElementById('result').dataset.state === 'live'")
    expected = api.run("pair", {**api.get("pair").example, "environment": "freshwater"})
    label = expected["result"]["display"]["verdict"]["label"]
    box = sized.locator("#summary").bounding_box()
    h = SIZES[[k for k, v in SIZES.items() if v[0] == sized.viewport_size["width"]][0]][1]
    assert box and 0 <= box["y"] and box["y"] + box["height"] <= h
    assert sized.inner_text("#summary .summary-verdict").lower() == label.lower()


@pytest.mark.parametrize("sized", ["phone"], indirect=True)
def test_series_view_is_grouped_and_filters(sized):
    _open(sized, "series")
    groups = sized.locator("#result .sview-group")
    assert groups.count() >= 8
    first = groups.nth(0)
    assert first.get_attribute("open") is not None
    assert first.locator(".sview-cathode, .sview-anode").count() >= 1
    assert sized.locator("#result .sview-win").count() > 0
    sized.check("#result .sview-fasteners")
    hidden = sized.eval_on_selector_all(
        "#result .sview-row", "rs => rs.filter(r => r.hidden).map(r => !!r.dataset.fastener)")
    assert hidden and not any(hidden)
    sized.select_option("#result .sview-family", "Copper-nickels")
    visible = sized.eval_on_selector_all("#result .sview-group", "gs => gs.filter(g => !g.hidden).map(g => g.dataset.family)")
    assert visible == ["Copper-nickels"]


def test_home_page_puts_the_checks_first(page, server):
    page.goto(f"{server}/index.html")
    hrefs = page.eval_on_selector_all("main .cards a", "as => as.map(a => a.getAttribute('href'))")
    assert hrefs.index("fastener.html") < hrefs.index("pair.html") < hrefs.index("series.html")
    assert hrefs.index("series.html") < hrefs.index("nernst.html")
    assert hrefs.index("convert.html") < hrefs.index("couple.html")
    assert page.locator("main h2", has_text="Check a joint").count() == 1
