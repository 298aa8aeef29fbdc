// Nothing falls out of sight, in real Chromium on the demo farm (Bramblewick Native Nursery, invented):
// 1. a Grower pulls two bags (one through "first roots" on the check sheet, one from the bag page) and finds both
//    under "To sow" on Today; the sowing queue is in the main navigation; small things on the way (title, favicon,
//    Permissions-Policy, a 2×1 in label on one page);
// 2. the Owner downloads every export and the backup from the Records screen, restores the backup into a new farm
//    on a fresh server, and the row counts match table by table; a server killed mid-restore leaves nothing behind.
import fs from "node:fs";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { formatBagCode } from "@/lib/domain/bag-codes";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { ARTIFACTS } from "./support/build";
import { queryServer, signIn, waitForRows } from "./support/pages";

const tables = [
  "protocols", "protocol_sources", "lots", "stores", "readings", "trials", "trial_arms", "plan_items", "bags", "checks",
  "photos", "sowings", "counts", "audit_log", "digest_runs",
] as const;

let demo: AppServer;
let fresh: AppServer | null = null;
let browser: Browser;

beforeAll(async () => {
  demo = await startApp({ name: "records-demo", seed: true });
  browser = await launchChromium();
}, 600_000);

afterAll(async () => {
  await browser?.close();
  await demo?.stop();
  await fresh?.stop();
});

const grower = { email: "tomas@bramblewick.example", password: "grower-frost-demo" };
const owner = { email: "wren@bramblewick.example", password: "owner-frost-demo" };

async function openAs(app: AppServer, who: { email: string; password: string }): Promise<{ context: BrowserContext; page: Page; errors: string[] }> {
  const context = await phoneContext(browser, app.origin);
  const page = await context.newPage();
  const errors = watchErrors(page);
  await signIn(page, who);
  await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
  return { context, page, errors };
}

const countFarmRows = (file: string, farmId: string) =>
  Object.fromEntries(tables.map((t) => [t, queryServer<{ n: number }>(file, `SELECT count(*) AS n FROM ${t} WHERE farm_id = ?`, farmId)[0].n]));

