"""Start-up and latency benchmark of the built site in headless Chromium.

    python3 bench/bench.py [--page convert.html] [--field potential] [--edits 50]

    python3 bench/bench.py --markdown > /tmp/bench-result.md

Run by hand, not by the test suite. In one Chromium run, against a local
server of site/ that counts every byte it sends:

1. bare Pyodide boot: a bench-only page whose module worker just calls
   loadPyodide() from the same site/pyodide files (fresh profile);
2. first visit of a calculator page (fresh profile): engine ready (and in
   which mode: memory snapshot or normal start), first live result, bytes
   sent until the service worker has precached the site;
3. input-to-DOM latency over N edits of one field (the page's own
   ``data-latency-ms`` and the wall clock seen from here);
4. second visit (same profile, service worker installed): engine ready and
   bytes sent.

The server answers with ``Content-Encoding: gzip`` when the browser asks for
it, for every file that is not compressed already (the snapshot, wheels,
python_stdlib.zip and PNGs go as they are), so the byte counts are what a
compressing host transfers; it also adds up the uncompressed bodies, which is
what a plain static host without compression would send. The bare Pyodide
core (pyodide.mjs, pyodide.asm.mjs, pyodide.asm.wasm and the npm package's
full python_stdlib.zip, which the site does not ship: it ships only the
members it can import, noblegap-stdlib.zip) is measured the same two ways,
and the bare boot loads that full standard library.

Targets (printed with each figure): first live result <= 0.3 x bare boot;
input-to-DOM p95 <= 16 ms; first-visit compressed bytes <= 2.0 x the bare
core compressed; second visit 0 bytes. The foundation's: engine ready <=
1.3 x bare boot, input-to-DOM p95 <= 50 ms.

The bench page lives in a temporary folder served at /__bench/; nothing is
added to site/. The page script marks ``body[data-engine="ready"]`` and
bumps ``#result[data-result-seq]`` on each render; this script waits on
those attributes.
"""

from __future__ import annotations

import argparse
import datetime
import email.utils
import gzip
import os
import platform
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
# Already compressed: sent as they are even to a browser that accepts gzip.
PRECOMPRESSED = (".gzip", ".gz", ".zip", ".whl", ".png")
PYODIDE_CORE = ("pyodide.mjs", "pyodide.asm.mjs", "pyodide.asm.wasm")
# The npm package's full standard library: part of the bare core, served
# from the bench folder (the site ships its own subset instead).
OFFICIAL_STDLIB = "python_stdlib.zip"
GZIP_LEVEL = 9

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
    stdLibURL: new URL("python_stdlib.zip", import.meta.url).href,
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
    """The build's stages the bench uses, under the names it uses."""
    import types

    if str(ROOT) not in sys.path:
        sys.path.insert(0, str(ROOT))
    from site_build import offline, paths, runtime, serve
    from site_build.__main__ import build_options

    return types.SimpleNamespace(
        SITE=paths.SITE, SiteHandler=serve.SiteHandler, SiteServer=serve.SiteServer,
        fetch_pyodide=runtime.fetch_pyodide, load_pyodide_pin=paths.load_pyodide_pin,
        site_is_current=lambda site: offline.site_is_current(site, build_options()),
    )


class ByteCounter:
    """Bytes on the wire (``bytes``) and the same bodies uncompressed (``raw``)."""

    def __init__(self):
        self.lock = threading.Lock()
        self.reset()

    def add(self, wire, raw):
        with self.lock:
            self.bytes += wire
            self.raw += raw

    def reset(self):
        with getattr(self, "lock", threading.Lock()):
            self.bytes = 0
            self.raw = 0
            self.requests = 0
            self.paths = []


def gzip_bytes(data: bytes) -> bytes:
    return gzip.compress(data, compresslevel=GZIP_LEVEL, mtime=0)


