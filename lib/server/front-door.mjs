// The front door of the server (scripts/serve.mjs, which `npm start`, `npm run demo`, `npm run dev` and the
// real-browser tests run): Next's own request handler, with two things Next does not do for us.
//
// 1. The caller's network address. A Next 16 route handler never sees the socket: `next start` only fills
//    X-Forwarded-For with the socket's address when the request did not bring one, so anyone can write that
//    header. The front door reads the socket itself and, with TRUST_PROXY=N (N proxies of ours in front,
//    each appending the address it saw to X-Forwarded-For), takes the entry the outermost of them wrote. The
//    result goes into CLIENT_HEADER, replacing whatever the request carried under that name.
// 2. Strict-Transport-Security when APP_ORIGIN is https (APP_ORIGIN is read at start, not at build).
//
// Plain JS so node runs it without a build step; lib/server/rate-limit.ts reads what it writes.

export const CLIENT_HEADER = "x-rimebook-client";
/** Set on globalThis by the front door: only then is CLIENT_HEADER the front door's own word. */
export const FRONT_DOOR = Symbol.for("rimebook.frontDoor");
export const HSTS_VALUE = "max-age=31536000";

/** TRUST_PROXY: how many proxies of ours stand in front (0 = people connect to this server directly). */
export function parseTrustProxy(value) {
  if (value === undefined || value === "") return 0;
  if (!/^\d{1,2}$/.test(value.trim())) throw new Error(`TRUST_PROXY must be a whole number of proxies in front of this server (0, 1, 2…), not "${value}"`);
  return Number(value.trim());
}

/** "::ffff:192.0.2.1" and "192.0.2.1" are the same caller. */
const plain = (address) => address.replace(/^::ffff:(?=\d+\.\d+\.\d+\.\d+$)/i, "").slice(0, 64);

/**
 * The caller: the socket's peer when no proxy is trusted; with `hops` trusted proxies, the X-Forwarded-For
 * entry written by the outermost trusted one (entries further left were written by whoever sent the request).
 */
export function clientAddressOf(remoteAddress, forwardedFor, hops) {
  const forwarded = (Array.isArray(forwardedFor) ? forwardedFor.join(",") : forwardedFor ?? "")
    .split(",")
    .map((s) => s.trim())
    .filter(Boolean);
  const chain = [...forwarded, remoteAddress ?? ""];
  return plain(chain[Math.max(0, chain.length - 1 - hops)] ?? "");
}

/** Loopback: this machine itself (127.0.0.0/8, ::1). */
export function isLoopback(address) {
  const a = plain(address ?? "");
  return a === "::1" || /^127\.\d+\.\d+\.\d+$/.test(a);
}

/** What the front door does to each request before Next sees it. */
export function frontDoor({ hops = 0, hsts = false } = {}) {
  globalThis[FRONT_DOOR] = true;
  return (req, res) => {
    req.headers[CLIENT_HEADER] = clientAddressOf(req.socket?.remoteAddress, req.headers["x-forwarded-for"], hops);
    if (hsts) res.setHeader("Strict-Transport-Security", HSTS_VALUE);
  };
}
