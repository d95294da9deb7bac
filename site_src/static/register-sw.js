// Registers the service worker that precaches the whole site for offline use.
export function registerServiceWorker() {
  if (!("serviceWorker" in navigator)) return;
  navigator.serviceWorker.register("sw.js").catch((err) => {
    console.warn("noblegap: offline cache not available:", err);
  });
}
registerServiceWorker();
