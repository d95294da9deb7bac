// Boot Pyodide from the site's own files and call noblegap.api.
//
// Shared by the page's Web Worker (static/worker.js), the Node parity runner
// (tools/pyodide_run.mjs) and the build's snapshot maker
// (tools/make_snapshot.mjs), so tests and build load the engine exactly as
// the browser does. Dicts cross the JS/Python boundary as JSON text only
// (json.loads / json.dumps on the Python side, JSON.parse / JSON.stringify
// here), so no PyProxy outlives a call.
//
// Two ways to start:
//
// * snapshot (the fast start): the build boots Pyodide under Node, installs
//   the engine's packages, imports and warms noblegap and saves the WebAssembly
//   memory (packages/noblegap-snapshot.json names the file and how to check
//   it; static/restore.mjs describes the container). Here the memory is
//   restored instead of starting Python: the runtime is compiled while
//   pyodide.asm.mjs loads and instantiated while the snapshot downloads, its
//   data segments are the base the snapshot is a delta against, the package
//   files the engine may still read go back into site-packages, Python's
//   random state is re-seeded, and a known case must give the answer the
//   build recorded.
// * normal: loadPyodide, loadPackage from the lock file (every wheel checked
//   with Subresource Integrity), import noblegap.api and warm it.
//
// Any failure of the snapshot path (missing or corrupt file, another Pyodide
// or lock file, a wrong answer) falls back to the normal start, visibly: a
// progress message "snapshot unusable — normal start" and the ready message's
// mode "normal" with a note saying why.
import { loadPyodide, version as PYODIDE_VERSION } from "../pyodide/pyodide.mjs";
import {
  SNAPSHOT_FORMAT,
  applyBase,
  applyPages,
  baseFromMemory,
  captureRuntimeWasm,
  parseSnapshot,
  sha256Hex,
} from "./restore.mjs";

export const LOCK_FILE = "noblegap-lock.json";
// The site's standard library (build.py STDLIB_FILE): the members of
// Pyodide's python_stdlib.zip the engine can import, next to pyodide.mjs.
export const STDLIB_FILE = "noblegap-stdlib.zip";
export const SNAPSHOT_INFO = "noblegap-snapshot.json";
// The file the build's sidecar names (build.py SNAPSHOT_FILE).
export const SNAPSHOT_FILE = "noblegap-snapshot.gzip";
export const ENGINE_PACKAGE = "noblegap";
export const FALLBACK_LABEL = "snapshot unusable — normal start";

// Loading phases in order, with the share of the loading bar reached when
// each one starts.
export const PHASES = [
  ["fetch runtime", 0.02, "Fetching the Python runtime"],
  ["restore snapshot", 0.5, "Restoring the prepared engine"],
  ["check engine", 0.9, "Checking the engine against a known case"],
  ["normal start", 0.02, FALLBACK_LABEL],
  ["start Python", 0.45, "Starting Python"],
  ["load packages", 0.7, "Loading the calculation engine"],
  ["import engine", 0.85, "Preparing the unit registry and tables"],
  ["ready", 1.0, "Ready"],
];

// Python run in the build right before the memory is saved: import what the
// pages use, warm the tables and unit registry, then drop what only the
// build needed. Nothing may stay referenced from JavaScript.
export const WARM_PY = `
import gc, importlib, json, linecache, sys
import noblegap.api as _api
import noblegap.units as _units
_units.registry()
for _calc in _api.describe()["calculators"]:
    _api.describe(_calc["name"])
    json.dumps(_api.run(_calc["name"], _calc.get("example", {})), allow_nan=False)
del _calc, _api, _units
linecache.clearcache()
importlib.invalidate_caches()
sys.last_exc = sys.last_type = sys.last_value = sys.last_traceback = None
gc.collect()
`;

// Python run right after a restore: every user gets fresh random state, and
// the import system forgets directory listings made at build time.
const AFTER_RESTORE_PY = `
import importlib, os, random
random.seed(int.from_bytes(os.urandom(32), "big"))
importlib.invalidate_caches()
`;

// Run once the engine is imported and warm (both starts): the modules, unit
// registry and tables live as long as the engine, so the cyclic garbage
// collector stops re-scanning them (tens of thousands of objects) during
// the user's edits. Objects made later are collected as usual.
const FREEZE_PY = `
import gc
gc.freeze()
`;

/** The id a snapshot must carry for this Pyodide and this lock file. */
export async function snapshotBuildId(pyodideVersion, lockSha256) {
  return sha256Hex(`noblegap-snapshot/${SNAPSHOT_FORMAT}|pyodide ${pyodideVersion}|lock ${lockSha256}`);
}

