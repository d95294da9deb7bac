// Time the galvanic-cell model inside Pyodide under Node (the same WebAssembly
// engine and V8 as Chromium), without the page around it.
//
// usage: node bench/cell_core.mjs [SITE_DIR]     (default: site/)
//
// Prints p50 / p95 in ms of: one assessment with its low / likely / high cases
// (methods.galvanic.assess, one couple: 3 cell solves with their spread
// iterations), and api.run of each galvanic page's example (fastener and joint
// also re-assess every alternative alloy and mitigation); the core's memory of
// recent cases (galvanic.solve_case) is cleared before each timed call, and a
// site built before it existed is timed the same way. Target (issue 16):
// one calculation, uncertainty included, <= 16 ms p95 in the browser.
import { existsSync } from "node:fs";
import { readFile } from "node:fs/promises";
import { join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const site = resolve(process.argv[2] ?? "site");
const lockPath = join(site, "packages", "noblegap-lock.json");

async function fileFetch(url) {
  const path = String(url).startsWith("file:") ? fileURLToPath(url) : String(url);
  try {
    return new Response(await readFile(path));
  } catch {
    return new Response(null, { status: 404 });
  }
}

const engineModule = ["static/engine.mjs", "static/engine/engine.mjs"]
  .map((p) => join(site, p)).find((p) => existsSync(p));
const { startEngine } = await import(pathToFileURL(engineModule).href);
const engine = await startEngine({
  indexURL: join(site, "pyodide") + "/",
  lockFileURL: lockPath,
  snapshotInfoURL: false,
  fetch: fileFetch,
  stdout: (msg) => console.error(msg),
  stderr: (msg) => console.error(msg),
});
const out = engine.pyodide.runPython(`
import json, math, time
from noblegap import api
from noblegap.methods import galvanic

def pct(v, q):
    v = sorted(v)
    return v[max(0, min(len(v) - 1, round(q / 100 * (len(v) - 1))))]

rows = {}
# every timed call starts without the core's memory of recent cases
forget = getattr(getattr(galvanic, "_solve_case", None), "cache_clear", lambda: None)
lay = galvanic.Layout("anode", 1, math.pi * 25e-6, 10.0, 5e-3, surrounds=False)
lay_f = galvanic.Layout("cathode", 12, 12 * 1.7e-3, 0.96, 0.01, 2)
for name, args, layout in (
        ("one assessment: 10 mm holiday, steel/bronze, seawater",
         ("carbon_steel", "C95800", "seawater_flowing"), lay),
        ("one assessment: 12 bolts 316 in 5083, CX film",
         ("S31600", "A95083", "CX"), lay_f)):
    galvanic.assess(*args, lambda r, l=layout: l, allowance_of=lambda a: (6e-4, None))
    ts = []
    for _ in range(100):
        forget()
        t0 = time.perf_counter()
        galvanic.assess(*args, lambda r, l=layout: l, allowance_of=lambda a: (6e-4, None))
        ts.append((time.perf_counter() - t0) * 1000)
    rows[name] = ts
for calc in ("holiday", "joint", "fastener"):
    ex = api.get(calc).example
    api.run(calc, ex)
    ts = []
    for _ in range(30):
        forget()
        t0 = time.perf_counter()
        api.run(calc, ex)
        ts.append((time.perf_counter() - t0) * 1000)
    rows[f"{calc} page, whole result (api.run)"] = ts
json.dumps({k: [len(v), pct(v, 50), pct(v, 95), min(v)] for k, v in rows.items()})
`);
// min: the least a call took (on a loaded machine the other figures carry the load)
console.log(`${"what (Pyodide under Node)".padEnd(58)}    n   min ms   p50 ms   p95 ms  target p95 <= 16 ms`);
for (const [k, [n, p50, p95, lo]] of Object.entries(JSON.parse(out))) {
  console.log(`${k.padEnd(58)} ${String(n).padStart(4)} ${lo.toFixed(1).padStart(8)} ${p50.toFixed(1).padStart(8)} ${p95.toFixed(1).padStart(8)}`);
}
