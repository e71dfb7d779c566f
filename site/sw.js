// Service worker: precache the whole build (list and content hashes from precache.json, written
// by build.py) so the page loads and computes offline after one visit. The page registers it as
// sw.js?build=<hash>; a new build therefore installs a new worker, and the page offers a reload.
const params = new URL(self.location.href).searchParams;
const BUILD = params.get("build") || "dev";
const CACHE = `drift-dose-${BUILD}`;
const ALWAYS_FRESH = new Set(["build-info.json", "precache.json"]);

self.addEventListener("install", (event) => {
  event.waitUntil((async () => {
    const list = await (await fetch("precache.json", { cache: "no-store" })).json();
    const cache = await caches.open(CACHE);
    // past the HTTP cache: a host without cache headers must not mix an older build's files in
    await cache.addAll(["./", ...list.files.map((f) => f.url)].map((url) => new Request(url, { cache: "reload" })));
  })());
});

self.addEventListener("activate", (event) => {
  event.waitUntil((async () => {
    for (const key of await caches.keys()) {
      if (key.startsWith("drift-dose-") && key !== CACHE) await caches.delete(key);
    }
    await self.clients.claim();
  })());
});

self.addEventListener("message", (event) => {
  if (event.data === "skip-waiting") self.skipWaiting();
});

self.addEventListener("fetch", (event) => {
  const request = event.request;
  const url = new URL(request.url);
  if (request.method !== "GET" || url.origin !== self.location.origin) return;
  const path = url.pathname.slice(new URL("./", self.location.href).pathname.length);
  if (ALWAYS_FRESH.has(path)) {
    event.respondWith(fetch(request).catch(() => caches.match(request, { ignoreSearch: true })));
    return;
  }
  event.respondWith((async () => {
    const cached = await caches.match(request, { cacheName: CACHE, ignoreSearch: true });
    return cached || fetch(request);
  })());
});
