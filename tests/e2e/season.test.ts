// The season screens in real Chromium on a phone: counts with the stepper (a falling running total is refused),
// a sowing, a logger CSV import that moves a bag's pull window, a bag started from the season plan, a trial's
// winner made the farm's protocol, a visitor who only reads, and counting with no signal.
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { queryServer, signIn, waitForRows, waitForServiceWorker } from "./support/pages";
import { ARTIFACTS } from "./support/build";

let app: AppServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let errors: string[];

const owner = { email: "wren@bramblewick.example", password: "owner-frost-demo" };
const visitor = { email: "juniper@bramblewick.example", password: "viewer-frost-demo" };
const q = <T>(sql: string, ...args: unknown[]) => queryServer<T>(app.databaseFile, sql, ...args);

beforeAll(async () => {
  app = await startApp({ name: "season", seed: true });
  browser = await launchChromium();
  context = await phoneContext(browser, app.origin);
  page = await context.newPage();
  errors = watchErrors(page);
  page.on("dialog", (d) => void d.accept());
  await signIn(page, owner);
  // The store list fills once the first pull has brought the farm onto the phone.
  await page.goto("/stores");
  await page.getByRole("link", { name: /Barn fridge/ }).waitFor({ timeout: 60_000 });
}, 900_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

describe("season screens on a phone", () => {
  it("counts: refuses a running total below the last count, saves a rising one, and the server has it", async () => {
    const [bag] = q<{ id: string; sowing_id: string; last: number }>(
      `SELECT b.id, s.id AS sowing_id, (SELECT germinated_total FROM counts c WHERE c.sowing_id = s.id ORDER BY counted_on DESC LIMIT 1) AS last
       FROM bags b JOIN sowings s ON s.bag_id = b.id JOIN trial_arms a ON a.id = b.trial_arm_id WHERE a.label LIKE 'Freezer%'`,
    );
    await page.goto(`/sowing?bag=${bag.id}`);
    const stepper = page.getByLabel(/Seedlings up so far/);
    await expect(stepper.inputValue()).resolves.toBe(String(bag.last));
    await page.getByRole("button", { name: "One fewer" }).click();
    await page.getByText("cannot go below").waitFor();
    await expect(page.getByRole("button", { name: /^Save \d+ up on/ }).isDisabled()).resolves.toBe(true);
    await shoot(page, "season-01-count-refused");
    for (let i = 0; i < 3; i++) await page.getByRole("button", { name: "One more" }).click();
    await page.getByRole("button", { name: `Save ${bag.last + 2} up on` , exact: false }).click();
    await page.getByText("Saved:").waitFor();
    const rows = await waitForRows<{ n: number }>(app.databaseFile, "SELECT germinated_total AS n FROM counts WHERE sowing_id = ? ORDER BY counted_on DESC, created_at DESC LIMIT 1", [bag.sowing_id], (r) => r[0]?.n === bag.last + 2);
    expect(rows[0].n).toBe(bag.last + 2);
    // Germination % with its formula and source is in the page, folded under "How this is worked out".
    const worked = page.getByTestId("germination-worked-out").first();
    await expect(worked.getByText("100·N/Nt").isVisible()).resolves.toBe(false);
    await worked.getByText("How this is worked out").click();
    await worked.getByText("100·N/Nt").first().waitFor();
  });

  it("records a sowing for a pulled bag; the bag is sown on the server", async () => {
    const [bag] = q<{ id: string }>("SELECT id FROM bags WHERE pulled_on IS NOT NULL AND sown_on IS NULL LIMIT 1");
    await page.goto(`/sowing?bag=${bag.id}`);
    await page.getByLabel("Tray").fill("Tray 12");
    await page.getByLabel("Cells").fill("72");
    await page.getByRole("button", { name: "Record sowing" }).click();
    await page.getByText("Counts start the day after sowing").waitFor();
    const rows = await waitForRows<{ sown_on: string | null; tray: string | null }>(
      app.databaseFile, "SELECT b.sown_on, s.tray FROM bags b LEFT JOIN sowings s ON s.bag_id = b.id WHERE b.id = ?", [bag.id], (r) => !!r[0]?.sown_on,
    );
    expect(rows[0].tray).toBe("Tray 12");
  });

  it("imports a °F logger CSV into the barn fridge: all rows in, and a warm day moves a bag's pull window", async () => {
    const [barn] = q<{ id: string }>("SELECT id FROM stores WHERE name = 'Barn fridge'");
    const before = q<{ n: number }>("SELECT COUNT(*) AS n FROM readings WHERE store_id = ?", barn.id)[0].n;
    await page.goto(`/stores/view?id=${barn.id}`);
    // A bag still in the cold: a pulled or sown bag's cold days ended before the imported readings begin.
    const firstBag = page.locator("li", { hasText: "cold days of" }).filter({ hasText: /Chilling|Window open|Overdue/ }).first();
    const bagBefore = await firstBag.innerText();
    // A logger's own preamble, then °F readings every two hours; a day at 59 °F (15 °C) sits above the 0–10 °C band.
    let csv = "Logger BW-7 export\nSerial 1234\nTime (UTC),Temperature (°F)\n";
    const now = Date.now();
    for (let h = 60; h >= 4; h -= 2) csv += `${new Date(now - h * 3_600_000).toISOString().slice(0, 16).replace("T", " ")},${h <= 40 && h >= 14 ? 59 : 38.5}\n`;
    fs.mkdirSync(ARTIFACTS, { recursive: true });
    const file = path.join(ARTIFACTS, "season-logger.csv");
    fs.writeFileSync(file, csv);
    await page.getByRole("button", { name: "Import logger CSV" }).click();
    await page.locator("#readings-file").setInputFiles(file);
    await page.getByText("29 readings to import").waitFor();
    await page.getByText("All 29 are new to this store.").waitFor();
    await shoot(page, "season-02-import-preview");
    await page.getByRole("button", { name: "Import 29 readings" }).click();
    await page.getByText("Imported 29 readings").waitFor();
    expect(q<{ n: number }>("SELECT COUNT(*) AS n FROM readings WHERE store_id = ?", barn.id)[0].n).toBe(before + 29);
    // The sync loop pulls the new readings; that bag's cold days and window change on the phone.
    await expect.poll(() => firstBag.innerText(), { timeout: 30_000 }).not.toBe(bagBefore);
    await shoot(page, "season-03-import-done");
  });

  it("starts a bag from a plan row: the bag and the row point at each other on the server", async () => {
    await page.goto("/plan");
    await page.getByText("Countdown to the frost").waitFor();
    await page.getByRole("button", { name: "Start this bag" }).first().click();
    await page.getByRole("button", { name: "Start bag today" }).click();
    await page.getByText("started today and linked").waitFor();
    const rows = await waitForRows<{ bag_id: string; plan_item_id: string; id: string }>(
      app.databaseFile, "SELECT p.id, p.bag_id, b.plan_item_id FROM plan_items p JOIN bags b ON b.id = p.bag_id", [], (r) => r.length > 0,
    );
    expect(rows[0].plan_item_id).toBe(rows[0].id);
    await shoot(page, "season-04-plan");
  });

  it("makes the trial's winner the farm's own protocol, with the trial as its source", async () => {
    const [trial] = q<{ id: string }>("SELECT id FROM trials");
    await page.goto(`/trials/view?id=${trial.id}`);
    await page.getByText("the difference is likely real").waitFor();
    await page.getByRole("button", { name: "Prepare the protocol" }).click();
    await page.getByRole("button", { name: "Save as our protocol" }).click();
    await page.getByText("Saved as the farm's own protocol").waitFor();
    const rows = await waitForRows<{ is_farm_own: number; phases: string }>(
      app.databaseFile, "SELECT is_farm_own, phases FROM protocols WHERE source_trial_id = ?", [trial.id], (r) => r.length === 1,
    );
    expect(rows[0].is_farm_own).toBe(1);
    expect(rows[0].phases).toContain("Farm trial");
    await shoot(page, "season-05-trial");
  });

  it("counts with no signal; the count reaches the server when the signal is back", async () => {
    const [bag] = q<{ id: string; sowing_id: string }>(
      "SELECT b.id, s.id AS sowing_id FROM bags b JOIN sowings s ON s.bag_id = b.id JOIN trial_arms a ON a.id = b.trial_arm_id WHERE a.label LIKE 'Fridge%'",
    );
    await page.goto("/today");
    await waitForServiceWorker(page);
    await context.setOffline(true);
    await page.goto(`/sowing?bag=${bag.id}`);
    const stepper = page.getByLabel(/Seedlings up so far/);
    const start = Number(await stepper.inputValue());
    await page.getByRole("button", { name: "One more" }).click();
    await page.getByRole("button", { name: /^Save \d+ up on/ }).click();
    await page.getByText("Saved:").waitFor();
    await shoot(page, "season-06-offline-count");
    await context.setOffline(false);
    const rows = await waitForRows<{ n: number }>(app.databaseFile, "SELECT germinated_total AS n FROM counts WHERE sowing_id = ? ORDER BY counted_on DESC, created_at DESC LIMIT 1", [bag.sowing_id], (r) => r[0]?.n === start + 1, 60_000);
    expect(rows[0].n).toBe(start + 1);
    // Offline fetches fail by design; the browser asks for a favicon the app does not serve.
    expect(errors.filter((e) => !/Failed to fetch|ERR_INTERNET_DISCONNECTED|net::|favicon\.ico/.test(e))).toEqual([]);
  });

  it("a visitor reads the chart and the verdict but gets no import, reading or protocol buttons", async () => {
    const ctx = await phoneContext(browser, app.origin);
    const p = await ctx.newPage();
    await signIn(p, visitor);
    await p.goto("/stores");
    await p.getByRole("link", { name: /Barn fridge/ }).click({ timeout: 60_000 });
    await p.getByRole("heading", { name: "Bags in this store" }).waitFor();
    expect(await p.getByRole("button", { name: "Import logger CSV" }).count()).toBe(0);
    expect(await p.getByRole("button", { name: "Add a reading" }).count()).toBe(0);
    const [trial] = q<{ id: string }>("SELECT id FROM trials");
    await p.goto(`/trials/view?id=${trial.id}`);
    await p.getByText("Verdict").waitFor();
    expect(await p.getByText("Make this our protocol").count()).toBe(0);
    await ctx.close();
  });
});
