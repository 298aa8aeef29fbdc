// The production build in real Chromium on a phone: health, the landing page, security headers on every kind
// of response, no CSP violation while the page loads, and no secret in anything a browser can download.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { ROOT, distPath } from "./support/build";
import { contentSecurityPolicy, securityHeaders } from "../../security-headers.mjs";
import { needlesFrom, scanBuild, scanFiles } from "../../scripts/check-bundle-secrets";

let app: AppServer;
let browser: Browser;

beforeAll(async () => {
  app = await startApp({ name: "smoke" });
  browser = await launchChromium();
}, 600_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

describe("production build", () => {
  it("answers /api/health with ok", async () => {
    const res = await fetch(`${app.origin}/api/health`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/application\/json/);
    expect(await res.json()).toMatchObject({ ok: true, app: "rimebook" });
  });

  it("sends the security headers on pages, API answers and static files", async () => {
    const expected = securityHeaders({ dev: false });
    const html = await fetch(`${app.origin}/`);
    const page = await html.text();
    const script = page.match(/src="(\/_next\/static\/[^"]+\.js)"/)?.[1];
    expect(script, "landing page loads at least one chunk").toBeTruthy();
    for (const url of ["/", "/api/health", script!, "/no-such-page"]) {
      const res = await fetch(`${app.origin}${url}`);
      for (const { key, value } of expected) expect(res.headers.get(key), `${key} on ${url}`).toBe(value);
      expect(res.headers.get("x-powered-by"), url).toBeNull();
    }
  });

  it("keeps the CSP tight: no eval, no foreign origins, never framed", () => {
    const csp = contentSecurityPolicy({ dev: false });
    const d = Object.fromEntries(csp.split("; ").map((p) => [p.split(" ")[0], p.split(" ").slice(1)]));
    expect(d["frame-ancestors"]).toEqual(["'none'"]);
    expect(d["object-src"]).toEqual(["'none'"]);
    expect(d["default-src"]).toEqual(["'self'"]);
    expect(d["script-src"]).not.toContain("'unsafe-eval'");
    for (const sources of Object.values(d)) for (const s of sources) expect(s, csp).toMatch(/^('self'|'none'|'unsafe-inline'|blob:|data:)$/);
    expect(d["img-src"]).toEqual(["'self'", "blob:", "data:"]);
  });

  it("renders the landing page on a phone with no console errors or CSP violations", async () => {
    const context = await phoneContext(browser, app.origin);
    const page = await context.newPage();
    const errors = watchErrors(page);
    const res = await page.goto("/", { waitUntil: "networkidle" });
    expect(res?.status()).toBe(200);
    await expect(page.getByRole("heading", { level: 1 }).textContent()).resolves.toMatch(/winter/);
    expect(await page.getByRole("link", { name: /sign in/i }).count()).toBeGreaterThan(0);
    // Nothing wider than the phone: no sideways scrolling.
    const width = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(width).toBeLessThanOrEqual(390);
    await shoot(page, "01-landing");
    // Missing routes are checked by the link test below; everything else (CSP, script errors) must be clean.
    expect(errors.filter((e) => !/status of 404/.test(e))).toEqual([]);
    await context.close();
  });

  it("has no dead links or missing icons on the landing page", async () => {
    const context = await phoneContext(browser, app.origin);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await page.goto("/", { waitUntil: "networkidle" });
    const hrefs = await page.$$eval("a[href^='/']", (as) => as.map((a) => a.getAttribute("href")!));
    for (const href of hrefs) expect((await fetch(`${app.origin}${href}`)).status, href).toBe(200);
    expect(errors).toEqual([]);
    await context.close();
  });
});

describe("bundle secret scan", () => {
  it("finds no secret, server env name or password column in what a browser downloads", () => {
    const { files, findings } = scanBuild(ROOT, distPath());
    expect(files).toBeGreaterThan(10);
    expect(findings.map((f) => `${path.relative(ROOT, f.file)}: ${f.reason} ${f.needle}`)).toEqual([]);
  });

  it("does flag a planted secret (the scan can fail)", () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-scan-"));
    const file = path.join(dir, "chunk.js");
    fs.writeFileSync(file, `const u={password_hash:1};fetch(process.env.SESSION_SECRET)`);
    const found = scanFiles([file], needlesFrom(ROOT)).map((f) => f.needle);
    expect(found).toEqual(expect.arrayContaining(["password_hash", "SESSION_SECRET"]));
    fs.rmSync(dir, { recursive: true, force: true });
  });
});
