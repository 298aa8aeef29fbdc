import { securityHeaders } from "./security-headers.mjs";

/** @type {import('next').NextConfig} */
const nextConfig = {
  reactStrictMode: true,
  // Parallel local builds (several people in one tree) each get their own output folder.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
  // knex resolves every dialect driver dynamically; keep it (and the native sqlite binding) out of the bundle.
  serverExternalPackages: ["knex", "better-sqlite3", "smtp-server", "nodemailer"],
  // `next dev` runs on Turbopack; production builds use webpack (`next build --webpack`) for the service worker.
  turbopack: {},
  // The e2e harness builds with NEXT_SKIP_TYPECHECK=1: CI runs `tsc --noEmit` as its own step just before.
  typescript: { ignoreBuildErrors: process.env.NEXT_SKIP_TYPECHECK === "1" },
  // CSP, referrer policy, framing, sniffing and camera permission for every response (security-headers.mjs).
  async headers() {
    return [{ source: "/:path*", headers: securityHeaders({ dev: process.env.NODE_ENV !== "production" }) }];
  },
};

export default nextConfig;
