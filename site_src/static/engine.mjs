// Boot Pyodide from the site's own files and call noblegap.api.
//
// Shared by the page's Web Worker (static/worker.js) and the Node parity
// runner (tools/pyodide_run.mjs), so the tests load the engine exactly as the
// browser does. Dicts cross the JS/Python boundary as JSON text only
// (json.loads / json.dumps on the Python side, JSON.parse / JSON.stringify
// here), so no PyProxy outlives a call.
import { loadPyodide } from "../pyodide/pyodide.mjs";

export const LOCK_FILE = "noblegap-lock.json";
export const ENGINE_PACKAGE = "noblegap";

// Loading phases in order, with the share of the loading bar reached when
// each one starts.
export const PHASES = [
  ["fetch runtime", 0.02, "Fetching the Python runtime"],
  ["start Python", 0.45, "Starting Python"],
  ["load packages", 0.7, "Loading the calculation engine"],
  ["import engine", 0.85, "Preparing the unit registry and tables"],
  ["ready", 1.0, "Ready"],
];

/**
 * Start Python and import noblegap.api.
 *
 * @param {object} [options]
 * @param {string} [options.indexURL] folder of pyodide.mjs and its runtime files
 * @param {string} [options.lockFileURL] the site's lock file (wheels + sha256)
 * @param {(p: {phase: string, fraction: number, label: string}) => void} [options.onProgress]
 * @param {(msg: string) => void} [options.stdout]
 * @param {(msg: string) => void} [options.stderr]
 * @returns {Promise<{run: Function, describe: Function, pyodide: object, timings: object}>}
 */
export async function startEngine(options = {}) {
  const here = import.meta.url;
  const indexURL = options.indexURL ?? new URL("../pyodide/", here).href;
  const lockFileURL = options.lockFileURL ?? new URL(`../packages/${LOCK_FILE}`, here).href;
  const onProgress = options.onProgress ?? (() => {});
  const stdout = options.stdout ?? ((msg) => console.log(msg));
  const stderr = options.stderr ?? ((msg) => console.warn(msg));
  const t0 = performance.now();
  const timings = {};
  const phase = (name) => {
    const [, fraction, label] = PHASES.find((p) => p[0] === name);
    timings[name] = performance.now() - t0;
    onProgress({ phase: name, fraction, label });
  };

  phase("fetch runtime");
  const pyodide = await loadPyodide({
    indexURL,
    lockFileURL,
    stdout,
    stderr,
    checkAPIVersion: true,
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
  const api = pyodide.pyimport("noblegap.api");
  // api, loads and dumps live as long as the engine; every other proxy is
  // destroyed by the call that made it.
  const json = pyodide.pyimport("json");
  const loads = json.loads.copy();
  const dumps = json.dumps.copy();

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

  // Warm the engine: the first calculation imports the calculator modules,
  // reads the tables and builds the unit registry.
  const schema = describe();
  const first = (schema.calculators ?? [])[0];
  if (first) run(first.name, first.example ?? {});
  phase("ready");
  timings.total = performance.now() - t0;

  return {
    pyodide,
    timings,
    run,
    describe,
  };
}
