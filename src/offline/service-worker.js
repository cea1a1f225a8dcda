/*
 * Tracewright's offline copy (a service worker). The build writes the list of
 * its own files into FILES and a digest of their contents into VERSION
 * (see the tracewright-offline plugin in vite.config.ts).
 *
 * * install: every file of the build is put in a cache named after VERSION.
 * * activate: caches of older builds are deleted.
 * * fetch, this origin only (the page never asks another): the page itself
 *   is fetched from the server first, so a new build is seen at once, and
 *   from the cache when the server does not answer; every other file comes
 *   from the cache first. Nothing is sent anywhere.
 */
/* global __TRACEWRIGHT_FILES__ */
const VERSION = '__TRACEWRIGHT_VERSION__';
const FILES = __TRACEWRIGHT_FILES__;
const CACHE = `tracewright-${VERSION}`;

self.addEventListener('install', (event) => {
  event.waitUntil(
    caches.open(CACHE)
      .then((cache) => cache.addAll(FILES.map((f) => new Request(f, { cache: 'reload' }))))
      .then(() => self.skipWaiting()),
  );
});

self.addEventListener('activate', (event) => {
  event.waitUntil(
    caches.keys()
      .then((keys) => Promise.all(keys.filter((k) => k.startsWith('tracewright-') && k !== CACHE).map((k) => caches.delete(k))))
      .then(() => self.clients.claim()),
  );
});

self.addEventListener('fetch', (event) => {
  const request = event.request;
  if (request.method !== 'GET') return;
  if (new URL(request.url).origin !== self.location.origin) return;
  event.respondWith((async () => {
    const cache = await caches.open(CACHE);
    if (request.mode === 'navigate') {
      try {
        return await fetch(request);
      } catch {
        return (await cache.match('index.html')) || (await cache.match('./')) || Response.error();
      }
    }
    const hit = await cache.match(request, { ignoreSearch: true });
    if (hit) return hit;
    try {
      return await fetch(request);
    } catch {
      return Response.error();
    }
  })());
});
