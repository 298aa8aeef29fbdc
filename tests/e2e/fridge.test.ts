// At the fridge, end to end in real Chromium on a phone: print a label for a demo bag, show its QR code to the
// fake camera, land on that bag's check sheet, tap "All good" once with no signal, and find the check on the
// phone (outbox) and, once the signal is back, on the server.
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { ARTIFACTS } from "./support/build";
import { formatBagCode } from "@/lib/domain/bag-codes";
import { matrixFromLabelPath, writeQrVideo } from "./support/qr-camera";
import { ONE_TAP_BAG, queryServer, signIn, waitForRows, waitForServiceWorker } from "./support/pages";

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

const helper = { email: "ada@bramblewick.example", password: "helper-frost-demo" };

/** Waits until the sync loop has pulled the farm into the phone store (the round lists bags). */
async function waitForFarm(page: Page) {
  try {
    await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
  } catch (e) {
    await shoot(page, "fridge-farm-not-loaded");
    throw e;
  }
}

/** A bag in the cold (most recently started): the one-tap case. */
function demoBag() {
  return queryServer<{ id: string; code: string }>(
    app.databaseFile,
    `SELECT id, code FROM bags WHERE ${ONE_TAP_BAG} ORDER BY start_date DESC LIMIT 1`,
  )[0];
}

/** Waits for the scanner to open the bag's sheet; on failure says what the scan screen showed. */
async function waitForSheet(page: Page, bagId: string, errors: string[]) {
  try {
    await page.waitForURL(new RegExp(`/check\\?bag=${bagId}`), { timeout: 45_000 });
  } catch (e) {
    await shoot(page, "fridge-scan-stuck");
    const text = async (id: string) => ((await page.getByTestId(id).count()) ? await page.getByTestId(id).first().textContent() : "(none)");
    const seen = {
      url: page.url(),
      notice: await text("scan-notice"),
      cameraTrouble: await text("camera-trouble"),
      phoneHasBag: await page.evaluate(
        (id) =>
          new Promise<boolean>((resolve) => {
            const open = indexedDB.open("rimebook");
            open.onerror = () => resolve(false);
            open.onsuccess = () => {
              const get = open.result.transaction("bags", "readonly").objectStore("bags").get(id);
              get.onsuccess = () => resolve(Boolean(get.result));
              get.onerror = () => resolve(false);
            };
          }),
        bagId,
      ),
      errors,
    };
    throw new Error(`The scanner did not open the bag's sheet: ${JSON.stringify(seen)}`, { cause: e });
  }
}

type CheckRow = { moisture: string; mould: string; sprouts: string; actions: string };
const checksOf = (bagId: string) =>
  queryServer<CheckRow>(app.databaseFile, `SELECT moisture, mould, sprouts, actions FROM checks WHERE bag_id = ? ORDER BY checked_at DESC`, bagId);

describe("scan a printed label and save a check with one tap", () => {
  let video = "";
  const bag = { id: "", code: "" };

  it("prints a label sheet for a demo bag", async () => {
    Object.assign(bag, demoBag());
    const context = await phoneContext(browser!, app.origin);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signIn(page, helper);
    await waitForFarm(page);
    await page.goto(`/labels?ids=${bag.id}&size=large`);
    const label = page.locator(`article[data-code="${bag.code}"]`);
    await label.waitFor();
    await expect(label.textContent()).resolves.toContain(formatBagCode(bag.code));
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
    await signIn(page, helper);
    await waitForFarm(page);
    await shoot(page, "fridge-02-today");
    // The service worker must hold the app (scanner chunk included) before the signal goes.
    await waitForServiceWorker(page);
    await waitForFarm(page);

    await context.setOffline(true);
    await page.getByRole("link", { name: /scan a bag/i }).click();
    await waitForSheet(page, bag.id, errors);
    await page.getByTestId("bag-header").waitFor();
    await expect(page.getByTestId("bag-header").textContent()).resolves.toContain(formatBagCode(bag.code));
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
    const before = checksOf(bag.id).length;
    await shoot(page, "fridge-04-saved-offline");

    await context.setOffline(false);
    await page.evaluate(() => window.dispatchEvent(new Event("online")));
    const after = await waitForRows<CheckRow>(app.databaseFile, `SELECT moisture, mould, sprouts, actions FROM checks WHERE bag_id = ? ORDER BY checked_at DESC`, [bag.id], (rows) => rows.length > before);
    expect(after).toHaveLength(before + 1);
    expect(after[0]).toMatchObject({ moisture: "damp", mould: "clean", sprouts: "none", actions: "[]" });
    expect(errors.filter((e) => !/ERR_INTERNET_DISCONNECTED|Failed to fetch|net::|status of 404/.test(e))).toEqual([]);
    await context.close();
  }, 180_000);
});
