import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase, storedBoolean } from "../support/db";
import { isForeignKeyViolation, isUniqueViolation } from "@/lib/server/db-errors";

const farmOwnedTables = [
  "memberships", "protocols", "protocol_sources", "lots", "stores", "readings", "bags", "checks",
  "photos", "sowings", "counts", "trials", "trial_arms", "plan_items",
];

describe("migrations on an empty database", () => {
  let ctx: Awaited<ReturnType<typeof freshDatabase>>;
  beforeAll(async () => {
    ctx = await freshDatabase();
  });
  afterAll(async () => ctx.cleanup());

  it("creates every table of the data model", async () => {
    for (const t of [...farmOwnedTables, "farms", "users", "sessions", "invites", "applied_mutations", "audit_log"]) {
      expect(await ctx.db.schema.hasTable(t), t).toBe(true);
    }
  });

  it("gives farm-owned tables the sync columns", async () => {
    for (const t of farmOwnedTables) {
      for (const c of ["id", "farm_id", "created_at", "updated_at", "seq", "deleted_at"]) {
        expect(await ctx.db.schema.hasColumn(t, c), `${t}.${c}`).toBe(true);
      }
    }
  });

  it("enforces a unique bag code per farm and foreign keys", async () => {
    const now = new Date().toISOString();
    const base = { created_at: now, updated_at: now, seq: 1 };
    await ctx.db("farms").insert([
      { id: "f1", name: "A", created_at: now, updated_at: now },
      { id: "f2", name: "B", created_at: now, updated_at: now },
    ]);
    await ctx.db("lots").insert([
      { id: "l1", farm_id: "f1", species: "Asclepias syriaca", ...base },
      { id: "l2", farm_id: "f2", species: "Asclepias syriaca", ...base },
    ]);
    await ctx.db("bags").insert({ id: "b1", farm_id: "f1", lot_id: "l1", code: "ABC123X", ...base });
    // Same code on another farm is fine.
    await ctx.db("bags").insert({ id: "b2", farm_id: "f2", lot_id: "l2", code: "ABC123X", ...base });
    // Each database words it its own way (SQLITE_CONSTRAINT_UNIQUE / SQLSTATE 23505): ask which constraint broke.
    const dup = await ctx.db("bags").insert({ id: "b3", farm_id: "f1", lot_id: "l1", code: "ABC123X", ...base }).then(() => null, (e: unknown) => e);
    expect(isUniqueViolation(dup)).toBe(true);
    const orphan = await ctx.db("bags").insert({ id: "b4", farm_id: "f1", lot_id: "nope", code: "ZZZ", ...base }).then(() => null, (e: unknown) => e);
    expect(isForeignKeyViolation(orphan)).toBe(true);
  });

  it("hands back bigint counters and counts as numbers, booleans as each database stores them", async () => {
    const now = new Date().toISOString();
    await ctx.db("farms").insert({ id: "f9", name: "Numbers", seq: 9_007_199_254, created_at: now, updated_at: now });
    // PostgreSQL sends int8 (seq, count(*)) as text unless lib/server/db-config.ts sets its parser.
    expect(await ctx.db("farms").where({ id: "f9" }).first("seq")).toEqual({ seq: 9_007_199_254 });
    const counted = await ctx.db("farms").count({ n: "*" }).first();
    expect(counted).toEqual({ n: 3 });
    const [max] = await ctx.db("farms").max({ top: "seq" });
    expect(max).toEqual({ top: 9_007_199_254 });
    await ctx.db("memberships").insert({ id: "m9", farm_id: "f9", user_id: await userId(), role: "owner", digest_opt_in: true, created_at: now, updated_at: now, seq: 1 });
    expect(storedBoolean((await ctx.db("memberships").where({ id: "m9" }).first("digest_opt_in")).digest_opt_in)).toBe(true);
  });

  async function userId() {
    const now = new Date().toISOString();
    await ctx.db("users").insert({ id: "u9", email: "numbers@example.test", name: "N", password_hash: "x", created_at: now, updated_at: now });
    return "u9";
  }

  it("rolls back and forward cleanly", async () => {
    await ctx.db.migrate.rollback(undefined, true);
    expect(await ctx.db.schema.hasTable("bags")).toBe(false);
    await ctx.db.migrate.latest();
    expect(await ctx.db.schema.hasTable("bags")).toBe(true);
  });
});
