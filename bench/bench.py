"""Start-up and latency benchmark of the built site in headless Chromium.

    python3 bench/bench.py [--page convert.html] [--field potential] [--edits 50]

Run by hand, not by the test suite. In one Chromium run, against a local
server of site/ that counts every byte it sends:

1. bare Pyodide boot: a bench-only page whose module worker just calls
   loadPyodide() from the same site/pyodide files (fresh profile);
2. first visit of a calculator page (fresh profile): engine ready, first
   live result, bytes sent;
3. input-to-DOM latency over N edits of one field (the page's own
   ``data-latency-ms`` and the wall clock seen from here);
4. second visit (same profile, service worker installed): engine ready and
   bytes sent.

The bench page lives in a temporary folder served at /__bench/; nothing is
added to site/. The page script marks ``body[data-engine="ready"]`` and
bumps ``#result[data-result-seq]`` on each render; this script waits on
those attributes.
"""

from __future__ import annotations

import argparse
import importlib.util
import shutil
import statistics
import subprocess
import sys
import tempfile
import threading
import time
from functools import partial
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
CHROMIUM = "/usr/bin/chromium"
CHROMIUM_ARGS = [
    "--no-sandbox", "--disable-gpu", "--disable-background-networking",
    "--disable-component-update", "--disable-sync", "--no-first-run",
    # Every host but loopback fails to resolve: nothing leaves the machine.
    # (Playwright's request routing would do the same but turns off the
    # HTTP cache, which the byte counts below depend on.)
    "--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1",
]
BENCH_PREFIX = "/__bench/"

BOOT_HTML = """<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>bare Pyodide boot</title>
<script type="module" src="boot.js"></script></head><body></body></html>
"""
BOOT_JS = """// Page side of the bare-boot bench: time from navigation start to Pyodide up.
const worker = new Worker(new URL("boot-worker.js", import.meta.url), { type: "module" });
worker.onmessage = (event) => {
  document.body.dataset.workerMs = String(event.data.workerMs);
  document.body.dataset.bootMs = String(performance.now());
  document.body.dataset.done = event.data.ok ? "ok" : "failed";
};
"""
BOOT_WORKER_JS = """// Worker side of the bare-boot bench: loadPyodide() and nothing else.
import { loadPyodide } from "../pyodide/pyodide.mjs";
const t0 = performance.now();
try {
  await loadPyodide({
    indexURL: new URL("../pyodide/", import.meta.url).href,
    lockFileURL: new URL("../packages/noblegap-lock.json", import.meta.url).href,
  });
  self.postMessage({ ok: true, workerMs: performance.now() - t0 });
} catch (err) {
  self.postMessage({ ok: false, workerMs: performance.now() - t0, message: String(err) });
}
"""

# Records, in the page's own clock (ms since navigation start), when the
# engine became ready and when the first result after that was rendered.
TIMING_INIT_SCRIPT = """
(() => {
  const marks = (window.__benchMarks = {});
  const watch = () => {
    const body = document.body;
    const result = document.getElementById("result");
    if (!body || !result) return false;
    let seqAtReady = null;
    const check = () => {
      const now = performance.now();
      if (marks.ready === undefined && body.dataset.engine === "ready") {
        marks.ready = now;
        seqAtReady = Number(result.dataset.resultSeq || 0);
      }
      if (marks.ready !== undefined && marks.firstLive === undefined &&
          Number(result.dataset.resultSeq || 0) > seqAtReady) {
        marks.firstLive = now;
      }
    };
    new MutationObserver(check).observe(document.documentElement,
      { attributes: true, subtree: true, attributeFilter: ["data-engine", "data-result-seq"] });
    check();
    return true;
  };
  if (!watch()) document.addEventListener("DOMContentLoaded", watch);
  // The engine worker's own phase marks, to see where start-up time goes.
  const NativeWorker = window.Worker;
  window.Worker = class extends NativeWorker {
    constructor(...args) {
      super(...args);
      marks.workerCreated = performance.now();
      marks.phases = {};
      this.addEventListener("message", (event) => {
        const msg = event.data || {};
        if (msg.type === "progress") marks.phases[msg.phase] = performance.now();
        if (msg.type === "ready") marks.workerTimings = msg.timings || null;
      });
    }
  };
})();
"""


def load_build():
    spec = importlib.util.spec_from_file_location("noblegap_build", ROOT / "build.py")
    mod = importlib.util.module_from_spec(spec)
    sys.modules["noblegap_build"] = mod
    spec.loader.exec_module(mod)
    return mod


class ByteCounter:
    def __init__(self):
        self.lock = threading.Lock()
        self.bytes = 0
        self.requests = 0

    def add(self, n):
        with self.lock:
            self.bytes += n

    def reset(self):
        with self.lock:
            self.bytes = 0
            self.requests = 0


