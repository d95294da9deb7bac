"""A typed edit on a page with a headline path: the headline first, then the rest.

The fastener, joint and holiday pages answer a typed edit in two phases
(``#result`` ``data-phase``): ``headline`` (verdict, headline and range,
weakest source, warnings; where the charts, tables and next steps go, a note
that they are being computed for these inputs) and then ``full``. Whatever the
timing, a result on screen belongs to the inputs on screen, and the two phases
show the same headline.

The whole-result phase is slowed here by holding the page's "run" messages
without ``headline_only`` before they reach the worker (a wrapper around
``Worker.prototype.postMessage`` installed before the page's scripts run), so
the in-between state lasts long enough to be seen and newer edits overtake
older whole results.
"""

from __future__ import annotations

import pytest

from conftest import wait_for, wait_live
from noblegap import api

#: The field each page's edits change, and the values typed (all computable).
EDITS = {
    "fastener": ("count", ["14", "15", "16", "31", "7"]),
    "joint": ("second_area", ["0.03 m²", "0.031 m²", "0.5 m²", "0.0205 m²", "2 m²"]),
    "holiday": ("holiday_count", ["3", "31", "12", "40", "1"]),
}

SLOW_FULL = """(() => {
  const post = Worker.prototype.postMessage;
  Worker.prototype.postMessage = function (msg, ...rest) {
    const ms = self.__slowFullMs || 0;
    if (ms && msg && msg.fn === "run" && !(msg.args && msg.args.headline_only)) {
      setTimeout(() => post.call(this, msg, ...rest), ms);
      return;
    }
    return post.call(this, msg, ...rest);
  };
})();"""

# Every change of the result panel, with the inputs on screen at that moment
# (the observer runs before any further input event is handled).
RECORD = """() => {
  window.__shown = [];
  const schema = JSON.parse(document.getElementById('schema').textContent);
  const r = document.getElementById('result');
  new MutationObserver(() => {
    const inputs = {};
    for (const f of schema.fields) {
      const c = document.getElementById(`f-${f.key}`);
      if (c) inputs[f.key] = c.value;
    }
    const q = (s) => r.querySelectorAll(s).length;
    window.__shown.push({
      seq: r.dataset.resultSeq, state: r.dataset.state, phase: r.dataset.phase ?? null,
      inputs, headline: r.querySelector('.headline')?.textContent ?? null,
      verdict: r.querySelector('.verdict-label')?.textContent ?? null,
      coming: q('.result-coming'), tables: q('.table-block'), charts: q('figure.chart'),
      steps: q('.next-steps'), echo: q('.echo'),
    });
  }).observe(r, { attributes: true, attributeFilter: ['data-result-seq'] });
}"""


def _open(page, server, name):
    page.add_init_script(SLOW_FULL)
    page.goto(f"{server}/{name}.html")
    seq = wait_live(page)
    page.evaluate(RECORD)
    return seq


def _slow(page, ms):
    page.evaluate("(ms) => { window.__slowFullMs = ms; }", ms)


def _expected(name, inputs):
    full = api.run(name, inputs)
    first = api.run(name, inputs, headline_only=True)
    assert full["ok"] and first["ok"], (full, first)
    return full["result"]["display"], first["result"]["display"]


@pytest.mark.parametrize("name", sorted(EDITS))
def test_a_typed_edit_shows_the_headline_then_the_rest(page, server, name):
    assert api.get(name).headline is not None
    field, values = EDITS[name]
    seq = _open(page, server, name)
    _slow(page, 1500)
    page.fill(f"#f-{field}", values[0])
    wait_for(page, "(s) => { const r = document.getElementById('result');"
                   " return r.dataset.phase === 'headline' && Number(r.dataset.resultSeq) > s; }",
             arg=seq)
    inputs = {**api.get(name).example, field: values[0]}
    full, first = _expected(name, inputs)
    # Phase 1: the verdict, headline and weakest source of these inputs ...
    assert page.get_attribute("#result", "data-state") == "live"
    assert page.inner_text("#result .headline") == first["headline"] == full["headline"]
    assert page.text_content("#result .verdict-label") == full["verdict"]["label"]
    assert page.locator("#result .headline-basis").count() == 1
    assert page.locator("#result .warning").count() == len(full["warnings"])
    # ... and nothing of the rest, which is marked as being computed for them.
    coming = page.inner_text("#result .result-coming")
    assert "being computed for these inputs" in coming
    for sel in (".table-block", "figure.chart", ".next-steps"):
        assert page.locator(f"#result {sel}").count() == 0, sel
    print("keystroke to headline, ms:", page.get_attribute("#result", "data-headline-latency-ms"))
    assert page.get_attribute("#result", "data-headline-latency-ms") is not None
    # Phase 2: the rest fills in; the headline does not change.
    wait_for(page, "() => document.getElementById('result').dataset.phase === 'full'")
    assert page.inner_text("#result .headline") == full["headline"]
    assert page.locator("#result .result-coming").count() == 0
    assert page.locator("#result .table-block").count() == len(full["tables"])
    assert page.locator("#result figure.chart").count() == len(full["charts"])
    shown = page.evaluate("() => window.__shown")
    # (an echo of the inputs may come first, if the headline takes over 150 ms)
    assert [s["phase"] for s in shown if s["state"] == "live"] == ["headline", "full"], shown
    assert all(s["echo"] == 1 for s in shown if s["state"] != "live"), shown


