import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it, vi } from "vitest";
import { renderToStaticMarkup } from "react-dom/server";

// The captured-mail page exists only for local work: with env.mailboxPage off it answers 404.
const fakeEnv = vi.hoisted(() => ({ mailboxPage: false, MAILBOX_DIR: "" }));
vi.mock("@/lib/server/env", () => ({ env: fakeEnv }));

describe("/dev/mailbox", () => {
  it("is not found when the mailbox page is off (https deployments by default)", async () => {
    const { default: MailboxPage } = await import("@/app/dev/mailbox/page");
    fakeEnv.mailboxPage = false;
    let thrown: unknown;
    try {
      MailboxPage();
    } catch (err) {
      thrown = err;
    }
    expect(String((thrown as { digest?: string })?.digest)).toMatch(/404/);
  });

  it("lists captured mail with its links clickable when on", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-mailbox-page-"));
    fs.writeFileSync(
      path.join(dir, "2026-12-02T00-00-00-000Z-aaaa.json"),
      JSON.stringify({ id: "aaaa", receivedAt: "2026-12-02T00:00:00.000Z", from: "rimebook@localhost", to: ["moss@example.test"], subject: "Join the nursery", text: "Open http://localhost:3000/invite/tok_123 now", html: null, links: ["http://localhost:3000/invite/tok_123"] }),
    );
    fakeEnv.mailboxPage = true;
    fakeEnv.MAILBOX_DIR = dir;
    const { default: MailboxPage } = await import("@/app/dev/mailbox/page");
    const html = renderToStaticMarkup(MailboxPage());
    expect(html).toContain("Join the nursery");
    expect(html).toContain('href="http://localhost:3000/invite/tok_123"');
    fs.rmSync(dir, { recursive: true, force: true });
  });
});
