// Which members of Pyodide's python_stdlib.zip the site can ever import.
//
// usage: node site_build/faststart/stdlib_closure.mjs PYODIDE_DIR LOCK_FILE
//
// Boots the pinned Pyodide from PYODIDE_DIR (the npm package's files, full
// standard library), loads the engine's packages from LOCK_FILE the normal
// way (every wheel checked against the lock's sha256), then runs
// stdlib_closure.py (beside this file), which imports and exercises the engine and
// follows every import statement to a fixed point. Prints its JSON.
import { createHash } from "node:crypto";
import { readFile } from "node:fs/promises";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

if (process.argv.length !== 4) {
  console.error("usage: node site_build/faststart/stdlib_closure.mjs PYODIDE_DIR LOCK_FILE");
  process.exit(2);
}
const [pyodideDir, lockFile] = process.argv.slice(2).map((p) => resolve(p));
const lock = JSON.parse(await readFile(lockFile, "utf8"));
for (const pkg of Object.values(lock.packages)) {
  const data = await readFile(join(dirname(lockFile), pkg.file_name));
  const digest = createHash("sha256").update(data).digest("hex");
  if (digest !== pkg.sha256) {
    console.error(`${pkg.file_name}: sha256 ${digest} does not match the lock file (${pkg.sha256})`);
    process.exit(1);
  }
}
const { loadPyodide } = await import(pathToFileURL(join(pyodideDir, "pyodide.mjs")).href);
const py = await loadPyodide({
  indexURL: pyodideDir + "/",
  lockFileURL: lockFile,
  stdout: (msg) => console.error(msg),
  stderr: (msg) => console.error(msg),
});
const failures = [];
// Every package of the lock, also those the page loads only when needed
// (segno, for a printed sheet's QR code), so their imports are followed too.
await py.loadPackage(Object.keys(lock.packages), { messageCallback: () => {}, errorCallback: (m) => failures.push(m) });
if (failures.length) {
  console.error(failures.join("\n"));
  process.exit(1);
}
const here = dirname(fileURLToPath(import.meta.url));
let out = "";
py.setStdout({ batched: (line) => (out += line + "\n") });
py.runPython(await readFile(join(here, "stdlib_closure.py"), "utf8"));
process.stdout.write(out.trim().split("\n").pop() + "\n");
