// Service worker: precache the whole build (list and content hashes from precache.json, written
// by build.py) so the page loads and computes offline after one visit. The page registers it as
// sw.js?build=<hash>; a new build therefore installs a new worker, and the page offers a reload.
//
// The build's files never change under their names, so where the browser offers it (static
// routing: InstallEvent.addRoutes) they are declared to come straight from this build's cache:
// the browser answers them without starting this worker or running its fetch handler, which on
// a repeat visit otherwise stands in front of every script, the engine and its snapshot. A file
// missing from the cache goes to the network. The page itself (a navigation, which may carry a
// query) and the always-fresh descriptions stay with the fetch handler below.
const params = new URL(self.location.href).searchParams;
const BUILD = params.get("build") || "dev";
const CACHE = `drift-dose-${BUILD}`;
const ALWAYS_FRESH = new Set(["build-info.json", "precache.json"]);
const SCOPE = new URL("./", self.location.href);

const literal = (text) => text.replace(/[\\*+?:(){}]/g, "\\$&"); // as a URL pattern

/** Static routes for the listed files of this build: folders by prefix, other files by name. */
function cacheRoutes(urls) {
  const patterns = new Set();
  for (const url of urls) {
    if (ALWAYS_FRESH.has(url) || url === "sw.js" || url === "index.html") continue;
    const slash = url.indexOf("/");
    patterns.add(slash > 0 ? `${literal(url.slice(0, slash + 1))}*` : literal(url));
  }
  const or = [...patterns].sort().map((p) => ({
    urlPattern: new URLPattern({ pathname: literal(SCOPE.pathname) + p, search: "", baseURL: SCOPE.href }),
  }));
  return [{ condition: { or }, source: { cacheName: CACHE } }];
}

self.addEventListener("install", (event) => {
  event.waitUntil((async () => {
    const list = await (await fetch("precache.json", { cache: "no-store" })).json();
    const cache = await caches.open(CACHE);
    // past the HTTP cache: a host without cache headers must not mix an older build's files in
    await cache.addAll(["./", ...list.files.map((f) => f.url)].map((url) => new Request(url, { cache: "reload" })));
    if (typeof event.addRoutes === "function" && typeof URLPattern === "function") {
      // only once everything is cached; a browser that refuses the routes keeps the handler
      await event.addRoutes(cacheRoutes(list.files.map((f) => f.url))).catch(() => {});
    }
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

let opened = null; // this build's cache, opened once per start of this worker

self.addEventListener("fetch", (event) => {
  const request = event.request;
  const url = new URL(request.url);
  if (request.method !== "GET" || url.origin !== self.location.origin) return;
  const path = url.pathname.slice(SCOPE.pathname.length);
  if (ALWAYS_FRESH.has(path)) {
    event.respondWith(fetch(request).catch(() => caches.match(request, { ignoreSearch: true })));
    return;
  }
  event.respondWith((async () => {
    opened ??= caches.open(CACHE);
    const cache = await opened;
    // the exact entry first (an indexed look-up); a query string (a link to the page) is
    // looked up without it, which reads every entry
    const cached = (await cache.match(request)) || (url.search ? await cache.match(request, { ignoreSearch: true }) : undefined);
    return cached || fetch(request);
  })());
});
