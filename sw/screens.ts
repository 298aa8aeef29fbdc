/// <reference lib="webworker" />
import type { PrecacheEntry, RuntimeCaching } from "serwist";
import { SCREENS_CACHE_PREFIX } from "../lib/client/cache-names";

// Moving between screens with no signal, without reloading the page.
//
// The precache holds every screen's HTML, which is enough to OPEN a screen offline. But a tap on a link
// (or router.push after a save) is a client-side navigation: the Next.js router asks the server for the
// screen's React Server Component payload (a GET to the screen's address with the `RSC: 1` header and
// an `_rsc=` cache-busting query). With no signal that request fails, the router logs "Failed to fetch
// RSC payload … Falling back to browser navigation" and reloads the whole document.
//
// Every farm screen is prerendered (static): its payload is the same for everyone, whatever the query
// (?id=, ?bag=) and whatever screen the router comes from (the server answers the build's stored
// payload, marked `x-nextjs-prerender: 1`). So, like the HTML, each screen's payload is fetched once per
// build when the worker installs, and the router's navigation requests are answered from it. The data
// a screen shows comes from the phone store, so nothing else is needed to render it.
//
// Prefetches (`Next-Router-Prefetch`, per-segment) are left to the network: when they fail offline the
// router falls back to the navigation request answered here.

type Manifest = readonly (PrecacheEntry | string)[];

/** The screens in the precache list: same-origin addresses that are routes, not files or build assets. */
export function screenRoutes(manifest: Manifest): { routes: string[]; revision: string } {
  const routes: string[] = [];
  let revision = "";
  for (const entry of manifest) {
    const url = typeof entry === "string" ? entry : entry.url;
    if (!url.startsWith("/") || url.startsWith("/_next/") || /\.[a-z0-9]+$/i.test(url)) continue;
    routes.push(url);
    if (!revision && typeof entry !== "string" && entry.revision) revision = entry.revision;
  }
  return { routes, revision };
}

/** A navigation request of the Next.js router for a screen's payload (not a prefetch). */
function isScreenPayloadRequest(request: Request): boolean {
  return (
    request.method === "GET" &&
    request.headers.get("RSC") === "1" &&
    !request.headers.has("Next-Router-Prefetch") &&
    !request.headers.has("Next-Router-Segment-Prefetch")
  );
}

/** Fetches one screen's payload as the router would from the screen it came from; null when not a static one. */
async function fetchScreenPayload(route: string): Promise<Response | null> {
  // Redirects are followed: the server first points a request without the right `_rsc` value to it.
  const res = await fetch(route, { headers: { RSC: "1" }, credentials: "same-origin", cache: "no-store" });
  const landed = new URL(res.url).pathname;
  // The header may come twice ("1, 1"): any "1" marks the build's stored payload.
  const prerendered = (res.headers.get("x-nextjs-prerender") ?? "").split(",").some((v) => v.trim() === "1");
  if (!res.ok || landed !== route || !prerendered || !(res.headers.get("content-type") ?? "").startsWith("text/x-component")) return null;
  // Stored under the bare address, without the Vary header: the payload does not depend on the router's headers.
  const headers = new Headers(res.headers);
  headers.delete("Vary");
  return new Response(await res.arrayBuffer(), { status: 200, headers });
}

export function screenPayloads(manifest: Manifest) {
  const { routes, revision } = screenRoutes(manifest);
  const cacheName = `${SCREENS_CACHE_PREFIX}${revision || "build"}`;
  const known = new Set(routes);

  /** At install: one payload per screen. A screen that fails here is fetched from the network later. */
  async function store(): Promise<void> {
    const cache = await caches.open(cacheName);
    await Promise.all(
      routes.map(async (route) => {
        try {
          const payload = await fetchScreenPayload(route);
          if (payload) await cache.put(route, payload);
        } catch {
          /* no signal during install: this screen's navigations go to the network, as before */
        }
      }),
    );
  }

  /** At activation: payloads of earlier builds go (they would not match this build's scripts). */
  async function dropOldBuilds(): Promise<void> {
    for (const name of await caches.keys()) {
      if (name.startsWith(SCREENS_CACHE_PREFIX) && name !== cacheName) await caches.delete(name);
    }
  }

  /** Answers the router's navigation requests for a known screen from this build's payloads (network if missing). */
  const runtimeCaching: RuntimeCaching = {
    matcher: ({ request, url, sameOrigin }) => sameOrigin && known.has(url.pathname) && isScreenPayloadRequest(request),
    handler: async ({ request, url }) => {
      const hit = await (await caches.open(cacheName)).match(url.pathname);
      return hit ?? fetch(request);
    },
  };

  return { cacheName, store, dropOldBuilds, runtimeCaching };
}
