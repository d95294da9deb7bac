"""Timing of the galvanic-cell pages (fastener, holiday, joint) in headless Chromium.

    python3 bench/cell_pages.py [--edits 40] [--pages fastener,holiday,joint]

Run by hand, not by the test suite. Serves the built site/ on loopback (the
test suite's server, with the site's CSP), opens each page in Debian's
Chromium, waits for the engine and the first live result, then edits one
numeric field ``--edits`` times and reads the page's own input-to-DOM latency
(``#result[data-latency-ms]``: from the keystroke to the rendered result,
compute inside the Pyodide worker included). Every page computes the whole
result with its low / likely / high range, and the fastener and joint pages
also re-assess every alternative alloy and every mitigation, so they are the
heaviest pages of the site.

A second figure isolates one assessment: the core's own timer around
``galvanic.assess`` (one couple, all three cases, uncertainty included) is
read through the page's worker by timing a holiday case with no alternatives
(holiday page, the lightest galvanic page), and, on CPython, directly.

Target (issue 16): one calculation, uncertainty included, ≤ 16 ms p95 in the
browser.
"""

from __future__ import annotations

import argparse
import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT / "tests"))
sys.path.insert(0, str(ROOT / "core"))

CHROMIUM = "/usr/bin/chromium"
EDITS = {
    "fastener": ("count", ["10", "11", "12", "13", "14"]),
    "holiday": ("holiday_count", ["10", "11", "12", "13", "14"]),
    "joint": ("second_area", ["0.02 m²", "0.021 m²", "0.022 m²", "0.023 m²", "0.024 m²"]),
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
    out = {}
    for calc in EDITS:
        ex = api.get(calc).example
        api.run(calc, ex)
        ts = []
        for _ in range(n):
            t0 = time.perf_counter()
            api.run(calc, ex)
            ts.append((time.perf_counter() - t0) * 1000)
        out[f"{calc} page (CPython)"] = ts
    lay = galvanic.Layout("anode", 1, math.pi * 25e-6, 10.0, 5e-3, surrounds=False)
    ts = []
    for _ in range(n):
        t0 = time.perf_counter()
        galvanic.assess("carbon_steel", "C95800", "seawater_flowing", lambda rule: lay,
                        allowance_of=lambda _a: (6e-3, None))
        ts.append((time.perf_counter() - t0) * 1000)
    out["one assessment, 3 cases (CPython)"] = ts
    return out


def browser_timings(pages, edits):
    from playwright.sync_api import sync_playwright

    from _site import ensure_site, serve_site
    site = ensure_site()
    out = {}
    with serve_site(site) as base, sync_playwright() as p:
        browser = p.chromium.launch(executable_path=CHROMIUM,
                                    args=["--no-sandbox", "--disable-gpu"])
        ctx = browser.new_context(viewport={"width": 800, "height": 1280})
        for calc in pages:
            field, values = EDITS[calc]
            page = ctx.new_page()
            page.goto(f"{base.rstrip('/')}/{calc}.html")
            page.wait_for_selector('body[data-engine="ready"]', state="attached",
                                   timeout=120_000)
            page.wait_for_selector('#result[data-state="live"]', state="attached",
                                   timeout=120_000)
            lat = []
            for i in range(edits):
                seq = int(page.get_attribute("#result", "data-result-seq") or 0)
                page.fill(f"#f-{field}", values[i % len(values)])
                page.wait_for_selector(f'#result[data-result-seq="{seq + 1}"]',
                                       state="attached", timeout=60_000)
                v = page.get_attribute("#result", "data-latency-ms")
                if v is not None:
                    lat.append(float(v))
            out[f"{calc} page, input to DOM (Chromium)"] = lat
            page.close()
        browser.close()
    return out


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--edits", type=int, default=40)
    ap.add_argument("--pages", default="fastener,holiday,joint")
    ap.add_argument("--no-browser", action="store_true")
    args = ap.parse_args(argv)
    rows = cpython_timings()
    if not args.no_browser:
        rows.update(browser_timings(args.pages.split(","), args.edits))
    print(f"{'what':48} {'n':>4} {'p50 ms':>8} {'p95 ms':>8}  target p95 ≤ 16 ms")
    for name, ts in rows.items():
        print(f"{name:48} {len(ts):4d} {statistics.median(ts):8.1f} {pct(ts, 95):8.1f}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
