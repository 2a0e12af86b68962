/// <reference lib="webworker" />
import { cleanupOutdatedCaches, precacheAndRoute } from "workbox-precaching";
import { registerRoute } from "workbox-routing";
import { NetworkFirst, StaleWhileRevalidate } from "workbox-strategies";

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
// Shown for a field page this phone has never stored (a page first opened with no signal).
const OFFLINE_FALLBACK = "/field/offline";

// Only a signed-in page is kept: never a redirect to sign-in, an error page or another origin's answer.
function keepable(res: Response): boolean {
  return res.status === 200 && res.type === "basic" && !res.redirected;
}

const fieldPages = new NetworkFirst({
  cacheName: FIELD_PAGES,
  networkTimeoutSeconds: 4,
  plugins: [
    {
      // One copy per page: field pages read their record from the query string in the browser.
      cacheKeyWillBeUsed: async ({ request }) => {
        const url = new URL(request.url);
        url.search = "";
        return url.href;
      },
      cacheWillUpdate: async ({ response }) => (keepable(response) ? response : null),
    },
  ],
});

registerRoute(
  ({ request, url }) => !neverCached(url) && request.mode === "navigate" && url.pathname.startsWith("/field"),
  async (options) => {
    try {
      return await fieldPages.handle(options);
    } catch {
      // No signal and no stored copy: the fallback page beats the browser's error page.
      const fallback = await caches.match(OFFLINE_FALLBACK, { cacheName: FIELD_PAGES });
      return fallback ?? Response.error();
    }
  },
);

// The install manifest and its icons, for the home-screen icon and splash screen offline.
registerRoute(
  ({ url }) =>
    url.origin === self.location.origin &&
    (url.pathname === "/manifest.webmanifest" || url.pathname.startsWith("/icons/")),
  new StaleWhileRevalidate({ cacheName: "app-icons" }),
);

// The page asks for the field app's pages to be stored right after the first visit, so they open
// offline without a second online visit.
async function cacheFieldPages(urls: string[]) {
  const cache = await caches.open(FIELD_PAGES);
  await Promise.all(
    urls
      .filter((u) => new URL(u, self.location.origin).pathname.startsWith("/field"))
      .map(async (u) => {
        const res = await fetch(u, { credentials: "same-origin" });
        if (keepable(res)) await cache.put(u, res);
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
