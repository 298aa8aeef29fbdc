// Debian's chromium driven by playwright-core (never a browser a tool downloads), in a phone viewport.
import fs from "node:fs";
import path from "node:path";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import { ARTIFACTS } from "./build";

export const CHROMIUM = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

const BASE_FLAGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--disable-dev-shm-usage",
];

/** Launches chromium; with `cameraVideo` the camera is a fake device playing that Y4M file. */
export async function launchChromium(opts: { cameraVideo?: string } = {}): Promise<Browser> {
  const camera = opts.cameraVideo
    ? ["--use-fake-ui-for-media-stream", "--use-fake-device-for-media-stream", `--use-file-for-fake-video-capture=${opts.cameraVideo}`]
    : [];
  return chromium.launch({ executablePath: CHROMIUM, headless: true, args: [...BASE_FLAGS, ...camera] });
}

export const PHONE = {
  viewport: { width: 390, height: 844 },
  deviceScaleFactor: 2,
  isMobile: true,
  hasTouch: true,
  userAgent:
    "Mozilla/5.0 (Linux; Android 14; Pixel 8) AppleWebKit/537.36 (KHTML, like Gecko) Chrome/156.0.0.0 Mobile Safari/537.36",
} as const;

/** A fresh phone-sized profile on the app (its own cookies, IndexedDB and service worker). */
export async function phoneContext(browser: Browser, origin: string, opts: { camera?: boolean } = {}): Promise<BrowserContext> {
  const context = await browser.newContext({ ...PHONE, baseURL: origin, serviceWorkers: "allow", locale: "en-GB", timezoneId: "UTC" });
  if (opts.camera) await context.grantPermissions(["camera"], { origin });
  // Generous: CI runs several browser suites and servers at once on two cores.
  context.setDefaultTimeout(30_000);
  return context;
}

/** Saves a full-page screenshot of a key screen under artifacts/e2e (kept by CI, ignored by git). */
export async function shoot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(ARTIFACTS, { recursive: true });
  const file = path.join(ARTIFACTS, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/** Collects console errors and uncaught page errors (CSP violations show up here). */
export function watchErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on("console", (msg) => {
    if (msg.type() !== "error") return;
    const where = msg.location().url;
    errors.push(where ? `${msg.text()} (${where})` : msg.text());
  });
  page.on("pageerror", (err) => errors.push(`pageerror: ${err.message} (on ${page.url()})`));
  return errors;
}
