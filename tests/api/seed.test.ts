import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { seed } from "@/db/seeds/01_demo_farm";
import { demoBags, demoFarm, demoHistoryBags, demoHistoryLots, demoLots, demoMembers } from "@/db/seeds/data/demo-farm";
import { buildRootsHistory, buildSpeciesWindows, groupChecksByBag } from "@/lib/domain/rows/farm-history-rows";
import { buildRoundFromRows } from "@/lib/domain/rows/round-input";
import { reconcileProtocol } from "@/lib/domain/protocols";
import { readProtocolRow } from "@/lib/domain/rows/protocol-row";
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
    expect(rows.map((r) => r.role).sort()).toEqual(["grower", "helper", "owner", "visitor"]);
    const owner = rows.find((r) => r.role === "owner")!;
    expect(await verifyPassword(demoMembers[0].password, owner.password_hash)).toBe(true);
  });

  it("has the stores, lots and starter protocols", async () => {
    expect(await ctx.db("stores").where({ farm_id: demoFarm.id }).count({ n: "*" }).first()).toEqual({ n: 3 });
    expect(await ctx.db("lots").where({ farm_id: demoFarm.id }).count({ n: "*" }).first()).toEqual({ n: demoLots.length + demoHistoryLots.length });
    const protocols = await ctx.db("protocols").where({ farm_id: demoFarm.id });
    expect(protocols.length).toBeGreaterThanOrEqual(10);
    // Every lot with a published cold phase is linked to its protocol.
    const unlinked = await ctx.db("lots").where({ farm_id: demoFarm.id }).whereNull("protocol_id").pluck("species");
    expect(unlinked).toEqual([]);
  });

  it("puts bags in every state, as the domain computes them today", async () => {
    const today = formatIsoDay(new Date());
    // This season's bags (the earlier seasons' finished bags are checked below).
    const bags = await ctx.db("bags").where({ "bags.farm_id": demoFarm.id }).whereNull("bags.note").orderBy("bags.seq").leftJoin("protocols", "protocols.id", "bags.protocol_id").select("bags.*", "protocols.phases", "protocols.species", "protocols.effective_band");
    expect(bags.length).toBe(demoBags.length);
    const states = bags.map((b) => {
      const window = b.start_date && b.phases ? computePullWindow({ species: b.species, phases: JSON.parse(b.phases), effectiveBand: b.effective_band ? JSON.parse(b.effective_band) : null }, b.start_date) : null;
      return determineBagState({ startedOn: b.start_date, pulledOn: b.pulled_on, sownOn: b.sown_on, discardedOn: b.discarded_on }, window, today);
    });
    for (const s of ["planned", "chilling", "window_open", "overdue", "pulled", "sown", "discarded"]) expect(states, s).toContain(s);
    // The state each demo bag was written for (in insertion order) is the state the domain gives it.
    expect(states).toEqual(demoBags.map((b) => b.state));
    const all = await ctx.db("bags").where({ farm_id: demoFarm.id }).pluck("code");
    expect(all.length).toBe(demoBags.length + demoHistoryBags.length);
    expect(new Set(all).size).toBe(all.length);
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
    expect(await ctx.db("bags").where({ farm_id: demoFarm.id }).count({ n: "*" }).first()).toEqual({ n: demoBags.length + demoHistoryBags.length });
  });

  describe("two earlier seasons of bag histories (invented demo data)", () => {
    async function loadRows() {
      const parse = (v: unknown) => (typeof v === "string" ? JSON.parse(v) : v);
      const [bags, lots, checks, protocols, stores] = await Promise.all([
        ctx.db("bags").where({ farm_id: demoFarm.id }),
        ctx.db("lots").where({ farm_id: demoFarm.id }),
        ctx.db("checks").where({ farm_id: demoFarm.id }),
        ctx.db("protocols").where({ farm_id: demoFarm.id }),
        ctx.db("stores").where({ farm_id: demoFarm.id }),
      ]);
      return {
        bags, lots, stores: stores.map((st) => ({ ...st, boxes: parse(st.boxes) })),
        checks: checks.map((c) => ({ ...c, actions: parse(c.actions) })),
        protocols: protocols.map((p) => ({ ...p, phases: parse(p.phases), effective_band: parse(p.effective_band), toxic_seed: parse(p.toxic_seed), medicinal: Boolean(p.medicinal), is_farm_own: Boolean(p.is_farm_own) })),
      };
    }

    it("are finished bags of two earlier seasons, each with its checks", async () => {
      const today = formatIsoDay(new Date());
      const history = await ctx.db("bags").where({ farm_id: demoFarm.id, note: "Earlier season (demo history)." });
      expect(history).toHaveLength(demoHistoryBags.length);
      expect(history.every((b) => b.start_date < today && (b.sown_on || b.discarded_on))).toBe(true);
      const years = new Set(history.map((b) => Number(b.start_date.slice(0, 4))));
      expect(years.size).toBeGreaterThanOrEqual(2);
    });

    it("bring coneflower roots earlier than the published 4 weeks (HortScience 28(9):899), with a window to suggest", async () => {
      const rows = await loadRows();
      const protocol = rows.protocols.find((p) => p.species === "Echinacea purpurea")!;
      const today = formatIsoDay(new Date());
      const { window, seasons } = buildRootsHistory(rows, groupChecksByBag(rows.checks), { species: "Echinacea purpurea" }, reconcileProtocol(readProtocolRow(protocol)), today);
      // The demo bags: roots on days 18–26 in 10 finished bags, 2 unfinished; plus this season's bags.
      expect(window).toMatchObject({ enough: true, earliest: 18, suggestsEarlier: true, published: { minDays: 28, maxDays: 28 } });
      expect(window.median).toBeLessThan(28);
      expect(seasons.length).toBeGreaterThanOrEqual(2);
      // Too few finished strawberry bags for a window of its own.
      expect(buildRootsHistory(rows, groupChecksByBag(rows.checks), { species: "Fragaria vesca" }, null, today).window.enough).toBe(false);
    });

    it("turns this season's chilling coneflower bag daily on Today, and only with the history", async () => {
      const rows = await loadRows();
      const today = formatIsoDay(new Date());
      const lastChecks = new Map<string, (typeof rows.checks)[number]>();
      for (const c of rows.checks) if (!lastChecks.get(c.bag_id) || lastChecks.get(c.bag_id)!.checked_at < c.checked_at) lastChecks.set(c.bag_id, c);
      const windows = buildSpeciesWindows(rows, groupChecksByBag(rows.checks), today);
      const coneflowerDaily = (round: ReturnType<typeof buildRoundFromRows>) =>
        round.items.filter((i) => i.bag.species?.startsWith("Echinacea") && i.next.reason === "roots_watch").length;
      expect(coneflowerDaily(buildRoundFromRows(rows, lastChecks, today))).toBe(0);
      expect(coneflowerDaily(buildRoundFromRows(rows, lastChecks, today, undefined, undefined, windows))).toBe(1);
    });
  });
});
