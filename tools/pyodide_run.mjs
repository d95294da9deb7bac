// Run calculator cases inside Pyodide under Node, loading the built site the
// way the browser worker does (site/static/engine.mjs: same runtime files,
// same lock file, same wheels).
//
// usage: node tools/pyodide_run.mjs SITE_DIR CASES.json
//
// CASES.json is a list of {"calc", "inputs"}. Prints one JSON object:
//   {"python": "3.14.2", "timings": {...}, "results": [api.run(...) per case]}
// Node reads local files without the browser's Subresource Integrity check,
// so this runner checks every wheel's sha256 against the lock file first.
import { createHash } from "node:crypto";
import { readFile } from "node:fs/promises";
import { join, resolve } from "node:path";
import { pathToFileURL } from "node:url";

if (process.argv.length !== 4) {
  console.error("usage: node tools/pyodide_run.mjs SITE_DIR CASES.json");
  process.exit(2);
}
const site = resolve(process.argv[2]);
const cases = JSON.parse(await readFile(process.argv[3], "utf8"));
const lockPath = join(site, "packages", "noblegap-lock.json");
const lock = JSON.parse(await readFile(lockPath, "utf8"));
for (const pkg of Object.values(lock.packages)) {
  const data = await readFile(join(site, "packages", pkg.file_name));
  const digest = createHash("sha256").update(data).digest("hex");
  if (digest !== pkg.sha256) {
    console.error(`${pkg.file_name}: sha256 ${digest} does not match the lock file (${pkg.sha256})`);
    process.exit(1);
  }
}

const { startEngine } = await import(pathToFileURL(join(site, "static", "engine.mjs")).href);
const engine = await startEngine({
  indexURL: join(site, "pyodide") + "/",
  lockFileURL: lockPath,
  stdout: (msg) => console.error(msg),
  stderr: (msg) => console.error(msg),
});
const results = cases.map((c) => engine.run(c.calc, c.inputs));
const sys = engine.pyodide.pyimport("sys");
const python = `${sys.version_info.major}.${sys.version_info.minor}.${sys.version_info.micro}`;
sys.destroy();
process.stdout.write(JSON.stringify({ python, timings: engine.timings, results }) + "\n");
