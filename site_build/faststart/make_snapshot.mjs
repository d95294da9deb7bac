// Make the engine's Pyodide memory snapshot at build time, under Node.
//
// usage: node site_build/faststart/make_snapshot.mjs JOB.json
//
// JOB.json: {"site_dir": "site.tmp", "files_dir": "...", "files": ["pint/__init__.pyc", ...],
//            "memory_out": ".../memory.bin", "base_out": ".../base.bin", "gaps_out": ".../gaps.bin"}
//
// Boots the site's own Pyodide (site_dir/pyodide) with the private option
// _makeSnapshot, writes the package files (the lock's wheels, unpacked and
// checked by snapshot.py) into site-packages with the same installFiles()
// the browser uses when it restores the snapshot, runs
// noblegap.engine_hooks.warm_up(), and saves pyodide.makeMemorySnapshot()
// to memory_out. base_out gets the heap the runtime's data segments make
// (dataSegmentsImage in static/engine/faststart/restore.mjs) and gaps_out
// the ranges between them (the gap list the browser zeroes in its freshly
// instantiated memory to get the same base): container.py stores the
// snapshot as a delta against the base.
// loadPackage is not used: it leaves JavaScript objects behind that a
// memory snapshot cannot hold.
//
// Prints one JSON object on stdout:
//   {"python": "3.14.2", "pyodide": "314.0.8", "pyodide_build_id": "...",
//    "memory_size": N, "site_packages": "/lib/python3.14/site-packages", "timings": {...}}
import { readFile, writeFile } from "node:fs/promises";
import { join, resolve } from "node:path";
import { pathToFileURL } from "node:url";

if (process.argv.length !== 3) {
  console.error("usage: node tools/make_snapshot.mjs JOB.json");
  process.exit(2);
}
const job = JSON.parse(await readFile(process.argv[2], "utf8"));
const site = resolve(job.site_dir);
const t0 = performance.now();
const { loadPyodide, version } = await import(pathToFileURL(join(site, "pyodide", "pyodide.mjs")).href);
const engineDir = join(site, "static", "engine");
const { NAMES, runtimeOptions } = await import(pathToFileURL(join(engineDir, "engine.mjs")).href);
const { installFiles } = await import(pathToFileURL(join(engineDir, "faststart", "start.mjs")).href);
const { baseFromMemory, captureRuntimeWasm, dataSegmentsGaps, dataSegmentsImage, encodeRuns } = await import(
  pathToFileURL(join(engineDir, "faststart", "restore.mjs")).href
);
const files = await Promise.all(
  job.files.map(async (path) => [path, new Uint8Array(await readFile(join(job.files_dir, path)))]),
);
let sitePackages = null;
let base = null;
let gaps = null;
let fsInitError = null;
const capture = captureRuntimeWasm();
const py = await loadPyodide({
  ...runtimeOptions({
    indexURL: join(site, NAMES.pyodide_dir) + "/",
    lockFileURL: join(site, NAMES.packages_dir, NAMES.lock_file),
    stdout: (msg) => console.error(msg),
    stderr: (msg) => console.error(msg),
  }),
  _makeSnapshot: true,
  // (Pyodide does not await this hook's errors: they are kept and thrown below)
  fsInit: async (FS, info) => {
    sitePackages = info.sitePackages;
    try {
      const memory = capture.memory();
      capture.release();
      const wasm = await capture.bytes;
      if (!wasm || !memory) throw new Error("the runtime's WebAssembly was not seen");
      base = dataSegmentsImage(wasm);
      gaps = dataSegmentsGaps(wasm, base.length);
      // what the browser will do: this runtime's memory, gaps zeroed
      const live = baseFromMemory(memory.buffer, { header: { base: { size: base.length } }, gaps });
      if (live.some((b, i) => b !== base[i])) throw new Error("the runtime's memory differs from its data segments");
    } catch (err) {
      fsInitError = err;
    }
  },
});
capture.release();
if (fsInitError) throw fsInitError;
if (!base) throw new Error("fsInit did not run");
await writeFile(job.base_out, base);
await writeFile(job.gaps_out, encodeRuns(gaps));
const booted = performance.now() - t0;
// After the boot, not in fsInit: files present while Pyodide starts are
// registered as loaded packages, which leaves objects a snapshot cannot hold.
installFiles(py.FS, sitePackages, files);
const importlib = py.pyimport("importlib");
importlib.invalidate_caches();
importlib.destroy();
const hooks = py.pyimport(NAMES.hooks_module);
hooks.warm_up();
// The package files whose modules are imported now: restored with the
// memory, never read again (container.py leaves them out).
const imported = JSON.parse(hooks.imported_package_files(sitePackages));
// Likewise the standard library's members (stdlib.py ships the rest).
const importedStdlib = JSON.parse(hooks.imported_stdlib_members());
hooks.destroy();
const gc = py.pyimport("gc");
gc.collect();
gc.destroy();
const zeroFilled = zeroFreeMemory(py._module);
const warmed = performance.now() - t0;
const python = pythonVersion(py);
const memory = py.makeMemorySnapshot();
await writeFile(job.memory_out, memory);
process.stdout.write(
  JSON.stringify({
    python,
    pyodide: version,
    pyodide_build_id: py._api.config.BUILD_ID,
    memory_size: memory.length,
    site_packages: sitePackages,
    imported_files: imported,
    imported_stdlib: importedStdlib,
    zero_filled: zeroFilled,
    timings: { boot: booted, warm: warmed - booted, total: performance.now() - t0 },
  }) + "\n",
);

