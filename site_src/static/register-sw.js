// Registers the service worker that precaches the whole site for offline use.
export function registerServiceWorker() {
  if (!("serviceWorker" in navigator)) return;
  navigator.serviceWorker.register("sw.js").catch((err) => {
    console.warn("noblegap: offline cache not available:", err);
  });
}

// A calculator page (static/app.js) registers once its engine is ready, so
// the precache download does not compete with the engine's start; other
// pages register right away.
if (![...document.scripts].some((s) => /(^|\/)app\.js$/.test(s.getAttribute("src") || ""))) {
  registerServiceWorker();
}
