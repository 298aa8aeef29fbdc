const TODAY = "/today";

/**
 * Where to go after signing in: a path on our own origin only (never another site). `next` is parsed the
 * way the browser will parse it (WHATWG URL drops tabs and newlines and reads "\" as "/"), and kept only
 * when the result is on `origin` and its path starts with exactly one "/"; control characters and
 * backslashes are refused outright, so the answer can also go into a redirect header. Anything else: Today.
 */
export function safeNext(next: string | null | undefined, origin: string): string {
  if (typeof next !== "string" || !next.startsWith("/") || /[\u0000-\u001f\u007f-\u009f\u2028\u2029\\]/.test(next)) return TODAY;
  let url: URL;
  try {
    url = new URL(next, origin);
  } catch {
    return TODAY;
  }
  if (url.origin !== new URL(origin).origin || !url.pathname.startsWith("/") || url.pathname.startsWith("//")) return TODAY;
  return `${url.pathname}${url.search}${url.hash}`;
}
