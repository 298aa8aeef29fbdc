// The offline-first spine in the production build and real Chromium on a phone: a signed-in phone loses
// its signal, still opens every farm screen from the service worker, records a check, and once the signal
// returns the check reaches the server and a second phone.
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { ARTIFACTS, ROOT } from "./support/build";
import { ONE_TAP_BAG } from "./support/pages";

let app: AppServer;
let browser: Browser;

beforeAll(async () => {
  app = await startApp({ name: "offline", seed: true });
  browser = await launchChromium();
}, 600_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

/** The farm screens ARCHITECTURE.md lists, as far as this tree has built them. */
const screens = ["/today", "/scan", "/bags", "/lots", "/protocols", "/stores", "/plan", "/trials", "/team", "/settings", "/labels"].filter((route) =>
  fs.existsSync(path.join(ROOT, "app/(farm)", route, "page.tsx")),
);

async function signIn(page: Page, email: string, password: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password", { exact: true }).fill(password);
  await page.getByRole("button", { name: /sign in/i }).click();
  await page.waitForURL(/\/today/);
}

async function pillText(page: Page): Promise<string> {
  return ((await page.getByTestId("sync-pill").textContent()) ?? "").trim();
}

async function waitForPill(page: Page, pattern: RegExp, timeout = 30_000) {
  await page.waitForFunction((src) => new RegExp(src).test(document.querySelector("[data-testid=sync-pill]")?.textContent ?? ""), pattern.source, { timeout });
}

/** Waits until the service worker has precached everything and controls the page. */
async function waitForServiceWorker(page: Page) {
  await page.evaluate(async () => {
    await navigator.serviceWorker.ready;
  });
  if (!(await page.evaluate(() => Boolean(navigator.serviceWorker.controller)))) await page.reload();
  await page.waitForFunction(() => Boolean(navigator.serviceWorker.controller), undefined, { timeout: 30_000 });
}

function readOne<T>(sql: string, ...args: unknown[]): T | undefined {
  const db = new Database(app.databaseFile, { readonly: true });
  try {
    return db.prepare(sql).get(...args) as T | undefined;
  } finally {
    db.close();
  }
}

describe("offline-first phone", () => {
  let context: BrowserContext;
  let page: Page;
  let errors: string[];

  it("signs in, loads the whole farm once, and installs the service worker with every screen", async () => {
    context = await phoneContext(browser, app.origin);
    page = await context.newPage();
    errors = watchErrors(page);
    await signIn(page, "ada@bramblewick.example", "helper-frost-demo");
    await waitForPill(page, /Synced at \d\d:\d\d/);
    await waitForServiceWorker(page);
    const precached = await page.evaluate(async () => {
      const names = await caches.keys();
      const urls: string[] = [];
      for (const name of names.filter((n) => n.includes("precache"))) {
        for (const req of await (await caches.open(name)).keys()) urls.push(new URL(req.url).pathname);
      }
      return urls;
    });
    for (const route of [...screens, "/offline"]) expect(precached, route).toContain(route);
    const manifest = await (await page.request.get("/manifest.webmanifest")).json();
    expect(manifest).toMatchObject({ name: "Rimebook", theme_color: "#1f4d6c", background_color: "#f4f8fa", display: "standalone" });
    expect(manifest.icons.map((i: { sizes: string }) => i.sizes)).toEqual(expect.arrayContaining(["192x192", "512x512"]));
    await shoot(page, "offline-01-synced");
  }, 180_000);

  it("opens every farm screen with no signal", async () => {
    await context.setOffline(true);
    await page.evaluate(() => window.dispatchEvent(new Event("offline")));
    for (const route of screens) {
      const res = await page.goto(route);
      expect(res?.ok(), route).toBe(true);
      await page.getByRole("navigation", { name: "Main" }).waitFor();
      expect(await page.getByRole("heading", { name: "No signal here" }).count(), route).toBe(0);
      await waitForPill(page, /Offline/);
      await shoot(page, `offline-02${route.replaceAll("/", "-")}`);
    }
    // A bag's page opened by its address (never visited on this phone) also opens.
    const bag = readOne<{ id: string }>("SELECT id FROM bags WHERE start_date IS NOT NULL AND pulled_on IS NULL AND discarded_on IS NULL ORDER BY code LIMIT 1")!;
    const res = await page.goto(`/bags/view?id=${bag.id}`);
    expect(res?.ok()).toBe(true);
    expect(await page.getByRole("heading", { name: "No signal here" }).count()).toBe(0);
    await shoot(page, "offline-03-bag-view");

    // A store's readings chart: its drawing (recharts) is a chunk loaded only when drawn, and still draws offline.
    const fridge = readOne<{ id: string }>("SELECT s.id FROM stores s WHERE s.kind = 'fridge' AND s.deleted_at IS NULL AND EXISTS (SELECT 1 FROM readings r WHERE r.store_id = s.id) LIMIT 1")!;
    expect((await page.goto(`/stores/view?id=${fridge.id}`))?.ok()).toBe(true);
    await page.getByRole("img", { name: /Temperature readings from/ }).locator("svg.recharts-surface").first().waitFor({ state: "visible", timeout: 30_000 });
    await shoot(page, "offline-03-store-chart");
  }, 180_000);

  it("records a check with no signal; it waits on the phone and reaches the server and a second phone when the signal returns", async () => {
    const bag = readOne<{ id: string }>(`SELECT id FROM bags WHERE ${ONE_TAP_BAG} ORDER BY code LIMIT 1`)!;
    const before = readOne<{ n: number }>("SELECT count(*) AS n FROM checks WHERE bag_id = ?", bag.id)!.n;
    await page.goto(`/check?bag=${bag.id}`);
    await page.getByTestId("all-good").click();
    await page.waitForURL(/\/scan/);
    await waitForPill(page, /Offline · 1 waiting/);
    await shoot(page, "offline-04-one-waiting");
    expect(readOne<{ n: number }>("SELECT count(*) AS n FROM checks WHERE bag_id = ?", bag.id)!.n).toBe(before);

    await context.setOffline(false);
    await page.evaluate(() => window.dispatchEvent(new Event("online")));
    await waitForPill(page, /Synced at/);
    expect(readOne<{ n: number }>("SELECT count(*) AS n FROM checks WHERE bag_id = ?", bag.id)!.n).toBe(before + 1);
    const check = readOne<{ id: string }>("SELECT id FROM checks WHERE bag_id = ? ORDER BY created_at DESC LIMIT 1", bag.id)!;
    await shoot(page, "offline-05-synced-again");

    const second = await phoneContext(browser, app.origin);
    const other = await second.newPage();
    await signIn(other, "wren@bramblewick.example", "owner-frost-demo");
    await waitForPill(other, /Synced at/);
    const found = await other.evaluate(
      (id) =>
        new Promise<boolean>((resolve, reject) => {
          const open = indexedDB.open("rimebook");
          open.onerror = () => reject(open.error);
          open.onsuccess = () => {
            const get = open.result.transaction("checks", "readonly").objectStore("checks").get(id);
            get.onsuccess = () => resolve(Boolean(get.result));
          };
        }),
      check.id,
    );
    expect(found).toBe(true);
    await second.close();
    expect(errors.filter((e) => !/ERR_INTERNET_DISCONNECTED|Failed to fetch|net::|Failed to load resource/.test(e))).toEqual([]);
  }, 180_000);

  it("a refused change shows in the sync details and is not dropped", async () => {
    // The visitor's phone still believes it may record checks (role changed while offline).
    const visitor = await phoneContext(browser, app.origin);
    const vpage = await visitor.newPage();
    await signIn(vpage, "juniper@bramblewick.example", "viewer-frost-demo");
    await waitForPill(vpage, /Synced at/);
    const bag = readOne<{ id: string }>("SELECT id FROM bags ORDER BY code LIMIT 1")!;
    await vpage.evaluate(async (bagId) => {
      const open = indexedDB.open("rimebook");
      await new Promise((r) => (open.onsuccess = r));
      const tx = open.result.transaction("outbox", "readwrite");
      tx.objectStore("outbox").add({
        id: crypto.randomUUID(),
        name: "check.record",
        args: { id: crypto.randomUUID(), bag_id: bagId, checked_at: new Date().toISOString(), moisture: "damp", mould: "clean", sprouts: "none", actions: [], note: null, temperature_c: null },
        at: new Date().toISOString(),
        status: "pending",
        tries: 0,
      });
      await new Promise((r) => (tx.oncomplete = r));
      window.dispatchEvent(new Event("focus"));
    }, bag.id);
    await waitForPill(vpage, /not saved/);
    await vpage.getByTestId("sync-pill").click();
    await vpage.getByTestId("rejected-list").getByText(/Visitor cannot/).waitFor();
    await vpage.screenshot({ path: path.join(ARTIFACTS, "offline-06-refused-details.png") }); // the dialog as the phone shows it
    await visitor.close();
  }, 120_000);

  it("sign-out warns while work is unsent, then empties the phone store and the farm's caches", async () => {
    await context.setOffline(true);
    await page.evaluate(() => window.dispatchEvent(new Event("offline")));
    const bag = readOne<{ id: string }>(`SELECT id FROM bags WHERE ${ONE_TAP_BAG} ORDER BY code DESC LIMIT 1`)!;
    await page.goto(`/check?bag=${bag.id}`);
    await page.getByTestId("all-good").click();
    await page.waitForURL(/\/scan/);
    await waitForPill(page, /1 waiting/);
    await page.getByRole("button", { name: "Farm" }).click();
    await page.getByRole("button", { name: "Sign out of this phone" }).click();
    await page.getByRole("alert").getByText("Not everything is sent yet").waitFor();
    await page.screenshot({ path: path.join(ARTIFACTS, "offline-07-sign-out-warning.png") });
    await page.getByRole("button", { name: "Sign out anyway" }).click();
    await page.waitForURL(/\/sign-in/);
    const left = await page.evaluate(async () => {
      const open = indexedDB.open("rimebook");
      const db: IDBDatabase = await new Promise((r) => (open.onsuccess = () => r(open.result)));
      const count = (store: string) =>
        new Promise<number>((r) => {
          const req = db.transaction(store, "readonly").objectStore(store).count();
          req.onsuccess = () => r(req.result);
        });
      const caches_ = await caches.keys();
      return { outbox: await count("outbox"), bags: await count("bags"), meta: await count("meta"), caches: caches_.filter((c) => !c.includes("precache") && !c.startsWith("rimebook-screens-")) }; // the app's own screens stay
    });
    expect(left).toEqual({ outbox: 0, bags: 0, meta: 1, caches: [] }); // only the device id stays
  }, 120_000);
});
