import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { createFarmWithOwner } from "@/lib/server/accounts";
import { writeProtocol } from "@/lib/server/protocols";
import { pullChanges } from "@/lib/server/sync/pull";
import { starterProtocols } from "@/lib/domain/starter-protocols";

describe("a new farm gets the starter protocol library", () => {
  let ctx: Awaited<ReturnType<typeof freshDatabase>>;
  let farmId = "";
  beforeAll(async () => {
    ctx = await freshDatabase();
    ({ farmId } = await ctx.db.transaction((trx) =>
      createFarmWithOwner(trx, { email: "wren@bramblewick.example", password: "catkins in february", name: "Wren Halloway", farmName: "Bramblewick Native Nursery" }),
    ));
  });
  afterAll(async () => ctx.cleanup());

  it("copies every starter row, marked as not the farm's own, with its phases intact", async () => {
    const rows = await ctx.db("protocols").where({ farm_id: farmId });
    expect(rows).toHaveLength(starterProtocols.length);
    for (const s of starterProtocols) {
      const row = rows.find((r) => r.starter_key === s.key);
      expect(row, s.key).toBeTruthy();
      expect(Boolean(row.is_farm_own)).toBe(false);
      expect(row.species).toBe(s.species);
      expect(JSON.parse(row.phases)).toEqual(s.phases);
      expect(row.toxic_seed === null ? null : JSON.parse(row.toxic_seed)).toEqual(s.toxicSeed);
    }
  });

  it("derives one protocol_sources row per published source", async () => {
    const sources = await ctx.db("protocol_sources").where({ farm_id: farmId }).whereNull("deleted_at");
    const expected = starterProtocols.flatMap((s) => s.phases.flatMap((p) => p.sources));
    expect(sources).toHaveLength(expected.length);
    expect(sources.map((r) => r.citation).sort()).toEqual(expected.map((s) => s.citation).sort());
  });

  it("reaches the phone through the pull feed, with the Owner's membership", async () => {
    const page = await pullChanges(ctx.db, farmId, 0, 5000);
    const protocols = page.changes.filter((c) => c.table === "protocols");
    expect(protocols).toHaveLength(starterProtocols.length);
    expect(Array.isArray(protocols[0].row.phases)).toBe(true);
    expect(page.changes.some((c) => c.table === "memberships" && c.row.role === "owner")).toBe(true);
  });

  it("replaces derived sources on a rewrite and tombstones the old ones under the new seq", async () => {
    const row = await ctx.db("protocols").where({ farm_id: farmId }).whereNotNull("starter_key").first();
    const before = await ctx.db("protocol_sources").where({ protocol_id: row.id }).whereNull("deleted_at");
    const seq = await ctx.db.transaction((trx) =>
      writeProtocol(trx, farmId, {
        id: row.id,
        species: row.species,
        commonName: "",
        phases: [{ kind: "cold_moist", note: "", sources: [{ citation: "Our 2026 trial", minDays: 30, maxDays: 45, band: null, note: "" }] }],
        effectiveBand: null,
        isFarmOwn: true,
        noColdReason: "",
        toxicSeed: null,
        medicinal: false,
        note: "",
        starter_key: row.starter_key,
        source_trial_id: null,
      }),
    );
    const live = await ctx.db("protocol_sources").where({ protocol_id: row.id }).whereNull("deleted_at");
    expect(live.map((s) => s.citation)).toEqual(["Our 2026 trial"]);
    const dead = await ctx.db("protocol_sources").where({ protocol_id: row.id }).whereNotNull("deleted_at");
    expect(dead).toHaveLength(before.length);
    expect(dead.every((d) => Number(d.seq) === seq)).toBe(true);
    expect(Number((await ctx.db("farms").where({ id: farmId }).first()).seq)).toBe(seq);
  });
});
