/*
 * Airtally's service worker: pages a technician has opened stay openable without a network, so a
 * reload in a plant room without signal shows the screen again and the entries kept on the device
 * (IndexedDB, lib/offline) fill it back in. It never touches the API: what the app sends and reads
 * goes through its own queue and device copy.
 *
 *  - /_next/static/* (content-hashed, never changes): cache first.
 *  - page navigations: network first (6 s), else the copy kept from the last visit, else a short
 *    offline page. Kept pages belong to one user; another user's sign-in or a sign-out drops them.
 */
const STATIC_CACHE = "airtally-static-v1";
const PAGE_CACHE = "airtally-pages-v1";
const META_CACHE = "airtally-meta-v1";
const OWNER_KEY = "/__airtally/owner";
const NETWORK_WAIT_MS = 6000;

self.addEventListener("install", () => self.skipWaiting());
self.addEventListener("activate", (event) => event.waitUntil(self.clients.claim()));

async function currentOwner() {
  const res = await (await caches.open(META_CACHE)).match(OWNER_KEY);
  return res ? res.text() : null;
}

async function setOwner(owner) {
  if ((await currentOwner()) !== owner) await caches.delete(PAGE_CACHE);
  await (await caches.open(META_CACHE)).put(OWNER_KEY, new Response(owner));
}

async function keepFiles(files) {
  const statics = await caches.open(STATIC_CACHE);
  await Promise.all(
    files.slice(0, 300).map(async (url) => {
      if (!(await statics.match(url))) {
        const res = await fetch(url).catch(() => null);
        if (res && res.ok) await statics.put(url, res);
      }
    }),
  );
}

async function keep(page, files) {
  await keepFiles(files);
  // The page itself was loaded before this worker controlled it: fetch a copy now.
  const res = await fetch(page, { credentials: "same-origin" }).catch(() => null);
  if (res && res.ok && !res.redirected) await (await caches.open(PAGE_CACHE)).put(page, res);
}

// Messages are handled one after another: a change of user must clear the pages before new ones are kept.
let work = Promise.resolve();
function inOrder(event, task) {
  work = work.then(task, task).catch(() => undefined);
  event.waitUntil(work);
}

self.addEventListener("message", (event) => {
  const data = event.data || {};
  if (data.type === "owner" && typeof data.owner === "string") inOrder(event, () => setOwner(data.owner));
  else if (data.type === "keep" && typeof data.page === "string" && Array.isArray(data.files)) inOrder(event, () => keep(data.page, data.files.filter((f) => typeof f === "string")));
  else if (data.type === "keep-files" && Array.isArray(data.files)) inOrder(event, () => keepFiles(data.files.filter((f) => typeof f === "string")));
  else if (data.type === "forget-pages") inOrder(event, () => caches.delete(PAGE_CACHE));
});

function withTimeout(promise, ms) {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("timeout")), ms);
    promise.then(
      (v) => {
        clearTimeout(timer);
        resolve(v);
      },
      (e) => {
        clearTimeout(timer);
        reject(e);
      },
    );
  });
}

async function staticFirst(request) {
  const cache = await caches.open(STATIC_CACHE);
  const hit = await cache.match(request);
  if (hit) return hit;
  const res = await fetch(request);
  if (res.ok) await cache.put(request, res.clone());
  return res;
}

const OFFLINE_PAGE = `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><title>No network · Airtally</title>
<style>body{font-family:system-ui,sans-serif;margin:0;padding:2rem;background:#f6f7f4;color:#111a22;font-size:1.1rem;line-height:1.5}main{max-width:36rem;margin:auto}a{display:inline-block;min-height:44px;line-height:44px;padding:0 1rem;background:#0d5c8c;color:#fff;border-radius:6px;text-decoration:none;font-weight:600}</style></head>
<body><main><h1>No network, and this page was not opened here before</h1><p>What you typed on other pages is kept on this device and is sent when the connection returns. Go back to a page you had open, or try again when there is signal.</p><p><a href="javascript:history.back()">Go back</a></p></main></body></html>`;

async function pageNetworkFirst(event) {
  const { request } = event;
  const cache = await caches.open(PAGE_CACHE);
  try {
    const res = await withTimeout(fetch(request), NETWORK_WAIT_MS);
    // Keep signed-in pages only (a redirect to sign-in is not the page), and never the sign-in or sign-out page.
    const url = new URL(request.url);
    if (res.ok && !res.redirected && !url.pathname.startsWith("/sign-")) event.waitUntil(cache.put(request.url, res.clone()));
    return res;
  } catch {
    const hit = await cache.match(request.url);
    if (hit) return hit;
    return new Response(OFFLINE_PAGE, { status: 503, headers: { "content-type": "text/html; charset=utf-8" } });
  }
}

self.addEventListener("fetch", (event) => {
  const { request } = event;
  if (request.method !== "GET") return;
  const url = new URL(request.url);
  if (url.origin !== self.location.origin || url.pathname.startsWith("/api/")) return;
  if (url.pathname.startsWith("/_next/static/")) event.respondWith(staticFirst(request));
  else if (request.mode === "navigate") event.respondWith(pageNetworkFirst(event));
});