@pytest.mark.parametrize("name", sorted(EDITS))
def test_fast_edits_never_show_a_foreign_result(page, server, name):
    field, values = EDITS[name]
    _open(page, server, name)
    _slow(page, 250)
    sel = f"#f-{field}"
    for i, value in enumerate(values):
        page.fill(sel, value)
        page.wait_for_timeout(40 if i % 2 else 120)      # some overtake, some not
    page.focus(sel)
    page.keyboard.press("End")
    for delay in (10, 25, 60):                          # keystrokes faster than a headline
        page.keyboard.type("205", delay=delay)
        for _ in range(3):
            page.keyboard.press("Backspace", delay=delay)
    wait_for(page, "(sel) => { const last = window.__shown[window.__shown.length - 1];"
                   " return last && last.phase === 'full' &&"
                   " Object.values(last.inputs).includes(document.querySelector(sel).value); }",
             arg=sel)
    page.wait_for_timeout(600)                          # anything still in flight lands
    shown = page.evaluate("() => window.__shown")
    assert shown and shown[-1]["phase"] == "full", shown[-1:]
    assert shown[-1]["inputs"][field] == page.input_value(sel)
    cache = {}
    headline_seen = {}
    for s in shown:
        if s["state"] != "live":
            assert s["headline"] is None and s["verdict"] is None, s
            continue
        key = tuple(sorted(s["inputs"].items()))
        if key not in cache:
            cache[key] = _expected(name, s["inputs"])
        full, first = cache[key]
        # The result on screen is the one of the inputs on screen.
        assert s["headline"] == full["headline"] == first["headline"], s
        assert s["verdict"] == full["verdict"]["label"], s
        if s["phase"] == "headline":
            assert s["coming"] == 1 and s["tables"] == s["charts"] == s["steps"] == 0, s
            headline_seen[key] = s["headline"]
        else:
            assert s["coming"] == 0 and s["tables"] == len(full["tables"]), s
            if key in headline_seen:                   # the same headline in both phases
                assert headline_seen[key] == s["headline"], s
    assert any(s["phase"] == "headline" for s in shown), shown


def test_an_input_error_in_the_first_phase_shows_as_before_and_stops_there(page, server):
    seq = _open(page, server, "fastener")
    _slow(page, 300)
    page.fill("#f-count", "abc")
    page.keyboard.press("Tab")                          # not typing: the error shows at once
    seq = wait_live(page, seq)
    assert page.get_attribute("#result", "data-state") == "error"
    assert page.locator("#result .headline").count() == 0
    assert page.locator("#result .result-coming").count() == 0
    assert page.is_visible("#e-count")
    page.wait_for_timeout(800)                          # no whole result follows
    assert page.get_attribute("#result", "data-state") == "error"
    shown = page.evaluate("() => window.__shown")
    assert all(s["state"] != "live" for s in shown), shown


def test_back_to_the_example_and_a_page_without_a_headline_path_wait_for_the_whole_result(
        page, server):
    seq = _open(page, server, "fastener")
    page.fill("#f-count", "30")
    seq = wait_live(page, seq)
    page.evaluate("() => { window.__shown = window.__shown.slice(0, 0); }")
    _slow(page, 300)
    page.click("#reset")
    wait_live(page, seq)
    assert page.locator("#result .table-block").count() > 0
    shown = page.evaluate("() => window.__shown")
    assert all(s["phase"] != "headline" for s in shown), shown
    assert shown and shown[-1]["phase"] == "full", shown
    # The couple page has no headline path: one whole result per edit.
    page.goto(f"{server}/pair.html")
    seq = wait_live(page)
    page.evaluate(RECORD)
    page.select_option("#f-environment", "freshwater")
    wait_live(page, seq)
    shown = page.evaluate("() => window.__shown")
    assert [s["phase"] for s in shown if s["state"] == "live"] == ["full"], shown