def make_server(build, site: Path, bench_dir: Path, counter: ByteCounter):
    class Handler(build.SiteHandler):
        def translate_path(self, path):
            if path.startswith(BENCH_PREFIX):
                rel = path[len(BENCH_PREFIX):].split("?", 1)[0]
                return str(bench_dir / rel)
            return super().translate_path(path)

        def copyfile(self, source, outputfile):
            while True:
                block = source.read(64 * 1024)
                if not block:
                    break
                outputfile.write(block)
                counter.add(len(block))

        def send_response(self, code, message=None):
            with counter.lock:
                counter.requests += 1
            super().send_response(code, message)

    handler = partial(Handler, directory=str(site))
    return build.SiteServer(("127.0.0.1", 0), handler)


def ensure_site(build) -> Path:
    if not build.site_is_current(build.SITE):
        subprocess.run([sys.executable, str(ROOT / "build.py")], check=True)
    return build.SITE


def wait_attr(page, selector, timeout_s):
    page.wait_for_selector(selector, state="attached", timeout=timeout_s * 1000)


def visit_calc(context, url, timeout_s):
    page = context.new_page()
    page.goto(url)
    wait_attr(page, 'body[data-engine="ready"]', timeout_s)
    # the first live result follows ready; give it a moment to land
    deadline = time.monotonic() + timeout_s
    marks = {}
    while time.monotonic() < deadline:
        marks = page.evaluate("() => window.__benchMarks")
        if marks.get("firstLive") is not None:
            break
        time.sleep(0.02)
    return page, marks


def edit_latencies(page, field, values, timeout_s):
    selector = f"#f-{field}"
    page_ms, wall_ms = [], []
    for value in values:
        seq = int(page.get_attribute("#result", "data-result-seq") or 0)
        t0 = time.perf_counter()
        page.fill(selector, value)
        wait_attr(page, f'#result[data-result-seq="{seq + 1}"]', timeout_s)
        wall_ms.append((time.perf_counter() - t0) * 1000)
        latency = page.get_attribute("#result", "data-latency-ms")
        if latency is not None:
            page_ms.append(float(latency))
    return page_ms, wall_ms


