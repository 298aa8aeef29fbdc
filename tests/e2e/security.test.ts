// Issue 11 in the production build: the local mailbox page is there only when the demo asks for it (a plain
// `npm start` on an http origin answers 404, however the probe asks for a reset link), `npm run demo` still
// prints it and it works there, saying it is a local stand-in for e-mail; and a `next` after sign-in never
// leads off-site in Chromium, from the form or from the server's redirect.
import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { freePort, startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot } from "./support/browser";
import { E2E_DIST_DIR, ROOT, ensureBuild } from "./support/build";
import { demoMembers } from "../../db/seeds/data/demo-farm";

const owner = demoMembers.find((m) => m.role === "owner")!;
const resetRequest = (origin: string) =>
  fetch(`${origin}/api/auth/reset-request`, { method: "POST", headers: { origin, "content-type": "application/json" }, body: JSON.stringify({ email: owner.email }) });

describe("a plain `npm start` on an http origin", () => {
  let app: AppServer;
  beforeAll(async () => {
    app = await startApp({ seed: true, name: "plain-start", mailboxPage: false });
  }, 600_000);
  afterAll(async () => app?.stop());

  it("has no mailbox page, even right after a reset link was mailed", async () => {
    expect(app.origin.startsWith("http://")).toBe(true);
    expect((await resetRequest(app.origin)).status).toBe(202);
    const res = await fetch(`${app.origin}/dev/mailbox`);
    expect(res.status).toBe(404);
    expect(await res.text()).not.toContain("/reset/");
  });

  it("sends no Strict-Transport-Security on an http origin", async () => {
    expect((await fetch(`${app.origin}/api/health`)).headers.get("strict-transport-security")).toBeNull();
  });
});

describe("`npm run demo`", () => {
  let demo: ChildProcess;
  let origin = "";
  let output = "";
  let browser: Browser;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-demo-"));

  beforeAll(async () => {
    await ensureBuild();
    const port = await freePort();
    const smtp = await freePort();
    origin = `http://127.0.0.1:${port}`;
    demo = spawn("npm", ["run", "--silent", "demo"], {
      cwd: ROOT,
      detached: true, // its own process group, stopped as one below
      env: {
        ...process.env,
        NODE_ENV: "production",
        PORT: String(port),
        HOSTNAME: "127.0.0.1",
        APP_ORIGIN: origin,
        DEMO_SKIP_BUILD: "1",
        NEXT_DIST_DIR: E2E_DIST_DIR,
        DATABASE_URL: `file:${path.join(dir, "demo.sqlite")}`,
        SMTP_URL: `smtp://127.0.0.1:${smtp}`,
        MAILBOX_DIR: path.join(dir, "mailbox"),
        UPLOAD_DIR: path.join(dir, "uploads"),
        SESSION_SECRET: "demo-session-secret-for-this-test-only-0123456789",
        CRON_SECRET: "demo-cron-secret-for-this-test",
      },
      stdio: ["ignore", "pipe", "pipe"],
    });
    demo.stdout!.on("data", (d: Buffer) => (output += d.toString()));
    demo.stderr!.on("data", (d: Buffer) => (output += d.toString()));
    const deadline = Date.now() + 240_000;
    while (!output.includes("/dev/mailbox") || !(await fetch(`${origin}/api/health`).then((r) => r.ok, () => false))) {
      if (Date.now() > deadline || demo.exitCode !== null) throw new Error(`demo did not start:\n${output}`);
      await new Promise((r) => setTimeout(r, 300));
    }
    browser = await launchChromium();
  }, 600_000);

  afterAll(async () => {
    await browser?.close();
    if (demo?.pid && demo.exitCode === null) {
      const exited = new Promise((r) => demo.once("exit", r));
      process.kill(-demo.pid, "SIGTERM");
      await Promise.race([exited, new Promise((r) => setTimeout(r, 8000))]);
    }
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it("prints the mailbox address, and the page shows the reset link, saying it is a local stand-in for e-mail", async () => {
    expect(output).toContain(`${origin}/dev/mailbox`);
    expect((await resetRequest(origin)).status).toBe(202);
    const context = await phoneContext(browser, origin);
    const page = await context.newPage();
    await page.goto("/dev/mailbox");
    await page.getByText("A local stand-in for e-mail").waitFor();
    await page.getByText("Choose a new Rimebook password").first().waitFor();
    expect(await page.getByRole("link", { name: "Open reset link" }).count()).toBeGreaterThan(0);
    await shoot(page, "security-mailbox-phone");
    await page.setViewportSize({ width: 1280, height: 800 });
    await shoot(page, "security-mailbox-desktop");
    await context.close();
  });

  const offsite = ["/%09/localhost:3999/phish", "/%5C/localhost:3999/phish", "//localhost:3999/phish", "/%2F/localhost:3999/phish", "javascript:alert(1)"];

  async function landed(page: Page): Promise<URL> {
    await page.waitForLoadState("load");
    return new URL(page.url());
  }

  it("after the sign-in form, a hostile next lands on Today here", async () => {
    for (const next of offsite) {
      const context = await phoneContext(browser, origin);
      const page = await context.newPage();
      await page.goto(`/sign-in?next=${next}`);
      await page.getByLabel("E-mail").fill(owner.email);
      await page.getByLabel("Password", { exact: true }).fill(owner.password);
      await page.getByRole("button", { name: /sign in/i }).click();
      await page.waitForURL((u) => u.pathname === "/today" || u.origin !== origin, { timeout: 30_000 });
      const at = await landed(page);
      expect(`${at.origin}${at.pathname}`, next).toBe(`${origin}/today`);
      await context.close();
    }
  });

  it("the server's redirect for someone already signed in never leaves the site, and %0a / %0d give no 500", async () => {
    const context = await phoneContext(browser, origin);
    const page = await context.newPage();
    await page.goto("/sign-in");
    await page.getByLabel("E-mail").fill(owner.email);
    await page.getByLabel("Password", { exact: true }).fill(owner.password);
    await page.getByRole("button", { name: /sign in/i }).click();
    await page.waitForURL(/\/today/);
    for (const next of [...offsite, "/%0a/localhost:3999/phish", "/%0d/localhost:3999/phish", "/%0d%0aSet-Cookie:x=1"]) {
      const res = await page.goto(`/sign-in?next=${next}`);
      const at = await landed(page);
      expect(res?.status() ?? 0, next).toBeLessThan(500);
      expect(`${at.origin}${at.pathname}`, next).toBe(`${origin}/today`);
    }
    // A real path inside the app is kept.
    await page.goto("/sign-in?next=/stores");
    expect(new URL(page.url()).pathname).toBe("/stores");
    await context.close();
  });
});
