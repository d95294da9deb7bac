// The calculation engine as a module Web Worker:
//   new Worker("static/worker.js", { type: "module" })
//
// In:   {id, fn: "run", args: {calc, inputs}}  or  {id, fn: "describe", args: {calc?}}
//       {id, fn: "schedule" | "sheet" | "compare", args}  args for noblegap.<fn>.handle
// Out:  {id, ok: true, result}                 result is exactly what
//                                              noblegap.api.run / describe returned
//       {id, ok: false, error: {type, message, fields, ...}, response?}
//       {type: "progress", phase, fraction, label}   while loading
//       {type: "ready", mode, note?, timings}        once, when calls are answered live;
//                                                    mode "snapshot" (restored from the
//                                                    build's memory snapshot) or "normal",
//                                                    note says why a snapshot was not used
//       {type: "fatal", message}                     the engine cannot start or crashed
// (the message types, call names and modes are those of names.json, which
// the build writes and the page script reads too)
//
// Calls sent before "ready" are queued and answered once the engine is up.
//
// The engine (engine.mjs) and, when the site has one, the fast start
// (faststart/start.mjs) are imported at once and side by side; no await at
// the top level, so the message handler below is in place from the start.
import NAMES from "./names.json" with { type: "json" };

const { messages: MSG, calls: CALLS } = NAMES;
const faststart = NAMES.faststart ? import("./faststart/start.mjs") : false;
if (faststart) faststart.catch(() => {});

/**
 * {take(url), abort(url?)}: take hands over the response promise for a URL
 * once (or null); abort(url) stops that request, abort() every one not taken.
 */
function earlyRequests(paths) {
  const requests = new Map();
  for (const path of paths) {
    const url = new URL(`../../${path}`, import.meta.url).href;
    const stop = new AbortController();
    const response = fetch(url, { credentials: "same-origin", signal: stop.signal });
    response.catch(() => {});
    requests.set(url, { response, stop, taken: false });
  }
  return {
    take(url) {
      const request = requests.get(url);
      if (!request || request.taken) return null;
      request.taken = true;
      return request.response;
    },
    abort(url) {
      for (const [key, request] of requests) {
        if (url === undefined ? !request.taken : key === url) request.stop.abort();
      }
    },
  };
}

// Once a fatal message is out, no progress message follows it (a runtime
// file requested early can fail before the engine has said what it does).
let fatalPosted = false;
const post = (msg) => {
  if (msg.type === MSG.fatal) fatalPosted = true;
  else if (fatalPosted && msg.type === MSG.progress) return;
  self.postMessage(msg);
};

// A Python runtime file that fails to arrive is reported at once, so the page
// can say what failed (a stalled one is caught by the page's own timer).
const runtimeFetch = self.fetch.bind(self);
self.fetch = async (input, init) => {
  const url = String(input && input.url ? input.url : input);
  const failed = (why) => url.includes("/pyodide/") &&
    post({ type: MSG.fatal, message: `a runtime file did not arrive (${url.split("/").pop()}: ${why})` });
  try {
    const response = await runtimeFetch(input, init);
    if (!response.ok) failed(`HTTP ${response.status}`);
    return response;
  } catch (err) {
    failed(err && err.message ? err.message : "network error");
    throw err;
  }
};

// A first visit's large files (names.json "faststart.early"), requested now
// (through the wrapper above) rather than once the engine's scripts have
// loaded; the fast start takes them. Not when the offline copy serves the
// page (boot.js names the worker so): the fast start then reads the files
// it unpacked there.
const early = faststart && !String(self.name ?? "").includes("offline copy")
  ? earlyRequests(NAMES.faststart.early ?? [])
  : null;

const fatal = (err) => {
  const message = err && err.message ? err.message : String(err);
  post({ type: MSG.fatal, message });
};

self.onerror = (event) => {
  fatal(event && event.message ? event.message : "The engine worker failed.");
};
self.onunhandledrejection = (event) => fatal(event.reason);

const engineReady = import("./engine.mjs").then(({ startEngine }) =>
  startEngine({
    faststart,
    early,
    onProgress: ({ phase, fraction, label }) => post({ type: MSG.progress, phase, fraction, label }),
  }),
);
// Whether the fast start's deferred standard library is in place (or there
// is none to wait for).
let restInstalled = false;
engineReady.then(
  (engine) => {
    if (engine.complete) {
      engine.complete.then(
        (note) => {
          restInstalled = true;
          if (note) post({ type: MSG.notice, note });
        },
        (err) => post({ type: MSG.notice, note: `part of the standard library did not load: ${err && err.message ? err.message : err}` }),
      );
    }
    else restInstalled = true;
    post({
      type: MSG.ready,
      mode: engine.mode,
      ...(engine.note ? { note: engine.note } : {}),
      timings: engine.timings,
    });
    warmUp(engine);
  },
  (err) => fatal(err),
);