def pct(values, q):
    if not values:
        return float("nan")
    ordered = sorted(values)
    k = max(0, min(len(ordered) - 1, round(q / 100 * (len(ordered) - 1))))
    return ordered[k]


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--page", default="convert.html", help="calculator page to load")
    parser.add_argument("--field", default="potential", help="text field to edit")
    parser.add_argument("--value", default="-0.{n:03d} V",
                        help="format of the edited values; {n} counts from 500")
    parser.add_argument("--edits", type=int, default=50)
    parser.add_argument("--timeout", type=float, default=120.0, help="seconds per wait")
    parser.add_argument("--markdown", action="store_true",
                        help="also print the figures as a Markdown table (for the README)")
    parser.add_argument("--site", type=Path, default=None,
                        help="benchmark this built site folder instead of site/ (implies --no-build)")
    parser.add_argument("--no-build", action="store_true",
                        help="benchmark site/ as it is, even if an input changed since it was built")
    args = parser.parse_args(argv)

    from playwright.sync_api import sync_playwright

    build = load_build()
    if args.site is not None:
        site = args.site.resolve()
    else:
        site = build.SITE if args.no_build else ensure_site(build)
    bench_dir = Path(tempfile.mkdtemp(prefix="noblegap-bench-"))
    (bench_dir / "boot.html").write_text(BOOT_HTML)
    (bench_dir / "boot.js").write_text(BOOT_JS)
    (bench_dir / "boot-worker.js").write_text(BOOT_WORKER_JS)

    counter = ByteCounter()
    server = make_server(build, site, bench_dir, counter)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    host, port = server.server_address[:2]
    base = f"http://{host}:{port}/"
    blocked = []

    def note_foreign(request):
        if not request.url.startswith((base, "data:", "blob:")):
            blocked.append(request.url)

    results = {}
    try:
        with sync_playwright() as p:
            browser = p.chromium.launch(executable_path=CHROMIUM, args=CHROMIUM_ARGS)

            # 1. bare Pyodide boot, cold profile
            ctx = browser.new_context(service_workers="block")
            ctx.on("request", note_foreign)
            page = ctx.new_page()
            page.goto(base + BENCH_PREFIX.lstrip("/") + "boot.html")
            wait_attr(page, "body[data-done]", args.timeout)
            if page.get_attribute("body", "data-done") != "ok":
                raise RuntimeError("bare Pyodide boot failed in the bench page")
            results["bare_boot_ms"] = float(page.get_attribute("body", "data-boot-ms"))
            ctx.close()

            # 2. first visit, cold profile
            ctx = browser.new_context()
            ctx.on("request", note_foreign)
            ctx.add_init_script(TIMING_INIT_SCRIPT)
            counter.reset()
            page, marks = visit_calc(ctx, base + args.page, args.timeout)
            results["ready_ms"] = marks.get("ready")
            results["first_live_ms"] = marks.get("firstLive")
            results["first_phases"] = {"worker created": marks.get("workerCreated"),
                                       **(marks.get("phases") or {})}
            # let the service worker finish precaching before counting bytes
            page.evaluate("async () => { await navigator.serviceWorker.ready; }")
            deadline = time.monotonic() + args.timeout
            while time.monotonic() < deadline and not page.evaluate(
                    "() => !!navigator.serviceWorker.controller"):
                time.sleep(0.05)
            time.sleep(0.5)
            results["first_visit_bytes"] = counter.bytes
            results["first_visit_requests"] = counter.requests

            # 3. input-to-DOM latency
            values = [args.value.format(n=500 + i) for i in range(args.edits)]
            page_ms, wall_ms = edit_latencies(page, args.field, values, args.timeout)
            results["latency_page_ms"] = page_ms
            results["latency_wall_ms"] = wall_ms
            page.close()

            # 4. second visit, service worker in control
            counter.reset()
            page, marks = visit_calc(ctx, base + args.page, args.timeout)
            results["second_ready_ms"] = marks.get("ready")
            results["second_first_live_ms"] = marks.get("firstLive")
            results["second_phases"] = {"worker created": marks.get("workerCreated"),
                                        **(marks.get("phases") or {})}
            results["second_visit_bytes"] = counter.bytes
            results["second_visit_requests"] = counter.requests
            page.close()
            ctx.close()
            browser.close()
    finally:
        server.shutdown()
        server.server_close()
        shutil.rmtree(bench_dir, ignore_errors=True)

    r = results
    page_ms, wall_ms = r["latency_page_ms"], r["latency_wall_ms"]
    print(f"site: {site}  page: {args.page}  edits: {args.edits}")
    print(f"bare Pyodide boot (cold)           {r['bare_boot_ms']:9.0f} ms")
    print(f"engine ready, first visit          {r['ready_ms']:9.0f} ms")
    if r["first_live_ms"] is not None:
        print(f"first live result, first visit     {r['first_live_ms']:9.0f} ms")
    for key, label in (("first_phases", "first visit"), ("second_phases", "second visit")):
        phases = ", ".join(f"{k} {v:.0f}" for k, v in r[key].items() if v is not None)
        print(f"  {label} phases (ms since navigation): {phases}")
    print(f"engine ready, second visit         {r['second_ready_ms']:9.0f} ms")
    if page_ms:
        print(f"input-to-DOM latency (page)  p50 {pct(page_ms, 50):7.1f} ms   p95 {pct(page_ms, 95):7.1f} ms")
    print(f"input-to-DOM latency (wall)  p50 {pct(wall_ms, 50):7.1f} ms   p95 {pct(wall_ms, 95):7.1f} ms"
          f"   mean {statistics.fmean(wall_ms):.1f} ms")
    print(f"first visit bytes                  {r['first_visit_bytes']:9d} B in {r['first_visit_requests']} responses")
    print(f"second visit bytes                 {r['second_visit_bytes']:9d} B in {r['second_visit_requests']} responses")
    print("ratios:")
    print(f"  engine ready / bare boot          {r['ready_ms'] / r['bare_boot_ms']:.2f}")
    print(f"  second-visit ready / first-visit  {r['second_ready_ms'] / r['ready_ms']:.2f}")
    print(f"  second-visit bytes / first-visit  {r['second_visit_bytes'] / max(1, r['first_visit_bytes']):.4f}")
    if args.markdown:
        rows = [
            ("Bare Pyodide boot, cold", f"{r['bare_boot_ms'] / 1000:.2f} s"),
            ("Engine ready, first visit", f"{r['ready_ms'] / 1000:.2f} s"),
            ("First live result, first visit",
             f"{r['first_live_ms'] / 1000:.2f} s" if r["first_live_ms"] is not None else "n/a"),
            ("Engine ready, second visit (offline cache)", f"{r['second_ready_ms'] / 1000:.2f} s"),
            ("Input to result on screen, p50 / p95",
             f"{pct(page_ms or wall_ms, 50):.0f} / {pct(page_ms or wall_ms, 95):.0f} ms"),
            ("Bytes, first visit", f"{r['first_visit_bytes'] / 1e6:.1f} MB"),
            ("Bytes, second visit", f"{r['second_visit_bytes'] / 1e3:.1f} kB"),
            ("Engine ready / bare boot", f"{r['ready_ms'] / r['bare_boot_ms']:.2f}"),
        ]
        print()
        print("| measure | value |")
        print("| --- | --- |")
        for name, value in rows:
            print(f"| {name} | {value} |")
    if blocked:
        print(f"{len(blocked)} request(s) to other origins (not resolved): {blocked[:5]}")
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
