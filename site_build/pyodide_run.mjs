// Run calculator cases inside Pyodide under Node, loading the built site the
// way the browser worker does (site/static/engine/: same runtime files,
// same lock file, same wheels, same memory snapshot).
//
// usage: node site_build/pyodide_run.mjs [--mode normal|snapshot] SITE_DIR CASES.json
//
//   --mode normal    (default) loadPyodide + loadPackage from the lock file
//   --mode snapshot  the fast start: restore the build's memory snapshot;
//                    exits 1 if the engine fell back to the normal start
//
// CASES.json is a list of {"calc", "inputs"}. Prints one JSON object:
//   {"python": "3.14.2", "mode": "...", "note": ..., "random": random.random(), "timings": {...},
//    "results": [api.run(...) per case]}
// Node reads local files without the browser's Subresource Integrity check,
// so this runner checks every wheel's sha256 against the lock file first,
// and the fetch it hands the engine checks any integrity it is asked for.
import { createHash } from "node:crypto";
import { readFile } from "node:fs/promises";
import { join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const argv = process.argv.slice(2);
let mode = "normal";
if (argv[0] === "--mode") {
  mode = argv[1];
  argv.splice(0, 2);
}
if (argv.length !== 2 || !["normal", "snapshot"].includes(mode)) {
  console.error("usage: node site_build/pyodide_run.mjs [--mode normal|snapshot] SITE_DIR CASES.json");
  process.exit(2);
}
const site = resolve(argv[0]);
const cases = JSON.parse(await readFile(argv[1], "utf8"));
const engineDir = join(site, "static", "engine");
const NAMES = JSON.parse(await readFile(join(engineDir, "names.json"), "utf8"));
const lockPath = join(site, NAMES.packages_dir, NAMES.lock_file);
const lock = JSON.parse(await readFile(lockPath, "utf8"));
for (const pkg of Object.values(lock.packages)) {
  const data = await readFile(join(site, NAMES.packages_dir, pkg.file_name));
  const digest = createHash("sha256").update(data).digest("hex");
  if (digest !== pkg.sha256) {
    console.error(`${pkg.file_name}: sha256 ${digest} does not match the lock file (${pkg.sha256})`);
    process.exit(1);
  }
}

// fetch for local files, with the integrity check a browser would make.
async function fileFetch(url, init = {}) {
  const path = String(url).startsWith("file:") ? fileURLToPath(url) : String(url);
  let data;
  try {
    data = await readFile(path);
  } catch {
    return new Response(null, { status: 404 });
  }
  if (init.integrity) {
    const [algorithm, expected] = init.integrity.split(/-(.*)/s);
    const actual = createHash(algorithm).update(data).digest("base64");
    if (actual !== expected) throw new TypeError(`${path}: integrity check failed`);
  }
  return new Response(data);
}

if (mode === "snapshot" && !NAMES.faststart) {
  console.error(`${site} was built without the fast start (python3 build.py --no-faststart)`);
  process.exit(1);
}
const { startEngine } = await import(pathToFileURL(join(engineDir, "engine.mjs")).href);
const engine = await startEngine({
  indexURL: join(site, NAMES.pyodide_dir) + "/",
  lockFileURL: lockPath,
  faststart: mode === "snapshot" ? import(pathToFileURL(join(engineDir, "faststart", "start.mjs")).href) : false,
  snapshotInfoURL:
    mode === "snapshot" ? pathToFileURL(join(site, NAMES.packages_dir, NAMES.faststart.info_file)).href : undefined,
  fetch: fileFetch,
  stdout: (msg) => console.error(msg),
  stderr: (msg) => console.error(msg),
});
const wanted = mode === "snapshot" ? NAMES.modes.faststart : NAMES.modes.normal;
if (engine.mode !== wanted) {
  console.error(`asked for mode ${mode}, the engine started in mode ${engine.mode} (${engine.note ?? ""})`);
  process.exit(1);
}
const results = cases.map((c) => engine.run(c.calc, c.inputs));
// The next number of Python's random module: differs between two restores
// of the same snapshot only if the engine re-seeded it.
const randomModule = engine.pyodide.pyimport("random");
const random = randomModule.random();
randomModule.destroy();
const sys = engine.pyodide.pyimport("sys");
const info = sys.version_info;
const python = `${info.major}.${info.minor}.${info.micro}`;
info.destroy();
sys.destroy();
process.stdout.write(
  JSON.stringify({ python, mode: engine.mode, note: engine.note ?? null, random, timings: engine.timings, results }) + "\n",
);