// After ready, in idle moments: a bounded number of warm-up calculations
// (engine.warmStep), one per task, so a call from the page waits for at most
// one of them. Stops for good once the page has sent a second call: its
// first is the live result on ready, a second one means the user is editing,
// and from then on a warm-up step could only delay an answer (some examples
// take 25 ms or more); the user's own calculations warm the engine instead.
const WARM_RUNS = 60;
const WARM_BUDGET_MS = 2500;
const WARM_DELAY_MS = 250;
let lastCallAt = 0;
let calls = 0;
function warmUp(engine) {
  const started = performance.now();
  let runs = 0;
  const step = () => {
    if (runs >= WARM_RUNS || calls > 1 || performance.now() - started > WARM_BUDGET_MS) return;
    // The page is busy with the user: leave the CPU to the calls.
    if (performance.now() - lastCallAt < 150) {
      setTimeout(step, 100);
      return;
    }
    try {
      if (!engine.warmStep()) return;
    } catch {
      return;
    }
    runs += 1;
    setTimeout(step, 0);
  };
  // Not at once: the page asks for its live result as soon as it sees
  // "ready", and that answer must not wait behind a warm-up step.
  setTimeout(step, WARM_DELAY_MS);
}

// {type, message, fields} from a noblegap error dict, keeping every key it has.
// fields maps each offending input to {message, value, allowed, suggestions}.
function workerError(error) {
  const fields = {};
  const parts = Array.isArray(error.errors) && error.errors.length ? error.errors : [error];
  for (const part of parts) {
    if (part && part.field) {
      fields[part.field] = {
        message: part.message,
        value: part.value ?? null,
        allowed: part.allowed ?? null,
        suggestions: part.suggestions ?? [],
      };
    }
  }
  return {
    ...error,
    type: error.type || "Error",
    message: error.message || "The calculation failed.",
    fields,
  };
}

// The job-record modules (noblegap.schedule, .sheet, .compare): JSON text in
// and out through their handle(); a sheet's QR library is loaded on first use.
const JOB_MODULES = ["schedule", "sheet", "compare"];
const LAZY_PACKAGES = { sheet: ["segno"] };
function jobCall(engine, fn, args) {
  const mod = engine.pyodide.pyimport(`noblegap.${fn}`);
  try {
    return { ok: true, result: JSON.parse(mod.handle(JSON.stringify(args))) };
  } finally {
    mod.destroy();
  }
}

function answer(engine, fn, args) {
  if (fn === CALLS.run) {
    const response = args.headline_only
      ? JSON.parse(engine.hooks.run_json(String(args.calc), JSON.stringify(args.inputs ?? {}), true))
      : engine.run(args.calc, args.inputs);
    if (response.ok) return { ok: true, result: response };
    return { ok: false, error: workerError(response.error ?? {}), response };
  }
  if (JOB_MODULES.includes(fn)) return jobCall(engine, fn, args);
  if (fn === CALLS.describe) {
    const response = engine.describe(args.calc);
    if (response.ok === false) return { ok: false, error: workerError(response.error ?? {}), response };
    return { ok: true, result: response };
  }
  return {
    ok: false,
    error: {
      type: "UnknownFunction",
      message: `The engine has no function ${JSON.stringify(fn)}; use ${[...Object.values(CALLS), ...JOB_MODULES].map((c) => JSON.stringify(c)).join(", ")}.`,
      fields: {},
    },
  };
}

self.onmessage = async (event) => {
  const { id, fn, args } = event.data ?? {};
  lastCallAt = performance.now();
  calls += 1;
  let engine;
  try {
    engine = await engineReady;
  } catch (err) {
    post({
      id,
      ok: false,
      error: { type: "EngineUnavailable", message: `The engine did not start: ${err.message ?? err}`, fields: {} },
    });
    return;
  }
  try {
    if (LAZY_PACKAGES[fn]) await engine.pyodide.loadPackage(LAZY_PACKAGES[fn], { messageCallback: () => {} });
    // The fast start installs the rest of the standard library only after
    // its first results (engine.complete): a job call, which may import from
    // it, waits for it; a calculation that failed unexpectedly before it was
    // there is answered again once it is.
    const complete = engine.complete ?? null;
    if (complete && JOB_MODULES.includes(fn)) await complete.catch(() => {});
    // ms: the call's own time in this worker (the Python work and the JSON
    // round trip, not the message queues), read by bench/cell_pages.py.
    let t0 = performance.now();
    let reply = answer(engine, fn, args ?? {});
    if (complete && !restInstalled && !reply.ok && reply.response?.error?.type === "InternalError") {
      await complete.catch(() => {});
      t0 = performance.now();
      reply = answer(engine, fn, args ?? {});
    }
    post({ id, ms: performance.now() - t0, ...reply });
  } catch (err) {
    post({
      id,
      ok: false,
      error: { type: "InternalError", message: String(err && err.message ? err.message : err), fields: {} },
    });
  }
};
