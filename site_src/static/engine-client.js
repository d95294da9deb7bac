// The engine worker for the job-record pages (saved jobs, joint schedule) and
// the calculator pages' sheet and save panels: a promise per call, progress
// and readiness as callbacks. The worker protocol is static/engine/worker.js's.
//
// A page that already runs static/app.js shares its worker: connect() adds
// listeners and never replaces the worker's onmessage. When app.js's watchdog
// replaces the worker, the calls still pending are sent again to the new one.

import NAMES from "./engine/names.json" with { type: "json" };

let clientPromise = null;

/**
 * Connect to the page's engine worker (started by static/boot.js).
 * @param {{onProgress?: Function, onReady?: Function, onFatal?: Function, shared?: boolean}} [hooks]
 * @returns {Promise<{call: (fn: string, args: object) => Promise<object>, ready: Promise<object>}>}
 */
export function connect(hooks = {}) {
  if (!clientPromise) clientPromise = start(hooks);
  return clientPromise;
}

async function start(hooks) {
  const { worker: first, takeEarly, onRestart } = await import("./boot.js");
  // id -> {fn, args, resolve}: kept until answered, so that a call still
  // pending when the page's watchdog replaces the worker is sent again to the
  // fresh one (which queues it until it is ready) instead of waiting forever.
  const waiting = new Map();
  let current = first;
  let nextId = 1_000_000; // far from app.js's own ids on a shared worker
  let readyResolve;
  let readyReject;
  const ready = new Promise((resolve, reject) => {
    readyResolve = resolve;
    readyReject = reject;
  });
  const onMessage = (msg) => {
    if (!msg) return;
    if (msg.type === NAMES.messages.progress) hooks.onProgress?.(msg);
    else if (msg.type === NAMES.messages.ready) {
      hooks.onReady?.(msg);
      readyResolve(msg);
    } else if (msg.type === NAMES.messages.fatal) {
      hooks.onFatal?.(msg.message);
      readyReject(new Error(msg.message));
    } else if (msg.id !== undefined && waiting.has(msg.id)) {
      const { resolve } = waiting.get(msg.id);
      waiting.delete(msg.id);
      resolve(msg);
    }
  };
  const listen = (w) => {
    w.addEventListener("message", (ev) => {
      if (w === current) onMessage(ev.data);
    });
    w.addEventListener("error", (ev) => {
      if (w !== current) return;
      hooks.onFatal?.(ev.message || "the engine could not start");
      readyReject(new Error(ev.message || "the engine could not start"));
    });
  };
  // On a calculator page app.js takes the early messages; elsewhere this does.
  const shared = document.querySelector('script[src$="static/app.js"]') !== null;
  if (!shared) for (const ev of takeEarly()) if (ev.type !== "error") onMessage(ev.data);
  if (shared && document.body.dataset.engine === "ready") readyResolve({ type: "ready" });
  listen(first);
  onRestart((fresh) => {
    current = fresh;
    listen(fresh);
    for (const [id, { fn, args }] of waiting) fresh.postMessage({ id, fn, args });
  });
  ready.catch(() => {});
  const call = (fn, args) => {
    const id = nextId++;
    return new Promise((resolve) => {
      waiting.set(id, { fn, args, resolve });
      current.postMessage({ id, fn, args });
    });
  };
  return { call, ready };
}
