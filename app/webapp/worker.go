package webapp

// workerJS is Pairline's service worker, used as go-app's
// ServiceWorkerTemplate ({{.Version}} and {{.ResourcesToCache}} are filled in
// by go-app; the list is the served set, Served, without the worker itself,
// as TestWorkerCachesTheServedSet checks). It differs from go-app's default in three ways that matter
// offline:
//   - install waits (event.waitUntil) until every resource is cached, so the
//     worker only takes over once the app can start with the server gone;
//   - requests to other origins are never answered from or added to the cache
//     (the app makes none; the Content-Security-Policy forbids them);
//   - a navigation that is not cached (for example "/?session=…") falls back
//     to the cached start page.
//
// A new version installs in the background and takes over (skipWaiting); the
// page is not reloaded: the app shows a banner and the technician reloads
// when it suits. The worker does not claim pages on first install, so a
// first visit is not mistaken for an update; the next navigation, online or
// offline, goes through it.
const workerJS = `// Pairline service worker, version {{.Version}}
const cacheName = "pairline-{{.Version}}";
const resourcesToCache = {{.ResourcesToCache}};

self.addEventListener("install", (event) => {
  event.waitUntil((async () => {
    const cache = await caches.open(cacheName);
    await cache.addAll(resourcesToCache.map((u) => new Request(u, { cache: "reload" })));
    await self.skipWaiting();
  })());
});

self.addEventListener("activate", (event) => {
  event.waitUntil((async () => {
    const keys = await caches.keys();
    await Promise.all(keys
      .filter((k) => k !== cacheName && k.startsWith("pairline-"))
      .map((k) => caches.delete(k)));
  })());
});

self.addEventListener("fetch", (event) => {
  const req = event.request;
  if (req.method !== "GET") {
    return;
  }
  const url = new URL(req.url);
  if (url.origin !== self.location.origin) {
    return;
  }
  event.respondWith((async () => {
    const cache = await caches.open(cacheName);
    const cached = await cache.match(req, { ignoreSearch: req.mode === "navigate" });
    if (cached) {
      return cached;
    }
    try {
      return await fetch(req);
    } catch (err) {
      if (req.mode === "navigate") {
        const start = await cache.match("/");
        if (start) {
          return start;
        }
      }
      throw err;
    }
  })());
});
`
