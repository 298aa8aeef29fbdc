// Managing cold stores and trials in real Chromium on a phone (390×844), as the demo farm's Grower:
// editing a trial with no signal (it reaches the server when the signal is back), a store with bags
// still in it refused with their codes, an empty store deleted after a confirmation, a trial deleted
// while its bags stay, and a Helper who gets none of these buttons.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { queryServer, signIn, waitForRows, waitForServiceWorker } from "./support/pages";
import { formatBagCode } from "@/lib/domain/bag-codes";

let app: AppServer;
let browser: Browser;
let context: BrowserContext;
let page: Page;
let errors: string[];

const grower = { email: "tomas@bramblewick.example", password: "grower-frost-demo" };
const helper = { email: "ada@bramblewick.example", password: "helper-frost-demo" };
const q = <T>(sql: string, ...args: unknown[]) => queryServer<T>(app.databaseFile, sql, ...args);

beforeAll(async () => {
  app = await startApp({ name: "manage", seed: true });
  browser = await launchChromium();
  context = await phoneContext(browser, app.origin);
  page = await context.newPage();
  errors = watchErrors(page);
  await signIn(page, grower);
  await page.goto("/stores");
  await page.getByRole("link", { name: /Barn fridge/ }).waitFor({ timeout: 60_000 });
}, 900_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

describe("managing stores and trials on a phone", () => {
  it("edits a trial's name and notes with no signal; the server has them once the signal is back", async () => {
    const [trial] = q<{ id: string; name: string; question: string | null }>("SELECT id, name, question FROM trials WHERE deleted_at IS NULL");
    await page.goto("/today");
    await waitForServiceWorker(page);
    await context.setOffline(true);
    try {
      await page.goto(`/trials/view?id=${trial.id}`);
      await page.getByRole("heading", { name: trial.name }).waitFor();
      // Real taps and typing: the comparison table once re-rendered itself without end at the first tap (fixed).
      await page.getByRole("button", { name: "Edit trial" }).click();
      const name = page.getByLabel("Name");
      await expect(name.inputValue()).resolves.toBe(trial.name);
      await name.fill("");
      await page.getByRole("button", { name: "Save changes" }).click();
      await page.getByText("Give the trial a name.").waitFor();
      await shoot(page, "manage-01-trial-edit-refused");
      await name.fill("Purple coneflower: fridge or freezer, second year");
      await page.getByLabel("Notes").fill("Freezer arm sown a week late; repeat with more seed.");
      await page.getByRole("button", { name: "Save changes" }).click();
      await page.getByText("Trial saved on this phone").waitFor();
      await page.getByRole("heading", { name: "Purple coneflower: fridge or freezer, second year" }).waitFor();
      await page.getByText("Freezer arm sown a week late").waitFor();
      await shoot(page, "manage-02-trial-edited-offline");
    } finally {
      await context.setOffline(false); // a failure here must not leave the later steps offline
    }
    const rows = await waitForRows<{ name: string; notes: string | null; question: string | null }>(
      app.databaseFile, "SELECT name, notes, question FROM trials WHERE id = ?", [trial.id], (r) => r[0]?.notes !== null, 60_000,
    );
    expect(rows[0]).toMatchObject({ name: "Purple coneflower: fridge or freezer, second year", notes: "Freezer arm sown a week late; repeat with more seed." });
    // Only the changed fields went up: the question was left as the demo wrote it.
    expect(rows[0].question).toBe(trial.question);
    const edits = q<{ field: string }>("SELECT field FROM audit_log WHERE table_name = 'trials' AND row_id = ? ORDER BY field", trial.id);
    expect(edits.map((e) => e.field)).toEqual(["name", "notes"]);
  });

  it("refuses to delete the barn fridge while bags are in it, naming them; nothing leaves the server", async () => {
    const [barn] = q<{ id: string }>("SELECT id FROM stores WHERE name = 'Barn fridge'");
    const held = q<{ code: string }>(
      "SELECT code FROM bags WHERE store_id = ? AND deleted_at IS NULL AND pulled_on IS NULL AND sown_on IS NULL AND discarded_on IS NULL ORDER BY code",
      barn.id,
    );
    expect(held.length).toBeGreaterThan(0);
    await page.goto(`/stores/view?id=${barn.id}`);
    await page.getByRole("button", { name: "Delete this store…" }).click();
    await page.getByText("Barn fridge cannot be deleted yet").waitFor();
    const said = await page.getByRole("alert").filter({ hasText: "still holds" }).innerText();
    expect(said).toContain(`Barn fridge still holds ${held.length} bag${held.length === 1 ? "" : "s"} not yet pulled, sown or discarded`);
    expect(said).toMatch(/Move (it|them) to another cold store first/);
    // Each bag is a link to open it and move it.
    for (const bag of held.slice(0, 8)) await page.getByRole("link", { name: `Open bag ${formatBagCode(bag.code)}` }).waitFor();
    expect(await page.getByRole("button", { name: /Yes, delete/ }).count()).toBe(0);
    await shoot(page, "manage-03-store-delete-refused");
    expect(q<{ deleted_at: string | null }>("SELECT deleted_at FROM stores WHERE id = ?", barn.id)[0].deleted_at).toBeNull();
  });

  it("deletes an empty store after a confirmation; the server keeps it as a tombstone", async () => {
    await page.goto("/stores");
    await page.getByRole("button", { name: "Add" }).click();
    await page.getByLabel("Name").fill("Spare porch fridge");
    await page.getByRole("button", { name: "Add cold store" }).click();
    await page.getByRole("link", { name: /Spare porch fridge/ }).click();
    await page.getByRole("heading", { name: "Spare porch fridge" }).waitFor();
    await page.getByRole("button", { name: "Delete this store…" }).click();
    const confirm = page.getByRole("alertdialog", { name: "Delete Spare porch fridge?" });
    await confirm.getByText("No bag is in it now.").waitFor();
    await shoot(page, "manage-04-store-delete-confirm");
    await confirm.getByRole("button", { name: "Yes, delete Spare porch fridge" }).click();
    await page.waitForURL(/\/stores$/);
    await page.getByRole("link", { name: /Barn fridge/ }).waitFor();
    expect(await page.getByRole("link", { name: /Spare porch fridge/ }).count()).toBe(0);
    const rows = await waitForRows<{ deleted_at: string | null }>(app.databaseFile, "SELECT deleted_at FROM stores WHERE name = 'Spare porch fridge'", [], (r) => !!r[0]?.deleted_at);
    expect(rows).toHaveLength(1);
  });

  it("a Helper sees no edit or delete buttons for stores and trials", async () => {
    const ctx = await phoneContext(browser, app.origin);
    const p = await ctx.newPage();
    await signIn(p, helper);
    await p.goto("/stores");
    await p.getByRole("link", { name: /Barn fridge/ }).click({ timeout: 60_000 });
    await p.getByRole("heading", { name: "Bags in this store" }).waitFor();
    expect(await p.getByRole("button", { name: "Delete this store…" }).count()).toBe(0);
    expect(await p.getByRole("button", { name: "Edit store" }).count()).toBe(0);
    const [trial] = q<{ id: string }>("SELECT id FROM trials");
    await p.goto(`/trials/view?id=${trial.id}`);
    await p.getByText("Verdict").waitFor({ timeout: 60_000 });
    expect(await p.getByRole("button", { name: "Edit trial" }).count()).toBe(0);
    expect(await p.getByRole("button", { name: "Delete this trial…" }).count()).toBe(0);
    await ctx.close();
  });

  it("deletes a trial after saying its bags stay; the trial and arms are tombstones, the bags untouched", async () => {
    const [trial] = q<{ id: string; name: string }>("SELECT id, name FROM trials WHERE deleted_at IS NULL");
    const bagsBefore = q<{ id: string; trial_arm_id: string }>(
      "SELECT b.id, b.trial_arm_id FROM bags b JOIN trial_arms a ON a.id = b.trial_arm_id WHERE a.trial_id = ? ORDER BY b.id", trial.id,
    );
    expect(bagsBefore.length).toBeGreaterThan(0);
    await page.goto(`/trials/view?id=${trial.id}`);
    await page.getByRole("button", { name: "Delete this trial…" }).click();
    const confirm = page.getByRole("alertdialog");
    await confirm.getByText(`Its ${bagsBefore.length} bags are not deleted`).waitFor();
    await confirm.getByText("just stop being compared").waitFor();
    await shoot(page, "manage-05-trial-delete-confirm");
    await confirm.getByRole("button", { name: "Yes, delete the trial" }).click();
    await page.waitForURL(/\/trials$/);
    const rows = await waitForRows<{ deleted_at: string | null; arms_left: number }>(
      app.databaseFile, "SELECT deleted_at, (SELECT COUNT(*) FROM trial_arms WHERE trial_id = t.id AND deleted_at IS NULL) AS arms_left FROM trials t WHERE id = ?", [trial.id], (r) => !!r[0]?.deleted_at,
    );
    expect(rows[0].arms_left).toBe(0);
    const bagsAfter = q<{ id: string; trial_arm_id: string }>(
      "SELECT id, trial_arm_id FROM bags WHERE id IN (" + bagsBefore.map(() => "?").join(",") + ") AND deleted_at IS NULL ORDER BY id", ...bagsBefore.map((b) => b.id),
    );
    expect(bagsAfter).toEqual(bagsBefore);
    expect(errors.filter((e) => !/Failed to fetch|ERR_INTERNET_DISCONNECTED|net::|favicon\.ico/.test(e))).toEqual([]);
  });

});
