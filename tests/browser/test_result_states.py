"""The result panel's states, the page's watchdog and what it tells people.

States (``#result`` ``data-state``): ``example`` (labelled, only while the
inputs are the example's), ``pending`` (your inputs echoed, nothing of other
inputs), ``live`` (your result), ``error`` (not computed; no verdict, no
numbers). The watchdog ends an overrunning worker and starts a fresh one, and
says when the runtime does not arrive.
"""

from __future__ import annotations

import re

import time

from conftest import wait_for, wait_live
from noblegap import api

STATE = "() => document.getElementById('result').dataset.state"
# The runtime, plain or as the fast start's pre-compressed twin (pyodide.asm.wasm.gzip).
RUNTIME = re.compile(r".*/pyodide/pyodide\.asm\.wasm(\.gzip)?$")


def _headline(name, inputs):
    return api.run(name, inputs)["result"]["display"]["headline"]


def _no_foreign_result(page):
    """Nothing of a result is on screen: no verdict, no headline, no values."""
    assert page.locator("#result .verdict").count() == 0
    assert page.locator("#result .headline").count() == 0
    assert page.locator("#result .values").count() == 0


def _hold_runtime(context):
    """The Python runtime never arrives (the request stays open)."""
    held = []
    context.route(RUNTIME, lambda route: held.append(route))
    return held


def test_example_is_labelled_and_only_for_its_inputs(page, context, server):
    _hold_runtime(context)
    page.goto(f"{server}/pair.html")
    assert page.evaluate(STATE) == "example"
    assert "Worked example" in page.inner_text("#example-label")
    example = _headline("pair", api.get("pair").example)
    assert page.inner_text("#result .headline") == example
    # Typing before the engine is live: the example and its label go at once.
    page.fill("#f-alloy_a", "copper")
    assert page.evaluate(STATE) == "pending"
    label = page.inner_text("#example-label")
    assert "Worked example" not in label and "as soon as the engine is ready" in label
    _no_foreign_result(page)
    assert "copper" in page.inner_text("#result .echo")
    # Back to the example's own inputs: the example (and its label) return.
    page.fill("#f-alloy_a", "316 stainless")
    assert page.evaluate(STATE) == "example"
    assert page.inner_text("#result .headline") == example


def test_link_opened_before_the_engine_is_live(page, server):
    inputs = {**api.get("pair").example, "alloy_a": "copper", "alloy_b": "galvanized steel",
              "environment": "freshwater"}
    query = "&".join(f"{k}={v.replace(' ', '+')}" for k, v in inputs.items())
    page.goto(f"{server}/pair.html?{query}")
    if page.get_attribute("body", "data-engine") != "ready":
        assert page.evaluate(STATE) == "pending"
        _no_foreign_result(page)
        assert "Worked example" not in page.inner_text("#result")
    wait_live(page)
    assert page.evaluate(STATE) == "live"
    assert page.inner_text("#result .headline") == _headline("pair", inputs)


def test_shared_link_with_one_bad_value_never_shows_the_example_verdict(page, server):
    page.goto(f"{server}/pair.html?alloy_a=copper&alloy_b=galvanized+steel&environment=indoors")
    assert page.evaluate(STATE) != "example"
    _no_foreign_result(page)
    wait_live(page)
    assert page.evaluate(STATE) == "error"
    _no_foreign_result(page)
    assert "fix the marked field" in page.inner_text("#example-label")
    assert page.get_attribute("#f-environment", "aria-invalid") == "true"
    msg = page.inner_text("#e-environment")
    assert "'indoors'" in msg and "Indoor, controlled temperature and humidity" in msg
    assert "marine_splash" not in msg and "seawater_flowing" not in msg
    # The example's verdict is nowhere on the page, the summary bar included.
    assert "Avoid" not in page.inner_text("#summary")


def test_errors_wait_while_a_unit_is_being_typed(page, server):
    page.goto(f"{server}/convert.html")
    seq = wait_live(page)
    page.evaluate("""() => { window.__states = [];
        new MutationObserver(() => window.__states.push(document.getElementById('result').dataset.state))
          .observe(document.getElementById('result'), {attributes: true, attributeFilter: ['data-state']}); }""")
    page.fill("#f-potential", "")
    page.type("#f-potential", "-900 mV", delay=120)
    wait_live(page, seq)
    wait_for(page, "() => document.getElementById('result').dataset.state === 'live'")
    states = page.evaluate("() => window.__states")
    assert "error" not in states, states
    assert page.inner_text("#result [data-key='potential_V'] .value") == "\u22120.6588 V"
    assert page.is_hidden("#e-potential")
    # A pause shows the error; leaving the field shows it at once.
    seq = int(page.get_attribute("#result", "data-result-seq"))
    page.fill("#f-potential", "3 kg")
    page.keyboard.press("Tab")
    wait_for(page, "() => document.getElementById('result').dataset.state === 'error'", 5_000)
    assert "not a potential" in page.inner_text("#e-potential")
    _no_foreign_result(page)


