// The season view on /plan, as the demo farm's Owner: counted back from the last frost in words (no month
// columns), each species saying when its bag must go in and the cold still to come; the same words a screen
// reader reads as a list in order; nothing wider than a 390 px phone; the width used on a desk. Screenshots go
// to artifacts/season-*.png for looking at.
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, watchErrors } from "./support/browser";
import { ROOT } from "./support/build";
import { signIn } from "./support/pages";

let app: AppServer;
let browser: Browser | null = null;
let context: BrowserContext;
let page: Page;
let errors: string[] = [];
const SHOTS = path.join(ROOT, "artifacts");

beforeAll(async () => {
  app = await startApp({ name: "plan-season", seed: true });
  browser = await launchChromium();
  context = await phoneContext(browser, app.origin);
  page = await context.newPage();
  errors = watchErrors(page);
  await signIn(page, { email: "wren@bramblewick.example", password: "owner-frost-demo" });
  fs.mkdirSync(SHOTS, { recursive: true });
}, 600_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

const lanes = () => page.locator("figure ol > li");

describe("the season counted back from the last frost", () => {
  it("says, species by species, when the bag goes in and how much cold it needs, on a phone", async () => {
    await page.goto("/plan");
    await page.getByRole("heading", { name: "Countdown to the frost" }).waitFor();
    const figure = page.getByRole("figure");
    // The demo farm's last frost is 8 May; the scale is in weeks before it, not months.
    await figure.getByText(/^Counted back from the last frost, \w{3} 8 May/).waitFor();
    expect(await figure.innerText()).not.toMatch(/\b(Jan|Feb|Mar|Apr)\n/);
    expect(await lanes().count()).toBe(5);
    // The text a screen reader reads, in the order of the start-by days: each lane in words.
    const texts = await lanes().allInnerTexts();
    for (const t of texts) {
      expect(t).toMatch(/not started — must go in by \w{3} \d{1,2} \w{3}|late: should have started|no cold needed/);
      expect(t).toMatch(/needs \d+ days (warm|cold)|no pretreatment/);
    }
    const spoken = await figure.locator("ol > li .sr-only").allInnerTexts();
    expect(spoken).toHaveLength(5);
    expect(spoken.every((s) => /sow \w{3} \d{1,2} \w{3}/.test(s))).toBe(true);
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    await figure.scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(SHOTS, "season-phone.png"), fullPage: true });
    await figure.screenshot({ path: path.join(SHOTS, "season-phone-figure.png") });
  });

  it("uses the width on a desk: tag and gauge side by side", async () => {
    await page.setViewportSize({ width: 1280, height: 800 });
    await page.reload();
    await page.getByRole("heading", { name: "Countdown to the frost" }).waitFor();
    const box = await page.getByRole("figure").boundingBox();
    expect(box!.width).toBeGreaterThan(900);
    const tag = await lanes().first().boundingBox();
    expect(tag!.height).toBeLessThan(140); // words and gauge on one row, not stacked
    await page.screenshot({ path: path.join(SHOTS, "season-desktop.png"), fullPage: true });
    await page.getByRole("figure").screenshot({ path: path.join(SHOTS, "season-desktop-figure.png") });
    await page.setViewportSize({ width: 390, height: 844 });
  });

  it("shows what is done: a bag started from a row is in the cold, with its cold still to go", async () => {
    await page.goto("/plan");
    await page.getByRole("heading", { name: "Countdown to the frost" }).waitFor();
    const species = (await page.locator("ul > li h2").first().innerText()).trim();
    await page.getByRole("button", { name: "Start this bag" }).first().click();
    await page.getByRole("button", { name: "Start bag today" }).click();
    await page.getByText("started today and linked").waitFor();
    const lane = lanes().filter({ hasText: species });
    await expect.poll(() => lane.innerText(), { timeout: 30_000 }).toMatch(/in the (cold|bag) since \w{3} \d{1,2} \w{3}/);
    expect(await lane.innerText()).toMatch(/needs .*\d+ days cold · \d+ to go/);
    await page.screenshot({ path: path.join(SHOTS, "season-phone-started.png"), fullPage: true });
    expect(errors).toEqual([]);
  });
});
