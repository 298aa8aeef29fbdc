// The check sheet follows the bag: the first, largest action is chosen by the bag's state and what was found,
// and the taps from an opened sheet to a saved result are counted for each case, on the demo farm at phone size.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Locator, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { queryServer, signIn, waitForRows } from "./support/pages";

let app: AppServer;
let browser: Browser | null = null;

beforeAll(async () => {
  app = await startApp({ name: "check-choice", seed: true });
  browser = await launchChromium();
}, 600_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

const grower = { email: "tomas@bramblewick.example", password: "grower-frost-demo" };

type BagId = { id: string };

/** Bags in the cold, by the state their sheet shows (the phone's effective window decides, so read it there). */
async function bagsByState(page: Page): Promise<Record<string, string[]>> {
  const live = queryServer<BagId>(
    app.databaseFile,
    `SELECT id FROM bags WHERE start_date IS NOT NULL AND pulled_on IS NULL AND discarded_on IS NULL AND sown_on IS NULL AND deleted_at IS NULL ORDER BY start_date`,
  );
  const found: Record<string, string[]> = {};
  for (const { id } of live) {
    await page.goto(`/check?bag=${id}&from=today`);
    const badge = page.getByTestId("bag-header").locator("[data-state]");
    await badge.waitFor({ timeout: 30_000 });
    const state = (await badge.getAttribute("data-state")) ?? "?";
    (found[state] ??= []).push(id);
  }
  return found;
}

async function openSheet(page: Page, id: string) {
  await page.goto(`/check?bag=${id}&from=today`);
  await page.getByTestId("choice").waitFor({ timeout: 30_000 });
}

/** The step buttons in the choice bar, in order, as a grower reads them. */
async function stepsShown(page: Page): Promise<string[]> {
  return (await page.getByTestId("choice").getByRole("button").allInnerTexts()).map((t) => t.replace(/\s+/g, " ").replace("✓ ", "").trim());
}

function tapCounter() {
  let taps = 0;
  return {
    tap: async (l: Locator) => {
      taps++;
      await l.click();
    },
    get count() {
      return taps;
    },
  };
}

async function leftTheSheet(page: Page) {
  await page.waitForURL(/\/today/, { timeout: 30_000 });
}

const checksOf = (bagId: string) =>
  queryServer<{ moisture: string; mould: string; sprouts: string; actions: string }>(app.databaseFile, `SELECT moisture, mould, sprouts, actions FROM checks WHERE bag_id = ? ORDER BY checked_at DESC`, bagId);

describe("the check sheet's first action, and the taps it takes", () => {
  it("chilling: All good in one tap; window open: keep chilling or pull side by side; overdue and roots: pull first; spreading: discard first; anything entered: Save check", async () => {
    const context = await phoneContext(browser!, app.origin);
    const page = await context.newPage();
    const errors = watchErrors(page);
    await signIn(page, grower);
    await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
    // Today's cards read with the sheet's own rule: a card and the sheet it opens have the same tone.
    const cards = page.getByTestId("round-bag");
    const tones: { href: string; tone: string }[] = [];
    for (let i = 0; i < Math.min(await cards.count(), 6); i++) {
      tones.push({ href: (await cards.nth(i).getAttribute("href"))!, tone: (await cards.nth(i).getAttribute("data-tone"))! });
    }
    expect(new Set(tones.map((t) => t.tone)).size).toBeGreaterThan(1); // routine work and trouble do not look the same
    await shoot(page, "check-choice-0-today");
    for (const { href, tone } of tones) {
      await page.goto(href);
      await page.getByTestId("choice").waitFor({ timeout: 30_000 });
      await expect(page.getByTestId("choice").getAttribute("data-tone"), href).resolves.toBe(tone);
    }
    const byState = await bagsByState(page);
    const chilling = byState.chilling ?? [];
    expect(chilling.length, JSON.stringify(byState)).toBeGreaterThanOrEqual(4);
    expect(byState.window_open?.length ?? 0, JSON.stringify(byState)).toBeGreaterThanOrEqual(1);
    expect(byState.overdue?.length ?? 0, JSON.stringify(byState)).toBeGreaterThanOrEqual(1);

    // 1. Chilling, nothing entered: "All good" is the only large step; one tap saves it.
    {
      const id = chilling[0];
      const before = checksOf(id).length;
      await openSheet(page, id);
      expect(await stepsShown(page)).toEqual(["All good damp, dry corners, clean, no sprouts"]);
      await shoot(page, "check-choice-1-chilling");
      const t = tapCounter();
      await t.tap(page.getByTestId("all-good"));
      await leftTheSheet(page);
      expect(t.count).toBe(1);
      const rows = await waitForRows(app.databaseFile, `SELECT moisture, mould, sprouts FROM checks WHERE bag_id = ?`, [id], (r) => r.length > before);
      expect(rows.length).toBe(before + 1);
    }

    // 2. Window open: the two choices side by side; pulling is its own step with a date (two taps).
    {
      const id = byState.window_open![0];
      await openSheet(page, id);
      expect(await stepsShown(page)).toEqual(["All good, keep chilling", "Pull now"]);
      const keep = await page.getByTestId("all-good").boundingBox();
      const pull = await page.getByTestId("step-pull").boundingBox();
      expect(Math.abs(keep!.y - pull!.y)).toBeLessThan(2); // one row
      await shoot(page, "check-choice-2-window-open");
      const t = tapCounter();
      await t.tap(page.getByTestId("step-pull"));
      await page.getByLabel("Pulled on").waitFor();
      await t.tap(page.getByRole("button", { name: "Save the pull" }));
      await leftTheSheet(page);
      expect(t.count).toBe(2);
      const rows = await waitForRows<{ pulled_on: string | null }>(app.databaseFile, `SELECT pulled_on FROM bags WHERE id = ?`, [id], (r) => r[0]?.pulled_on !== null);
      expect(rows[0].pulled_on).not.toBeNull();
    }

    // 3. Past the latest pull: "Pull now" first, no "All good" at all.
    {
      const id = byState.overdue![0];
      await openSheet(page, id);
      const steps = await stepsShown(page);
      expect(steps[0]).toBe("Pull now");
      expect(await page.getByTestId("all-good").count()).toBe(0);
      await expect(page.getByTestId("choice").getAttribute("data-tone")).resolves.toBe("act");
      await shoot(page, "check-choice-3-overdue");
      const t = tapCounter();
      await t.tap(page.getByTestId("step-pull"));
      await t.tap(page.getByRole("button", { name: "Save the pull" }));
      await leftTheSheet(page);
      expect(t.count).toBe(2);
      await waitForRows<{ pulled_on: string | null }>(app.databaseFile, `SELECT pulled_on FROM bags WHERE id = ?`, [id], (r) => r[0]?.pulled_on !== null);
    }

    // 4. First roots found on a chilling bag: "All good" goes, "Pull now" comes first, the roots advice sits under Sprouts.
    {
      const id = chilling[1];
      await openSheet(page, id);
      const t = tapCounter();
      await t.tap(page.getByRole("group", { name: "Sprouts" }).getByText("First roots", { exact: true }));
      expect(await page.getByTestId("all-good").count()).toBe(0);
      expect((await stepsShown(page))[0]).toBe("Pull now");
      await expect(page.getByTestId("advice-sprouts").textContent()).resolves.toMatch(/roots/i);
      await shoot(page, "check-choice-4-roots");
      await t.tap(page.getByTestId("step-pull"));
      await t.tap(page.getByRole("button", { name: "Save the pull" }));
      await leftTheSheet(page);
      expect(t.count).toBe(3);
      const rows = await waitForRows<{ sprouts: string; actions: string }>(app.databaseFile, `SELECT sprouts, actions FROM checks WHERE bag_id = ? ORDER BY checked_at DESC`, [id], (r) => r[0]?.sprouts === "first_roots");
      expect(rows[0]).toMatchObject({ sprouts: "first_roots" });
      expect(JSON.parse(rows[0].actions)).toContain("pulled");
    }

    // 5. Spreading mould: "Discard" first (with its confirmation), the rescue steps under Mould.
    {
      const id = chilling[2];
      await openSheet(page, id);
      const t = tapCounter();
      await t.tap(page.getByRole("group", { name: "Mould" }).getByText("Spreading", { exact: true }));
      expect((await stepsShown(page))[0]).toBe("Discard");
      await expect(page.getByTestId("choice").getAttribute("data-tone")).resolves.toBe("trouble");
      await expect(page.getByTestId("advice-mould").textContent()).resolves.toMatch(/rescue/i);
      // The advice is right under the Mould choice, above the Sprouts choice.
      const adviceBox = await page.getByTestId("advice-mould").boundingBox();
      const sproutsBox = await page.getByRole("group", { name: "Sprouts" }).boundingBox();
      expect(adviceBox!.y).toBeLessThan(sproutsBox!.y);
      await shoot(page, "check-choice-5-spreading");
      await t.tap(page.getByTestId("step-discard"));
      await t.tap(page.getByRole("button", { name: "Discard this bag" }));
      await leftTheSheet(page);
      expect(t.count).toBe(3);
      const rows = await waitForRows<{ discarded_on: string | null; discard_reason: string | null }>(
        app.databaseFile,
        `SELECT discarded_on, discard_reason FROM bags WHERE id = ?`,
        [id],
        (r) => r[0]?.discarded_on !== null,
      );
      expect(rows[0].discard_reason).toBe("Mould spreading (found at a check).");
    }

    // 6. Anything entered (soggy): "All good" disappears and the primary step is "Save check".
    {
      const id = chilling[3];
      await openSheet(page, id);
      const t = tapCounter();
      await t.tap(page.getByRole("group", { name: "Moisture" }).getByText("Soggy", { exact: true }));
      expect(await page.getByTestId("all-good").count()).toBe(0);
      expect((await stepsShown(page))[0]).toBe("Save check");
      await expect(page.getByTestId("advice-moisture").textContent()).resolves.toMatch(/blot/i);
      await t.tap(page.getByTestId("step-save"));
      await leftTheSheet(page);
      expect(t.count).toBe(2);
      await waitForRows<{ moisture: string }>(app.databaseFile, `SELECT moisture FROM checks WHERE bag_id = ? ORDER BY checked_at DESC`, [id], (r) => r[0]?.moisture === "soggy");
    }

    // The same sheet at desktop size, for looking at.
    await page.setViewportSize({ width: 1280, height: 800 });
    await openSheet(page, byState.window_open![1] ?? chilling[4] ?? chilling[0]);
    await shoot(page, "check-choice-desktop");
    expect(errors.filter((e) => !/status of 404/.test(e))).toEqual([]);
    await context.close();
  }, 300_000);

  it("a caution read by a person on a bag folds to a chip for them (kept across reloads), and stays in full for someone else", async () => {
    // A live bag in the store that holds food: its sheet carries the fridge-and-food caution.
    const [bag] = queryServer<BagId>(
      app.databaseFile,
      `SELECT b.id FROM bags b JOIN stores s ON s.id = b.store_id WHERE s.holds_food = 1 AND b.start_date IS NOT NULL AND b.pulled_on IS NULL AND b.discarded_on IS NULL AND b.deleted_at IS NULL LIMIT 1`,
    );
    expect(bag).toBeDefined();
    const context = await phoneContext(browser!, app.origin);
    const page = await context.newPage();
    await signIn(page, grower);
    await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
    await openSheet(page, bag!.id);
    const full = page.getByTestId("cautions-full");
    await full.getByRole("note").filter({ hasText: "This fridge and food" }).waitFor();
    await full.getByRole("button", { name: /I have read/ }).click();
    const folded = page.getByTestId("cautions-folded");
    await folded.waitFor();
    expect(await page.getByTestId("cautions-full").count()).toBe(0);
    // The words are one tap away.
    const chip = folded.locator("details").filter({ hasText: "This fridge and food" });
    await expect(chip.getByText(/Keep seed bags sealed/).isVisible()).resolves.toBe(false);
    await chip.locator("summary").click();
    await chip.getByText(/Keep seed bags sealed/).waitFor();
    await page.reload();
    await page.getByTestId("choice").waitFor({ timeout: 30_000 });
    await page.getByTestId("cautions-folded").waitFor();
    await shoot(page, "check-choice-cautions-folded");
    await context.close();

    // Another person on another phone has not read them.
    const other = await phoneContext(browser!, app.origin);
    const p2 = await other.newPage();
    await signIn(p2, { email: "wren@bramblewick.example", password: "owner-frost-demo" });
    await p2.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
    await openSheet(p2, bag!.id);
    await p2.getByTestId("cautions-full").waitFor();
    await other.close();
  }, 180_000);
});
