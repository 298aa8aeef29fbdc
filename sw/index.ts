/// <reference lib="webworker" />
import { defaultCache } from "@serwist/next/worker";
import { ExpirationPlugin, NetworkFirst, NetworkOnly, Serwist, type PrecacheEntry, type SerwistGlobalConfig } from "serwist";
import { listenForReminders } from "./reminders";
import { screenPayloads } from "./screens";

// Rimebook's service worker: the app shell and every app route are precached per build (listed in
// next.config.mjs), so each screen opens in a barn with no signal. Farm data never lives here: it
// is in the phone store (IndexedDB) and travels through /api/sync, which is never cached.

declare global {
  interface WorkerGlobalScope extends SerwistGlobalConfig {
    __SW_MANIFEST: (PrecacheEntry | string)[] | undefined;
  }
}
declare const self: ServiceWorkerGlobalScope;

const manifest = self.__SW_MANIFEST ?? [];

/** Each screen's router payload, so moving between screens offline needs no reload (sw/screens.ts). */
const screens = screenPayloads(manifest);

/** Placeholder id of a detail route's prerendered shell (lib/client/route-id.ts). */
const SHELL_ID = "_";

/** A hanging connection (one bar of signal) counts as none after a while. */
function withTimeout<T>(p: Promise<T>, ms: number): Promise<T> {
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("timeout")), ms);
    p.then((v) => (clearTimeout(timer), resolve(v)), (e) => (clearTimeout(timer), reject(e)));
  });
}

const serwist: Serwist = new Serwist({
  precacheEntries: manifest,
  skipWaiting: true,
  clientsClaim: true,
  navigationPreload: false,
  runtimeCaching: [
    // The router's requests for a screen (client-side navigation), answered from this build's payloads.
    screens.runtimeCaching,
    // Sync, sign-in and uploads talk to the server or fail: a cached answer would be a lie.
    { matcher: ({ url, sameOrigin }) => sameOrigin && (url.pathname.startsWith("/api/sync/") || url.pathname.startsWith("/api/auth/")), handler: new NetworkOnly() },
    { matcher: ({ request }) => request.method !== "GET", handler: new NetworkOnly() },
    // Photos are immutable per id; kept a while for bag history offline (cleared at sign-out).
    {
      matcher: ({ url, sameOrigin }) => sameOrigin && /^\/api\/uploads\/[^/]+$/.test(url.pathname),
      handler: new NetworkFirst({
        cacheName: "rimebook-photos",
        networkTimeoutSeconds: 5,
        plugins: [new ExpirationPlugin({ maxEntries: 300, maxAgeSeconds: 30 * 24 * 3600 })],
      }),
    },
    // Other reads: network first, a recent copy when there is no signal (cleared at sign-out).
    {
      matcher: ({ url, sameOrigin }) => sameOrigin && url.pathname.startsWith("/api/"),
      handler: new NetworkFirst({
        cacheName: "rimebook-api",
        networkTimeoutSeconds: 8,
        plugins: [new ExpirationPlugin({ maxEntries: 100, maxAgeSeconds: 7 * 24 * 3600 })],
      }),
    },
    // Navigations the precache does not answer by itself: screens opened with a query
    // (/bags/view?id=…) or a detail id (/bags/<id>). Network first; with no signal, the route's
    // precached page (it reads the rest from the address), else the offline page.
    {
      matcher: ({ request, url, sameOrigin }) => sameOrigin && request.mode === "navigate" && !url.pathname.startsWith("/api/"),
      handler: async ({ request, url }): Promise<Response> => {
        try {
          return await withTimeout(fetch(request), 8000);
        } catch {
          const parts = url.pathname.split("/").filter(Boolean);
          const candidates = [url.pathname, `/${[...parts.slice(0, -1), SHELL_ID].join("/")}`];
          for (const candidate of candidates) {
            const hit: Response | undefined = await serwist.matchPrecache(candidate);
            if (hit) return hit;
          }
          return (await caches.match(request)) ?? (await serwist.matchPrecache("/offline")) ?? Response.error();
        }
      },
    },
    ...defaultCache,
  ],
  fallbacks: {
    entries: [{ url: "/offline", matcher: ({ request }) => request.destination === "document" }],
  },
});

serwist.addEventListeners();
// Phone reminders (Web Push): sw/reminders.ts.
listenForReminders();

self.addEventListener("install", (event) => event.waitUntil(screens.store()));
self.addEventListener("activate", (event) => event.waitUntil(screens.dropOldBuilds()));
