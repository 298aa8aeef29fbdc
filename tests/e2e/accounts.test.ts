// Farm accounts end to end in the production build and real Chromium on a phone: an Owner signs up a farm,
// invites a Helper, the invite arrives over real SMTP at the local fake and shows on the mailbox page, the
// Helper accepts it in another browser profile, and is then limited to what a Helper may do. In Settings the
// Helper changes their password (other sessions end), their name, and switches between two farms.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { startApp, type AppServer } from "./support/server";
import { launchChromium, phoneContext, shoot, watchErrors } from "./support/browser";
import { readMailbox } from "@/lib/server/mail-fake";
import { queryServer, waitForRows } from "./support/pages";

let app: AppServer;
let browser: Browser;
let owner: BrowserContext;
let helper: BrowserContext;
let ownerPage: Page;
let helperPage: Page;
let inviteLink = "";
const ownerErrors: string[] = [];

beforeAll(async () => {
  app = await startApp({ name: "accounts" });
  browser = await launchChromium();
  owner = await phoneContext(browser, app.origin);
  helper = await phoneContext(browser, app.origin);
  ownerPage = await owner.newPage();
  helperPage = await helper.newPage();
  ownerErrors.push(...watchErrors(ownerPage));
}, 600_000);

afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

/** Errors the browser logs that are not the app's own deliberate 4xx answers. */
const unexpected = (errors: string[]) => errors.filter((e) => !/status of (401|403|404)/.test(e));

