// Byte-compile pure-Python wheels inside Pyodide under Node.
//
// usage: node tools/pyodide_compile.mjs PYODIDE_DIR OUT_DIR WHEEL...
//
// Loads Pyodide from PYODIDE_DIR (the files extracted from the pinned npm
// package), runs tools/pyc_wheel.py in it, and writes one compiled wheel per
// input into OUT_DIR. Prints one JSON object on stdout:
//   {"python": "3.14.2", "magic": "...", "wheels": {"in.whl": "out.whl"}}
import { readFile, writeFile, mkdir } from "node:fs/promises";
import { basename, dirname, join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const [pyodideDir, outDir, ...wheels] = process.argv.slice(2);
if (!pyodideDir || !outDir || wheels.length === 0) {
  console.error("usage: node tools/pyodide_compile.mjs PYODIDE_DIR OUT_DIR WHEEL...");
  process.exit(2);
}
const here = dirname(fileURLToPath(import.meta.url));
const { loadPyodide } = await import(pathToFileURL(join(resolve(pyodideDir), "pyodide.mjs")).href);
const py = await loadPyodide({
  indexURL: resolve(pyodideDir) + "/",
  stdout: (msg) => console.error(msg),
  stderr: (msg) => console.error(msg),
});
const script = await readFile(join(here, "pyc_wheel.py"), "utf8");
const ns = py.globals.get("dict")();
py.runPython(script, { globals: ns, filename: "pyc_wheel.py" });
const compileWheel = ns.get("compile_wheel");
py.FS.mkdirTree("/tmp/in");
py.FS.mkdirTree("/tmp/out");
await mkdir(outDir, { recursive: true });
const mapping = {};
for (const wheel of wheels) {
  const name = basename(wheel);
  py.FS.writeFile(`/tmp/in/${name}`, await readFile(wheel));
  const outName = compileWheel(`/tmp/in/${name}`, "/tmp/out");
  await writeFile(join(outDir, outName), py.FS.readFile(`/tmp/out/${outName}`));
  mapping[name] = outName;
}
compileWheel.destroy();
ns.destroy();
const importlibUtil = py.pyimport("importlib.util");
const magic = Buffer.from(importlibUtil.MAGIC_NUMBER.toJs()).toString("hex");
importlibUtil.destroy();
const version = py.runPython("import sys; sys.version.split()[0]");
process.stdout.write(JSON.stringify({ python: version, magic, wheels: mapping }) + "\n");
