// The farm learns from its own bags, in real Chromium on the demo farm: the coneflower protocol shows the farm's
// curve and median beside the published 4 weeks (HortScience 28(9):899, 1993); accepting the farm's window saves a
// farm-own protocol whose source names the farm's record; this season's chilling coneflower bag turns daily on
// Today because the farm's history says roots may show; the protocol page still draws the curve with no signal.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { queryServer, signIn, waitForRows, waitForServiceWorker } from "./support/pages";
import { formatIsoDay } from "@/lib/domain/dates";
import { buildRootsHistory, groupChecksByBag } from "@/lib/domain/rows/farm-history-rows";
import { reconcileProtocol } from "@/lib/domain/protocols";

let app: AppServer;
let browser: Browser;

beforeAll(async () => {
  app = await startApp({ name: "learn", seed: true });
  browser = await launchChromium();
}, 900_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

const grower = { email: "tomas@bramblewick.example", password: "grower-frost-demo" };

/** The median the domain gives for the demo farm's coneflower bags, read straight from the server's rows. */
function expectedConeflowerMedian(): number | null {
  const q = <T,>(sql: string) => queryServer<T>(app.databaseFile, sql);
  const bags = q<Record<string, unknown>>("SELECT * FROM bags WHERE deleted_at IS NULL") as never[];
  const lots = q<Record<string, unknown>>("SELECT * FROM lots WHERE deleted_at IS NULL") as never[];
  const checks = q<{ actions: string }>("SELECT * FROM checks").map((c) => ({ ...c, actions: JSON.parse(c.actions) })) as never[];
  const [p] = q<{ species: string; phases: string; effective_band: string | null }>("SELECT species, phases, effective_band FROM protocols WHERE starter_key = 'echinacea-purpurea'");
  const protocol = reconcileProtocol({ species: p.species, phases: JSON.parse(p.phases), effectiveBand: p.effective_band ? JSON.parse(p.effective_band) : null });
  return buildRootsHistory({ bags, lots }, groupChecksByBag(checks), { species: "Echinacea purpurea" }, protocol, formatIsoDay(new Date())).window.median;
}

async function openConeflowerProtocol(page: Page): Promise<string> {
  const [starter] = queryServer<{ id: string }>(app.databaseFile, "SELECT id FROM protocols WHERE starter_key = 'echinacea-purpurea'");
  await page.goto(`/protocols/view?id=${starter.id}`);
  await page.getByTestId("farm-history").waitFor({ timeout: 40_000 });
  return starter.id;
}

describe("the farm learns from its own bags", () => {
  it("shows the coneflower curve and median beside the published window, and saves the farm's window as its own protocol", async () => {
    const context = await phoneContext(browser, app.origin);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signIn(page, grower);
    await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
    await openConeflowerProtocol(page);

    const median = expectedConeflowerMedian();
    expect(median).not.toBeNull();
    expect(median!).toBeLessThan(28);
    await expect.poll(() => page.getByTestId("history-median").textContent()).toBe(`day ${median}`);
    // The step line and its band are drawn (recharts loads lazily on this screen).
    await page.getByTestId("roots-curve").locator("svg path.recharts-curve").first().waitFor({ timeout: 30_000 });
    await page.getByText("Published window: day 28.").waitFor();
    await page.getByText("Start daily checks from day 15, not day 28.").waitFor();
    await shoot(page, "learn-protocol-phone");

    await page.getByRole("button", { name: "Save as the farm's own protocol" }).click();
    await page.getByRole("status").getByText("citing this farm's record").waitFor();
    const rows = await waitForRows<{ phases: string; is_farm_own: number }>(
      app.databaseFile,
      "SELECT phases, is_farm_own FROM protocols WHERE species = 'Echinacea purpurea' AND is_farm_own = 1",
      [],
      (r) => r.length === 1,
    );
    expect(rows).toHaveLength(1);
    const sources = JSON.parse(rows[0].phases)[0].sources;
    expect(sources[0].citation).toMatch(/^This farm's record, \d+ bags, seasons \d{4}–\d{4}; first roots from day 18; half the bags by day \d+/);
    expect(sources[0]).toMatchObject({ minDays: 15 });
    // The published source stays beside it.
    expect(sources.map((s: { citation: string }) => s.citation)).toContain("HortScience 28(9):899 (1993)");
    // The new protocol's page shows the farm's record as its source and no longer suggests an earlier start.
    await page.getByRole("link", { name: "Open it" }).click();
    await page.getByText(/^This farm's record, /).first().waitFor();
    await page.getByTestId("farm-history").waitFor();
    expect(await page.getByRole("button", { name: /farm's own protocol/ }).count()).toBe(0);
    expect(await page.getByText("citing this farm's record").count()).toBe(0);
    await shoot(page, "learn-farm-protocol-phone");
    // The browser asks for /favicon.ico on its own (the app ships its icons in the manifest).
    expect(errors.filter((e) => !e.includes("/favicon.ico"))).toEqual([]);
    await context.close();
  }, 240_000);

  it("turns this season's chilling coneflower bag daily on Today, and says why on its bag page", async () => {
    const context = await phoneContext(browser, app.origin);
    const page = await context.newPage();
    await signIn(page, grower);
    const bag = page.getByTestId("round-bag").filter({ hasText: "Echinacea purpurea" }).filter({ hasText: "On this farm roots have shown by now: check daily." });
    await bag.first().waitFor({ timeout: 60_000 });
    await page.getByText(/Roots may show/).first().waitFor();
    await shoot(page, "learn-today-phone");
    await bag.first().click();
    await page.waitForURL(/\/check\?bag=/);
    await page.getByTestId("farm-roots-line").getByText(/^On this farm, half the Echinacea purpurea bags showed roots by day \d+/).waitFor();
    await shoot(page, "learn-check-phone");
    await context.close();
  }, 180_000);

  it("draws the curve with no signal and at desktop size; the lot page and a fridge's drying time too", async () => {
    const context = await phoneContext(browser, app.origin);
    const page = await context.newPage();
    await signIn(page, grower);
    await waitForServiceWorker(page);
    await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
    const id = await openConeflowerProtocol(page);
    await page.getByTestId("roots-curve").locator("svg").first().waitFor();
    await context.setOffline(true);
    await page.goto(`/protocols/view?id=${id}`);
    await page.getByTestId("roots-curve").locator("svg path.recharts-curve").first().waitFor({ timeout: 30_000 });
    await context.setOffline(false);
    await page.setViewportSize({ width: 1280, height: 800 });
    await shoot(page, "learn-protocol-desktop");
    // The lot page shows the same history for that lot alone; the barn fridge's page says how fast its bags dry.
    await page.setViewportSize({ width: 390, height: 844 });
    const [lot] = queryServer<{ id: string }>(app.databaseFile, "SELECT id FROM lots WHERE species = 'Echinacea purpurea' AND year = 2025");
    await page.goto(`/lots/edit?id=${lot.id}`);
    await page.getByTestId("farm-history").getByTestId("roots-curve").locator("svg").first().waitFor({ timeout: 30_000 });
    await shoot(page, "learn-lot-phone");
    const [barn] = queryServer<{ id: string }>(app.databaseFile, "SELECT id FROM stores WHERE name = 'Barn fridge'");
    await page.goto(`/stores/view?id=${barn.id}`);
    await page.getByTestId("drying-history").getByText(/Bags in this store go from damp to dry in about \d+ days/).waitFor({ timeout: 30_000 });
    await shoot(page, "learn-store-phone");
    await context.close();
  }, 180_000);
});