/** Write the package files of a snapshot (or of the build) into site-packages. */
export function installFiles(FS, sitePackages, files) {
  const made = new Set();
  for (const [path, data] of files) {
    const dir = path.includes("/") ? `${sitePackages}/${path.slice(0, path.lastIndexOf("/"))}` : sitePackages;
    if (!made.has(dir)) {
      FS.mkdirTree(dir);
      made.add(dir);
    }
    FS.writeFile(`${sitePackages}/${path}`, data, { canOwn: false });
  }
}

/**
 * Unpack a gzip response: {bytes, sha256}, the sha256 being that of the
 * compressed bytes as they came.
 */
async function gunzipResponse(response) {
  if (!response.ok) throw new Error(`snapshot file: HTTP ${response.status}`);
  // whole first (drained off this thread), then hashed and unpacked at once
  const packed = new Uint8Array(await response.arrayBuffer());
  const hashed = sha256Hex(packed);
  const stream = new Blob([packed]).stream().pipeThrough(new DecompressionStream("gzip"));
  const bytes = new Uint8Array(await new Response(stream).arrayBuffer());
  return { bytes, sha256: await hashed };
}

/** Does result match the known case the build recorded (to 1e-12 relative)? */
export function knownCaseError(result, expect) {
  if (!result || !result.ok) return `known case failed: ${JSON.stringify(result && result.error)}`;
  for (const [key, want] of Object.entries(expect)) {
    const got = key === "headline" ? result.result.display.headline : result.result[key];
    const same =
      typeof want === "number" && typeof got === "number"
        ? Math.abs(got - want) <= 1e-12 * Math.max(Math.abs(want), Math.abs(got))
        : got === want;
    if (!same) return `known case: ${key} is ${JSON.stringify(got)}, expected ${JSON.stringify(want)}`;
  }
  return null;
}

/** run / describe through JSON text, so no PyProxy outlives a call. */
function bindApi(pyodide) {
  const api = pyodide.pyimport("noblegap.api");
  // api, loads and dumps live as long as the engine; every other proxy is
  // destroyed by the call that made it.
  const json = pyodide.pyimport("json");
  const loads = json.loads.copy();
  const dumps = json.dumps.copy();
  json.destroy();
  const toJS = (proxy) => {
    try {
      return JSON.parse(dumps(proxy));
    } finally {
      proxy.destroy();
    }
  };
  const run = (calc, inputs) => {
    const pyInputs = loads(JSON.stringify(inputs ?? {}));
    try {
      return toJS(api.run(String(calc), pyInputs));
    } finally {
      pyInputs.destroy();
    }
  };
  const describe = (calc) => toJS(calc == null ? api.describe() : api.describe(String(calc)));
  return { run, describe };
}

/**
 * Start Python and import noblegap.api, from the build's snapshot when it is
 * usable, else the normal way.
 *
 * @param {object} [options]
 * @param {string} [options.indexURL] folder of pyodide.mjs and its runtime files
 * @param {string} [options.lockFileURL] the site's lock file (wheels + sha256)
 * @param {string|false} [options.snapshotInfoURL] the snapshot's JSON sidecar; false: normal start only
 * @param {Function} [options.fetch] fetch-like (url, init) => Response, for the
 *   sidecar, the lock file and the snapshot (Node passes one that reads files
 *   and checks init.integrity itself)
 * @param {(p: {phase: string, fraction: number, label: string}) => void} [options.onProgress]
 * @param {(msg: string) => void} [options.stdout]
 * @param {(msg: string) => void} [options.stderr]
 * @returns {Promise<{run, describe, pyodide, timings, mode: "snapshot"|"normal", note?: string}>}
 */
export async function startEngine(options = {}) {
  const here = import.meta.url;
  const indexURL = options.indexURL ?? new URL("../pyodide/", here).href;
  const lockFileURL = options.lockFileURL ?? new URL(`../packages/${LOCK_FILE}`, here).href;
  const snapshotInfoURL = options.snapshotInfoURL ?? new URL(`../packages/${SNAPSHOT_INFO}`, here).href;
  const fetchFn = options.fetch ?? ((url, init) => fetch(url, init));
  const onProgress = options.onProgress ?? (() => {});
  const stdout = options.stdout ?? ((msg) => console.log(msg));
  const stderr = options.stderr ?? ((msg) => console.warn(msg));
  const t0 = performance.now();
  const timings = {};
  const phase = (name, label) => {
    const [, fraction, defaultLabel] = PHASES.find((p) => p[0] === name);
    timings[name] = performance.now() - t0;
    onProgress({ phase: name, fraction, label: label ?? defaultLabel });
  };
  // A timing without a progress message.
  const mark = (name) => {
    timings[name] = performance.now() - t0;
  };
  const ctx = { indexURL, lockFileURL, snapshotInfoURL, fetchFn, stdout, stderr, phase, mark, timings };

  let engine;
  let note;
  if (snapshotInfoURL !== false) {
    try {
      engine = await startFromSnapshot(ctx);
    } catch (err) {
      note = `${FALLBACK_LABEL}: ${err && err.message ? err.message.split("\n")[0] : err}`;
      stderr(`noblegap: ${note}`);
      phase("normal start", note);
    }
  }
  if (!engine) engine = await startNormally(ctx);
  phase("ready");
  timings.total = performance.now() - t0;
  return { ...engine, warmStep: warmer(engine), timings, ...(note ? { note } : {}) };
}

