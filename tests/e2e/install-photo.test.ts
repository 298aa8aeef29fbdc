// What the other real-browser suites leave out, on the demo farm in the production build and a phone-sized
// Chromium: the session cookie's flags; a check with a photo recorded with no signal, whose check and photo
// both reach the server (the photo stored on disk) and a second phone; and installability (manifest, icons,
// a service worker in control). Sign-up and invites: accounts.test.ts; labels and scanning: fridge.test.ts;
// every screen offline: offline.test.ts.
import fs from "node:fs";
import path from "node:path";
import QRCode from "qrcode";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { queryServer, signIn, waitForRows, waitForServiceWorker } from "./support/pages";

let app: AppServer;
let browser: Browser;
let owner: BrowserContext;
let helper: BrowserContext;
let ownerPage: Page;
let ownerErrors: string[] = [];

// The demo farm's Owner and Helper (db/seeds/data/demo-farm.ts).
const OWNER = { email: "wren@bramblewick.example", password: "owner-frost-demo" };
const HELPER = { email: "ada@bramblewick.example", password: "helper-frost-demo" };
const state: { bagId?: string; bagCode?: string; checkNote?: string } = {};

const query = <T>(sql: string, ...args: unknown[]) => queryServer<T>(app.databaseFile, sql, ...args);
const waitForServer = <T>(sql: string, args: unknown[], ok: (rows: T[]) => boolean, timeout?: number) => waitForRows<T>(app.databaseFile, sql, args, ok, timeout);

beforeAll(async () => {
  app = await startApp({ name: "photo", seed: true });
  browser = await launchChromium();
  owner = await phoneContext(browser, app.origin);
  helper = await phoneContext(browser, app.origin);
  ownerPage = await owner.newPage();
  ownerErrors = watchErrors(ownerPage);
}, 600_000);

afterAll(async () => {
  await owner?.close();
  await helper?.close();
  await browser?.close();
  await app?.stop();
});

describe("on the demo farm's phones", () => {
  it("signs in with an httpOnly, SameSite=Lax session cookie that scripts cannot read", async () => {
    await signIn(ownerPage, OWNER);
    const session = (await owner.cookies()).find((c) => c.name === "rimebook_session");
    expect(session, "session cookie set").toBeTruthy();
    expect(session!.httpOnly).toBe(true);
    expect(session!.sameSite).toBe("Lax");
    expect(session!.path).toBe("/");
    expect(session!.secure).toBe(false); // plain http on loopback; Secure whenever APP_ORIGIN is https
    expect(session!.expires).toBeGreaterThan(Date.now() / 1000 + 7 * 86_400);
    expect(await ownerPage.evaluate(() => document.cookie)).not.toContain("rimebook_session");
    const me = await ownerPage.evaluate(async () => (await fetch("/api/me")).json());
    expect(me).toMatchObject({ role: "owner" });
    const bag = query<{ id: string; code: string }>(
      "SELECT id, code FROM bags WHERE start_date IS NOT NULL AND pulled_on IS NULL AND discarded_on IS NULL AND sown_on IS NULL AND deleted_at IS NULL ORDER BY start_date DESC LIMIT 1",
    )[0];
    expect(bag, "a demo bag in the cold").toBeTruthy();
    state.bagId = bag.id;
    state.bagCode = bag.code;
  }, 120_000);

  it("records a check with a photo with no signal; both reach the server and the helper's phone", async () => {
    const page = ownerPage;
    await page.goto("/today");
    await waitForServiceWorker(page);
    // The farm is on the phone (first pull done) before the signal goes.
    await page.getByTestId("round-bag").first().waitFor({ timeout: 30_000 });
    await owner.setOffline(true);
    await page.goto(`/check?bag=${state.bagId}`);
    await page.getByRole("button", { name: /all good/i }).first().waitFor({ timeout: 20_000 });

    const photo = path.join(app.dir, "bag-photo.png");
    await QRCode.toFile(photo, `photo of ${state.bagCode}`, { type: "png", width: 480 });
    await page.locator("#check-photo").setInputFiles(photo);
    state.checkNote = "Towel damp, first sign of swelling";
    await page.getByLabel("Note").fill(state.checkNote);
    await shoot(page, "16-check-offline");
    await page.getByRole("button", { name: /save check/i }).click();
    // Saved on the phone (outbox); nothing can reach the server yet.
    await page.waitForURL((u) => !u.pathname.startsWith("/check"), { timeout: 20_000 }).catch(() => undefined);
    await shoot(page, "17-after-save-offline");
    expect(query("SELECT id FROM checks WHERE bag_id = ? AND note = ?", state.bagId, state.checkNote)).toHaveLength(0);

    await owner.setOffline(false);
    const checks = await waitForServer<{ id: string }>("SELECT id FROM checks WHERE bag_id = ? AND note = ?", [state.bagId, state.checkNote], (r) => r.length > 0, 60_000);
    expect(checks, "the offline check reached the server once").toHaveLength(1);
    const photos = await waitForServer<{ id: string; check_id: string }>("SELECT id, check_id FROM photos WHERE bag_id = ?", [state.bagId], (r) => r.length > 0, 60_000);
    expect(photos, "the photo uploaded after its check").toHaveLength(1);
    expect(photos[0].check_id).toBe(checks[0].id);
    const stored = fs.readdirSync(app.uploadDir, { recursive: true }).map(String).filter((f) => /\.(jpe?g|png|webp)$/i.test(f));
    expect(stored.length).toBeGreaterThan(0);

    // The helper's phone (another profile) pulls it.
    const hp = await helper.newPage();
    await signIn(hp, HELPER);
    const seen = await hp.evaluate(async (bagId) => {
      let since = 0;
      const found: string[] = [];
      for (let i = 0; i < 20; i++) {
        const page = await (await fetch(`/api/sync/pull?since=${since}&limit=500`)).json();
        for (const c of page.changes) if ((c.table === "checks" || c.table === "photos") && c.row.bag_id === bagId) found.push(c.table);
        since = page.cursor;
        if (!page.more) break;
      }
      return found;
    }, state.bagId!);
    expect(seen).toEqual(expect.arrayContaining(["checks", "photos"]));
    await hp.close();
  }, 240_000);

  it("is installable: manifest, icons and a service worker in control", async () => {
    const page = ownerPage;
    const manifestHref = await page.locator("link[rel=manifest]").getAttribute("href");
    expect(manifestHref).toBeTruthy();
    const manifest = await (await fetch(new URL(manifestHref!, app.origin))).json();
    expect(manifest).toMatchObject({ name: "Rimebook", short_name: "Rimebook", display: "standalone" });
    expect(manifest.start_url).toBeTruthy();
    const sizes = manifest.icons.map((i: { sizes: string }) => i.sizes);
    expect(sizes).toEqual(expect.arrayContaining(["192x192", "512x512"]));
    for (const icon of manifest.icons) {
      const res = await fetch(new URL(icon.src, app.origin));
      expect(res.status, icon.src).toBe(200);
      expect(res.headers.get("content-type")).toBe(icon.type);
    }
    await page.goto("/today");
    await waitForServiceWorker(page);
    const sw = await page.evaluate(async () => {
      const reg = await navigator.serviceWorker.getRegistration();
      return { scope: reg?.scope, active: reg?.active?.state, controlled: Boolean(navigator.serviceWorker.controller) };
    });
    expect(sw).toMatchObject({ scope: `${app.origin}/`, active: "activated", controlled: true });
    const csp = ownerErrors.filter((e) => /Content Security Policy/i.test(e));
    expect(csp, "no CSP violation on any screen visited").toEqual([]);
  }, 120_000);
});
