// The bag, lot and protocol screens in real Chromium on a phone: a grower sets up a bag from a toxic-seed lot in a
// food fridge (cautions shown, window from the protocol), the bag reaches the server, an edit lands in the bag's
// history, the table finds it, a visitor only reads, and a published protocol is copied to the farm's own.
import Database from "better-sqlite3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { addDaysToIsoDay, formatIsoDay } from "@/lib/domain/dates";
import { formatBagCode } from "@/lib/domain/bag-codes";

let app: AppServer;
let browser: Browser;

beforeAll(async () => {
  app = await startApp({ name: "bags", seed: true });
  browser = await launchChromium();
}, 900_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

function query<T>(sql: string, ...args: unknown[]): T[] {
  const db = new Database(app.databaseFile, { readonly: true });
  try {
    return db.prepare(sql).all(...args) as T[];
  } finally {
    db.close();
  }
}

async function until<T>(read: () => T | undefined | null, what: string, ms = 30_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = read();
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 300));
  }
}

async function signIn(page: Page, email: string, password: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password", { exact: true }).fill(password);
  await page.getByRole("button", { name: /sign in/i }).click();
  await page.waitForURL(/\/today/);
}

/** The bags table lists bags once the first pull has filled the phone store. */
async function waitForBags(page: Page) {
  await page.goto("/bags");
  await page.getByRole("list", { name: "Bags" }).getByRole("link").first().waitFor({ timeout: 40_000 });
}

