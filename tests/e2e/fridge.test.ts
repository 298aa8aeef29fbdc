// At the fridge, end to end in real Chromium on a phone: print a label for a demo bag, show its QR code to the
// fake camera, land on that bag's check sheet, tap "All good" once with no signal, and find the check on the
// phone (outbox) and, once the signal is back, on the server.
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { ARTIFACTS } from "./support/build";
import { matrixFromLabelPath, writeQrVideo } from "./support/qr-camera";

let app: AppServer;
let browser: Browser | null = null;
let cameraBrowser: Browser | null = null;

beforeAll(async () => {
  app = await startApp({ name: "fridge", seed: true });
  browser = await launchChromium();
}, 600_000);

afterAll(async () => {
  await cameraBrowser?.close();
  await browser?.close();
  await app?.stop();
});

async function signIn(page: Page, email = "ada@bramblewick.example", password = "helper-frost-demo") {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password", { exact: true }).fill(password);
  await page.getByRole("button", { name: /sign in/i }).click();
  await page.waitForURL(/\/today/);
}

/** Waits until the sync loop has pulled the farm into the phone store (the round lists bags). */
async function waitForFarm(page: Page) {
  try {
    await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
  } catch (e) {
    await shoot(page, "fridge-farm-not-loaded");
    throw e;
  }
}

function demoBag() {
  const db = new Database(app.databaseFile, { readonly: true });
  try {
    // A bag in the cold whose last check was clean: the one-tap case.
    return db
      .prepare(
        `SELECT b.id, b.code FROM bags b WHERE b.start_date IS NOT NULL AND b.pulled_on IS NULL AND b.discarded_on IS NULL AND b.sown_on IS NULL
         ORDER BY b.start_date DESC LIMIT 1`,
      )
      .get() as { id: string; code: string };
  } finally {
    db.close();
  }
}

function serverChecks(bagId: string) {
  const db = new Database(app.databaseFile, { readonly: true });
  try {
    return db.prepare(`SELECT moisture, mould, sprouts, actions, checked_by FROM checks WHERE bag_id = ? ORDER BY checked_at DESC`).all(bagId) as {
      moisture: string;
      mould: string;
      sprouts: string;
      actions: string;
      checked_by: string;
    }[];
  } finally {
    db.close();
  }
}

describe("scan a printed label and save a check with one tap", () => {
  let video = "";
  const bag = { id: "", code: "" };

  it("prints a label sheet for a demo bag", async () => {
    Object.assign(bag, demoBag());
    const context = await phoneContext(browser!, app.origin);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signIn(page);
    await waitForFarm(page);
    await page.goto(`/labels?ids=${bag.id}&size=large`);
    const label = page.locator(`article[data-code="${bag.code}"]`);
    await label.waitFor();
    await expect(label.textContent()).resolves.toContain(`${bag.code.slice(0, 3)}-${bag.code.slice(3)}`);
    await shoot(page, "fridge-01-labels");
    await page.emulateMedia({ media: "print" });
    await page.pdf({ path: path.join(ARTIFACTS, "fridge-labels.pdf"), preferCSSPageSize: true, printBackground: true });
    await page.emulateMedia({ media: "screen" });

    const qr = label.locator("svg");
    const size = Number((await qr.getAttribute("viewBox"))!.split(" ")[2]);
    const d = (await qr.locator("path").getAttribute("d"))!;
    video = path.join(ARTIFACTS, "fridge-label.y4m");
    fs.mkdirSync(ARTIFACTS, { recursive: true });
    writeQrVideo(video, matrixFromLabelPath(d, size));
    expect(errors.filter((e) => !/status of 404/.test(e))).toEqual([]); // favicon: not this screen's
    await context.close();
  }, 120_000);

  it("reads the label through the camera, opens the bag's sheet, and keeps an offline All good", async () => {
    cameraBrowser = await launchChromium({ cameraVideo: video });
    const context = await phoneContext(cameraBrowser, app.origin, { camera: true });
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signIn(page);
    await waitForFarm(page);
    await shoot(page, "fridge-02-today");
    // The service worker must hold the app (scanner chunk included) before the signal goes.
    await page.evaluate(async () => {
      await navigator.serviceWorker.ready;
      for (let i = 0; i < 100 && !navigator.serviceWorker.controller; i++) await new Promise((r) => setTimeout(r, 100));
    });
    await page.reload();
    await waitForFarm(page);

    await context.setOffline(true);
    await page.getByRole("link", { name: /scan a bag/i }).click();
    await page.waitForURL(new RegExp(`/check\\?bag=${bag.id}`), { timeout: 20_000 });
    await page.getByTestId("bag-header").waitFor();
    await expect(page.getByTestId("bag-header").textContent()).resolves.toContain(`${bag.code.slice(0, 3)}-${bag.code.slice(3)}`);
    await shoot(page, "fridge-03-check-sheet");

    await page.getByTestId("all-good").click();
    await page.waitForURL(/\/scan\?saved=/);
    await page.getByTestId("saved-notice").waitFor();
    const outbox = await page.evaluate(
      () =>
        new Promise<{ name: string; status: string; bag: string }[]>((resolve, reject) => {
          const open = indexedDB.open("rimebook");
          open.onerror = () => reject(open.error);
          open.onsuccess = () => {
            const tx = open.result.transaction("outbox", "readonly");
            const all = tx.objectStore("outbox").getAll();
            all.onsuccess = () => resolve(all.result.map((e: { name: string; status: string; args: { bag_id: string } }) => ({ name: e.name, status: e.status, bag: e.args.bag_id })));
          };
        }),
    );
    expect(outbox).toContainEqual({ name: "check.record", status: "pending", bag: bag.id });
    const before = serverChecks(bag.id).length;
    await shoot(page, "fridge-04-saved-offline");

    await context.setOffline(false);
    await page.evaluate(() => window.dispatchEvent(new Event("online")));
    let after = before;
    for (let i = 0; i < 60 && after === before; i++) {
      await page.waitForTimeout(500);
      after = serverChecks(bag.id).length;
    }
    expect(after).toBe(before + 1);
    expect(serverChecks(bag.id)[0]).toMatchObject({ moisture: "damp", mould: "clean", sprouts: "none", actions: "[]" });
    expect(errors.filter((e) => !/ERR_INTERNET_DISCONNECTED|Failed to fetch|net::|status of 404/.test(e))).toEqual([]);
    await context.close();
  }, 180_000);
});