// Free heap blocks still hold what the build's imports and warm-up left in
// them (file contents, freed objects); it is never read again, but it would
// be saved and shipped. Claim every free malloc block that lies inside the
// heap already in use (largest first, stopping a size as soon as malloc has
// to extend the heap), zero it and free it again: the memory saves as ~0.9 MB
// less gzip and more all-zero pages. Build-time only.
function zeroFreeMemory(M) {
  const held = [];
  let bytes = 0;
  const heapBefore = M.HEAPU8.length;
  for (const size of [1 << 16, 1 << 14, 1 << 12, 1 << 10, 256, 64, 16, 8]) {
    for (;;) {
      const top = M._sbrk(0) >>> 0;
      const p = M._malloc(size) >>> 0;
      if (!p) break;
      if ((M._sbrk(0) >>> 0) > top) {
        M._free(p);
        break;
      }
      M.HEAPU8.fill(0, p, p + size);
      held.push(p);
      bytes += size;
    }
  }
  for (const p of held) M._free(p);
  // The C stack grows down from its base to its end; below the current
  // stack pointer lie only frames that have returned (the imports' and the
  // warm-up's deepest calls). No C code is running now (this is JavaScript
  // between calls), so nothing reads them again.
  const stackEnd = M._emscripten_stack_get_end() >>> 0;
  const stackPointer = M._emscripten_stack_get_current() >>> 0;
  let stackBytes = 0;
  if (stackEnd < stackPointer && stackPointer <= (M._emscripten_stack_get_base() >>> 0)) {
    for (let i = stackEnd; i < stackPointer; i++) stackBytes += M.HEAPU8[i] !== 0;
    M.HEAPU8.fill(0, stackEnd, stackPointer);
  }
  // The malloc that first needs more heap is freed at once, but if it had to
  // grow the memory, the memory stays larger: all zeros, left out of the
  // container, and only the snapshot's memory size shows it.
  return { bytes, blocks: held.length, heap_grown_by: M.HEAPU8.length - heapBefore, stack: [stackEnd, stackPointer, M._emscripten_stack_get_base() >>> 0, stackBytes] };
}

// "3.14.2": the interpreter's version, every proxy destroyed.
function pythonVersion(py) {
  const sys = py.pyimport("sys");
  const info = sys.version_info;
  const text = `${info.major}.${info.minor}.${info.micro}`;
  info.destroy();
  sys.destroy();
  return text;
}
