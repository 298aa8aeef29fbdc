// First-load JS of a page of the production build, as README's table counts it: the gzip size of the scripts
// the page's HTML loads (module browsers skip the nomodule polyfills). Shared by `npm run bench -- firstload`
// and tests/e2e/first-load.test.ts so the budget test and the published table measure the same thing.
import fs from "node:fs";
import zlib from "node:zlib";
import { distPath } from "./build";

export type FirstLoad = { status: number; html: boolean; total: number; count: number; scripts: string[] };

const gzipped = new Map<string, number>();

/** The file a `/_next/static/...` script address names in the build folder. */
export function staticFile(src: string): string {
  return distPath("static", src.replace("/_next/static/", ""));
}

/** Fetches `route` (signed in with `cookie`, or signed out when it redirects) and sums its scripts' gzip sizes. */
export async function measureFirstLoad(origin: string, route: string, cookie = ""): Promise<FirstLoad> {
  let res = await fetch(`${origin}${route}`, { headers: cookie ? { cookie } : {}, redirect: "manual" });
  if (res.status >= 300 && res.status < 400) res = await fetch(`${origin}${route}`, { redirect: "manual" });
  if (!(res.headers.get("content-type") ?? "").includes("text/html")) return { status: res.status, html: false, total: 0, count: 0, scripts: [] };
  const html = await res.text();
  const scripts = [
    ...new Set(
      [...html.matchAll(/<script\b([^>]*)\bsrc="(\/_next\/static\/[^"]+\.js)"([^>]*)>/g)].filter((m) => !/nomodule/i.test(m[1] + m[3])).map((m) => m[2]),
    ),
  ];
  let total = 0;
  for (const src of scripts) {
    if (!gzipped.has(src)) gzipped.set(src, zlib.gzipSync(fs.readFileSync(staticFile(src))).length);
    total += gzipped.get(src)!;
  }
  return { status: res.status, html: true, total, count: scripts.length, scripts };
}

/** The framework floor: the built-in not-found page of the same build. */
export const FLOOR_ROUTE = "/_rimebook_bench_missing_page";
