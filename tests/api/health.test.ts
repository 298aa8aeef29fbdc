import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { GET } from "@/app/api/health/route";

describe("GET /api/health", () => {
  let ctx: Awaited<ReturnType<typeof freshDatabase>>;
  beforeAll(async () => {
    ctx = await freshDatabase();
  });
  afterAll(async () => ctx.cleanup());

  it("answers ok with the database up and migrations current", async () => {
    const res = await GET(new Request("http://localhost/api/health"), {});
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toMatchObject({ ok: true, database: "up", migrations: { current: true, pending: [] } });
  });

  it("reports pending migrations with 503 when the schema is behind", async () => {
    await ctx.db.migrate.rollback(undefined, true);
    const res = await GET(new Request("http://localhost/api/health"), {});
    expect(res.status).toBe(503);
    const body = await res.json();
    expect(body.migrations.pending).toContain("20261202000000_initial");
    await ctx.db.migrate.latest();
  });
});
