// Glowgap offline worker.
// On install it fetches the page, caches it together with every asset the page names
// (scripts, wasm, styles, icon, manifest: names carry content hashes), and takes over open
// pages at once. Requests are answered from the cache first, from the network otherwise;
// the page itself is refreshed in the background so a new build is picked up on the next
// visit. All URLs are relative to the worker, so the app works under any path.
'use strict';

const CACHE = 'glowgap-v1';
const ASSET = /["'(]([^"'()\s]+\.(?:js|wasm|css|svg|png|webmanifest|json|ico))(?:[?#][^"'()\s]*)?["')]/g;

function scopeUrl(path) {
  return new URL(path, self.registration.scope).href;
}

// The asset URLs named in a page's HTML, resolved against the worker's scope.
function assetsOf(html) {
  const found = new Set();
  for (const m of html.matchAll(ASSET)) {
    const u = m[1];
    if (/^(?:[a-z]+:)?\/\//i.test(u) || u.startsWith('data:')) continue;
    found.add(scopeUrl(u));
  }
  return [...found];
}

// Fetch the page and everything it names into the cache.
async function precache() {
  const cache = await caches.open(CACHE);
  const index = scopeUrl('./');
  const res = await fetch(index, { cache: 'no-cache' });
  if (!res.ok) throw new Error('page fetch failed: ' + res.status);
  const html = await res.clone().text();
  const assets = assetsOf(html).concat([scopeUrl('sw.js')]);
  await cache.put(index, res);
  await Promise.all(
    assets.map(async (u) => {
      try {
        const r = await fetch(u, { cache: 'no-cache' });
        if (r.ok) await cache.put(u, r);
      } catch (_) {
        /* one missing asset must not stop the rest */
      }
    })
  );
  return assets;
}

self.addEventListener('install', (event) => {
  event.waitUntil(precache().then(() => self.skipWaiting()));
});

self.addEventListener('activate', (event) => {
  event.waitUntil(
    caches
      .keys()
      .then((keys) => Promise.all(keys.filter((k) => k.startsWith('glowgap-') && k !== CACHE).map((k) => caches.delete(k))))
      .then(() => self.clients.claim())
  );
});

// A newer page: cache it and the assets it names, drop assets no longer named.
async function refreshPage(index) {
  try {
    const res = await fetch(index, { cache: 'no-cache' });
    if (!res.ok) return;
    const html = await res.clone().text();
    const cache = await caches.open(CACHE);
    const old = await cache.match(index);
    if (old && (await old.text()) === html) return;
    const assets = assetsOf(html);
    for (const u of assets) {
      if (!(await cache.match(u))) {
        const r = await fetch(u, { cache: 'no-cache' });
        if (r.ok) await cache.put(u, r);
      }
    }
    await cache.put(index, res);
    const keep = new Set(assets.concat([index, scopeUrl('sw.js')]));
    for (const req of await cache.keys()) {
      if (!keep.has(req.url)) await cache.delete(req);
    }
  } catch (_) {
    /* offline: keep what we have */
  }
}

self.addEventListener('fetch', (event) => {
  const req = event.request;
  if (req.method !== 'GET') return;
  const url = new URL(req.url);
  if (url.origin !== self.location.origin) return;
  const index = scopeUrl('./');
  const isPage = req.mode === 'navigate' || url.href === index || url.href === scopeUrl('index.html');
  if (isPage) {
    event.respondWith(
      (async () => {
        const cache = await caches.open(CACHE);
        const hit = await cache.match(index);
        if (hit) {
          event.waitUntil(refreshPage(index));
          return hit;
        }
        const res = await fetch(req);
        if (res.ok) await cache.put(index, res.clone());
        return res;
      })()
    );
    return;
  }
  event.respondWith(
    (async () => {
      const cache = await caches.open(CACHE);
      const hit = await cache.match(req, { ignoreSearch: true });
      if (hit) return hit;
      const res = await fetch(req);
      if (res.ok && url.href.startsWith(self.registration.scope)) await cache.put(req, res.clone());
      return res;
    })()
  );
});
