// Every screen of the built app, signed in as the demo farm's Owner: axe finds no serious or critical
// accessibility problem at phone size, every interactive target is at least 44 × 44 CSS px, nothing spills off a
// 390 px screen, and a phone and a desktop screenshot of each is saved under artifacts/routes for looking at.
// The routes come from the pages on disk, so a new screen is covered by itself.
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext } from "./support/browser";
import { ROOT } from "./support/build";
import { queryServer, signIn } from "./support/pages";

let app: AppServer;
let browser: Browser | null = null;
const SHOTS = path.join(ROOT, "artifacts", "routes");

beforeAll(async () => {
  app = await startApp({ name: "every-route", seed: true });
  browser = await launchChromium();
  fs.mkdirSync(SHOTS, { recursive: true });
}, 600_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

const owner = { email: "wren@bramblewick.example", password: "owner-frost-demo" };

/** Page files under app/ as URL paths ("(group)" folders drop out; "[param]" pages are left to their own tests). */
function routesOnDisk(under = "app"): string[] {
  const out: string[] = [];
  const walk = (dir: string, url: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      if (e.isDirectory()) {
        if (e.name.startsWith("[") || e.name === "api") continue;
        walk(path.join(dir, e.name), e.name.startsWith("(") ? url : `${url}/${e.name}`);
      } else if (e.name === "page.tsx") out.push(url || "/");
    }
  };
  walk(path.join(ROOT, under), "");
  return out.sort();
}

/** A concrete address for each screen that reads an id from its query, taken from the demo farm. */
function concreteUrl(route: string): string {
  const one = (sql: string) => queryServer<{ id: string }>(app.databaseFile, sql)[0]?.id ?? "";
  const liveBag = () => one(`SELECT id FROM bags WHERE start_date IS NOT NULL AND pulled_on IS NULL AND discarded_on IS NULL AND deleted_at IS NULL ORDER BY start_date DESC LIMIT 1`);
  switch (route) {
    case "/bags/view":
      return `/bags/view?id=${liveBag()}`;
    case "/check":
      return `/check?bag=${liveBag()}`;
    case "/stores/view":
      return `/stores/view?id=${one(`SELECT id FROM stores WHERE kind = 'fridge' AND deleted_at IS NULL LIMIT 1`)}`;
    case "/protocols/view":
    case "/protocols/edit":
      return `${route}?id=${one(`SELECT p.id FROM protocols p JOIN bags b ON b.protocol_id = p.id WHERE p.deleted_at IS NULL LIMIT 1`)}`;
    case "/lots/edit":
      return `/lots/edit?id=${one(`SELECT id FROM lots WHERE deleted_at IS NULL LIMIT 1`)}`;
    case "/trials/view":
      return `/trials/view?id=${one(`SELECT id FROM trials WHERE deleted_at IS NULL LIMIT 1`)}`;
    case "/sowing":
      return `/sowing?bag=${one(`SELECT id FROM bags WHERE pulled_on IS NOT NULL AND deleted_at IS NULL LIMIT 1`)}`;
    default:
      return route;
  }
}

type Finding = { route: string; what: string };

/** Serious and critical axe violations on the page, as "rule: target" lines. */
async function runAxe(page: Page): Promise<string[]> {
  await page.addScriptTag({ path: path.join(ROOT, "node_modules/axe-core/axe.min.js") });
  return page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: { id: string; impact: string; nodes: { target: string[] }[] }[] }> } }).axe;
    const r = await axe.run(document, { resultTypes: ["violations"] });
    return r.violations
      .filter((v) => v.impact === "serious" || v.impact === "critical")
      .map((v) => `${v.id} (${v.impact}): ${v.nodes.slice(0, 3).map((n) => n.target.join(" ")).join(", ")}`);
  });
}

