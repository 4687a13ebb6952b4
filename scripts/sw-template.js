/* Warmfold's service worker. scripts/service-worker.ts writes it to dist/sw.js after the web
 * export: it fills in the list of the build's files to precache and the folder of the
 * Workbox runtime copied beside it. Plain script (importScripts), no bundler. */
importScripts('/__WORKBOX_DIR__/workbox-sw.js');
workbox.setConfig({ modulePathPrefix: '/__WORKBOX_DIR__/', debug: false });

const { core, precaching, routing, strategies, expiration } = workbox;

core.setCacheNameDetails({ prefix: 'warmfold' });
/** API answers (patient data): deleted when someone signs out. Never holds /api/auth answers. */
const API_CACHE = 'warmfold-api';
/** Pages opened online, by their own path (a flowsheet's page is generic; its data is in API_CACHE). */
const PAGE_CACHE = 'warmfold-pages';

/** Each route's pattern and its pre-rendered page, the same mapping as server/web.ts. */
const PAGES = __PAGE_ROUTES__;

// The new build waits until the page asks it to take over (the "new version" prompt), so a page
// never runs half old, half new scripts; clientsClaim lets the first install control the page at once.
self.addEventListener('message', (event) => {
  const type = event.data && event.data.type;
  if (type === 'SKIP_WAITING') self.skipWaiting();
  if (type === 'CLEAR_PATIENT_DATA') event.waitUntil(caches.delete(API_CACHE));
});
core.clientsClaim();
precaching.cleanupOutdatedCaches();
precaching.precacheAndRoute(self.__WB_MANIFEST);

/** The pre-rendered page for a path (infants/[id]/record.html for /infants/abc/record). */
function pageFor(pathname) {
  for (const [pattern, file] of PAGES) if (new RegExp(pattern).test(pathname)) return file;
  return '/+not-found.html';
}

// Pages: the network first; with no connection the page last opened at that path, else the
// build's pre-rendered page for the route.
routing.registerRoute(
  ({ request }) => request.mode === 'navigate',
  new strategies.NetworkFirst({
    cacheName: PAGE_CACHE,
    networkTimeoutSeconds: 6,
    plugins: [
      { cacheWillUpdate: async ({ response }) => (response && response.status === 200 ? response : null) },
      { handlerDidError: async ({ request }) => precaching.matchPrecache(pageFor(new URL(request.url).pathname)) },
      new expiration.ExpirationPlugin({ maxEntries: 60 }),
    ],
  }),
);

// API reads: the network first, the last answer when there is no connection. Sign-in, sign-out,
// the session check and every other /api/auth answer are never stored; writes are never stored.
routing.registerRoute(
  ({ url, request }) => url.origin === self.location.origin && request.method === 'GET' && url.pathname.startsWith('/api/') && !url.pathname.startsWith('/api/auth'),
  new strategies.NetworkFirst({
    cacheName: API_CACHE,
    networkTimeoutSeconds: 8,
    plugins: [
      {
        cacheWillUpdate: async ({ response }) =>
          response && response.status === 200 && (response.headers.get('Content-Type') || '').startsWith('application/json') ? response : null,
      },
      new expiration.ExpirationPlugin({ maxEntries: 300, maxAgeSeconds: 7 * 24 * 3600 }),
    ],
  }),
);
