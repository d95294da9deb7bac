"""Timing of the galvanic-cell pages (fastener, holiday, joint) in headless Chromium.

    python3 bench/cell_pages.py [--edits 40] [--pages fastener,holiday,joint]
                                [--site DIR] [--before-site DIR]

Run by hand, not by the test suite. Serves the built site/ on loopback (the
test suite's server, with the site's CSP), opens each page in Debian's
Chromium, waits for the engine and the first live result, then edits one
numeric field ``--edits`` times and reads the page's own input-to-DOM latency
(``#result[data-latency-ms]``: from the keystroke to the rendered result,
compute inside the Pyodide worker included). These pages answer a typed edit
in two phases, the headline first and then the whole result; both are timed
(``#result[data-headline-latency-ms]``: keystroke to headline on screen). A
build without the headline phase shows its headline with the whole result, so
there both figures are the same. Every page computes the whole
result with its low / likely / high range, and the fastener and joint pages
also re-assess every alternative alloy and every mitigation, so they are the
heaviest pages of the site.

A second figure isolates one assessment: the core's own timer around
``galvanic.assess`` (one couple, all three cases, uncertainty included) is
read through the page's worker by timing a holiday case with no alternatives
(holiday page, the lightest galvanic page), and, on CPython, directly.

Every edit types a value not typed before, so no result comes from the core's
memory of recent cases (``galvanic.solve_case``); the CPython timings clear it
before each call.

``--site DIR`` times an already built site instead of building site/;
``--before-site DIR`` (another build, e.g. of the main branch) is timed in the
same run, page by page in turn with the same edits, and printed beside it.

A third figure times one calculation inside the page's worker: the same
page's inputs sent straight to the worker through static/engine-client.js,
each with a value of the edited field not used before, timed by the worker
itself (the reply's ``ms``), the headline path (verdict and local rate with
its low / likely / high range) and the whole result apart.

Target (issue 16): one calculation, uncertainty included, ≤ 16 ms p95 in the
browser.
"""

from __future__ import annotations

import argparse
import os
import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "tests"))
sys.path.insert(0, str(ROOT / "core"))

CHROMIUM = "/usr/bin/chromium"
#: The field each page's edits change, and the value of edit i (never repeated).
EDITS = {
    "fastener": ("count", lambda i: str(10 + i)),
    "holiday": ("holiday_count", lambda i: str(10 + i)),
    "joint": ("second_area", lambda i: f"{0.02 + 0.0005 * i:.4f} m²"),
}


def pct(values, q):
    ordered = sorted(values)
    k = max(0, min(len(ordered) - 1, round(q / 100 * (len(ordered) - 1))))
    return ordered[k]


def cpython_timings(n=30):
    """Per-calculation wall time on this CPython (ms), for comparison."""
    import math

    from noblegap import api
    from noblegap.methods import galvanic
    forget = getattr(getattr(galvanic, "_solve_case", None), "cache_clear", lambda: None)

    def timed(fn):
        fn()
        ts = []
        for _ in range(n):
            forget()
            t0 = time.perf_counter()
            fn()
            ts.append((time.perf_counter() - t0) * 1000)
        return ts

    out = {}
    for calc in EDITS:
        ex = api.get(calc).example
        out[f"{calc} page (CPython)"] = timed(lambda: api.run(calc, ex))
        out[f"{calc} page, headline only (CPython)"] = timed(
            lambda: api.run(calc, ex, headline_only=True))
    lay = galvanic.Layout("anode", 1, math.pi * 25e-6, 10.0, 5e-3, surrounds=False)
    out["one assessment, seawater (CPython)"] = timed(lambda: galvanic.assess(
        "carbon_steel", "C95800", "seawater_flowing", lambda rule: lay,
        allowance_of=lambda _a: (6e-3, None)))
    lay_f = galvanic.Layout("cathode", 12, 12 * 1.7e-3, 0.96, 0.01, 2)
    out["one assessment, CX film (CPython)"] = timed(lambda: galvanic.assess(
        "S31600", "A95083", "CX", lambda rule: lay_f, allowance_of=lambda _a: (6e-4, None)))
    return out


def _wait_whole(page, seq, timeout_s=60):
    """Until a result newer than ``seq`` shows that is not the headline phase.
    (Polled through page.evaluate: the site's CSP forbids wait_for_function's eval;
    the latency itself is the page's own figure, so the polling step does not count.)"""
    from playwright.sync_api import TimeoutError as PlaywrightTimeout
    deadline = time.monotonic() + timeout_s
    while not page.evaluate(
            "(s) => { const r = document.getElementById('result');"
            " return Number(r.dataset.resultSeq) > s && r.dataset.phase !== 'headline' &&"
            " (r.dataset.state === 'live' || r.dataset.state === 'error'); }", seq):
        if time.monotonic() > deadline:
            raise PlaywrightTimeout(f"no whole result after {timeout_s} s")
        page.wait_for_timeout(5)