describe("pulled bags waiting to be sown", () => {
  it("a Grower pulls two bags (one via first roots) and finds both under To sow on Today", async () => {
    const { context, page, errors } = await openAs(demo, grower);
    try {
      const [rooted, plain] = queryServer<{ id: string; code: string }>(
        demo.databaseFile,
        `SELECT id, code FROM bags WHERE start_date IS NOT NULL AND pulled_on IS NULL AND sown_on IS NULL AND discarded_on IS NULL AND deleted_at IS NULL
         ORDER BY start_date LIMIT 2`,
      );
      const shown = (code: string) => formatBagCode(code);

      // Small things on the way: one page title, a favicon, no Permissions-Policy complaint.
      expect(await page.title()).toBe("Today · Rimebook");
      const favicon = await page.request.get("/favicon.ico");
      expect(favicon.status()).toBe(200);
      expect(favicon.headers()["content-type"]).toMatch(/image/);

      // 1. First roots on the check sheet, then its own "Pull now" step with the day.
      await page.goto(`/check?bag=${rooted.id}&from=today`);
      await page.getByTestId("choice").waitFor();
      await page.getByRole("group", { name: "Sprouts" }).getByText("First roots", { exact: true }).click();
      await page.getByTestId("step-pull").click();
      await page.getByRole("button", { name: "Save the pull" }).click();
      await page.waitForURL(/\/today/);

      // 2. A plain pull from the bag's page.
      await page.goto(`/bags/view?id=${plain.id}`);
      await page.getByRole("button", { name: "Pull", exact: true }).click();
      await page.getByRole("button", { name: "Save the pull" }).click();
      await page.getByRole("button", { name: "Pull", exact: true }).waitFor({ state: "detached" });

      // Today: both under "To sow", the sprouted one before the plain pull, counted in the summary.
      await page.goto("/today");
      const group = page.getByTestId("to-sow");
      await group.getByText(shown(rooted.code)).waitFor();
      await group.getByText(shown(plain.code)).waitFor();
      const codes = await group.getByTestId("sow-bag").locator(".font-mono").allTextContents();
      expect(codes.indexOf(shown(rooted.code))).toBeLessThan(codes.indexOf(shown(plain.code)));
      expect(await group.getByTestId("sow-bag").filter({ hasText: shown(rooted.code) }).textContent()).toMatch(/Pulled today, roots showing: sow by tomorrow/);
      expect(await group.getByTestId("sow-bag").filter({ hasText: shown(plain.code) }).textContent()).toMatch(/Pulled today: sow by/);
      expect(await page.getByTestId("round-count").textContent()).toMatch(/pulled bags? to sow/);
      // Neither is in the round of checks any more.
      expect(await page.getByTestId("round-bag").filter({ hasText: shown(rooted.code) }).count()).toBe(0);
      await shoot(page, "sow-today-phone");
      await page.setViewportSize({ width: 1280, height: 800 });
      await shoot(page, "sow-today-desktop");
      await page.setViewportSize({ width: 390, height: 844 });

      // The sowing queue from the main navigation (Season menu).
      await page.getByRole("navigation", { name: "Main" }).getByRole("button", { name: "Season" }).click();
      await page.getByRole("link", { name: /Sowing and counts/ }).click();
      await page.waitForURL(/\/sowing$/);
      await page.getByText(shown(plain.code)).waitFor();
      // The queue says the same as Today, most urgent first: the sprouted bag above the plain pull.
      const queue = page.locator("main li");
      expect(await queue.filter({ hasText: shown(rooted.code) }).textContent()).toMatch(/roots showing: sow by tomorrow/);
      const order = await queue.locator(".font-mono").allTextContents();
      expect(order.indexOf(shown(rooted.code))).toBeLessThan(order.indexOf(shown(plain.code)));
      await shoot(page, "sow-queue-phone");
      expect(await page.title()).toBe("Sowing and counts · Rimebook");

      // The bags list opens on everything still needing a person: the pulled bags are there.
      await page.goto("/bags");
      await page.getByText(shown(plain.code)).first().waitFor();

      // The server has both pulls.
      await waitForRows<{ n: number }>(demo.databaseFile, "SELECT count(*) AS n FROM bags WHERE id IN (?, ?) AND pulled_on IS NOT NULL", [rooted.id, plain.id], (r) => r[0].n === 2);
      expect(errors.filter((e) => /Permissions-Policy|Unrecognized feature/i.test(e))).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it("a small (2×1 in) label prints as one page", async () => {
    const { context, page } = await openAs(demo, owner);
    try {
      const bag = queryServer<{ id: string }>(demo.databaseFile, "SELECT id FROM bags WHERE start_date IS NOT NULL AND pulled_on IS NULL LIMIT 1")[0];
      await page.goto(`/labels?size=small&ids=${bag.id}`);
      await page.getByTestId("label-sheet").locator("article").first().waitFor();
      await page.emulateMedia({ media: "print" });
      const file = path.join(ARTIFACTS, "label-small.pdf");
      const pdf = await page.pdf({ path: file, preferCSSPageSize: true, printBackground: true });
      expect(pdf.toString("latin1").match(/\/Type\s*\/Page[^s]/g)?.length).toBe(1);
    } finally {
      await context.close();
    }
  });
});

describe("Records: exports, backup and restore on screen", () => {
  let backupFile = "";

  it("the Owner downloads every export and the backup from the Records screen", async () => {
    const { context, page } = await openAs(demo, owner);
    try {
      await page.getByRole("navigation", { name: "Main" }).getByRole("button", { name: "Farm" }).click();
      await page.getByRole("link", { name: /Records/ }).click();
      await page.waitForURL(/\/records$/);
      await page.getByTestId("export-bags").waitFor();
      await shoot(page, "records-phone");
      await page.setViewportSize({ width: 1280, height: 800 });
      await shoot(page, "records-desktop");
      await page.setViewportSize({ width: 390, height: 844 });

      for (const what of ["bags", "checks", "sowings", "counts", "readings"]) {
        const [download] = await Promise.all([page.waitForEvent("download"), page.getByTestId(`export-${what}`).click()]);
        const bytes = fs.readFileSync((await download.path())!);
        // UTF-8 with a byte-order mark, a header row, CRLF lines: opens right in a spreadsheet.
        expect(bytes.subarray(0, 3).equals(Buffer.from([0xef, 0xbb, 0xbf]))).toBe(true);
        const text = bytes.toString("utf8").slice(1);
        expect(download.suggestedFilename()).toMatch(new RegExp(`-${what}-\\d{4}-\\d{2}-\\d{2}\\.csv$`));
        expect(text.split("\r\n")[0]).toMatch(what === "bags" ? /^code,species/ : what === "readings" ? /^cold_store,/ : /bag_code|sown_on/);
        if (what === "bags") expect(text.split("\r\n")[1]).toMatch(/^[0-9A-Z]{3,4}-[0-9A-Z*~$=U]{3,4},/);
      }
      const [download] = await Promise.all([page.waitForEvent("download"), page.getByTestId("backup-photos").click()]);
      backupFile = path.join(ARTIFACTS, "records-backup.json");
      await download.saveAs(backupFile);
      expect(JSON.parse(fs.readFileSync(backupFile, "utf8"))).toMatchObject({ format: "rimebook-farm-backup", withPhotos: true });
    } finally {
      await context.close();
    }
  });

  it("restores the backup into a new farm on a fresh server: the same row counts, table by table", async () => {
    fresh = await startApp({ name: "records-fresh" });
    const context = await phoneContext(browser, fresh.origin);
    const page = await context.newPage();
    try {
      await page.goto("/sign-in");
      const signUp = await page.evaluate(async () => {
        const res = await fetch("/api/auth/sign-up", {
          method: "POST",
          headers: { "content-type": "application/json" },
          body: JSON.stringify({ email: "wren@hosted.example", password: "hosted-frost-demo-2026", name: "Wren Alder", farmName: "Bramblewick (hosted)" }),
        });
        return res.status;
      });
      expect(signUp).toBe(201);
      await page.goto("/records");
      await page.getByTestId("restore-file").setInputFiles(backupFile);
      await page.getByTestId("restore-run").click();
      await page.getByTestId("restore-done").waitFor({ timeout: 60_000 });
      await shoot(page, "records-restored-phone");

      const backup = JSON.parse(fs.readFileSync(backupFile, "utf8"));
      const farmId = queryServer<{ farm_id: string }>(fresh.databaseFile, "SELECT m.farm_id FROM memberships m JOIN users u ON u.id = m.user_id WHERE u.email = ?", "wren@hosted.example")[0].farm_id;
      const restored = countFarmRows(fresh.databaseFile, farmId);
      const original = countFarmRows(demo.databaseFile, backup.farm.id);
      expect(restored).toEqual(original);
      const codes = (file: string, id: string) => queryServer<{ code: string }>(file, "SELECT code FROM bags WHERE farm_id = ? ORDER BY code", id).map((r) => r.code);
      expect(codes(fresh.databaseFile, farmId)).toEqual(codes(demo.databaseFile, backup.farm.id));

      // The phone fetched the restored farm: Today shows its round and the farm's name.
      await page.goto("/today");
      await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });
      await page.getByText(backup.farm.name).first().waitFor();
    } finally {
      await context.close();
    }
  });

  it("refuses a file that is not a backup, and a server killed mid-restore leaves nothing half-restored", async () => {
    const app = fresh!;
    const context = await phoneContext(browser, app.origin);
    const page = await context.newPage();
    try {
      await page.goto("/sign-in");
      await page.evaluate(async () => {
        await fetch("/api/auth/sign-up", {
          method: "POST",
          headers: { "content-type": "application/json" },
          body: JSON.stringify({ email: "kill@hosted.example", password: "hosted-frost-demo-2026", name: "Ash Finch", farmName: "Power cut farm" }),
        });
      });
      await page.goto("/records");
      // Not a backup: a clear message, nothing written.
      const csv = path.join(ARTIFACTS, "not-a-backup.csv");
      fs.writeFileSync(csv, "code,species\r\nBW7-K2Q,Echinacea purpurea\r\n");
      await page.getByTestId("restore-file").setInputFiles(csv);
      await page.getByTestId("restore-run").click();
      await page.getByRole("alert").filter({ hasText: "not a Rimebook farm backup" }).waitFor();
      await shoot(page, "records-refused-phone");

      const farmId = queryServer<{ farm_id: string }>(app.databaseFile, "SELECT m.farm_id FROM memberships m JOIN users u ON u.id = m.user_id WHERE u.email = ?", "kill@hosted.example")[0].farm_id;
      const before = countFarmRows(app.databaseFile, farmId);

      // A large backup (the demo farm plus 150,000 readings and a photo): the picture is written first, then the rows in
      // one transaction. Kill the server once the picture is on disk, while the rows are going in.
      const big = JSON.parse(fs.readFileSync(backupFile, "utf8"));
      const store = big.tables.stores[0].id;
      const template = big.tables.readings[0] ?? { store_id: store, taken_at: "2026-11-01T00:00:00.000Z", temperature_c: 3, origin: "manual", check_id: null, created_at: "2026-11-01T00:00:00.000Z", updated_at: "2026-11-01T00:00:00.000Z", seq: 1, deleted_at: null };
      for (let i = 0; i < 150_000; i++) big.tables.readings.push({ ...template, id: randomUUID(), store_id: store, taken_at: new Date(Date.UTC(2026, 0, 1) + i * 60_000).toISOString() });
      const bag = big.tables.bags[0];
      big.tables.photos.push({ id: randomUUID(), farm_id: big.farm.id, bag_id: bag.id, check_id: null, mime: "image/png", bytes: 10, uploaded_by: null, created_at: bag.created_at, updated_at: bag.created_at, seq: 1, deleted_at: null, data: fs.readFileSync(path.resolve("public/icons/rimebook-192.png")).toString("base64") });
      const bigFile = path.join(app.dir, "big-backup.json");
      fs.writeFileSync(bigFile, JSON.stringify(big));
      const body = fs.readFileSync(bigFile, "utf8");

      const cookies = await context.cookies();
      const sending = fetch(`${app.origin}/api/backup/restore`, {
        method: "POST",
        headers: { "content-type": "application/json", origin: app.origin, cookie: cookies.map((c) => `${c.name}=${c.value}`).join("; ") },
        body,
      }).then((r) => r.status, () => "connection lost");
      const farmPhotos = path.join(app.uploadDir, farmId);
      const deadline = Date.now() + 60_000;
      while (!(fs.existsSync(farmPhotos) && fs.readdirSync(farmPhotos).some((f) => f.endsWith(".png")))) {
        if (Date.now() > deadline) throw new Error("the restore never started writing");
        await new Promise((r) => setTimeout(r, 10));
      }
      await new Promise((r) => setTimeout(r, 300));
      await app.kill();
      expect(await sending).toBe("connection lost");
      await app.restart();
      expect(countFarmRows(app.databaseFile, farmId)).toEqual(before);
      expect(queryServer<{ ok: string }>(app.databaseFile, "PRAGMA integrity_check")[0]).toEqual({ integrity_check: "ok" });
    } finally {
      await context.close();
    }
  });
});
