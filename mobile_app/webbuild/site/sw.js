// Boardside's service worker: keeps the whole site in the browser so it starts with no network.
//
// The build writes the site's files into SITE below, in groups: "runtime" (the Flet web client and
// Python), "libraries" (the app's Python dependencies), "export" (the PDF library and fonts, loaded by
// the page on the first export), "fonts" (the screen's fallback font, which the PDF uses too) and "app"
// (Boardside's own code, page, icons).
// Each group is cached under a name made from its files' hashes, so an update downloads only the
// groups that changed; the others are kept as they are. Requests are answered from the cache; a file
// not in the cache is fetched from the site's own host; requests for any other host are refused here,
// never sent, except those to the office folder's host: the page's Python names that one origin in
// the cache OFFICE (mobile_app/browser/network.py) before it syncs, and the sync's requests to it go
// to the network as they are (never cached). Caches named in SITE.keep (the Python worker's start-up
// snapshot of this version, the office folder's name) stay; other caches of Boardside's from earlier
// versions are deleted when this version takes over.
const SITE = "@SITE_FILES@";
const PREFIX = "boardside-";
const OFFICE = "boardside-office-folder";

function cacheName(group) {
  return PREFIX + group.name + "-" + group.version;
}

async function isComplete(cache, group) {
  const keys = await cache.keys();
  const cached = new Set(keys.map((request) => request.url));
  return group.files.every((file) => cached.has(new URL(file, self.registration.scope).href));
}

async function fill(group) {
  const cache = await caches.open(cacheName(group));
  if (await isComplete(cache, group)) {
    return;
  }
  // "no-cache": revalidate with the host, so a stale copy in the HTTP cache is never kept.
  await cache.addAll(group.files.map((file) => new Request(file, { cache: "no-cache" })));
}

self.addEventListener("install", (event) => {
  event.waitUntil(Promise.all(SITE.groups.map(fill)));
});

self.addEventListener("activate", (event) => {
  const current = new Set([...SITE.groups.map(cacheName), ...SITE.keep]);
  event.waitUntil(
    caches.keys().then((names) =>
      Promise.all(
        names.filter((name) => name.startsWith(PREFIX) && !current.has(name)).map((name) => caches.delete(name)),
      ),
    ).then(() => self.clients.claim()),
  );
});

async function fromCache(request) {
  for (const group of SITE.groups) {
    const cache = await caches.open(cacheName(group));
    const found = await cache.match(request, { ignoreSearch: true });
    if (found) {
      return found;
    }
  }
  return null;
}

async function answer(request) {
  const url = new URL(request.url);
  const page = request.mode === "navigate" ? new URL(SITE.page, self.registration.scope) : url;
  const cached = await fromCache(new Request(page.href));
  if (cached) {
    return cached;
  }
  return fetch(request);
}

// A request to another host: sent only if that host is the office folder's, else refused unsent.
async function elsewhere(request) {
  const named = await (await caches.open(OFFICE)).match("office-origin");
  if (named && new URL(request.url).origin === (await named.text())) {
    return fetch(request);
  }
  return Response.error();
}

self.addEventListener("fetch", (event) => {
  const url = new URL(event.request.url);
  if (url.origin !== self.location.origin) {
    event.respondWith(elsewhere(event.request));
    return;
  }
  if (event.request.method !== "GET") {
    return;
  }
  event.respondWith(answer(event.request));
});
