// Registers the service worker that precaches the whole site for offline use,
// and says on the page once the precache has finished.
export function registerServiceWorker() {
  if (!("serviceWorker" in navigator)) return;
  const status = document.getElementById("offline-status");
  if (status && !navigator.serviceWorker.controller) {
    status.textContent = "Saving the site on this device for offline use…";
  }
  navigator.serviceWorker.register("sw.js").catch((err) => {
    console.warn("noblegap: offline cache not available:", err);
    if (status) status.textContent = "Offline use is not available in this browser; the site needs a connection.";
  });
  // ready resolves once a worker is active, i.e. after its install step has
  // put every file of the site in the cache.
  navigator.serviceWorker.ready.then(() => {
    if (status) status.textContent = "Ready for offline use: this site now works on this device without a connection.";
    document.body.dataset.offline = "ready";
  });
}

// A calculator page (static/app.js) registers once its engine is ready, so
// the precache download does not compete with the engine's start; other
// pages register right away.
if (![...document.scripts].some((s) => /(^|\/)app\.js$/.test(s.getAttribute("src") || ""))) {
  registerServiceWorker();
}