/**
 * One warm-up calculation per call, cycling through the calculators'
 * examples. A restored snapshot has run almost no code in this browser, so
 * the WebAssembly interpreter loop is still in the baseline tier; running
 * the real calculations a few dozen times while the user reads the page lets
 * the browser optimise the hot functions before the first edits. Returns
 * false when there is nothing to warm.
 */
function warmer(engine) {
  let examples = null;
  let next = 0;
  return () => {
    if (examples === null) {
      examples = (engine.describe().calculators ?? []).map((c) => [c.name, c.example ?? {}]);
    }
    if (!examples.length) return false;
    const [name, inputs] = examples[next++ % examples.length];
    engine.run(name, inputs);
    return true;
  };
}

// The sidecar, checked against this Pyodide and the lock file it will load;
// returns {info, lock}.
async function snapshotInfo(snapshotInfoURL, lockFileURL, fetchFn) {
  const [infoResponse, lockResponse] = await Promise.all([
    fetchFn(snapshotInfoURL, { cache: "no-cache" }),
    fetchFn(lockFileURL),
  ]);
  if (!infoResponse.ok) throw new Error(`no snapshot (${infoResponse.status})`);
  if (!lockResponse.ok) throw new Error(`no lock file (${lockResponse.status})`);
  const info = await infoResponse.json();
  const lockBytes = new Uint8Array(await lockResponse.arrayBuffer());
  const lockSha = await sha256Hex(lockBytes);
  if (info.format !== SNAPSHOT_FORMAT) throw new Error(`snapshot format ${info.format}, expected ${SNAPSHOT_FORMAT}`);
  if (info.pyodide !== PYODIDE_VERSION) {
    throw new Error(`snapshot made with Pyodide ${info.pyodide}, this is ${PYODIDE_VERSION}`);
  }
  const buildId = await snapshotBuildId(PYODIDE_VERSION, lockSha);
  if (info.build_id !== buildId) throw new Error("snapshot build id does not match this Pyodide and lock file");
  const size = info.memory_size;
  if (!Number.isInteger(size) || size <= 0 || size % 4 !== 0) {
    throw new Error(`snapshot sidecar gives a bad memory size ${JSON.stringify(size)}`);
  }
  return { info, lock: JSON.parse(new TextDecoder().decode(lockBytes)) };
}

// The loadPyodide options both boots share: our files, our lock, our output.
function runtimeOptions({ indexURL, lockFileURL, stdout, stderr }) {
  const stdLibURL = `${indexURL.endsWith("/") ? indexURL : indexURL + "/"}${STDLIB_FILE}`;
  return { indexURL, lockFileURL, stdLibURL, stdout, stderr, checkAPIVersion: true };
}

