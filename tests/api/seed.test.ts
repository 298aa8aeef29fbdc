import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { seed } from "@/db/seeds/01_demo_farm";
import { demoBags, demoFarm, demoLots, demoMembers } from "@/db/seeds/data/demo-farm";
import { computePullWindow } from "@/lib/domain/schedule";
import { determineBagState } from "@/lib/domain/schedule";
import { formatIsoDay } from "@/lib/domain/dates";
import { verifyPassword } from "@/lib/server/passwords";

describe("demo farm seed", () => {
  let ctx: Awaited<ReturnType<typeof freshDatabase>>;
  beforeAll(async () => {
    ctx = await freshDatabase();
    await seed(ctx.db);
  }, 60_000);
  afterAll(async () => ctx.cleanup());

  it("loads one member per role with working demo passwords", async () => {
    const rows = await ctx.db("memberships").join("users", "users.id", "memberships.user_id").where("memberships.farm_id", demoFarm.id).select("role", "email", "password_hash");
    expect(rows.map((r) => r.role).sort()).toEqual(["grower", "helper", "owner", "viewer"]);
    const owner = rows.find((r) => r.role === "owner")!;
    expect(await verifyPassword(demoMembers[0].password, owner.password_hash)).toBe(true);
  });

  it("has the stores, lots and starter protocols", async () => {
    expect(await ctx.db("stores").where({ farm_id: demoFarm.id }).count({ n: "*" }).first()).toEqual({ n: 3 });
    expect(await ctx.db("lots").where({ farm_id: demoFarm.id }).count({ n: "*" }).first()).toEqual({ n: demoLots.length });
    const protocols = await ctx.db("protocols").where({ farm_id: demoFarm.id });
    expect(protocols.length).toBeGreaterThanOrEqual(10);
    // Every lot with a published cold phase is linked to its protocol.
    const unlinked = await ctx.db("lots").where({ farm_id: demoFarm.id }).whereNull("protocol_id").pluck("species");
    expect(unlinked).toEqual([]);
  });

  it("puts bags in every state, as the domain computes them today", async () => {
    const today = formatIsoDay(new Date());
    const bags = await ctx.db("bags").where({ "bags.farm_id": demoFarm.id }).orderBy("bags.seq").leftJoin("protocols", "protocols.id", "bags.protocol_id").select("bags.*", "protocols.phases", "protocols.species", "protocols.effective_band");
    expect(bags.length).toBe(demoBags.length);
    const states = bags.map((b) => {
      const window = b.start_date && b.phases ? computePullWindow({ species: b.species, phases: JSON.parse(b.phases), effectiveBand: b.effective_band ? JSON.parse(b.effective_band) : null }, b.start_date) : null;
      return determineBagState({ startedOn: b.start_date, pulledOn: b.pulled_on, sownOn: b.sown_on, discardedOn: b.discarded_on }, window, today);
    });
    for (const s of ["planned", "chilling", "window_open", "overdue", "pulled", "sown", "discarded"]) expect(states, s).toContain(s);
    // The state each demo bag was written for (in insertion order) is the state the domain gives it.
    expect(states).toEqual(demoBags.map((b) => b.state));
    const codes = new Set(bags.map((b) => b.code));
    expect(codes.size).toBe(bags.length);
  });

  it("has checks, readings, counts and a trial with two arms", async () => {
    const n = async (t: string) => Number((await ctx.db(t).where({ farm_id: demoFarm.id }).count({ n: "*" }).first())!.n);
    expect(await n("checks")).toBeGreaterThan(30);
    expect(await n("readings")).toBeGreaterThan(500);
    expect(await n("counts")).toBeGreaterThan(10);
    expect(await n("trials")).toBe(1);
    expect(await n("trial_arms")).toBe(2);
  });

  it("stamps every row with a distinct seq not above the farm counter", async () => {
    const farm = await ctx.db("farms").where({ id: demoFarm.id }).first();
    const maxBag = await ctx.db("bags").max({ m: "seq" }).first();
    expect(Number(maxBag!.m)).toBeLessThanOrEqual(Number(farm.seq));
  });

  it("can be loaded again (idempotent reset of the demo farm)", async () => {
    await seed(ctx.db);
    expect(await ctx.db("farms").where({ id: demoFarm.id }).count({ n: "*" }).first()).toEqual({ n: 1 });
    expect(await ctx.db("bags").where({ farm_id: demoFarm.id }).count({ n: "*" }).first()).toEqual({ n: demoBags.length });
  });
});
