// Security headers for every response, applied by next.config.mjs `headers()`.
// Kept in its own file so the e2e suite can assert exactly what is configured.

/**
 * Content-Security-Policy: what the app needs and no more.
 * - script-src 'unsafe-inline': App Router pages are prerendered (so they can be precached for offline use) and
 *   carry inline `self.__next_f.push(...)` scripts; per-request nonces would need dynamic rendering of every page.
 *   No third-party script origin is allowed, and no eval in production.
 * - style-src 'unsafe-inline': React style attributes (charts, progress bars) and Next's injected font styles.
 * - img-src blob: data:: photos previewed from the phone store (blob:) and QR codes drawn as data: URLs on labels.
 * - media-src blob:: the scanner's camera preview; worker-src 'self': the service worker (and zxing, if it ever
 *   uses a worker from our own origin).
 * - frame-ancestors 'none': never shown inside someone else's frame.
 */
export function contentSecurityPolicy({ dev = false } = {}) {
  const directives = {
    "default-src": ["'self'"],
    "script-src": ["'self'", "'unsafe-inline'", ...(dev ? ["'unsafe-eval'"] : [])],
    "style-src": ["'self'", "'unsafe-inline'"],
    "img-src": ["'self'", "blob:", "data:"],
    "font-src": ["'self'"],
    "connect-src": ["'self'", ...(dev ? ["ws:", "wss:"] : [])],
    "media-src": ["'self'", "blob:"],
    "worker-src": ["'self'"],
    "manifest-src": ["'self'"],
    "object-src": ["'none'"],
    "base-uri": ["'self'"],
    "form-action": ["'self'"],
    "frame-src": ["'none'"],
    "frame-ancestors": ["'none'"],
  };
  return Object.entries(directives)
    .map(([k, v]) => `${k} ${v.join(" ")}`)
    .join("; ");
}

/**
 * Camera for our own pages (the scanner and check photos); every other powerful feature off. Only features Chromium
 * recognises: an unknown name (such as "bluetooth") is logged as an error on every page load.
 */
export const PERMISSIONS_POLICY = [
  "camera=(self)",
  "microphone=()",
  "geolocation=()",
  "payment=()",
  "usb=()",
  "serial=()",
  "hid=()",
  "midi=()",
  "display-capture=()",
  "browsing-topics=()",
].join(", ");

/** @returns {{ key: string; value: string }[]} */
export function securityHeaders({ dev = false } = {}) {
  return [
    { key: "Content-Security-Policy", value: contentSecurityPolicy({ dev }) },
    // "same-origin", not "no-referrer": with no-referrer browsers send `Origin: null` on same-origin POSTs,
    // which the server's own-origin check would refuse.
    { key: "Referrer-Policy", value: "same-origin" },
    { key: "X-Content-Type-Options", value: "nosniff" },
    { key: "X-Frame-Options", value: "DENY" },
    { key: "Permissions-Policy", value: PERMISSIONS_POLICY },
    { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
    { key: "Cross-Origin-Resource-Policy", value: "same-origin" },
  ];
}
