// Starts the engine worker before the page is parsed: a classic script,
// loaded without async or defer at the top of <head>, runs as soon as it has
// arrived, before the body is parsed and laid out (an async module waits for
// the parser to yield: 0.2 s later on a throttled tablet). It leaves the
// worker and the messages it sent meanwhile on one global; boot.js (a module,
// imported by app.js) adopts them, or starts the worker itself when this
// file did not run (a host that refused it, an old cached page).
//
// The worker's name says whether a service worker serves this page: the
// fast start then compiles the runtime from the offline copy's stored plain
// file instead of unpacking its gzip twin again (engine/faststart/start.mjs).
(() => {
  if (typeof Worker !== "function" || !document.currentScript) return;
  try {
    const served = Boolean(navigator.serviceWorker && navigator.serviceWorker.controller);
    const url = new URL("engine/worker.js", document.currentScript.src);
    const worker = new Worker(url, {
      type: "module",
      name: served ? "noblegap engine (offline copy)" : "noblegap engine",
    });
    const kept = [];
    const keep = (event) => kept.push(event);
    worker.addEventListener("message", keep);
    worker.addEventListener("error", keep);
    globalThis.noblegapEarlyEngine = { worker, kept, keep, url: url.href };
  } catch {
    // boot.js starts the worker instead
  }
})();