def test_an_overrunning_calculation_restarts_the_worker(page, server):
    # A worker that never answers one input (as a power tower did once).
    page.add_init_script("""(() => {
        const Real = window.Worker;
        window.__workers = 0;
        window.Worker = class extends Real {
          constructor(...a) { super(...a); window.__workers += 1; }
          postMessage(msg, ...rest) {
            const v = msg && msg.args && msg.args.inputs && msg.args.inputs.potential;
            if (typeof v === 'string' && v.includes('STALL')) return;
            return super.postMessage(msg, ...rest);
          }
        };
      })();""")
    page.goto(f"{server}/convert.html")
    seq = wait_live(page)
    assert page.evaluate("() => window.__workers") == 1
    page.fill("#f-potential", "-0.5 V STALL")
    page.keyboard.press("Tab")
    t0 = time.monotonic()
    wait_for(page, "() => document.getElementById('result').dataset.reason === 'timeout'", 15_000)
    assert 2.5 < time.monotonic() - t0 < 10
    assert page.evaluate("() => window.__workers") == 2
    assert "took longer than 3 s" in page.inner_text("#engine-status")
    assert "took longer than 3 s" in page.inner_text("#result")
    assert page.input_value("#f-potential") == "-0.5 V STALL"      # nothing typed is lost
    _no_foreign_result(page)
    # The fresh engine answers the next edit.
    wait_for(page, "() => document.body.dataset.engine === 'ready'")
    seq = int(page.get_attribute("#result", "data-result-seq"))
    page.fill("#f-potential", "-900 mV")
    wait_live(page, seq)
    wait_for(page, "() => document.getElementById('result').dataset.state === 'live'")
    assert page.inner_text("#result [data-key='potential_V'] .value") == "\u22120.6588 V"


def test_sheet_and_compare_calls_survive_a_watchdog_restart(page, server):
    """A compare call pending on a worker the watchdog ends is answered by the
    fresh worker, and the sheet's calls work after the restart."""
    # Worker 1 never answers the job bar's calls (ids from 1 000 000), and stops
    # answering the page's own calculations once the test says so.
    page.add_init_script("""(() => {
        const Real = window.Worker;
        window.__workers = 0;
        window.Worker = class extends Real {
          constructor(...a) { super(...a); this.__n = ++window.__workers; }
          postMessage(msg, ...rest) {
            const first = this.__n === 1;
            if (first && msg && msg.id >= 1000000) return;
            if (first && msg && msg.id < 1000000 && window.__stall) return;
            return super.postMessage(msg, ...rest);
          }
        };
      })();""")
    page.goto(f"{server}/fastener.html?compare=isolate")
    seq = wait_live(page)
    assert page.get_attribute("#compare-block", "data-state") != "ready"   # held by worker 1
    page.evaluate("() => { window.__stall = true; }")
    page.fill("#f-count", "14")
    wait_for(page, "() => document.getElementById('result').dataset.reason === 'timeout'", 15_000)
    assert page.evaluate("() => window.__workers") == 2
    # The pending compare call was sent again to the fresh worker and answered.
    page.wait_for_selector("#compare-block[data-state='ready']", timeout=90_000)
    assert "Electrically isolated" in page.inner_text("#compare-block thead")
    # A new sheet call (the QR code of the link) works on the fresh worker.
    got = page.evaluate("""async () => {
        const { connect } = await import('./static/engine-client.js');
        const { call } = await connect();
        const reply = await call('sheet', { op: 'qr', link: location.href });
        return reply.ok && reply.result && reply.result.ok ? reply.result.svg.slice(0, 4) : reply;
      }""")
    assert got == "<svg", got
    # And the page computes again after an edit.
    seq = int(page.get_attribute("#result", "data-result-seq"))
    page.fill("#f-count", "16")
    wait_live(page, seq)
    wait_for(page, "() => document.getElementById('result').dataset.state === 'live'")


def test_a_power_tower_link_never_leaves_the_page_busy(page, server):
    """``10**10**10 V`` either is refused or overruns and is stopped: never a hang."""
    page.goto(f"{server}/convert.html?potential=10**10**10+V")
    wait_for(page, "() => document.getElementById('result').dataset.state === 'error'", 120_000)
    _no_foreign_result(page)
    wait_for(page, "() => document.body.dataset.engine === 'ready'")
    seq = int(page.get_attribute("#result", "data-result-seq"))
    page.fill("#f-potential", "-0.8 V")
    wait_live(page, seq)
    wait_for(page, "() => document.getElementById('result').dataset.state === 'live'")
    assert page.inner_text("#result .headline") == _headline(
        "convert", {**api.get("convert").example, "potential": "-0.8 V"})


