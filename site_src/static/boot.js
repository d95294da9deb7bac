// The page's engine worker. engine-start.js (a classic script at the top of
// <head>) normally started it before the page was parsed, and kept its
// messages: this module adopts that worker. When that script did not run,
// the worker starts here; app.js imports this module, so there is one worker
// either way. The worker's messages are kept until app.js takes them with
// takeEarly().
//
// The worker's name says whether a service worker serves this page: the
// fast start then compiles the runtime from the offline copy's stored plain
// file instead of unpacking its gzip twin again (engine/faststart/start.mjs).
const WORKER_URL = new URL("./engine/worker.js", import.meta.url);
const served = Boolean(navigator.serviceWorker && navigator.serviceWorker.controller);
const WORKER_OPTIONS = {
  type: "module",
  name: served ? "noblegap engine (offline copy)" : "noblegap engine",
};

const early = globalThis.noblegapEarlyEngine;
const adopted = early && early.url === WORKER_URL.href ? early : null;
if (early) delete globalThis.noblegapEarlyEngine;
export let worker = adopted ? adopted.worker : new Worker(WORKER_URL, WORKER_OPTIONS);
const kept = adopted ? adopted.kept : [];
const keep = adopted ? adopted.keep : (event) => kept.push(event);
if (!adopted) {
  worker.addEventListener("message", keep);
  worker.addEventListener("error", keep);
}

/** Stop keeping messages; returns the events received so far, in order. */
export function takeEarly() {
  worker.removeEventListener("message", keep);
  worker.removeEventListener("error", keep);
  return kept.splice(0);
}

const restartHooks = new Set();

/**
 * Be told of every fresh worker the watchdog starts: `hook(newWorker)` runs
 * before restartWorker() returns (static/engine-client.js re-sends its
 * pending calls there). Returns a function that removes the hook.
 */
export function onRestart(hook) {
  restartHooks.add(hook);
  return () => restartHooks.delete(hook);
}

/**
 * The page's watchdog: end the current worker (a calculation that overran,
 * or an engine that never became ready) and start a fresh one. Returns the
 * new worker; the `worker` binding follows it.
 */
export function restartWorker() {
  takeEarly();
  worker.terminate();
  worker = new Worker(WORKER_URL, WORKER_OPTIONS);
  for (const hook of restartHooks) hook(worker);
  return worker;
}