/** Visible interactive elements smaller than 44 × 44 CSS px (a checkbox or radio counts by its label). */
async function smallTargets(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = [];
    const seen = new Set<Element>();
    const els = document.querySelectorAll("a[href], button, input:not([type=hidden]), select, textarea, summary, [role=button], [tabindex]:not([tabindex='-1'])");
    for (const el of els) {
      let target: Element = el;
      if (el instanceof HTMLInputElement && (el.type === "checkbox" || el.type === "radio" || el.type === "file")) {
        const label = el.closest("label") ?? (el.id ? document.querySelector(`label[for="${el.id}"]`) : null);
        if (label) target = label;
      }
      if (seen.has(target)) continue;
      seen.add(target);
      const style = getComputedStyle(target);
      const box = target.getBoundingClientRect();
      if (style.visibility === "hidden" || style.display === "none" || box.width === 0 || box.height === 0) continue;
      if (target.closest("[aria-hidden=true], .label-print")) continue; // the printed label preview is paper, not a control
      if (box.width < 43.5 || box.height < 43.5) {
        const name = (target.getAttribute("aria-label") ?? target.textContent ?? "").trim().slice(0, 40);
        out.push(`${target.tagName.toLowerCase()} "${name}" ${Math.round(box.width)}×${Math.round(box.height)}`);
      }
    }
    return out;
  });
}

async function settle(page: Page) {
  await page.waitForLoadState("networkidle").catch(() => undefined);
  // Screens read the phone store after the first paint; let them fill in.
  await page.waitForTimeout(600);
}

describe("every screen, as the Owner on a phone", () => {
  it("has no serious accessibility problem, no target under 44 px, nothing wider than the phone; screenshots saved", async () => {
    const routes = routesOnDisk();
    expect(routes).toContain("/today");
    const farmScreens = new Set(routesOnDisk("app/(farm)"));
    expect(farmScreens.has("/today") && !farmScreens.has("/sign-in")).toBe(true);
    const context = await phoneContext(browser!, app.origin);
    const page = await context.newPage();
    await signIn(page, owner);
    await page.getByTestId("round-bag").first().waitFor({ timeout: 60_000 });

    const axeFindings: Finding[] = [];
    const small: Finding[] = [];
    const wide: Finding[] = [];
    const landmarks: Finding[] = [];
    const desk: Finding[] = [];
    for (const route of routes) {
      if (route === "/dev/mailbox") continue; // a local stand-in for e-mail, not a farm screen (off in production)
      const url = concreteUrl(route);
      await page.setViewportSize({ width: 390, height: 844 });
      await page.goto(url);
      await settle(page);
      const name = route === "/" ? "landing" : route.slice(1).replace(/\//g, "-");
      await page.screenshot({ path: path.join(SHOTS, `${name}-phone.png`), fullPage: true });
      for (const what of await runAxe(page)) axeFindings.push({ route, what });
      for (const what of await smallTargets(page)) small.push({ route, what });
      const mains = await page.locator("main").count();
      if (mains !== 1) landmarks.push({ route, what: `${mains} <main> elements` });
      const width = await page.evaluate(() => document.documentElement.scrollWidth);
      if (width > 390) {
        // Name the outermost elements that reach past the screen's edge, so the fix is easy to find.
        const culprits = await page.evaluate(() =>
          [...document.querySelectorAll("body *")]
            .filter((el) => el.getBoundingClientRect().right > 391 && !(el.parentElement && el.parentElement.getBoundingClientRect().right > 391))
            .slice(0, 3)
            .map((el) => `${el.tagName.toLowerCase()}.${String(el.className).split(" ").slice(0, 3).join(".")} →${Math.round(el.getBoundingClientRect().right)}`),
        );
        wide.push({ route, what: `${width} px wide: ${culprits.join("; ")}` });
      }
      await page.setViewportSize({ width: 1280, height: 800 });
      await settle(page);
      if (farmScreens.has(route)) {
        // At a desk the farm screens get the side column, not the phone's bottom bar.
        const nav = page.getByRole("navigation", { name: "Main" });
        const box = (await nav.count()) === 1 ? await nav.boundingBox() : null;
        if (!box || box.x > 0 || box.height < 500) desk.push({ route, what: `main navigation at ${JSON.stringify(box)}` });
      }
      await page.screenshot({ path: path.join(SHOTS, `${name}-desktop.png`), fullPage: true });
    }
    const list = (fs: Finding[]) => fs.map((f) => `${f.route}: ${f.what}`);
    // All three at once, so one run names every problem (axe rule names included).
    expect({ axe: list(axeFindings), small: list(small), wide: list(wide), landmarks: list(landmarks), desk: list(desk) }).toEqual({
      axe: [],
      small: [],
      wide: [],
      landmarks: [],
      desk: [],
    });
    await context.close();
  }, 600_000);
});
