import fs from "node:fs";
import path from "node:path";
import { createHash, randomUUID } from "node:crypto";
import withSerwistInit from "@serwist/next";
import { securityHeaders } from "./security-headers.mjs";

/**
 * Every app screen's address, found from the app/ folder, for the service worker to precache
 * (webpack mode precaches scripts and styles but not route HTML). Route groups vanish from the
 * address; API routes and dev-only pages are left out; a dynamic detail route is included only as
 * its "_" shell when its page opts in by using OFFLINE_SHELL_ID (lib/client/route-id.ts).
 */
function appRoutes(dir = "app", segments = []) {
  const routes = [];
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    if (!entry.isDirectory()) continue;
    const name = entry.name;
    if (name === "api" || name === "dev" || name.startsWith("_") || name.startsWith("@")) continue;
    const full = path.join(dir, name);
    let segment = name;
    if (name.startsWith("(") && name.endsWith(")")) segment = null;
    else if (name.startsWith("[")) {
      const page = path.join(full, "page.tsx");
      if (!fs.existsSync(page) || !fs.readFileSync(page, "utf8").includes("OFFLINE_SHELL_ID")) continue;
      segment = "_";
    }
    const next = segment ? [...segments, segment] : segments;
    if (fs.existsSync(path.join(full, "page.tsx"))) routes.push(`/${next.join("/")}`);
    routes.push(...appRoutes(full, next));
  }
  return routes;
}

const routes = ["/", "/manifest.webmanifest", ...new Set(appRoutes())];
// One revision per build: a new deployment replaces every precached page.
const revision = process.env.RIMEBOOK_BUILD_ID || randomUUID();

/** Rimebook's icons in public/icons, revisioned by content (listing routes replaces Serwist's own public scan). */
function publicAssets(dir = "public/icons") {
  if (!fs.existsSync(dir)) return [];
  return fs
    .readdirSync(dir)
    .filter((f) => /\.(png|svg|ico|webp)$/.test(f))
    .map((f) => ({ url: `/${path.posix.join("icons", f)}`, revision: createHash("sha256").update(fs.readFileSync(path.join(dir, f))).digest("hex").slice(0, 16) }));
}

// Several builds can share this tree (NEXT_DIST_DIR): each writes its own worker file so one build's
// worker never points at another build's scripts. The default build serves /sw.js.
const distDir = process.env.NEXT_DIST_DIR || ".next";
const swFile = distDir === ".next" ? "sw.js" : `sw-${distDir.replace(/[^a-z0-9]+/gi, "") || "build"}.js`;

const withSerwist = withSerwistInit({
  swSrc: "sw/index.ts",
  swDest: `public/${swFile}`,
  swUrl: `/${swFile}`,
  // `next dev` runs on Turbopack without the service worker.
  disable: process.env.NODE_ENV === "development",
  // Reloading on reconnect would throw away a half-filled check; the sync loop handles reconnects.
  reloadOnOnline: false,
  // Registered by lib/client/service-worker.ts, which survives a browser that has none or blocks it.
  register: false,
  cacheOnNavigation: false,
  // Fonts, scripts and styles come from the webpack build; routes and icons are listed here.
  additionalPrecacheEntries: [...routes.map((url) => ({ url, revision })), ...publicAssets()],
});

/** @type {import('next').NextConfig} */
const nextConfig = {
  reactStrictMode: true,
  // Parallel local builds (several people in one tree) each get their own output folder.
  distDir,
  poweredByHeader: false,
  // Bundle analysis only (RIMEBOOK_SOURCE_MAPS=1 with its own NEXT_DIST_DIR): browser source maps to attribute each chunk's bytes.
  productionBrowserSourceMaps: process.env.RIMEBOOK_SOURCE_MAPS === "1",
  // knex resolves every dialect driver dynamically; keep it (and the native sqlite binding) out of the bundle.
  serverExternalPackages: ["knex", "better-sqlite3", "pg", "smtp-server", "nodemailer", "web-push"],
  // `next dev` runs on Turbopack; production builds use webpack (`next build --webpack`) for the service worker.
  turbopack: {},
  // The e2e harness builds with NEXT_SKIP_TYPECHECK=1: CI runs `tsc --noEmit` as its own step just before.
  typescript: { ignoreBuildErrors: process.env.NEXT_SKIP_TYPECHECK === "1" },
  // CSP, referrer policy, framing, sniffing and camera permission for every response (security-headers.mjs).
  async headers() {
    return [
      { source: "/:path*", headers: securityHeaders({ dev: process.env.NODE_ENV !== "production" }) },
      // The worker must always be fetched fresh so a new build's pages replace the old ones.
      { source: `/${swFile}`, headers: [{ key: "Cache-Control", value: "no-cache, no-store, must-revalidate" }] },
    ];
  },
};

export default withSerwist(nextConfig);
