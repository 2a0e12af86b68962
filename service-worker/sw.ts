/// <reference lib="webworker" />
import { cleanupOutdatedCaches, precacheAndRoute } from "workbox-precaching";
import { registerRoute } from "workbox-routing";
import { NetworkFirst } from "workbox-strategies";

declare const self: ServiceWorkerGlobalScope & {
  __WB_MANIFEST: Array<{ url: string; revision: string | null }>;
};

// Built assets of this release (scripts, styles, fonts), precached at install.
precacheAndRoute(self.__WB_MANIFEST);
cleanupOutdatedCaches();

// Never answered from a cache: sync, sign-in and anything that is not this origin (the photo bucket).
function neverCached(url: URL): boolean {
  return (
    url.origin !== self.location.origin ||
    url.pathname.startsWith("/api/sync") ||
    url.pathname.startsWith("/api/auth")
  );
}

// The field app's pages: fresh from the network when there is signal, the last copy when there is
// none. A slow rural connection falls back to the cache after 4 s.
const FIELD_PAGES = "field-pages";

registerRoute(
  ({ request, url }) => !neverCached(url) && request.mode === "navigate" && url.pathname.startsWith("/field"),
  new NetworkFirst({ cacheName: FIELD_PAGES, networkTimeoutSeconds: 4 }),
);

// The page asks for the field app's pages to be stored right after the first visit, so they open
// offline without a second online visit. Only a signed-in, non-redirected answer is kept.
async function cacheFieldPages(urls: string[]) {
  const cache = await caches.open(FIELD_PAGES);
  await Promise.all(
    urls
      .filter((u) => new URL(u, self.location.origin).pathname.startsWith("/field"))
      .map(async (u) => {
        const res = await fetch(u, { credentials: "same-origin" });
        if (res.ok && !res.redirected) await cache.put(u, res);
      }),
  );
}

self.addEventListener("message", (event) => {
  // A new version waits until the user chooses to reload, so a half-filled form is never lost.
  if (event.data?.type === "SKIP_WAITING") void self.skipWaiting();
  if (event.data?.type === "CACHE_FIELD_PAGES" && Array.isArray(event.data.urls)) {
    event.waitUntil(cacheFieldPages(event.data.urls));
  }
  // Signing out forgets the stored pages: they hold the signed-in user's data.
  if (event.data?.type === "CLEAR_FIELD_PAGES") event.waitUntil(caches.delete(FIELD_PAGES));
});

// The first install takes control at once, so the page that installed it already works offline.
self.addEventListener("activate", (event) => {
  event.waitUntil(self.clients.claim());
});
