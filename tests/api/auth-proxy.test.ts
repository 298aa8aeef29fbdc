import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { NextRequest } from "next/server";
import { unstable_doesMiddlewareMatch } from "next/experimental/testing/server";
import { freshDatabase } from "../support/db";
import { signedInMember } from "../support/auth";
import { proxy, config } from "@/proxy";
import { safeNext } from "@/components/auth/next-path";

describe("proxy: the sign-in redirect for farm pages", () => {
  let ctx: Awaited<ReturnType<typeof freshDatabase>>;
  beforeAll(async () => {
    ctx = await freshDatabase();
  });
  afterAll(async () => ctx.cleanup());

  const nav = (path: string, headers: Record<string, string> = {}) =>
    new NextRequest(new URL(path, "http://localhost:3000"), { headers: { "sec-fetch-mode": "navigate", ...headers } });

  it("sends a page visit without a session to sign-in, remembering where it was going", async () => {
    const res = await proxy(nav("/bags/123?tab=checks"));
    expect(res.status).toBe(307);
    const to = new URL(res.headers.get("location")!);
    expect(to.pathname).toBe("/sign-in");
    expect(to.searchParams.get("next")).toBe("/bags/123?tab=checks");
  });

  it("treats a request with no fetch metadata (curl, old browsers) as a page visit", async () => {
    const res = await proxy(new NextRequest(new URL("/team", "http://localhost:3000")));
    expect(res.status).toBe(307);
  });

  it("redirects a tampered cookie and lets a validly signed one through", async () => {
    const m = await signedInMember(ctx.db, { role: "helper" });
    const bad = await proxy(nav("/today", { cookie: `${m.cookie.slice(0, -2)}xx` }));
    expect(bad.status).toBe(307);
    const ok = await proxy(nav("/today", { cookie: m.cookie }));
    expect(ok.headers.get("location")).toBeNull();
    expect(ok.headers.get("x-middleware-next")).toBe("1");
  });

  it("lets the service worker precache the app shell (no farm data in it)", async () => {
    const res = await proxy(new NextRequest(new URL("/today", "http://localhost:3000"), { headers: { "sec-fetch-mode": "same-origin" } }));
    expect(res.headers.get("location")).toBeNull();
  });

  const runsOn = (url: string) => unstable_doesMiddlewareMatch({ config, url });
  it("runs on every farm screen (deny by default), not on public pages, the API or assets", () => {
    for (const p of ["/today", "/scan", "/bags", "/bags/new", "/bags/view?id=1", "/check", "/sowing", "/lots", "/protocols", "/stores", "/plan", "/trials", "/team", "/settings", "/labels"]) {
      expect(runsOn(p), p).toBe(true);
    }
    for (const p of ["/", "/sign-in", "/sign-in?next=/team", "/sign-up", "/offline", "/invite/abc_DEF-123", "/reset", "/reset/abc", "/dev/mailbox", "/api/me", "/api/sync/push", "/_next/static/chunks/x.js", "/sw.js", "/manifest.webmanifest", "/icons/icon-192.png"]) {
      expect(runsOn(p), p).toBe(false);
    }
  });

  it("opens the no-signal page without a session (the page a phone falls back to; it holds no farm data)", () => {
    expect(runsOn("/offline")).toBe(false);
  });

  it("only follows a next path inside the app", () => {
    expect(safeNext("/bags/1", "http://localhost:3000")).toBe("/bags/1");
    expect(safeNext("//evil.example/x", "http://localhost:3000")).toBe("/today");
    expect(safeNext("/\\evil.example", "http://localhost:3000")).toBe("/today");
    expect(safeNext("https://evil.example", "http://localhost:3000")).toBe("/today");
    expect(safeNext(undefined, "http://localhost:3000")).toBe("/today");
  });
});
