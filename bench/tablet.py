"""The first visit on a mid-range tablet, next to the plain run, in one run.

    python3 bench/tablet.py [--markdown]

Run by hand, not by the test suite. For each device (``plain``: this
machine as it is; ``tablet``: Chromium's CPU throttled x4 through the
DevTools protocol, ``Emulation.setCPUThrottlingRate``, and a 20 Mbit/s link
with 40 ms latency) and each host (``plain``: a static host that never
compresses; ``gzip``: one that compresses every file not compressed
already), on a fresh profile:

* the bare Pyodide boot (the npm package's files, ``loadPyodide()`` only),
  first, second and third visit (HTTP cache);
* a shared link to the lightest page (``couple.html`` with the user's own
  inputs) and to the heaviest (``holiday.html``): the first correct live
  result, first, second and third visit (service worker installed; the
  third shows a later visit, once the browser may keep compiled code),

and prints each page's time over the bare boot's on the same visit, side by
side. The tablet's link is ``Network.emulateNetworkConditions`` on the
page's DevTools target (it slows the page's dedicated Web Worker too, one
link shared by both: checked with a 9.6 MB download from each at once).

Targets (tablet, plain host, a shared link): first visit <= 0.6 x the bare
boot's first visit, second visit <= 0.25 x the bare boot's second visit.
"""

from __future__ import annotations

import argparse
import datetime
import os
import shutil
import sys
import tempfile
import threading
import time
from pathlib import Path
from urllib.parse import urlencode

sys.path.insert(0, str(Path(__file__).resolve().parent))
import bench  # noqa: E402

RATE_BPS = 20e6 / 8          # 20 Mbit/s
LATENCY_S = 0.040
CPU_RATE = 4
PHASES_TO_STDERR = False
PAGES = {
    "lightest": ("couple.html", {"metal_a": "Mg", "metal_b": "Au"}),
    "heaviest": ("holiday.html", None),   # the example with one field changed (below)
}


def heavy_inputs():
    sys.path.insert(0, str(bench.ROOT / "core"))
    from noblegap import api

    example = dict(api.get("holiday").example)
    example["design_life"] = "35 year"
    return example


def emulate(context, page, tablet):
    """The tablet's CPU and link on this page (and its workers), through the DevTools protocol."""
    if not tablet:
        return
    cdp = context.new_cdp_session(page)
    cdp.send("Emulation.setCPUThrottlingRate", {"rate": CPU_RATE})
    cdp.send("Network.enable")
    cdp.send("Network.emulateNetworkConditions", {
        "offline": False, "latency": LATENCY_S * 1000,
        "downloadThroughput": RATE_BPS, "uploadThroughput": RATE_BPS})


class TimedCounter(bench.ByteCounter):
    """A ByteCounter that also keeps when each block was sent (monotonic s)."""

    def reset(self):
        super().reset()
        self.sent = []

    def add(self, wire, raw):
        super().add(wire, raw)
        with self.lock:
            self.sent.append((time.monotonic(), wire))

    def bytes_before(self, moment):
        with self.lock:
            return sum(wire for at, wire in self.sent if at <= moment)


def first_live(context, url, timeout_s, tablet, counter=None):
    """Open url; returns (page, first live ms, result state, engine mode).
    With counter (a TimedCounter), counter.at_first_live is set to the bytes
    sent until the first live result was on the page (the offline copy's
    precache starts after it): the page's clock starts at navigation, taken
    here as the moment just before page.goto."""
    page = context.new_page()
    emulate(context, page, tablet)
    started = time.monotonic()
    page.goto(url)
    bench.wait_attr(page, 'body[data-engine="ready"]', timeout_s)
    deadline = time.monotonic() + timeout_s
    marks = {}
    while time.monotonic() < deadline:
        marks = page.evaluate("() => window.__benchMarks")
        if marks.get("firstLive") is not None:
            if counter is not None:
                counter.at_first_live = counter.bytes_before(started + marks["firstLive"] / 1000)
            break
        time.sleep(0.02)
    state = page.get_attribute("#result", "data-state")
    mode = page.get_attribute("body", "data-engine-mode")
    if PHASES_TO_STDERR:
        timings = marks.get("workerTimings") or {}
        print(f"    {url.split('?')[0].rsplit('/', 1)[-1]}: worker created {marks.get('workerCreated', 0):.0f} ms, "
              f"engine ready {marks.get('ready') or 0:.0f} ms, first live {marks.get('firstLive') or 0:.0f} ms; worker: "
              + ", ".join(f"{k} {v:.0f}" for k, v in timings.items()), file=sys.stderr, flush=True)
    return page, marks.get("firstLive"), state, mode