class GzipCache:
    """Compressed bodies, made once per file (the wasm takes a second at level 9)."""

    def __init__(self):
        self.lock = threading.Lock()
        self.bodies = {}

    def get(self, path: str) -> bytes:
        with self.lock:
            body = self.bodies.get(path)
            if body is None:
                body = self.bodies[path] = gzip_bytes(Path(path).read_bytes())
            return body

    def warm(self, site: Path):
        for p in sorted(site.rglob("*")):
            if p.is_file() and not p.name.endswith(PRECOMPRESSED):
                self.get(str(p))


def make_server(build, site: Path, bench_dir: Path, counter: ByteCounter, gz: GzipCache,
                gzip_host: bool = True):
    """The bench's server: a gzip host, or with gzip_host=False a plain one."""

    class Handler(build.SiteHandler):
        def translate_path(self, path):
            if path.startswith(BENCH_PREFIX):
                rel = path[len(BENCH_PREFIX):].split("?", 1)[0]
                return str(bench_dir / rel)
            return super().translate_path(path)

        def _gzip_ok(self, path):
            accept = self.headers.get("Accept-Encoding", "")
            return gzip_host and "gzip" in accept and os.path.isfile(path) and not path.endswith(PRECOMPRESSED)

        def send_head(self):
            path = self.translate_path(self.path)
            if self.command == "GET" and self._gzip_ok(path):
                mtime = int(os.path.getmtime(path))
                since = self.headers.get("If-Modified-Since")
                if since:
                    try:
                        if email.utils.parsedate_to_datetime(since).timestamp() >= mtime:
                            self.send_response(304)
                            self.end_headers()
                            return None
                    except (TypeError, ValueError, IndexError, OverflowError):
                        pass
                body = gz.get(path)
                self.send_response(200)
                self.send_header("Last-Modified", self.date_time_string(mtime))
                self.send_header("Content-Type", self.guess_type(path))
                self.send_header("Content-Encoding", "gzip")
                self.send_header("Content-Length", str(len(body)))
                self.send_header("Vary", "Accept-Encoding")
                self.end_headers()
                self.wfile.write(body)
                counter.add(len(body), os.path.getsize(path))
                return None
            return super().send_head()

        def copyfile(self, source, outputfile):
            while True:
                block = source.read(64 * 1024)
                if not block:
                    break
                outputfile.write(block)
                counter.add(len(block), len(block))

        def send_response(self, code, message=None):
            with counter.lock:
                counter.requests += 1
                counter.paths.append(f"{self.path} {code}")
            super().send_response(code, message)

    handler = partial(Handler, directory=str(site))
    return build.SiteServer(("127.0.0.1", 0), handler)


def core_sizes(site: Path, bench_dir: Path, gz: GzipCache) -> tuple[int, int]:
    """(raw, gzip) bytes of the bare Pyodide core, gzip as this server sends it."""
    raw = comp = 0
    for path in [site / "pyodide" / name for name in PYODIDE_CORE] + [bench_dir / OFFICIAL_STDLIB]:
        name = path.name
        raw += path.stat().st_size
        comp += path.stat().st_size if name.endswith(PRECOMPRESSED) else len(gz.get(str(path)))
    return raw, comp


