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
# Our own files, which a page never names (a citation may name another
# repository's file, e.g. a published table extracted to CSV elsewhere).
OWN_PATHS = ["core/noblegap", "site_src/", "site_build/"] + [
    name for path in (ROOT / "data").glob("*.csv") for name in (f"data/{path.name}", path.name)]
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
        for path in OWN_PATHS:
            assert path not in shown, path
        for i in IDS:
            assert not re.search(rf"(?<![\w]){re.escape(i)}(?![\w])", shown), i


# Each chart shown: its width, its column's, its box's scroll, its smallest
# text as shown, and any text or mark of the drawing reaching past its edges
# (the drawing is laid out inline off screen to measure its parts).
CHARTS = r"""() => [...document.querySelectorAll('#result figure.chart img')]
  .filter((img) => img.getBoundingClientRect().width > 0)
  .map((img) => {
    const src = decodeURIComponent(img.getAttribute('src').split(',').slice(1).join(','));
    const svg = new DOMParser().parseFromString(src, 'image/svg+xml').documentElement;
    const [, , vw, vh] = svg.getAttribute('viewBox').split(/\s+/).map(Number);
    const host = document.createElement('div');
    host.style.cssText = 'position:absolute;left:-5000px;top:0;visibility:hidden';
    host.appendChild(document.importNode(svg, true));
    document.body.appendChild(host);
    const cut = [];
    for (const t of host.querySelectorAll('text, polyline, line, circle, rect')) {
      const b = t.getBBox();
      const m = t.getCTM ? t.transform.baseVal.consolidate() : null;
      let [x0, y0, x1, y1] = [b.x, b.y, b.x + b.width, b.y + b.height];
      if (m) {
        const p = [[x0, y0], [x1, y0], [x0, y1], [x1, y1]].map(([x, y]) =>
          [m.matrix.a * x + m.matrix.c * y + m.matrix.e, m.matrix.b * x + m.matrix.d * y + m.matrix.f]);
        [x0, x1] = [Math.min(...p.map((q) => q[0])), Math.max(...p.map((q) => q[0]))];
        [y0, y1] = [Math.min(...p.map((q) => q[1])), Math.max(...p.map((q) => q[1]))];
      }
      if (x0 < -0.5 || y0 < -0.5 || x1 > vw + 0.5 || y1 > vh + 0.5) cut.push(`${t.tagName} ${t.textContent || ''} ${Math.round(x0)}..${Math.round(x1)}`);
    }
    host.remove();
    const sizes = [...svg.querySelectorAll('[font-size]')].map((t) => Number(t.getAttribute('font-size')));
    const shown = img.getBoundingClientRect().width;
    const box = img.parentElement;
    return {
      shown, column: img.closest('figure').getBoundingClientRect().width,
      scrolls: box.scrollWidth > box.clientWidth + 1,
      smallest_px: Math.min(...sizes) * (shown - 2) / vw, cut,
    };
  })"""


@pytest.mark.parametrize("width", [360, 390, 800])
@pytest.mark.parametrize("name", ["fastener", "joint", "holiday", "nernst"])
def test_charts_fit_their_column_with_text_of_12_px(browser, server, name, width):
    ctx = browser.new_context(viewport={"width": width, "height": 900})
    ctx.route(re.compile(r"^(?!http://127\.0\.0\.1).*"), lambda route: route.abort())
    pg = ctx.new_page()
    try:
        pg.goto(f"{server}/{name}.html")
        for state in ("example", "live"):
            if state == "live":
                wait_live(pg)
            charts = pg.evaluate(CHARTS)
            assert charts, f"no chart shown on {name} ({state})"
            for c in charts:
                assert c["shown"] <= c["column"] + 0.5 and not c["scrolls"], (state, c)
                assert c["smallest_px"] >= 12.0, (state, c)
                assert not c["cut"], (state, c)
    finally:
        ctx.close()


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
    # The headline's number is in the bar, whole (not cut by the two-line clamp).
    assert sized.inner_text("#summary .summary-text") == expected["result"]["display"]["summary"]
    assert sized.evaluate("() => { const t = document.querySelector('#summary .summary-text');"
                          " return t.scrollHeight <= t.clientHeight + 1; }")


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
