/* global self, caches -- service worker globals */
/*
 * Slotsmith's service worker: after the first load the app starts with the network off. The build
 * (vite.config.ts, offlineWorker) replaces the two marked values with the built file list and a
 * version made from it; in the dev server it is never registered.
 *
 * Built files are precached and served cache-first (their names carry content hashes); a page load
 * tries the network first so a new version is seen at once, and falls back to the cached page.
 */
const VERSION = 'dev'; /* slotsmith:version */
const PRECACHE = []; /* slotsmith:precache */
const CACHE = `slotsmith-${VERSION}`;

self.addEventListener('install', (event) => {
  event.waitUntil(
    caches
      .open(CACHE)
      .then((cache) => cache.addAll(PRECACHE))
      .then(() => self.skipWaiting()),
  );
});

self.addEventListener('activate', (event) => {
  event.waitUntil(
    caches
      .keys()
      .then((keys) => Promise.all(keys.filter((key) => key.startsWith('slotsmith-') && key !== CACHE).map((key) => caches.delete(key))))
      .then(() => self.clients.claim()),
  );
});

self.addEventListener('fetch', (event) => {
  const request = event.request;
  if (request.method !== 'GET' || new URL(request.url).origin !== self.location.origin) return;
  if (request.mode === 'navigate') {
    event.respondWith(
      fetch(request).catch(() => caches.open(CACHE).then((cache) => cache.match('/', { ignoreVary: true })).then((page) => page ?? Response.error())),
    );
    return;
  }
  event.respondWith(
    caches
      .open(CACHE)
      .then((cache) => cache.match(request, { ignoreSearch: true, ignoreVary: true }))
      .then((hit) => hit ?? fetch(request)),
  );
});
