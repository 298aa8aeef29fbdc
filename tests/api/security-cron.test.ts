import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { freshDatabase } from "../support/db";
import { signedInMember } from "../support/auth";

// Issue 11, item 2: a production server (NODE_ENV=production, not the demo, which makes its own secret)
// without CRON_SECRET has the digest route switched off, so the built-in development value opens nothing;
// with a secret the answer says how many farms were served, never which.

const saved = { ...process.env };
let ctx: Awaited<ReturnType<typeof freshDatabase>>;
const farmIds: string[] = [];

beforeAll(async () => {
  ctx = await freshDatabase();
  for (const name of ["Bramblewick Native Nursery", "Second Farm"]) farmIds.push((await signedInMember(ctx.db, { role: "owner", farmName: name })).farmId);
});
afterAll(async () => {
  process.env = saved;
  vi.resetModules();
  await ctx.cleanup();
});

/** The cron route as a production server with these settings loads it. */
async function productionRoute(settings: { CRON_SECRET?: string }) {
  vi.resetModules();
  process.env = { ...saved, NODE_ENV: "production", SESSION_SECRET: "a-production-session-secret-of-32-chars-or-more" };
  delete process.env.CRON_SECRET;
  if (settings.CRON_SECRET) process.env.CRON_SECRET = settings.CRON_SECRET;
  const { POST, GET } = await import("@/app/api/cron/digest/route");
  return (method: "GET" | "POST", secret: string) =>
    (method === "GET" ? GET : POST)(new Request("http://localhost:3000/api/cron/digest", { method, headers: { authorization: `Bearer ${secret}` } }), {} as never);
}

describe("the digest route in production", () => {
  it("is switched off without CRON_SECRET: the development value (or any other) runs nothing", async () => {
    const cron = await productionRoute({});
    for (const secret of ["rimebook-development-cron", "", "anything at all"]) {
      for (const method of ["GET", "POST"] as const) {
        const res = await cron(method, secret);
        expect(res.status).toBe(404);
        expect((await res.json()).error.message).toMatch(/CRON_SECRET/);
      }
    }
    expect(await ctx.db("digest_runs")).toHaveLength(0);
  });

  it("with CRON_SECRET, refuses the development value and a near miss, and never lists farm ids", async () => {
    const cron = await productionRoute({ CRON_SECRET: "a-real-scheduler-secret-7731" });
    expect((await cron("POST", "rimebook-development-cron")).status).toBe(401);
    expect((await cron("POST", "a-real-scheduler-secret-7732")).status).toBe(401);
    const res = await cron("POST", "a-real-scheduler-secret-7731");
    expect(res.status).toBe(200);
    const text = await res.text();
    for (const id of farmIds) expect(text).not.toContain(id);
    expect(JSON.parse(text)).toMatchObject({ ok: true, farms: 2 });
  });
});
