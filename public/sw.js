// Tidewell's service worker (hand-written, as Next.js' guidance for progressive web apps shows).
// Same-origin GET requests only; everything else (sign-in, server actions, API writes, the live
// stream) goes straight to the network.
//  - /_next/static/ and /icons/: cache first (file names carry a content hash or never change).
//  - The tank wall, tank pages and calibration runs, and the JSON they read: network first; the
//    last good answer is kept, stamped with when it was fetched, and shown when offline.
//  - Any other page while offline: the offline page.
const VERSION = "tidewell-v1";
const STATIC = `${VERSION}-static`;
const PAGES = `${VERSION}-pages`;
const OFFLINE_URL = "/offline";

const KEPT_PAGES = [/^\/$/, /^\/tanks$/, /^\/tanks\/\d+$/, /^\/calibrations\/runs\/\d+$/];
const KEPT_API = [/^\/api\/tanks$/, /^\/api\/tanks\/\d+$/, /^\/api\/tanks\/\d+\/series$/, /^\/api\/calibrations\/runs\/\d+$/, /^\/api\/me$/];

self.addEventListener("install", (event) => {
  event.waitUntil(
    caches
      .open(STATIC)
      .then((cache) => cache.addAll([OFFLINE_URL, "/icons/icon-192.png", "/manifest.webmanifest"]))
      .then(() => self.skipWaiting()),
  );
});

self.addEventListener("activate", (event) => {
  event.waitUntil(
    caches
      .keys()
      .then((keys) => Promise.all(keys.filter((k) => !k.startsWith(VERSION)).map((k) => caches.delete(k))))
      .then(() => self.clients.claim()),
  );
});

// The page asks for this when someone signs out or in: kept pages hold that user's farm data.
self.addEventListener("message", (event) => {
  if (event.data && event.data.type === "forget-pages") event.waitUntil(caches.delete(PAGES));
});

self.addEventListener("fetch", (event) => {
  const request = event.request;
  if (request.method !== "GET") return;
  const url = new URL(request.url);
  if (url.origin !== self.location.origin) return;
  if (url.pathname.startsWith("/_next/static/") || url.pathname.startsWith("/icons/")) {
    event.respondWith(cacheFirst(request));
    return;
  }
  const isRsc = request.headers.get("RSC") === "1" || url.searchParams.has("_rsc");
  if (request.mode === "navigate") {
    const keep = KEPT_PAGES.some((re) => re.test(url.pathname));
    event.respondWith(networkFirst(request, keep, true, request.url));
    return;
  }
  // JSON is kept per path, whatever its query (a chart asks for a moving time range): offline, the
  // last answer for that path is shown.
  if (!isRsc && KEPT_API.some((re) => re.test(url.pathname))) event.respondWith(networkFirst(request, true, false, url.origin + url.pathname));
});

async function cacheFirst(request) {
  const cached = await caches.match(request);
  if (cached) return cached;
  const response = await fetch(request);
  if (response.ok) (await caches.open(STATIC)).put(request, response.clone());
  return response;
}

/** The network's answer (kept when good); offline, the kept answer, or the offline page for a navigation. */
async function networkFirst(request, keep, navigation, key) {
  try {
    const response = await fetch(request);
    if (keep && response.ok && !response.redirected && response.type === "basic") {
      const stamped = await stamp(response.clone());
      (await caches.open(PAGES)).put(key, stamped);
    }
    return response;
  } catch (err) {
    const cached = await caches.match(key, { cacheName: PAGES });
    if (cached) return cached;
    if (navigation) {
      const offline = await caches.match(OFFLINE_URL, { cacheName: STATIC });
      if (offline) return offline;
    }
    throw err;
  }
}

/** A copy of the response with the time it was fetched, for the "offline — last updated at" line. */
async function stamp(response) {
  const headers = new Headers(response.headers);
  headers.set("x-tidewell-fetched-at", String(Date.now()));
  return new Response(await response.blob(), { status: response.status, statusText: response.statusText, headers });
}
