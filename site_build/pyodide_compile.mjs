// Byte-compile pure-Python wheels inside Pyodide under Node.
//
// usage: node tools/pyodide_compile.mjs JOB.json
//
// JOB.json: {"pyodide_dir": "...", "out_dir": "...",
//            "wheels": [{"path": "x-1.0-py3-none-any.whl", "drop": ["x/tests/"]}]}
//
// Loads Pyodide from pyodide_dir (the files extracted from the pinned npm
// package), runs tools/pyc_wheel.py in it, and writes one compiled wheel per
// input into out_dir. Prints one JSON object on stdout:
//   {"python": "3.14.2", "magic": "2b0e0d0a", "wheels": {"in.whl": "out.whl"}}
import { readFile, writeFile, mkdir } from "node:fs/promises";
import { basename, dirname, join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

if (process.argv.length !== 3) {
  console.error("usage: node tools/pyodide_compile.mjs JOB.json");
  process.exit(2);
}
const job = JSON.parse(await readFile(process.argv[2], "utf8"));
const here = dirname(fileURLToPath(import.meta.url));
const pyodideDir = resolve(job.pyodide_dir);
const { loadPyodide } = await import(pathToFileURL(join(pyodideDir, "pyodide.mjs")).href);
const py = await loadPyodide({
  indexURL: pyodideDir + "/",
  stdout: (msg) => console.error(msg),
  stderr: (msg) => console.error(msg),
});
const ns = py.globals.get("dict")();
py.runPython(await readFile(join(here, "pyc_wheel.py"), "utf8"), {
  globals: ns,
  filename: "pyc_wheel.py",
});
const compileWheel = ns.get("compile_wheel");
py.FS.mkdirTree("/tmp/in");
py.FS.mkdirTree("/tmp/out");
await mkdir(job.out_dir, { recursive: true });
const mapping = {};
for (const wheel of job.wheels) {
  const name = basename(wheel.path);
  py.FS.writeFile(`/tmp/in/${name}`, await readFile(wheel.path));
  const drop = py.toPy(wheel.drop || []);
  const outName = compileWheel(`/tmp/in/${name}`, "/tmp/out", drop);
  drop.destroy();
  await writeFile(join(job.out_dir, outName), py.FS.readFile(`/tmp/out/${outName}`));
  py.FS.unlink(`/tmp/in/${name}`);
  py.FS.unlink(`/tmp/out/${outName}`);
  mapping[name] = outName;
}
compileWheel.destroy();
ns.destroy();
const util = py.pyimport("importlib.util");
const magicProxy = util.MAGIC_NUMBER;
const magic = Buffer.from(magicProxy.toJs ? magicProxy.toJs() : magicProxy).toString("hex");
util.destroy();
const sys = py.pyimport("sys");
const version = `${sys.version_info.major}.${sys.version_info.minor}.${sys.version_info.micro}`;
sys.destroy();
process.stdout.write(JSON.stringify({ python: version, magic, wheels: mapping }) + "\n");