async function startFromSnapshot({ indexURL, lockFileURL, snapshotInfoURL, fetchFn, stdout, stderr, phase, mark }) {
  phase("fetch runtime", "Fetching the Python runtime and the prepared engine");
  // loadPyodide starts at once (the runtime downloads meanwhile); it waits
  // for the memory, which is only handed over once the sidecar matches.
  const checked = snapshotInfo(snapshotInfoURL, lockFileURL, fetchFn);
  // The file is requested at the same time as the sidecar (one round trip
  // less); its bytes are used only if the sidecar names this file, and they
  // must still have the sidecar's sha256.
  const snapshotBase = new URL(snapshotInfoURL, "file:///");
  const guessURL = new URL(SNAPSHOT_FILE, snapshotBase).href;
  const stop = new AbortController();
  const unpack = (url) => fetchFn(url, { signal: stop.signal }).then(gunzipResponse);
  const early = unpack(guessURL);
  early.catch(() => {});
  // No usable sidecar (the normal start follows): stop the download.
  checked.catch(() => stop.abort());
  // Pyodide needs only the memory's size to compile and instantiate its
  // WebAssembly, and reads the memory itself only after fsInit below has
  // returned: so it gets a zero-filled buffer of the sidecar's size at once,
  // compiles while the snapshot downloads and unpacks, and the buffer is
  // filled before fsInit returns. Should anything fail, the buffer's magic
  // number is zero (or wiped by fsInit), Pyodide rejects it and the normal
  // start follows with the real error as the reason.
  const memory = checked.then(({ info }) => new Uint8Array(info.memory_size));
  const container = (async () => {
    const { info } = await checked;
    mark("snapshot info checked");
    const url = new URL(info.file, snapshotBase).href;
    const { bytes, sha256 } = await (url === guessURL ? early : unpack(url));
    mark("snapshot unpacked");
    if (bytes.length !== info.raw_size) {
      throw new Error(`snapshot unpacks to ${bytes.length} bytes, its sidecar says ${info.raw_size}`);
    }
    if (sha256 !== info.sha256) throw new Error("snapshot file does not match its sha256");
    return parseSnapshot(bytes, info.memory_size);
  })();
  // loadPyodide awaits the memory only after it has loaded its own script:
  // keep an early rejection from surfacing as unhandled meanwhile (it still
  // rejects loadPyodide, and so starts the normal way).
  for (const promise of [checked, container, memory]) promise.catch(() => {});
  // The runtime's binary, compiled as soon as its response arrives; its
  // memory, once instantiated, holds the base the snapshot is a delta against.
  const wasmURL =
    typeof location === "undefined" ? null : new URL("pyodide.asm.wasm", new URL(indexURL, location)).href;
  const capture = captureRuntimeWasm(wasmURL);
  // What needs no runtime is written as soon as the container is here:
  // Pyodide's header and the pages past the base.
  const paged = Promise.all([container, memory]).then(([snapshot, target]) => {
    applyPages(snapshot, target);
    mark("pages copied");
    return snapshot;
  });
  paged.catch(() => {});
  let containerError = null;
  const pyodide = await loadPyodide({
    ...runtimeOptions({ indexURL, lockFileURL, stdout, stderr }),
    _loadSnapshot: memory,
    // Runs once the WebAssembly is instantiated and before Python resumes
    // from the memory: the base pages are rebuilt from the runtime's fresh
    // memory, and the snapshot's package files go back where the build had
    // them. Never throws (Pyodide does not await this hook's errors): a
    // failure is kept and reported instead of Pyodide's complaint about the
    // memory, whose magic number is wiped so Pyodide never resumes from it.
    fsInit: async (FS, { sitePackages }) => {
      mark("runtime instantiated");
      const runtimeMemory = capture.memory();
      capture.release();
      try {
        if (!runtimeMemory) throw new Error("the runtime's memory was not seen");
        const snapshot = await paged;
        const base = baseFromMemory(runtimeMemory.buffer, snapshot);
        if ((await sha256Hex(base)) !== snapshot.header.base.sha256) {
          throw new Error("the runtime's data segments differ from the ones the snapshot was made against");
        }
        phase("restore snapshot");
        applyBase(snapshot, await memory, base);
        mark("memory rebuilt");
        installFiles(FS, sitePackages, snapshot.files);
        mark("files installed");
      } catch (err) {
        containerError = err;
        (await memory.catch(() => new Uint8Array(8))).fill(0, 0, 8);
      }
    },
  })
    .catch((err) => {
      throw containerError ?? err;
    })
    .finally(() => capture.release());
  if (containerError) throw containerError;
  const { info } = await checked;
  phase("check engine");
  pyodide.runPython(AFTER_RESTORE_PY);
  const bound = bindApi(pyodide);
  const known = info.known_case;
  const problem = knownCaseError(bound.run(known.calc, known.inputs), known.expect);
  if (problem) throw new Error(problem);
  pyodide.runPython(FREEZE_PY);
  return { pyodide, ...bound, mode: "snapshot" };
}

async function startNormally({ indexURL, lockFileURL, stdout, stderr, phase }) {
  phase("fetch runtime");
  const pyodide = await loadPyodide({
    ...runtimeOptions({ indexURL, lockFileURL, stdout, stderr }),
    // Called once the runtime is downloaded and instantiated, just before
    // the interpreter starts.
    fsInit: async () => phase("start Python"),
  });

  phase("load packages");
  const failures = [];
  await pyodide.loadPackage([ENGINE_PACKAGE], {
    checkIntegrity: true,
    messageCallback: () => {},
    errorCallback: (msg) => failures.push(msg),
  });
  if (failures.length) {
    throw new Error(`Could not load the engine packages: ${failures.join("; ")}`);
  }

  phase("import engine");
  const bound = bindApi(pyodide);
  // Warm the engine: the first calculation imports the calculator modules,
  // reads the tables and builds the unit registry.
  const schema = bound.describe();
  const first = (schema.calculators ?? [])[0];
  if (first) bound.run(first.name, first.example ?? {});
  pyodide.runPython(FREEZE_PY);
  return { pyodide, ...bound, mode: "normal" };
}