def bare_boot(context, url, timeout_s, tablet):
    page = context.new_page()
    emulate(context, page, tablet)
    page.goto(url)
    bench.wait_attr(page, "body[data-done]", timeout_s)
    if page.get_attribute("body", "data-done") != "ok":
        raise RuntimeError("bare Pyodide boot failed")
    ms = float(page.get_attribute("body", "data-boot-ms"))
    page.close()
    return ms


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--timeout", type=float, default=240.0)
    parser.add_argument("--markdown", action="store_true")
    parser.add_argument("--devices", default="plain,tablet")
    parser.add_argument("--hosts", default="plain,gzip")
    parser.add_argument("--phases", action="store_true", help="print each visit's engine phases on stderr")
    args = parser.parse_args(argv)
    global PHASES_TO_STDERR
    PHASES_TO_STDERR = args.phases
    from playwright.sync_api import sync_playwright

    load_start = os.getloadavg()
    build = bench.load_build()
    site = bench.ensure_site(build)
    bench_dir = Path(tempfile.mkdtemp(prefix="noblegap-tablet-"))
    (bench_dir / "boot.html").write_text(bench.BOOT_HTML)
    (bench_dir / "boot.js").write_text(bench.BOOT_JS)
    (bench_dir / "boot-worker.js").write_text(bench.BOOT_WORKER_JS)
    pyodide_npm = build.fetch_pyodide(build.load_pyodide_pin(), offline=True)
    shutil.copyfile(pyodide_npm / bench.OFFICIAL_STDLIB, bench_dir / bench.OFFICIAL_STDLIB)
    gz = bench.GzipCache()
    gz.warm(site)
    heavy = heavy_inputs()
    links = {name: f"{page}?{urlencode(inputs if inputs is not None else heavy)}"
             for name, (page, inputs) in PAGES.items()}
    results = {}
    with sync_playwright() as p:
        for device in args.devices.split(","):
            for host in args.hosts.split(","):
                counter = TimedCounter()
                server = bench.make_server(build, site, bench_dir, counter, gz, gzip_host=host == "gzip")
                thread = threading.Thread(target=server.serve_forever, daemon=True)
                thread.start()
                base = f"http://127.0.0.1:{server.server_address[1]}/"
                tablet = device == "tablet"
                row = results[(device, host)] = {}
                try:
                    def fresh(**kw):
                        return p.chromium.launch_persistent_context(
                            tempfile.mkdtemp(prefix="profile-", dir=bench_dir),
                            executable_path=bench.CHROMIUM, args=bench.CHROMIUM_ARGS, **kw)

                    ctx = fresh(service_workers="block")
                    boot_url = base + bench.BENCH_PREFIX.lstrip("/") + "boot.html"
                    counter.reset()
                    row["bare first"] = bare_boot(ctx, boot_url, args.timeout, tablet)
                    row["bare first bytes"] = counter.bytes
                    counter.reset()
                    row["bare second"] = bare_boot(ctx, boot_url, args.timeout, tablet)
                    row["bare third"] = bare_boot(ctx, boot_url, args.timeout, tablet)
                    ctx.close()
                    for name, url in links.items():
                        ctx = fresh()
                        ctx.add_init_script(bench.TIMING_INIT_SCRIPT)
                        counter.reset()
                        page, ms, state, mode = first_live(ctx, base + url, args.timeout, tablet, counter)
                        row[f"{name} first bytes"] = counter.at_first_live
                        row[f"{name} first"], row[f"{name} mode"] = ms, mode
                        if state != "live":
                            raise RuntimeError(f"{url}: result state {state}")
                        page.evaluate("async () => { await navigator.serviceWorker.ready; }")
                        page.close()
                        page, ms, state, mode = first_live(ctx, base + url, args.timeout, tablet)
                        row[f"{name} second"] = ms
                        page.close()
                        # a later visit: the browser may by now keep compiled
                        # code for the runtime the offline copy serves
                        page, ms, state, mode = first_live(ctx, base + url, args.timeout, tablet)
                        row[f"{name} third"] = ms
                        page.close()
                        ctx.close()
                finally:
                    server.shutdown()
                    server.server_close()
                print(f"  done: {device} device, {host} host: "
                      + ", ".join(f"{k} {v:.0f}" if isinstance(v, float) else f"{k} {v}" for k, v in row.items()),
                      file=sys.stderr, flush=True)
    shutil.rmtree(bench_dir, ignore_errors=True)
    report(results, links, args.markdown, (load_start, os.getloadavg()))
    return 0


