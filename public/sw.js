// Bufferwright service worker: cache-first for same-origin GET requests.
// This file is a template: scripts/postbuild.mjs (trunk post_build hook) replaces the two
// placeholders below with a per-build version and the list of hashed files in dist/.
/* global self, caches, fetch */
const CACHE_VERSION = '__BUFFERWRIGHT_CACHE_VERSION__';
const PRECACHE = ['__BUFFERWRIGHT_PRECACHE__'];
const CACHE_NAME = `bufferwright-${CACHE_VERSION}`;

self.addEventListener('install', (event) => {
  event.waitUntil(
    caches
      .open(CACHE_NAME)
      .then((cache) => cache.addAll(PRECACHE.map((path) => new Request(path, { cache: 'reload' }))))
      .then(() => self.skipWaiting()),
  );
});

self.addEventListener('activate', (event) => {
  event.waitUntil(
    caches
      .keys()
      .then((names) =>
        Promise.all(
          names
            .filter((name) => name.startsWith('bufferwright-') && name !== CACHE_NAME)
            .map((name) => caches.delete(name)),
        ),
      )
      .then(() => self.clients.claim()),
  );
});

self.addEventListener('fetch', (event) => {
  const request = event.request;
  if (request.method !== 'GET') return;
  const url = new URL(request.url);
  if (url.origin !== self.location.origin) return;
  // Only navigations to the app's own page (the folder URL or index.html, with any query or
  // fragment) are answered by the cached shell. Every other navigation (a sibling page such as
  // embed-example.html, a documentation page, a mistyped address) goes to the network as usual.
  const scope = new URL('./', self.registration.scope);
  if (request.mode === 'navigate') {
    const appPage = url.pathname === scope.pathname || url.pathname === `${scope.pathname}index.html`;
    if (!appPage) return;
  }
  const key = request.mode === 'navigate' ? scope.href : request;
  event.respondWith(
    caches.open(CACHE_NAME).then((cache) =>
      cache.match(key, { ignoreSearch: request.mode === 'navigate' }).then(
        (hit) =>
          hit ||
          fetch(request).then((response) => {
            if (response.ok && response.type === 'basic') cache.put(request, response.clone());
            return response;
          }),
      ),
    ),
  );
});
