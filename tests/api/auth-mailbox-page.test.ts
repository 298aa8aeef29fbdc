import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { renderToStaticMarkup } from "react-dom/server";
import { CLIENT_HEADER, FRONT_DOOR } from "@/lib/server/front-door.mjs";

// The captured-mail page shows every reset and invite link, so it exists only when the demo or dev asks
// (MAILBOX_PAGE=on, never from the origin's scheme), and then only for this computer (loopback, as the front
// door read it from the socket) unless MAILBOX_PAGE_REMOTE=on as well.
const fakeEnv = vi.hoisted(() => ({ mailboxPage: false, mailboxRemote: false, MAILBOX_DIR: "", APP_ORIGIN: "http://192.168.1.20:3000" }));
const caller = vi.hoisted(() => ({ address: "127.0.0.1" as string | null }));
vi.mock("@/lib/server/env", () => ({ env: fakeEnv }));
vi.mock("next/headers", () => ({
  headers: async () => new Headers(caller.address ? { [CLIENT_HEADER]: caller.address } : {}),
}));

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-mailbox-page-"));
beforeAll(() => {
  (globalThis as Record<symbol, unknown>)[FRONT_DOOR] = true;
  fs.writeFileSync(
    path.join(dir, "2026-12-02T00-00-00-000Z-aaaa.json"),
    JSON.stringify({ id: "aaaa", receivedAt: "2026-12-02T00:00:00.000Z", from: "rimebook@localhost", to: ["moss@example.test"], subject: "Join the nursery", text: "Open http://localhost:3000/invite/tok_123 now", html: null, links: ["http://localhost:3000/invite/tok_123"] }),
  );
  fakeEnv.MAILBOX_DIR = dir;
});
afterAll(() => {
  delete (globalThis as Record<symbol, unknown>)[FRONT_DOOR];
  fs.rmSync(dir, { recursive: true, force: true });
});

async function render(): Promise<string | 404> {
  const { default: MailboxPage } = await import("@/app/dev/mailbox/page");
  try {
    return renderToStaticMarkup(await MailboxPage());
  } catch (err) {
    if (/404/.test(String((err as { digest?: string })?.digest))) return 404;
    throw err;
  }
}

describe("/dev/mailbox", () => {
  it.each([
    ["not asked for, on an http origin (a LAN box or a proxy that ends TLS)", { page: false, remote: false, address: "127.0.0.1" }],
    ["not asked for, even with the remote switch", { page: false, remote: true, address: "127.0.0.1" }],
    ["asked for, but the caller is another computer", { page: true, remote: false, address: "192.168.1.33" }],
    ["asked for, but the caller's address is unknown (served without the front door)", { page: true, remote: false, address: null }],
  ])("is not found when %s", async (_, c) => {
    Object.assign(fakeEnv, { mailboxPage: c.page, mailboxRemote: c.remote });
    caller.address = c.address;
    expect(await render()).toBe(404);
  });

  it("lists captured mail to this computer when asked for, with its links clickable and says it is a local stand-in for e-mail", async () => {
    Object.assign(fakeEnv, { mailboxPage: true, mailboxRemote: false });
    for (const address of ["127.0.0.1", "::1"]) {
      caller.address = address;
      const html = await render();
      expect(html).toContain("Join the nursery");
      expect(html).toContain('href="http://localhost:3000/invite/tok_123"');
      expect(html).toContain("A local stand-in for e-mail");
    }
  });

  it("answers another computer only with MAILBOX_PAGE_REMOTE=on as well", async () => {
    Object.assign(fakeEnv, { mailboxPage: true, mailboxRemote: true });
    caller.address = "192.168.1.33";
    expect(await render()).toContain("Join the nursery");
  });
});
