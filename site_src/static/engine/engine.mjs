// The engine: Pyodide started from the site's own files, noblegap.api called.
//
// Shared by the page's Web Worker (worker.js), the Node parity runner
// (site_build/pyodide_run.mjs) and the build's snapshot maker, so tests and
// build load the engine exactly as the browser does. Dicts cross the
// JS/Python boundary as JSON text only (json.loads / json.dumps on the
// Python side, JSON.parse / JSON.stringify here), so no PyProxy outlives a
// call. Python is never written here: the warm-up and checks are functions
// of noblegap.engine_hooks.
//
// The normal start: loadPyodide, loadPackage from the lock file (every
// wheel checked with Subresource Integrity), import noblegap.api and warm
// it. When the site has a fast start (names.json "faststart", the folder
// faststart/), that is tried first; any failure of it falls back to the
// normal start, visibly: a progress message "snapshot unusable — normal
// start" and the ready message's mode "normal" with a note saying why.
import NAMES from "./names.json" with { type: "json" };
import { loadPyodide, version as PYODIDE_VERSION } from "../../pyodide/pyodide.mjs";

export { NAMES, loadPyodide, PYODIDE_VERSION };

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

/** run / describe through JSON text, and the engine's hooks module. */
export function bindApi(pyodide) {
  const api = pyodide.pyimport(`${NAMES.engine_package}.api`);
  const hooks = pyodide.pyimport(NAMES.hooks_module);
  // api, hooks, loads and dumps live as long as the engine; every other
  // proxy is destroyed by the call that made it.
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
  return { run, describe, hooks };
}

// The loadPyodide options both starts share: our files, our lock, our output.
export function runtimeOptions({ indexURL, lockFileURL, stdout, stderr }) {
  const stdLibURL = `${indexURL.endsWith("/") ? indexURL : indexURL + "/"}${NAMES.stdlib_file}`;
  return { indexURL, lockFileURL, stdLibURL, stdout, stderr, checkAPIVersion: true };
}

/**
 * Start Python and import noblegap.api: the fast start when the site has one
 * and it is usable, else the normal way.
 *
 * @param {object} [options]
 * @param {string} [options.indexURL] folder of pyodide.mjs and its runtime files
 * @param {string} [options.lockFileURL] the site's lock file (wheels + sha256)
 * @param {Promise|false} [options.faststart] the faststart/start.mjs module (a
 *   promise of it), or false for the normal start only; by default imported
 *   when names.json lists a fast start
 * @param {object} [options.early] the worker's early requests of the fast
 *   start's files ({take, abort}, worker.js), or null; those the fast
 *   start has not taken are stopped when it fails
 * @param {string} [options.snapshotInfoURL] the snapshot's JSON sidecar (fast start)
 * @param {Function} [options.fetch] fetch-like (url, init) => Response, for the
 *   files the engine fetches itself (Node passes one that reads files and
 *   checks init.integrity)
 * @param {(p: {phase: string, fraction: number, label: string}) => void} [options.onProgress]
 * @param {(msg: string) => void} [options.stdout]
 * @param {(msg: string) => void} [options.stderr]
 * @returns {Promise<{run, describe, hooks, pyodide, timings, mode: string, note?: string}>}
 */
export async function startEngine(options = {}) {
  const here = import.meta.url;
  const indexURL = options.indexURL ?? new URL(`../../${NAMES.pyodide_dir}/`, here).href;
  const lockFileURL = options.lockFileURL ?? new URL(`../../${NAMES.packages_dir}/${NAMES.lock_file}`, here).href;
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
  const ctx = { ...options, indexURL, lockFileURL, fetchFn, stdout, stderr, phase, mark, timings };

  const fast = options.faststart ?? (NAMES.faststart ? import("./faststart/start.mjs") : false);
  let engine;
  let note;
  if (fast) {
    try {
      const { startFromSnapshot } = await fast;
      engine = await startFromSnapshot(ctx);
    } catch (err) {
      options.early?.abort();
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
  await pyodide.loadPackage([NAMES.engine_package], {
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
  bound.hooks.freeze();
  return { pyodide, ...bound, mode: NAMES.modes.normal };
}