describe("bags, lots and protocols on a phone", () => {
  const made = { id: "", code: "" };

  it("sets up a bag from the elder lot: protocol, window, cautions, code, print link, synced", async () => {
    const context = await phoneContext(browser, app.origin);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signIn(page, "tomas@bramblewick.example", "grower-frost-demo");
    await waitForBags(page);
    const [lot] = query<{ id: string }>(`SELECT id FROM lots WHERE species LIKE 'Sambucus%'`);
    const [shed] = query<{ id: string }>(`SELECT id FROM stores WHERE holds_food = 1`);
    const [protocol] = query<{ id: string }>(`SELECT id FROM protocols WHERE starter_key = 'sambucus'`);

    await page.goto(`/bags/new?lot=${lot.id}`);
    await expect(page.getByLabel("Protocol").inputValue()).resolves.toBe(protocol.id);
    // Young & Young 1992: 90 days warm, then 90 days cold → the window opens 180 days after today.
    const today = formatIsoDay(new Date());
    await expect(page.getByLabel("Start date").inputValue()).resolves.toBe(today);
    await page.getByLabel("Cold store").selectOption(shed.id);
    await page.getByLabel("Seeds in the bag").fill("90");
    await expect(page.getByRole("note").filter({ hasText: "Toxic seed" }).textContent()).resolves.toContain("CDC, MMWR 1984");
    await page.getByRole("note").filter({ hasText: "This fridge and food" }).waitFor();
    await page.getByRole("note").filter({ hasText: "Medicinal plant" }).waitFor();
    await shoot(page, "bags-01-new-bag");
    await page.getByRole("button", { name: "Save bag" }).click();

    const print = page.getByRole("link", { name: "Print label" });
    await print.waitFor();
    const href = (await print.getAttribute("href"))!;
    expect(href).toMatch(/^\/labels\?ids=[0-9a-f-]{36}$/);
    made.id = decodeURIComponent(href.split("=")[1]);
    const row = await until(
      () => query<{ code: string; start_date: string; window_start: string; window_end: string; store_id: string; seed_count: number; protocol_id: string }>(`SELECT * FROM bags WHERE id = ?`, made.id)[0],
      "the new bag on the server",
    );
    made.code = row.code;
    expect(row).toMatchObject({ start_date: today, window_start: addDaysToIsoDay(today, 180), window_end: addDaysToIsoDay(today, 180), store_id: shed.id, seed_count: 90, protocol_id: protocol.id });
    expect(errors.filter((e) => !/status of 404|sw\.js|ServiceWorker/.test(e))).toEqual([]);
    await context.close();
  }, 180_000);

  it("edits the bag's box and note, and the history of edits shows both", async () => {
    const context = await phoneContext(browser, app.origin);
    const page = await context.newPage();
    await signIn(page, "tomas@bramblewick.example", "grower-frost-demo");
    await waitForBags(page);
    // The table finds the bag by its code typed in lower case with a hyphen.
    await page.getByPlaceholder("Search code, species, store or box").fill(formatBagCode(made.code).toLowerCase());
    const cards = page.getByRole("list", { name: "Bags" }).getByRole("link");
    await expect.poll(() => cards.count()).toBe(1);
    await cards.first().click();
    await page.waitForURL(/\/bags\/view\?id=/);
    await page.getByRole("heading", { level: 1 }).filter({ hasText: formatBagCode(made.code) }).waitFor();
    await page.getByRole("img", { name: /Started .* window opens/ }).waitFor();

    await page.getByRole("button", { name: "Edit", exact: true }).click();
    await page.getByLabel("Box or shelf").selectOption("Crisper");
    await page.getByLabel("Note").fill("Moved to the crisper, sealed in a tub");
    await page.getByRole("button", { name: "Save changes" }).click();
    await until(() => query(`SELECT 1 FROM audit_log WHERE row_id = ? AND field = 'note'`, made.id)[0], "the edit in the server's audit log");
    const history = page.getByRole("region", { name: "History of edits" });
    await expect
      .poll(async () => {
        await page.reload();
        await history.waitFor();
        return history.textContent();
      }, { timeout: 40_000 })
      .toMatch(/Note: \(empty\) → Moved to the crisper, sealed in a tub.*Tomas Reed/);
    await shoot(page, "bags-02-bag-page");
    await context.close();
  }, 180_000);

  it("shows a visitor the bag without any action that changes it", async () => {
    const context = await phoneContext(browser, app.origin);
    const page = await context.newPage();
    await signIn(page, "juniper@bramblewick.example", "viewer-frost-demo");
    await waitForBags(page);
    await page.goto(`/bags/view?id=${made.id}`);
    await page.getByText("Your role can read this bag but not change it.").waitFor();
    for (const name of ["Edit", "Pull", "Discard", "Check now"]) await expect(page.getByRole("button", { name, exact: true }).count()).resolves.toBe(0);
    await expect(page.getByRole("link", { name: "New bag" }).count()).resolves.toBe(0);
    // The demo's read-only member is a Visitor (the role's own word), on the Team page and in Settings.
    await page.goto("/team");
    const me = page.getByRole("listitem").filter({ hasText: "Juniper Cole" });
    await me.getByText("Visitor", { exact: true }).waitFor();
    expect(await page.getByText(/viewer/i).count()).toBe(0);
    await shoot(page, "bags-team-visitor");
    await page.setViewportSize({ width: 1280, height: 800 });
    await shoot(page, "bags-team-visitor-desktop");
    await page.setViewportSize({ width: 390, height: 844 });
    await page.goto("/settings");
    await page.getByText("you are Visitor").waitFor();
    await context.close();
  }, 120_000);

  it("copies a published protocol to the farm's own with its sources", async () => {
    const context = await phoneContext(browser, app.origin);
    const page = await context.newPage();
    await signIn(page, "tomas@bramblewick.example", "grower-frost-demo");
    await waitForBags(page);
    const [starter] = query<{ id: string }>(`SELECT id FROM protocols WHERE starter_key = 'asclepias-speciosa'`);
    await page.goto(`/protocols/view?id=${starter.id}`);
    await page.getByText("Kaye, Sandlin & Bahm 2018, AoB PLANTS 10:ply018").waitFor();
    await page.getByRole("button", { name: "Copy to the farm's own" }).click();
    await page.waitForURL(/\/protocols\/edit\?id=/);
    const copyId = new URL(page.url()).searchParams.get("id")!;
    const copy = await until(
      () => query<{ is_farm_own: number; starter_key: string | null; phases: string }>(`SELECT is_farm_own, starter_key, phases FROM protocols WHERE id = ?`, copyId)[0],
      "the copied protocol on the server",
    );
    expect(copy.is_farm_own).toBe(1);
    expect(copy.starter_key).toBeNull();
    expect(JSON.parse(copy.phases)[0].sources[0]).toMatchObject({ citation: "Kaye, Sandlin & Bahm 2018, AoB PLANTS 10:ply018", minDays: 14, maxDays: 28 });
    await context.close();
  }, 120_000);
});
