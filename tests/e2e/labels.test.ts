// Printed labels that work on paper: at every size the pull window is the largest words after the code, store and
// box are on the label, nothing is cut or under 8 pt, a label that cannot fit is named and not printed, and the
// larger sizes carry pencil tick boxes for checks.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot } from "./support/browser";
import { queryServer, signIn } from "./support/pages";

let app: AppServer;
let browser: Browser | null = null;

beforeAll(async () => {
  app = await startApp({ name: "labels", seed: true });
  browser = await launchChromium();
}, 600_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

const grower = { email: "tomas@bramblewick.example", password: "grower-frost-demo" };
const EIGHT_PT_PX = (8 * 96) / 72;

type LabelReport = { code: string; fit: string; spills: boolean; smallestPx: number; codePx: number; windowPx: number; biggestOtherPx: number; text: string; ticks: number };

/** What each label on the sheet looks like once the fitting has settled. */
async function readLabels(page: Page): Promise<LabelReport[]> {
  await page.waitForTimeout(800); // the fitting runs over a few frames after the fonts load
  return page.locator("article.bag-label").evaluateAll((els) =>
    els.map((el) => {
      const px = (sel: string) => {
        const n = el.querySelector(sel);
        return n ? parseFloat(getComputedStyle(n).fontSize) : 0;
      };
      const spill = (n: Element) => n.scrollHeight > n.clientHeight + 1 || n.scrollWidth > n.clientWidth + 1;
      const text = el.querySelector(".bag-label-text")!;
      const sizes = [...el.querySelectorAll(".bag-label-text *, .bag-label-ticks *")]
        .filter((n) => (n.textContent ?? "").trim() !== "" && n.children.length === 0)
        .map((n) => parseFloat(getComputedStyle(n).fontSize));
      const others = [...el.querySelectorAll(".bag-label-species, .bag-label-line, .bag-label-caution, .bag-label-mark")].map((n) => parseFloat(getComputedStyle(n).fontSize));
      return {
        code: (el as HTMLElement).dataset.code ?? "",
        fit: (el as HTMLElement).dataset.fit ?? "",
        spills: spill(el) || spill(text),
        smallestPx: Math.min(...sizes),
        codePx: px(".bag-label-code"),
        windowPx: px(".bag-label-window"),
        biggestOtherPx: Math.max(0, ...others),
        text: el.textContent ?? "",
        ticks: el.querySelectorAll(".bag-label-box").length,
      };
    }),
  );
}

describe("labels on paper", () => {
  it("every size: window largest after the code, store and box shown, nothing cut or under 8 pt; unfit labels named", async () => {
    const context = await phoneContext(browser!, app.origin);
    const page = await context.newPage();
    await signIn(page, grower);
    await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
    const places = new Map(
      queryServer<{ code: string; store: string; box: string | null }>(
        app.databaseFile,
        `SELECT b.code, s.name AS store, b.box FROM bags b JOIN stores s ON s.id = b.store_id WHERE b.deleted_at IS NULL`,
      ).map((r) => [r.code, r]),
    );

    for (const size of ["a4", "large", "small"] as const) {
      await page.goto(`/labels?size=${size}`);
      await page.locator("article.bag-label").first().waitFor();
      const labels = await readLabels(page);
      await shoot(page, `labels-${size}`);
      expect(labels.length).toBeGreaterThan(3);
      const unfitShown = (await page.getByTestId("labels-unfit").count()) ? await page.getByTestId("labels-unfit").textContent() : "";
      for (const l of labels) {
        const where = places.get(l.code);
        expect(l.smallestPx, `${size} ${l.code}: no words under 8 pt`).toBeGreaterThanOrEqual(EIGHT_PT_PX - 0.05);
        expect(l.windowPx, `${size} ${l.code}: the pull window is the largest after the code`).toBeGreaterThanOrEqual(l.biggestOtherPx);
        expect(l.codePx).toBeGreaterThan(l.windowPx);
        expect(l.text).not.toContain("…");
        if (where) expect(l.text, `${size} ${l.code}: store on the label`).toContain(where.store);
        if (where?.box) expect(l.text, `${size} ${l.code}: box on the label`).toContain(where.box);
        expect(l.ticks, `${size}: pencil tick boxes`).toBe(size === "small" ? 0 : size === "a4" ? 5 : 6);
        // A label either fits whole, or is named on screen and keeps the print button off.
        if (l.spills) expect(unfitShown, `${size} ${l.code} spills but is not named`).toContain(l.code.slice(0, 4));
      }
      if (unfitShown) await expect(page.getByRole("button", { name: /^Print / }).isDisabled()).resolves.toBe(true);
    }
    await context.close();
  }, 240_000);

  it("a label too long for the small roll is named and not printed; the others print", async () => {
    // A bag whose species and store name cannot fit 2 × 1 in at 8 pt.
    const context = await phoneContext(browser!, app.origin);
    const page = await context.newPage();
    await signIn(page, grower);
    await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
    const bag = queryServer<{ id: string; code: string }>(app.databaseFile, `SELECT id, code FROM bags WHERE deleted_at IS NULL AND start_date IS NOT NULL LIMIT 1`)[0];
    // Make the phone's copy of the bag's store name very long (what a grower might type), then open the labels.
    await page.evaluate(async (id) => {
      await new Promise<void>((resolve, reject) => {
        const open = indexedDB.open("rimebook");
        open.onerror = () => reject(open.error);
        open.onsuccess = () => {
          const tx = open.result.transaction(["bags", "stores"], "readwrite");
          const get = tx.objectStore("bags").get(id);
          get.onsuccess = () => {
            const st = tx.objectStore("stores").get(get.result.store_id);
            st.onsuccess = () => tx.objectStore("stores").put({ ...st.result, name: "The long walk-in cold room behind the potting shed past the old orchard gate" });
          };
          tx.oncomplete = () => resolve();
          tx.onerror = () => reject(tx.error);
        };
      });
    }, bag.id);
    await page.goto(`/labels?size=small&ids=${bag.id}`);
    await page.getByTestId("labels-unfit").waitFor({ timeout: 15_000 });
    await expect(page.getByTestId("labels-unfit").textContent()).resolves.toContain(bag.code.slice(0, 4));
    await expect(page.getByRole("button", { name: /^Print / }).isDisabled()).resolves.toBe(true);
    await shoot(page, "labels-small-unfit");
    // The same label at the large size fits and prints.
    await page.getByLabel("Label size").selectOption("large");
    await page.waitForTimeout(800);
    expect(await page.getByTestId("labels-unfit").count()).toBe(0);
    await expect(page.getByRole("button", { name: "Print 1 label" }).isEnabled()).resolves.toBe(true);
    await context.close();
  }, 120_000);

  it("with no bag ticked there is no 'Print 0 labels'", async () => {
    const context = await phoneContext(browser!, app.origin);
    const page = await context.newPage();
    await signIn(page, grower);
    await page.goto("/labels");
    await page.getByRole("button", { name: "Tick none" }).click();
    await page.getByText("Tick at least one bag below to print its label.").waitFor();
    expect(await page.getByRole("button", { name: /Print 0/ }).count()).toBe(0);
    await context.close();
  }, 120_000);
});
