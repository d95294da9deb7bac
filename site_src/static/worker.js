// The calculation engine as a module Web Worker:
//   new Worker("static/worker.js", { type: "module" })
//
// In:   {id, fn: "run", args: {calc, inputs}}  or  {id, fn: "describe", args: {calc?}}
// Out:  {id, ok: true, result}                 result is exactly what
//                                              noblegap.api.run / describe returned
//       {id, ok: false, error: {type, message, fields, ...}, response?}
//       {type: "progress", phase, fraction, label}   while loading
//       {type: "ready", timings}                     once, when calls are answered live
//       {type: "fatal", message}                     the engine cannot start or crashed
//
// Calls sent before "ready" are queued and answered once the engine is up.
import { startEngine } from "./engine.mjs";

const post = (msg) => self.postMessage(msg);

const fatal = (err) => {
  const message = err && err.message ? err.message : String(err);
  post({ type: "fatal", message });
};

self.onerror = (event) => {
  fatal(event && event.message ? event.message : "The engine worker failed.");
};
self.onunhandledrejection = (event) => fatal(event.reason);

const engineReady = startEngine({
  onProgress: ({ phase, fraction, label }) => post({ type: "progress", phase, fraction, label }),
});
engineReady.then(
  (engine) => post({ type: "ready", timings: engine.timings }),
  (err) => fatal(err),
);

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

function answer(engine, fn, args) {
  if (fn === "run") {
    const response = engine.run(args.calc, args.inputs);
    if (response.ok) return { ok: true, result: response };
    return { ok: false, error: workerError(response.error ?? {}), response };
  }
  if (fn === "describe") {
    const response = engine.describe(args.calc);
    if (response.ok === false) return { ok: false, error: workerError(response.error ?? {}), response };
    return { ok: true, result: response };
  }
  return {
    ok: false,
    error: {
      type: "UnknownFunction",
      message: `The engine has no function ${JSON.stringify(fn)}; use "run" or "describe".`,
      fields: {},
    },
  };
}

self.onmessage = async (event) => {
  const { id, fn, args } = event.data ?? {};
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
    post({ id, ...answer(engine, fn, args ?? {}) });
  } catch (err) {
    post({
      id,
      ok: false,
      error: { type: "InternalError", message: String(err && err.message ? err.message : err), fields: {} },
    });
  }
};