def report(results, links, markdown, loads):
    when = datetime.datetime.now().astimezone().isoformat(timespec="seconds")
    load = " / ".join(f"{a:.2f}, {b:.2f}, {c:.2f}" for a, b, c in loads)
    lines = [f"date: {when}", f"machine: {bench.machine()}",
             f"load average (1, 5, 15 min) at start / at end: {load}",
             f"tablet: CPU x{CPU_RATE} (Emulation.setCPUThrottlingRate), link {RATE_BPS * 8 / 1e6:.0f} Mbit/s, "
             f"{LATENCY_S * 1000:.0f} ms (Network.emulateNetworkConditions); shared links: {', '.join(links.values())}", ""]
    head = ["device", "host", "visit", "bare boot", "lightest", "ratio", "heaviest", "ratio", "first-visit MB to first result (bare / lightest)"]
    rows = []
    for (device, host), r in results.items():
        for visit in ("first", "second", "third"):
            bare = r[f"bare {visit}"]
            light, heavy = r[f"lightest {visit}"], r[f"heaviest {visit}"]
            mb = (f"{r['bare first bytes'] / 1e6:.1f} / {r['lightest first bytes'] / 1e6:.1f}"
                  if visit == "first" else "")
            rows.append([device, host, visit, f"{bare / 1000:.2f} s", f"{light / 1000:.2f} s",
                         f"{light / bare:.2f}", f"{heavy / 1000:.2f} s", f"{heavy / bare:.2f}", mb])
    if markdown:
        print("\n".join(f"- {line}" if line else "" for line in lines))
        print("| " + " | ".join(head) + " |")
        print("|" + " --- |" * len(head))
        for row in rows:
            print("| " + " | ".join(row) + " |")
    else:
        print("\n".join(lines))
        widths = [max(len(str(x)) for x in col) for col in zip(head, *rows)]
        for row in [head, *rows]:
            print("  ".join(str(x).ljust(w) for x, w in zip(row, widths)))
    tablet = results.get(("tablet", "plain"))
    if tablet:
        for visit, goal in (("first", 0.6), ("second", 0.25)):
            ratio = tablet[f"lightest {visit}"] / tablet[f"bare {visit}"]
            print(f"{'- ' if markdown else ''}target, tablet, plain host, shared link, {visit} visit: "
                  f"{ratio:.2f} x bare boot (goal <= {goal}): {'met' if ratio <= goal else 'NOT met'}")


if __name__ == "__main__":
    sys.exit(main())
