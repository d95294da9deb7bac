// Service worker: the whole site, Pyodide included, works offline after one visit.
//
// The build (site_build/offline.py) replaces the marker below with
// {"cache": name, "files": [paths], "unpack": {plain path: {"packed": gzip
// path, "sha256": plain sha256}}, "checked_header": name}: the cache name
// carries the site's content hash, so every rebuild that changes a file
// installs a new cache and drops the old ones. A plain file with a gzip twin
// (the fast start's pre-compressed runtime and snapshot) is not downloaded:
// the install unpacks the twin, checks the plain bytes against the build's
// sha256 and keeps them under the plain file's URL with that sha256 in the
// checked header, so nothing is downloaded twice, a later visit need not
// hash them again, and it compiles the runtime from a stored response (which
// the browser may keep compiled code for).
const BUILD = "__NOBLEGAP_BUILD__";

const CACHE = BUILD.cache;
const SCOPE = new URL("./", self.location.href);
const PRECACHE = BUILD.files.map((path) => new URL(path, SCOPE).href);
const UNPACK = new Map(Object.entries(BUILD.unpack ?? {}).map(([plain, twin]) => [
  new URL(plain, SCOPE).href,
  { packed: new URL(twin.packed, SCOPE).href, sha256: twin.sha256 },
]));
const TYPES = { ".wasm": "application/wasm", ".mjs": "text/javascript", ".container": "application/octet-stream" };

function typeOf(plainURL) {
  const path = new URL(plainURL).pathname;
  return TYPES[path.slice(path.lastIndexOf("."))] ?? "application/octet-stream";
}

// The plain file from its gzip twin in the cache (unchecked, streamed), or null.
async function unpacked(cache, plainURL) {
  const twin = UNPACK.get(plainURL);
  if (!twin || typeof DecompressionStream !== "function") return null;
  const hit = await cache.match(twin.packed);
  if (!hit) return null;
  return new Response(hit.body.pipeThrough(new DecompressionStream("gzip")), {
    headers: { "Content-Type": typeOf(plainURL) },
  });
}

// Unpack once into the cache, kept only with the build's sha256.
async function keepUnpacked(cache, plainURL) {
  const response = await unpacked(cache, plainURL);
  if (!response) return;
  const bytes = await response.arrayBuffer();
  const digest = new Uint8Array(await crypto.subtle.digest("SHA-256", bytes));
  const sha256 = Array.from(digest, (b) => b.toString(16).padStart(2, "0")).join("");
  // Other bytes than the build made: not kept (a later visit unpacks the
  // twin again and the page checks it itself).
  if (sha256 !== UNPACK.get(plainURL).sha256) return;
  await cache.put(plainURL, new Response(bytes, {
    headers: { "Content-Type": typeOf(plainURL), [BUILD.checked_header]: sha256 },
  }));
}

self.addEventListener("install", (event) => {
  event.waitUntil(
    (async () => {
      const cache = await caches.open(CACHE);
      // cache: "no-cache" revalidates every HTTP-cache entry with the
      // server: a file the page has just downloaded costs a 304, and a new
      // build never mixes in files of the old one.
      await cache.addAll(PRECACHE.map((url) => new Request(url, { cache: "no-cache" })));
      for (const plainURL of UNPACK.keys()) await keepUnpacked(cache, plainURL);
      await self.skipWaiting();
    })(),
  );
});

self.addEventListener("activate", (event) => {
  event.waitUntil(
    (async () => {
      const names = await caches.keys();
      await Promise.all(
        names.filter((name) => name.startsWith("noblegap-") && name !== CACHE).map((name) => caches.delete(name)),
      );
      // No clients.claim(): a page that loaded from the network keeps doing
      // so; the next navigation is served from the new cache.
    })(),
  );
});

// A page URL: a navigation, or a path ending in .html or "/".
function isPage(request, url) {
  return request.mode === "navigate" || url.pathname.endsWith(".html") || url.pathname.endsWith("/");
}

self.addEventListener("fetch", (event) => {
  const request = event.request;
  if (request.method !== "GET") return;
  const url = new URL(request.url);
  if (url.origin !== self.location.origin) return;
  event.respondWith(
    (async () => {
      const cache = await caches.open(CACHE);
      if (isPage(request, url)) {
        // A bookmarked page?inputs=... is the same page; the page script
        // reads the query itself.
        const page = new URL(url.pathname.endsWith("/") ? url.pathname + "index.html" : url.pathname, url);
        const hit = await cache.match(page.href, { ignoreSearch: true });
        if (hit) return hit;
      } else {
        const hit = (await cache.match(request)) ?? (await unpacked(cache, url.href.split("?")[0]));
        if (hit) return hit;
      }
      return fetch(request);
    })(),
  );
});