describe("a farm and its team, in the browser", () => {
  it("sends a visitor of a farm page to sign-in, remembering the page", async () => {
    await ownerPage.goto("/team");
    expect(new URL(ownerPage.url()).pathname).toBe("/sign-in");
    expect(new URL(ownerPage.url()).searchParams.get("next")).toBe("/team");
  });

  it("shows field errors in words on an empty sign-up, then signs up the farm and lands on Today", async () => {
    await ownerPage.goto("/sign-up");
    await ownerPage.getByRole("button", { name: "Start the farm account" }).click();
    await expect.poll(() => ownerPage.getByText("Give the farm a name.").count()).toBe(1);
    expect(await ownerPage.getByText("Enter your e-mail address.").count()).toBe(1);
    await shoot(ownerPage, "accounts-sign-up-errors");

    await ownerPage.getByLabel("Farm name").fill("Bramblewick Native Nursery");
    await ownerPage.getByLabel("Your name").fill("Wren Halloway");
    await ownerPage.getByLabel("E-mail").fill("wren@bramblewick.example");
    await ownerPage.getByLabel("Password", { exact: true }).fill("catkins in february");
    await ownerPage.getByRole("button", { name: "Start the farm account" }).click();
    await ownerPage.waitForURL(/\/today/);
    const me = await ownerPage.evaluate(() => fetch("/api/me").then((r) => r.json()));
    expect(me).toMatchObject({ role: "owner", farm: { name: "Bramblewick Native Nursery" }, user: { name: "Wren Halloway" } });
    const cookie = (await owner.cookies()).find((c) => c.name === "rimebook_session");
    expect(cookie).toMatchObject({ httpOnly: true, sameSite: "Lax", path: "/" });
  });

  it("a new farm's Today is its first steps in order; a cold store added from them comes back with that step done", async () => {
    const steps = ownerPage.getByTestId("first-steps");
    await steps.waitFor({ timeout: 30_000 });
    await expect(ownerPage.getByTestId("round-headline").textContent()).resolves.toBe("A new farm: four steps to the first bag");
    // Nothing to scan yet: the first step is the first button.
    expect(await ownerPage.getByRole("link", { name: /scan a bag/i }).count()).toBe(0);
    expect(await steps.getByRole("listitem").allTextContents()).toEqual([
      expect.stringContaining("Add a cold store"),
      expect.stringContaining("Add a seed lot"),
      expect.stringContaining("Set up the first bag"),
      expect.stringContaining("Print its label"),
    ]);
    await shoot(ownerPage, "accounts-first-steps");
    await steps.getByRole("link", { name: "Add a cold store" }).click();
    await ownerPage.waitForURL(/\/stores\?add=1/);
    await ownerPage.getByLabel("Name").fill("Barn fridge");
    await ownerPage.getByRole("button", { name: "Add cold store" }).click();
    await ownerPage.waitForURL(/\/today$/);
    await expect.poll(() => steps.getByRole("listitem").first().getAttribute("data-done")).toBe("true");
    await steps.getByRole("link", { name: "Add a seed lot" }).waitFor();
  });

  it("invites a Helper from the Team page; the e-mail arrives in the local mailbox with its link", async () => {
    await ownerPage.goto("/team");
    // The role ladder in the product's own words, the read-only end included.
    await ownerPage.getByRole("button", { name: "Send invite" }).waitFor();
    const roleChoices = (await ownerPage.getByLabel("Role", { exact: true }).locator("option").allTextContents()).map((t) => t.split(" — ")[0]);
    expect(roleChoices).toEqual(["Owner", "Grower", "Helper", "Visitor"]);
    expect(await ownerPage.getByText(/viewer/i).count()).toBe(0);
    await ownerPage.getByLabel("E-mail").fill("moss@bramblewick.example");
    await ownerPage.getByLabel("Role", { exact: true }).selectOption("helper");
    await ownerPage.getByRole("button", { name: "Send invite" }).click();
    await ownerPage.getByText("Invite sent to moss@bramblewick.example").waitFor();
    await ownerPage.getByText("Pending invites (1)").waitFor();
    await shoot(ownerPage, "accounts-team-owner");
    await ownerPage.setViewportSize({ width: 1280, height: 800 });
    await shoot(ownerPage, "accounts-team-owner-desktop");
    await ownerPage.setViewportSize({ width: 390, height: 844 });

    await ownerPage.goto("/dev/mailbox");
    await ownerPage.getByText("Wren Halloway invited you to Bramblewick Native Nursery on Rimebook").waitFor();
    inviteLink = (await ownerPage.getByRole("link", { name: "Open invite link" }).first().getAttribute("href")) ?? "";
    expect(inviteLink.startsWith(`${app.origin}/invite/`)).toBe(true);
    await shoot(ownerPage, "accounts-mailbox");
  });

  it("accepts the invite in another browser profile, with a clear error for a short password first", async () => {
    await helperPage.goto(inviteLink);
    await helperPage.getByRole("heading", { name: "Join Bramblewick Native Nursery" }).waitFor();
    await helperPage.getByLabel("Your name").fill("Moss Fenwick");
    await helperPage.getByLabel("Choose a password").fill("short");
    await helperPage.getByRole("button", { name: "Join the farm" }).click();
    await helperPage.getByText("Use at least 10 characters").waitFor();
    await shoot(helperPage, "accounts-invite-accept");
    await helperPage.getByLabel("Choose a password").fill("sphagnum and sand");
    await helperPage.getByRole("button", { name: "Join the farm" }).click();
    await helperPage.waitForURL(/\/today/);
    const me = await helperPage.evaluate(() => fetch("/api/me").then((r) => r.json()));
    expect(me).toMatchObject({ role: "helper", user: { name: "Moss Fenwick" }, farm: { name: "Bramblewick Native Nursery" } });
  });

  it("works once: the same link cannot be used again", async () => {
    const third = await phoneContext(browser, app.origin);
    const page = await third.newPage();
    await page.goto(inviteLink);
    await page.getByRole("heading", { name: "This invite cannot be used" }).waitFor();
    expect(await page.getByText("already been used").count()).toBe(1);
    await third.close();
  });

  it("limits the Helper to what a Helper may do: no team changes, and the Team page offers none", async () => {
    const tries = await helperPage.evaluate(async () => {
      const post = (url: string, body: unknown) =>
        fetch(url, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) }).then((r) => r.status);
      return {
        invite: await post("/api/invites", { email: "someone@example.test", role: "owner" }),
        farmUpdate: await post("/api/sync/push", { deviceId: "helper-phone", mutations: [{ id: crypto.randomUUID(), name: "farm.update", args: { name: "Mine now" }, at: new Date().toISOString() }] }).then(
          () => fetch("/api/me").then((r) => r.json()).then((m) => m.farm.name),
        ),
      };
    });
    expect(tries.invite).toBe(403);
    expect(tries.farmUpdate).toBe("Bramblewick Native Nursery");

    await helperPage.goto("/team");
    await helperPage.getByText("Moss Fenwick").waitFor();
    expect(await helperPage.getByRole("button", { name: "Send invite" }).count()).toBe(0);
    expect(await helperPage.getByRole("combobox").count()).toBe(0);
    expect(await helperPage.getByText("Only an Owner can change the team.").count()).toBe(1);
    await shoot(helperPage, "accounts-team-helper");
  });

  it("refuses a cross-origin POST even with the Owner's cookie", async () => {
    const cookie = (await owner.cookies()).find((c) => c.name === "rimebook_session")!;
    const res = await fetch(`${app.origin}/api/invites`, {
      method: "POST",
      headers: { cookie: `rimebook_session=${cookie.value}`, origin: "https://elsewhere.example", "content-type": "application/json" },
      body: JSON.stringify({ email: "x@example.test", role: "owner" }),
    });
    expect(res.status).toBe(403);
  });

  it("signs the Helper out, refuses a wrong password in words, and signs in again", async () => {
    await helperPage.getByRole("button", { name: "Sign out on this phone" }).click();
    await helperPage.waitForURL(/\/sign-in/);
    await helperPage.getByLabel("E-mail").fill("moss@bramblewick.example");
    await helperPage.getByLabel("Password", { exact: true }).fill("not the password");
    await helperPage.getByRole("button", { name: "Sign in" }).click();
    await helperPage.getByText("That e-mail and password do not match an account.").waitFor();
    await helperPage.getByLabel("Password", { exact: true }).fill("sphagnum and sand");
    await helperPage.getByRole("button", { name: "Sign in" }).click();
    await helperPage.waitForURL(/\/today/);
  });

  it("changes the Helper's password in Settings: a wrong current one is refused in words; then other sessions end, this one stays", async () => {
    // A second session of the Helper elsewhere (another phone), which the change must end.
    const other = await fetch(`${app.origin}/api/auth/sign-in`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: app.origin },
      body: JSON.stringify({ email: "moss@bramblewick.example", password: "sphagnum and sand" }),
    });
    expect(other.status).toBe(200);
    const otherCookie = other.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
    const meStatus = (cookie: string) => fetch(`${app.origin}/api/me`, { headers: { cookie } }).then((r) => r.status);
    expect(await meStatus(otherCookie)).toBe(200);

    await helperPage.goto("/settings");
    const form = helperPage.getByRole("form", { name: "Change password" });
    await form.getByLabel("Current password").fill("not my password");
    await form.getByLabel("New password", { exact: true }).fill("moss on the north side");
    await form.getByLabel("New password again").fill("moss on the north side");
    await form.getByRole("button", { name: "Change password" }).click();
    await form.getByText("That is not your current password.").waitFor();
    expect(await meStatus(otherCookie)).toBe(200);
    await shoot(helperPage, "accounts-settings-password-wrong");

    await form.getByLabel("Current password").fill("sphagnum and sand");
    await form.getByRole("button", { name: "Change password" }).click();
    await form.getByText("Password changed. You were signed out on 1 other phone or computer. This phone stays signed in.").waitFor();
    expect(await meStatus(otherCookie)).toBe(401);
    expect(await helperPage.evaluate(() => fetch("/api/me").then((r) => r.status))).toBe(200);
    expect(await form.getByLabel("Current password").inputValue()).toBe("");
  });

  it("renames the Helper in Settings; /api/me and the screen show the new name", async () => {
    const form = helperPage.getByRole("form", { name: "Your name" });
    await form.getByLabel("Your name").fill("Moss Fenwick-Hale");
    await form.getByRole("button", { name: "Save name" }).click();
    await form.getByText("Saved. Your team now sees you as Moss Fenwick-Hale.").waitFor();
    expect(await helperPage.evaluate(() => fetch("/api/me").then((r) => r.json()))).toMatchObject({ user: { name: "Moss Fenwick-Hale" } });
    await helperPage.reload();
    expect(await helperPage.getByRole("form", { name: "Your name" }).getByLabel("Your name").inputValue()).toBe("Moss Fenwick-Hale");
  });

  it("shows no farm switcher for one farm; after joining a second farm, lists both with roles and switches with one tap", async () => {
    expect(await helperPage.getByRole("list", { name: "Your farms" }).count()).toBe(0);

    // Another farm invites the same person (their existing account).
    const quill = await fetch(`${app.origin}/api/auth/sign-up`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: app.origin },
      body: JSON.stringify({ email: "ash@quill.example", password: "frost on the barn door", name: "Ash Quill", farmName: "Quill Seed Library" }),
    });
    expect(quill.status).toBe(201);
    const ashCookie = quill.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
    const invited = await fetch(`${app.origin}/api/invites`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: app.origin, cookie: ashCookie },
      body: JSON.stringify({ email: "moss@bramblewick.example", role: "grower" }),
    });
    expect(invited.status).toBe(201);
    const inviteMail = () => readMailbox(app.mailboxDir).find((m) => m.subject === "Ash Quill invited you to Quill Seed Library on Rimebook");
    await expect.poll(() => Boolean(inviteMail())).toBe(true);
    const link = inviteMail()!.links.find((l) => l.includes("/invite/"))!;
    await helperPage.goto(link);
    await helperPage.getByLabel("Your Rimebook password").fill("moss on the north side");
    await helperPage.getByRole("button", { name: "Join the farm" }).click();
    await helperPage.waitForURL(/\/today/);
    await helperPage.getByRole("link", { name: /: today's round$/ }).getByText("Quill Seed Library").waitFor();

    await helperPage.goto("/settings");
    const farms = helperPage.getByRole("list", { name: "Your farms" });
    await farms.getByText("Open now").waitFor();
    expect(await farms.getByRole("listitem").count()).toBe(2);
    await shoot(helperPage, "accounts-settings");
    await helperPage.screenshot({ path: "artifacts/settings-390x844.png" });

    // With no signal and a change waiting, the phone refuses to switch and says why.
    const digest = helperPage.getByRole("switch", { name: "Send me the daily e-mail" });
    await expect.poll(() => digest.isEnabled()).toBe(true);
    await helper.setOffline(true);
    await digest.check();
    await farms.getByRole("button", { name: "Switch to Bramblewick Native Nursery (Helper)" }).click();
    await helperPage.getByText("1 e-mail preference is still only on this phone and could not be sent to Quill Seed Library just now.", { exact: false }).waitFor();
    expect(await helperPage.getByText("Rimebook will not switch until it has gone up.", { exact: false }).count()).toBe(1);
    expect(await helperPage.getByRole("link", { name: /: today's round$/ }).getByText("Quill Seed Library").count()).toBe(1);
    await shoot(helperPage, "accounts-settings-switch-refused");

    // Back in signal: one tap sends the waiting change to Quill Seed Library, then opens the other farm.
    await helper.setOffline(false);
    await farms.getByRole("button", { name: "Switch to Bramblewick Native Nursery (Helper)" }).click();
    await helperPage.waitForURL(/\/today/);
    const optIn = `select m.digest_opt_in as on_ from memberships m join farms f on f.id = m.farm_id join users u on u.id = m.user_id where u.email = ? and f.name = ?`;
    await waitForRows<{ on_: number }>(app.databaseFile, optIn, ["moss@bramblewick.example", "Quill Seed Library"], (rows) => rows[0]?.on_ === 1);
    expect(queryServer<{ on_: number }>(app.databaseFile, optIn, "moss@bramblewick.example", "Bramblewick Native Nursery")[0].on_).toBe(0);
    await helperPage.getByRole("link", { name: /: today's round$/ }).getByText("Bramblewick Native Nursery").waitFor();
    expect(await helperPage.evaluate(() => fetch("/api/me").then((r) => r.json()))).toMatchObject({ role: "helper", farm: { name: "Bramblewick Native Nursery" } });
    await helperPage.goto("/settings");
    await helperPage.getByRole("list", { name: "Your farms" }).getByRole("button", { name: "Switch to Quill Seed Library (Grower)" }).waitFor();
  });

  it("resets a forgotten password by the e-mailed link, which then stops working", async () => {
    const page = await (await phoneContext(browser, app.origin)).newPage();
    await page.goto("/sign-in");
    await page.getByRole("link", { name: "Forgot your password?" }).click();
    // The sign-in page has an "E-mail" field too: fill the reset form's, not the one being left.
    await page.waitForURL(/\/reset$/);
    await page.getByRole("form", { name: "Ask for a new password" }).getByLabel("E-mail").fill("wren@bramblewick.example");
    await page.getByRole("button", { name: "Send the link" }).click();
    await page.getByText("a link to choose a new password is on its way").waitFor();

    await page.goto("/dev/mailbox");
    await page.getByText("Choose a new Rimebook password").first().waitFor();
    const link = (await page.getByRole("link", { name: "Open reset link" }).first().getAttribute("href")) ?? "";
    expect(link.startsWith(`${app.origin}/reset/`)).toBe(true);
    await page.goto(link);
    await page.getByLabel("New password", { exact: true }).fill("hazel catkins in march");
    await page.getByRole("button", { name: "Save the new password" }).click();
    await page.waitForURL(/\/today/);
    // The Owner's other session (the first profile) ended with the reset.
    expect(await ownerPage.evaluate(() => fetch("/api/me").then((r) => r.status))).toBe(401);

    await page.goto(link);
    await page.getByLabel("New password", { exact: true }).fill("another phrase entirely");
    await page.getByRole("button", { name: "Save the new password" }).click();
    await page.getByText("This link has already been used.").waitFor();
    expect(await page.getByRole("link", { name: "Ask for a new link" }).count()).toBe(1);
    await shoot(page, "accounts-reset-used");
  });

  it("logged no unexpected errors on the Owner's pages", () => {
    expect(unexpected(ownerErrors)).toEqual([]);
  });
});
