// With no signal, in the production build and real Chromium on a phone: a grower records three checks from
// Today through the typed code and the check sheet, and the page is never reloaded (the service worker
// answers the router's screen requests); the sync pill and its details count what was recorded the same
// way; a bag saved with signal does not claim to wait for signal; a browser without service workers
// still opens every page; the no-signal page needs no sign-in.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import QRCode from "qrcode";
import path from "node:path";
import { startApp, type AppServer } from "./support/server";
import { PHONE, launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { ONE_TAP_BAG, queryServer, signIn, waitForRows, waitForServiceWorker } from "./support/pages";

let app: AppServer;
let browser: Browser;

beforeAll(async () => {
  app = await startApp({ name: "offline-navigation", seed: true });
  browser = await launchChromium();
}, 600_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

const helper = { email: "ada@bramblewick.example", password: "helper-frost-demo" };
const grower = { email: "tomas@bramblewick.example", password: "grower-frost-demo" };

type BagRef = { id: string; code: string; store_id: string };
/** Bags in the cold, none pulled, discarded or sown: each takes a one-tap check. */
function bagsInTheCold(n: number, offset = 0): BagRef[] {
  return queryServer<BagRef>(
    app.databaseFile,
    `SELECT id, code, store_id FROM bags WHERE ${ONE_TAP_BAG} ORDER BY code LIMIT ? OFFSET ?`,
    n,
    offset,
  );
}

async function goOffline(context: BrowserContext, page: Page) {
  await context.setOffline(true);
  await page.evaluate(() => window.dispatchEvent(new Event("offline")));
}

async function waitForPill(page: Page, pattern: RegExp, timeout = 30_000) {
  await page.waitForFunction((src) => new RegExp(src).test(document.querySelector("[data-testid=sync-pill]")?.textContent ?? ""), pattern.source, { timeout });
}

/** Signs in, waits for the farm on the phone and the service worker in control. */
async function readyPhone(who: { email: string; password: string }) {
  const context = await phoneContext(browser, app.origin);
  const page = await context.newPage();
  const errors = watchErrors(page);
  await signIn(page, who);
  await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
  await waitForServiceWorker(page);
  await waitForPill(page, /Synced at/);
  return { context, page, errors };
}

describe("moving between screens with no signal", () => {
  it("records three checks from Today through the typed code and the sheet without one full page load after the first", async () => {
    const { context, page, errors } = await readyPhone(helper);
    // The worker stored each screen's router payload when it installed (sw/screens.ts).
    const stored = await page.evaluate(async () => {
      const name = (await caches.keys()).find((n) => n.startsWith("rimebook-screens-"));
      return name ? (await (await caches.open(name)).keys()).map((r) => new URL(r.url).pathname) : [];
    });
    expect(stored).toEqual(expect.arrayContaining(["/today", "/scan", "/check", "/bags/view"]));

    await goOffline(context, page);
    const documentLoads: string[] = [];
    page.on("request", (req) => {
      if (req.resourceType() === "document") documentLoads.push(req.url());
    });
    const rscFallbacks: string[] = [];
    page.on("console", (msg) => {
      if (/Failed to fetch RSC payload|Falling back to browser navigation/.test(msg.text())) rscFallbacks.push(msg.text());
    });
    await page.goto("/today"); // the one full load, from the precache
    await page.getByTestId("round-bag").first().waitFor();
    await page.evaluate(() => Object.assign(window, { __rimebookLoaded: "first load" }));
    documentLoads.length = 0;

    const bags = bagsInTheCold(3);
    expect(bags).toHaveLength(3);
    const checksOf = (bagId: string) => queryServer<{ id: string }>(app.databaseFile, "SELECT id FROM checks WHERE bag_id = ?", bagId).length;
    const before = bags.map((b) => checksOf(b.id));
    for (const [i, bag] of bags.entries()) {
      await page.getByRole("link", { name: /scan a bag/i }).click();
      await page.waitForURL(/\/scan/);
      await page.locator("#typed-code").fill(`${bag.code.slice(0, 3)}-${bag.code.slice(3)}`);
      await page.locator("#typed-code").press("Enter");
      await page.waitForURL(new RegExp(`/check\\?bag=${bag.id}`));
      await page.getByTestId("all-good").click();
      await page.waitForURL(/\/scan\?saved=/);
      await page.getByTestId("saved-notice").waitFor();
      if (i === 0) await shoot(page, "offnav-01-saved-offline-no-reload");
      await page.getByRole("link", { name: "Today's round", exact: true }).click();
      await page.waitForURL(/\/today$/);
      await page.getByTestId("round-bag").first().waitFor();
    }

    // Same document all along: the marker survived, the browser saw one navigation, no document was requested.
    expect(await page.evaluate(() => (window as unknown as { __rimebookLoaded?: string }).__rimebookLoaded)).toBe("first load");
    expect(await page.evaluate(() => performance.getEntriesByType("navigation").length)).toBe(1);
    expect(documentLoads).toEqual([]);
    expect(rscFallbacks).toEqual([]);
    await waitForPill(page, /Offline · 3 waiting/);
    await shoot(page, "offnav-02-three-checks-waiting");

    // The control: without the stored payloads the same tap falls back to a full page load (as before this fix).
    await page.evaluate(async () => {
      for (const name of await caches.keys()) if (name.startsWith("rimebook-screens-")) await caches.delete(name);
    });
    await page.getByRole("link", { name: /scan a bag/i }).click();
    await page.waitForURL(/\/scan/);
    await page.locator("#typed-code").waitFor();
    expect(documentLoads.length).toBeGreaterThan(0);
    expect(await page.evaluate(() => (window as unknown as { __rimebookLoaded?: string }).__rimebookLoaded)).toBeUndefined();

    await context.setOffline(false);
    await page.evaluate(() => window.dispatchEvent(new Event("online")));
    await waitForPill(page, /Synced at/);
    for (const [i, bag] of bags.entries()) {
      const rows = await waitForRows(app.databaseFile, "SELECT id FROM checks WHERE bag_id = ?", [bag.id], (r) => r.length > before[i]);
      expect(rows.length, bag.code).toBe(before[i] + 1);
    }
    expect(errors.filter((e) => !/ERR_INTERNET_DISCONNECTED|Failed to fetch|net::|Failed to load resource/.test(e))).toEqual([]);
    await context.close();
  }, 300_000);
});

describe("sync counts a person can trust", () => {
  it("two offline checks, one with a temperature and a photo: the pill and the details both say 3 waiting (2 checks and 1 photo), each sentence once", async () => {
    const { context, page } = await readyPhone(helper);
    const [first, second] = bagsInTheCold(2, 3);
    const checksBefore = (bagId: string) => queryServer<{ id: string }>(app.databaseFile, "SELECT id FROM checks WHERE bag_id = ?", bagId).length;
    const before = { first: checksBefore(first.id), second: checksBefore(second.id) };
    await goOffline(context, page);

    await page.goto(`/check?bag=${first.id}`);
    await page.getByTestId("all-good").waitFor();
    await page.locator("#check-temperature").fill("3.5");
    const photo = path.join(app.dir, "count-photo.png");
    await QRCode.toFile(photo, `photo of ${first.code}`, { type: "png", width: 320 });
    await page.locator("#check-photo").setInputFiles(photo);
    await page.getByRole("img", { name: /photo that will be saved/i }).waitFor();
    await page.getByRole("button", { name: /save check/i }).click();
    await page.waitForURL((u) => !u.pathname.startsWith("/check"));

    await page.goto(`/check?bag=${second.id}`);
    await page.getByTestId("all-good").click();
    await page.waitForURL(/\/scan\?saved=/);

    await waitForPill(page, /Offline · 3 waiting/);
    expect((await page.getByTestId("sync-pill").textContent())?.trim()).toBe("Offline · 3 waiting");
    await page.getByTestId("sync-pill").click();
    const dialog = page.getByRole("dialog", { name: "Sync" });
    await expect(dialog.getByTestId("sync-waiting").textContent()).resolves.toBe("3 waiting on this phone: 2 checks and 1 photo.");
    const text = (await dialog.textContent()) ?? "";
    expect(text.match(/No signal/g) ?? []).toHaveLength(1);
    expect(text).not.toMatch(/Photos waiting|Waiting to send \d/);
    await dialog.screenshot({ path: path.join(path.dirname(await shoot(page, "offnav-03-counts-page")), "offnav-04-counts-details.png") });
    await page.setViewportSize({ width: 1280, height: 800 });
    await shoot(page, "offnav-04-counts-details-desktop");
    await page.setViewportSize(PHONE.viewport);
    await dialog.getByRole("button", { name: "Close" }).click();

    await context.setOffline(false);
    await page.evaluate(() => window.dispatchEvent(new Event("online")));
    await waitForPill(page, /Synced at/, 60_000);
    expect(checksBefore(first.id)).toBe(before.first + 1);
    expect(checksBefore(second.id)).toBe(before.second + 1);
    expect(queryServer(app.databaseFile, "SELECT id FROM photos WHERE bag_id = ?", first.id)).toHaveLength(1);
    await context.close();
  }, 240_000);

  it("a bag saved with signal says it is on the farm, never that it waits for signal", async () => {
    const { context, page } = await readyPhone(grower);
    const [lot] = queryServer<{ id: string }>(app.databaseFile, "SELECT id FROM lots WHERE species LIKE 'Sambucus%'");
    await page.goto(`/bags/new?lot=${lot.id}`);
    await page.getByLabel("Seeds in the bag").fill("40");
    await page.getByRole("button", { name: "Save bag" }).click();
    const where = page.getByTestId("saved-where");
    await where.waitFor();
    await page.waitForFunction(() => /on the farm now/.test(document.querySelector("[data-testid=saved-where]")?.textContent ?? ""), undefined, { timeout: 30_000 });
    expect(await where.textContent()).not.toMatch(/signal/);
    await expect(page.getByText(/saved on the farm/).count()).resolves.toBe(1);
    await shoot(page, "offnav-05-bag-saved-online");
    await page.setViewportSize({ width: 1280, height: 800 });
    await shoot(page, "offnav-05-bag-saved-online-desktop");
    await context.close();
  }, 180_000);
});

describe("without a service worker, and before sign-in", () => {
  it("a browser that blocks service workers still opens every farm page without an error", async () => {
    const context = await browser.newContext({ ...PHONE, baseURL: app.origin, serviceWorkers: "block", locale: "en-GB", timezoneId: "UTC" });
    context.setDefaultTimeout(30_000);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signIn(page, helper);
    for (const route of ["/today", "/scan", "/bags", "/settings"]) {
      await page.goto(route);
      await page.getByRole("navigation", { name: "Main" }).waitFor();
      await page.waitForLoadState("load");
      await page.waitForTimeout(300); // registration runs after the load event
    }
    expect(await page.evaluate(() => Boolean(navigator.serviceWorker?.controller))).toBe(false);
    expect(errors.filter((e) => /pageerror|waiting/.test(e))).toEqual([]);
    // The control: the framework's own registration, which used to run on every page, fails in this browser.
    const helperRegistration = await page.evaluate(() =>
      (window as unknown as { serwist?: { register: () => Promise<unknown> } }).serwist?.register().then(
        () => "registered",
        (e: unknown) => String(e),
      ),
    );
    expect(helperRegistration).not.toBe("registered");
    await context.close();
  }, 120_000);

  it("the no-signal page opens without a session instead of sending the person to sign-in", async () => {
    const context = await phoneContext(browser, app.origin);
    const page = await context.newPage();
    const res = await page.goto("/offline");
    expect(res?.status()).toBe(200);
    expect(new URL(page.url()).pathname).toBe("/offline");
    await page.getByRole("heading", { name: "No signal here" }).waitFor();
    await shoot(page, "offnav-06-offline-page-signed-out");
    await context.close();
  }, 60_000);
});