#: One calculation timed inside the page's Pyodide worker: the worker's own
#: ``ms`` for the call (static/engine/worker.js), from the moment it takes the call
#: to the reply it posts, so neither the message queues nor the page's drawing
#: count. "headline" is the headline path (the verdict and the local rate with
#: its low / likely / high range: the uncertainty included); "whole result" is
#: the page's whole result (every alternative alloy, every mitigation, the
#: charts and the page text).
WORKER_CALLS = """async ([calc, inputs, field, values]) => {
  const { connect } = await import('./static/engine-client.js');
  const client = await connect();
  await client.ready;
  const out = { 'headline': [], 'whole result': [] };
  for (const value of values) {
    for (const [phase, headline_only] of [['headline', true], ['whole result', false]]) {
      const reply = await client.call('run', { calc, inputs: { ...inputs, [field]: value }, headline_only });
      if (!reply.ok) throw new Error(JSON.stringify(reply.error));
      out[phase].push(reply.ms);
    }
  }
  return out;
}"""


#: The field varied for the worker's calls: a wetted area (no value the keystroke
#: edits used, and every one a new cell, so none comes from the core's memory).
WORKER_EDITS = {
    "fastener": ("plate_area", lambda i: f"{1.0 + 0.001 * i:.3f} m²"),
    "holiday": ("coated_area", lambda i: f"{3.0 + 0.001 * i:.3f} m²"),
    "joint": ("first_area", lambda i: f"{0.5 + 0.001 * i:.3f} m²"),
}


def worker_calls(page, calc, n):
    """``{phase: [ms]}`` for ``n`` calculations not computed before on this page."""
    from noblegap import api
    field, value = WORKER_EDITS[calc]
    inputs = {k: str(v) for k, v in api.calculators()[calc].example.items() if v is not None}
    values = [value(i) for i in range(n)]
    return page.evaluate(WORKER_CALLS, [calc, inputs, field, values])


def browser_timings(pages, edits, sites):
    """``sites`` {label: built site dir or None (site/, built if needed)}; the sites
    are timed page by page in turn, so a change in the machine's load falls on both."""
    import contextlib

    from playwright.sync_api import TimeoutError as PlaywrightTimeout
    from playwright.sync_api import sync_playwright

    from _site import ensure_site, serve_site
    out = {}
    missed = {}
    with contextlib.ExitStack() as stack, sync_playwright() as p:
        bases = {label: stack.enter_context(serve_site(Path(d) if d else ensure_site()))
                 for label, d in sites.items()}
        browser = p.chromium.launch(executable_path=CHROMIUM,
                                    args=["--no-sandbox", "--disable-gpu"])
        ctx = browser.new_context(viewport={"width": 800, "height": 1280})
        for calc in pages:
            field, value = EDITS[calc]
            for label, base in bases.items():
                page = ctx.new_page()
                page.goto(f"{base.rstrip('/')}/{calc}.html")
                page.wait_for_selector('body[data-engine="ready"]', state="attached",
                                       timeout=120_000)
                page.wait_for_selector('#result[data-state="live"]', state="attached",
                                       timeout=120_000)
                lat = []
                first = []
                for i in range(edits):
                    seq = int(page.get_attribute("#result", "data-result-seq") or 0)
                    page.fill(f"#f-{field}", value(i))
                    try:
                        _wait_whole(page, seq)
                    except PlaywrightTimeout:
                        missed[f"{calc} ({label})"] = missed.get(f"{calc} ({label})", 0) + 1
                        continue
                    v = page.get_attribute("#result", "data-latency-ms")
                    h = page.get_attribute("#result", "data-headline-latency-ms")
                    if v is not None:
                        lat.append(float(v))
                        first.append(float(h if h is not None else v))
                out.setdefault(f"{calc} page, keystroke to headline (Chromium)", {})[label] = first
                out.setdefault(f"{calc} page, keystroke to whole result (Chromium)", {})[label] = lat
                for phase, ms in worker_calls(page, calc, edits).items():
                    out.setdefault(f"{calc}, one calculation in the worker: {phase}",
                                   {})[label] = ms
                page.close()
        browser.close()
    for what, n in missed.items():
        print(f"note: {n} edit(s) of the {what} page gave no new result within 60 s")
    return out


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--edits", type=int, default=40)
    ap.add_argument("--pages", default="fastener,holiday,joint")
    ap.add_argument("--no-browser", action="store_true")
    ap.add_argument("--site", default=None, help="a built site to time (default: site/)")
    ap.add_argument("--before-site", default=None,
                    help="another built site, timed in the same run and shown beside it")
    args = ap.parse_args(argv)
    rows = {k: {"this": v} for k, v in cpython_timings().items()}
    sites = {"this": args.site}
    if args.before_site:
        sites = {"before": args.before_site, "this": args.site}
    load = os.getloadavg()
    if not args.no_browser:
        rows.update(browser_timings(args.pages.split(","), args.edits, sites))
    print("load average (1, 5, 15 min) at start {:.2f} {:.2f} {:.2f}, at end {:.2f} {:.2f} {:.2f}"
          .format(*load, *os.getloadavg()))
    head = f"{'what':48} {'n':>4} {'p50 ms':>8} {'p95 ms':>8}"
    if args.before_site:
        head += f" {'before p50':>11} {'before p95':>11} {'p95 ratio':>10}"
    print(head + "  target p95 ≤ 16 ms")
    for name, by in rows.items():
        ts = by["this"]
        line = f"{name:48} {len(ts):4d} {statistics.median(ts):8.1f} {pct(ts, 95):8.1f}"
        if "before" in by:
            b = by["before"]
            line += (f" {statistics.median(b):11.1f} {pct(b, 95):11.1f} "
                     f"{pct(ts, 95) / pct(b, 95):10.2f}")
        print(line)
    return 0


if __name__ == "__main__":
    sys.exit(main())