def machine() -> str:
    cpu = platform.processor() or "unknown CPU"
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                cpu = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    return f"{os.cpu_count()} cores ({len(os.sched_getaffinity(0))} usable), {cpu}, {platform.system()} {platform.release()}"


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
                        help="print only a Markdown report (machine, date, table, what misses its target)")
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
    pyodide_npm = build.fetch_pyodide(build.load_pyodide_pin(), offline=True)
    shutil.copyfile(pyodide_npm / OFFICIAL_STDLIB, bench_dir / OFFICIAL_STDLIB)

    counter = ByteCounter()
    gz = GzipCache()
    gz.warm(site)
    core_raw, core_gzip = core_sizes(site, bench_dir, gz)
    server = make_server(build, site, bench_dir, counter, gz)
    thread = threading.Thread(target=server.serve_forever, daemon=True)
    thread.start()
    host, port = server.server_address[:2]
    base = f"http://{host}:{port}/"
    blocked = []

    def note_foreign(request):
        if not request.url.startswith((base, "data:", "blob:")):
            blocked.append(request.url)

    r = {}
    try:
        with sync_playwright() as p:
            # Each measurement gets a fresh on-disk profile, as a real
            # browser has: its HTTP cache keeps the large files, so the
            # service worker's precache revalidates them (304) instead of
            # downloading them again, which an in-memory profile would.
            def fresh_context(**kw):
                return p.chromium.launch_persistent_context(
                    tempfile.mkdtemp(prefix="profile-", dir=bench_dir), executable_path=CHROMIUM,
                    args=CHROMIUM_ARGS, **kw)

            # 1. bare Pyodide boot, cold profile
            ctx = fresh_context(service_workers="block")
            ctx.on("request", note_foreign)
            page = ctx.new_page()
            page.goto(base + BENCH_PREFIX.lstrip("/") + "boot.html")
            wait_attr(page, "body[data-done]", args.timeout)
            if page.get_attribute("body", "data-done") != "ok":
                raise RuntimeError("bare Pyodide boot failed in the bench page")
            r["bare_boot_ms"] = float(page.get_attribute("body", "data-boot-ms"))
            ctx.close()

            # 2. first visit, cold profile
            ctx = fresh_context()
            ctx.on("request", note_foreign)
            ctx.add_init_script(TIMING_INIT_SCRIPT)
            counter.reset()
            page, marks = visit_calc(ctx, base + args.page, args.timeout)
            r["mode"] = page.get_attribute("body", "data-engine-mode")
            r["status"] = page.inner_text("#engine-status")
            r["ready_ms"] = marks.get("ready")
            r["first_live_ms"] = marks.get("firstLive")
            r["first_phases"] = {"worker created": marks.get("workerCreated"), **(marks.get("phases") or {})}
            r["worker_timings"] = marks.get("workerTimings") or {}
            # the service worker registers after the engine is ready; count
            # bytes until it has precached the site and is active
            page.evaluate("async () => { await navigator.serviceWorker.ready; }")
            time.sleep(0.5)
            r["first_bytes"], r["first_raw"], r["first_requests"] = counter.bytes, counter.raw, counter.requests
            counter_paths = list(counter.paths)

            # 3. input-to-DOM latency
            values = [args.value.format(n=500 + i) for i in range(args.edits)]
            page_ms, wall_ms = edit_latencies(page, args.field, values, args.timeout)
            r["latency_page_ms"], r["latency_wall_ms"] = page_ms, wall_ms
            page.close()

            # 4. second visit, service worker in control
            counter.reset()
            page, marks = visit_calc(ctx, base + args.page, args.timeout)
            r["second_mode"] = page.get_attribute("body", "data-engine-mode")
            r["second_ready_ms"] = marks.get("ready")
            r["second_first_live_ms"] = marks.get("firstLive")
            r["second_phases"] = {"worker created": marks.get("workerCreated"), **(marks.get("phases") or {})}
            r["second_bytes"], r["second_requests"] = counter.bytes, counter.requests
            page.close()
            ctx.close()
    finally:
        server.shutdown()
        server.server_close()
        shutil.rmtree(bench_dir, ignore_errors=True)

    page_ms, wall_ms = r["latency_page_ms"], r["latency_wall_ms"]
    lat = page_ms or wall_ms
    bare = r["bare_boot_ms"]
    first_live = r["first_live_ms"] if r["first_live_ms"] is not None else float("nan")
    MB = 1e6
    checks = [
        # (measure, value text, ratio/value, target text, ok)
        ("First live result / bare Pyodide boot", f"{first_live / bare:.2f}", first_live / bare <= 0.3, "<= 0.30"),
        ("Engine ready / bare Pyodide boot", f"{r['ready_ms'] / bare:.2f}", r["ready_ms"] / bare <= 1.3, "<= 1.30 (foundation)"),
        ("Input-to-DOM p95", f"{pct(lat, 95):.1f} ms", pct(lat, 95) <= 16, "<= 16 ms"),
        ("Input-to-DOM p95 (foundation)", f"{pct(lat, 95):.1f} ms", pct(lat, 95) <= 50, "<= 50 ms"),
        ("First-visit bytes, compressed / bare core compressed", f"{r['first_bytes'] / core_gzip:.2f}",
         r["first_bytes"] / core_gzip <= 2.0, "<= 2.00"),
        ("Second-visit bytes from the network", f"{r['second_bytes']} B", r["second_bytes"] == 0, "0 B"),
    ]
    rows = [
        ("Bare Pyodide boot, cold", f"{bare / 1000:.2f} s"),
        (f"Engine ready, first visit (mode: {r['mode']})", f"{r['ready_ms'] / 1000:.2f} s"),
        ("First live result, first visit", f"{first_live / 1000:.2f} s"),
        (f"Engine ready, second visit (mode: {r['second_mode']})", f"{r['second_ready_ms'] / 1000:.2f} s"),
        ("First live result, second visit",
         f"{r['second_first_live_ms'] / 1000:.2f} s" if r["second_first_live_ms"] is not None else "n/a"),
        (f"Input to result on screen, p50 / p95 ({len(lat)} edits)", f"{pct(lat, 50):.1f} / {pct(lat, 95):.1f} ms"),
        ("Input to result, wall clock via Playwright, p50 / p95",
         f"{pct(wall_ms, 50):.1f} / {pct(wall_ms, 95):.1f} ms"),
        ("Bare Pyodide core, raw / gzip", f"{core_raw / MB:.2f} / {core_gzip / MB:.2f} MB"),
        ("First visit, transferred (gzip host)", f"{r['first_bytes'] / MB:.2f} MB in {r['first_requests']} responses"),
        ("First visit, plain host without compression", f"{r['first_raw'] / MB:.2f} MB"),
        ("First visit raw / bare core raw", f"{r['first_raw'] / core_raw:.2f}"),
        ("Second visit, transferred", f"{r['second_bytes']} B in {r['second_requests']} responses"),
    ]
    phases = {key: ", ".join(f"{k} {v:.0f}" for k, v in r[key].items() if v is not None)
              for key in ("first_phases", "second_phases")}
    misses = [c for c in checks if not c[2]]

    if args.markdown:
        print(f"# noblegap start-up benchmark\n")
        print(f"- date: {datetime.datetime.now().astimezone().isoformat(timespec='seconds')}")
        print(f"- machine: {machine()}")
        print(f"- Chromium headless (Playwright), loopback server; page `{args.page}`, field `{args.field}`")
        print(f"- engine status after start: \"{r['status']}\"\n")
        print("| measure | value |")
        print("| --- | --- |")
        for name, value in rows:
            print(f"| {name} | {value} |")
        print("\n| target | reached | goal | met |")
        print("| --- | --- | --- | --- |")
        for name, value, ok, goal in checks:
            print(f"| {name} | {value} | {goal} | {'yes' if ok else '**no**'} |")
        print(f"\nPhases, ms since navigation (first visit): {phases['first_phases']}  ")
        print(f"Phases, ms since navigation (second visit): {phases['second_phases']}")
    else:
        print(f"site: {site}  page: {args.page}  edits: {args.edits}")
        print(f"machine: {machine()}")
        for name, value in rows:
            print(f"{name:58s} {value}")
        print(f"  first visit phases (ms since navigation): {phases['first_phases']}")
        print(f"  second visit phases (ms since navigation): {phases['second_phases']}")
        print(f"  worker timings (ms since worker start): "
              + ", ".join(f"{k} {v:.0f}" for k, v in r["worker_timings"].items()))
        print(f"  latencies (page, ms, in edit order): {', '.join(f'{v:.0f}' for v in lat)}")
        print(f"  first-visit responses: {len(counter_paths)}; repeated paths: {sorted({x for x in counter_paths if counter_paths.count(x) > 1})}")
        print("targets:")
        for name, value, ok, goal in checks:
            print(f"  {name:58s} {value:>10s}  goal {goal:22s} {'ok' if ok else 'MISSED'}")
    if blocked:
        print(f"{len(blocked)} request(s) to other origins (not resolved): {blocked[:5]}")
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