def test_a_missing_runtime_file_is_reported_at_once(page, context, server):
    context.route(RUNTIME, lambda route: route.fulfill(status=404, body="not found"))
    page.goto(f"{server}/convert.html")
    wait_for(page, "() => document.body.dataset.engine === 'failed'", 20_000)
    status = page.inner_text("#engine-status")
    assert "pyodide.asm.wasm" in status and "404" in status
    assert "reload" in status and "connection" in status
    assert page.evaluate(STATE) == "example"
    assert "Only the worked example" in page.inner_text("#example-label")


def test_a_stalled_runtime_file_is_reported_after_30_s(page, context, server):
    _hold_runtime(context)
    page.goto(f"{server}/convert.html?potential=-0.9+V")
    assert page.evaluate(STATE) == "pending"
    wait_for(page, "() => document.body.dataset.engine === 'failed'", 45_000)
    status = page.inner_text("#engine-status")
    assert "not ready after 30 s" in status and "reload" in status
    assert page.evaluate(STATE) == "error"
    _no_foreign_result(page)
    assert page.input_value("#f-potential") == "-0.9 V"
    # Back to the example's inputs: only the example, and it says so.
    page.click("#reset")
    assert page.evaluate(STATE) == "example"
    assert "Only the worked example" in page.inner_text("#example-label")


def test_back_to_the_example_keeps_the_users_check(page, server):
    page.goto(f"{server}/convert.html")
    seq = wait_live(page)
    page.fill("#f-potential", "-700 mV")
    seq = wait_live(page, seq)
    mine = page.url
    page.click("#reset")
    seq = wait_live(page, seq)
    assert page.input_value("#f-potential") == api.get("convert").example["potential"]
    page.click(".btn-undo")
    seq = wait_live(page, seq)
    assert page.input_value("#f-potential") == "-700 mV"
    page.click("#reset")
    seq = wait_live(page, seq)
    page.go_back()
    wait_for(page, "() => document.getElementById('f-potential').value === '-700 mV'", 10_000)
    assert page.url == mine
    wait_live(page, seq)


def test_units_choice_is_remembered_and_carried_in_the_link(page, context, server):
    page.goto(f"{server}/fastener.html")
    seq = wait_live(page)
    assert "mm/yr (" in page.inner_text("#result .headline")
    page.select_option("#f-units", "us")
    seq = wait_live(page, seq)
    assert "mpy (" in page.inner_text("#result .headline")
    assert "units=us" in page.url
    other = context.new_page()
    other.goto(f"{server}/convert.html")
    assert other.input_value("#f-units") == "us"          # remembered on the device
    other.close()
    page.goto(f"{server}/fastener.html?diameter=3%2F8+in&units=si")
    wait_live(page)
    assert "mm/yr (" in page.inner_text("#result .headline")


def test_typed_inches_come_back_in_inches(page, server):
    page.goto(f"{server}/fastener.html")
    seq = wait_live(page)
    page.fill("#f-thickness", "1/4 in")
    wait_live(page, seq)
    wait_for(page, "() => document.getElementById('result').dataset.state === 'live'")
    assert "mpy (" in page.inner_text("#result .headline")


def test_live_region_speaks_results_not_keystrokes(page, server):
    page.goto(f"{server}/pair.html")
    seq = wait_live(page)
    assert page.get_attribute("#result", "aria-live") is None
    assert page.get_attribute("#announce", "aria-live") == "polite"
    page.fill("#f-alloy_b", "zinc")
    wait_live(page, seq)
    wait_for(page, "() => document.getElementById('announce').textContent.includes('Result updated')", 5_000)
    text = page.inner_text("#announce")
    assert api.run("pair", {**api.get("pair").example, "alloy_b": "zinc"})[
        "result"]["display"]["verdict"]["label"] in text


def test_source_toggles_have_names(page, server):
    page.goto(f"{server}/pair.html")
    wait_live(page)
    names = page.eval_on_selector_all("details.src summary", "els => els.map(e => e.getAttribute('aria-label'))")
    assert names and all(n and n.startswith("source of ") and len(n) > 12 for n in names)
    assert any("range vs SCE" in n for n in names)


def test_next_steps_open_the_other_pages_prefilled(page, server):
    page.goto(f"{server}/pair.html")
    wait_live(page)
    page.click(".next-steps a[href^='fastener.html']")
    wait_live(page)
    assert page.input_value("#f-fastener") == "Stainless steel 316 (S31600), passive"
    assert page.input_value("#f-plate") == "Aluminium alloy 5083 (A95083)"
    assert page.evaluate(STATE) == "live"


def test_offline_readiness_is_announced(page, server):
    page.goto(f"{server}/convert.html")
    wait_live(page)
    wait_for(page, "() => document.body.dataset.offline === 'ready'", 60_000)
    assert "Ready for offline use" in page.inner_text("#offline-status")
