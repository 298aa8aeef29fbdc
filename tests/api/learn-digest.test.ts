import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { signedInMember } from "../support/auth";
import { addBag, addCheck, addLot, addProtocol, addStore } from "../support/season-rows";
import { buildFarmDigest } from "@/lib/server/digest";
import { addDaysToIsoDay } from "@/lib/domain";
import { findZonedDay } from "@/lib/domain/csv";

// The e-mail digest reads the farm's own history as Today does: a bag whose species showed roots early on this farm
// is due daily from a few days before those roots (common practice), even before its published window opens.
// Invented farm, protocol and days (28–42 days cold, "Test source").

let ctx: Awaited<ReturnType<typeof freshDatabase>>;
const now = new Date();
const today = findZonedDay(now, "UTC");
const day = (n: number) => addDaysToIsoDay(today, n);
let farmId = "";

beforeAll(async () => {
  ctx = await freshDatabase();
  const owner = await signedInMember(ctx.db, { role: "owner", farmName: "Bramblewick Native Nursery", name: "Wren" });
  farmId = owner.farmId;
  const protocol = await addProtocol(ctx.db, farmId, "Hypericum perforatum", [28, 42]);
  const lot = await addLot(ctx.db, farmId, { species: "Hypericum perforatum" });
  const fridge = await addStore(ctx.db, farmId, { name: "Barn fridge" });
  // Last season: five bags showed roots on days 12–16 of their cold.
  for (let i = 0; i < 5; i++) {
    const start = day(-400 - i);
    const roots = addDaysToIsoDay(start, 12 + i);
    const bag = await addBag(ctx.db, farmId, { code: `HIST0${i}`, lotId: lot, storeId: fridge, protocolId: protocol, start, pulledOn: roots, sownOn: roots });
    await addCheck(ctx.db, farmId, bag, `${addDaysToIsoDay(start, 7)}T09:00:00.000Z`);
    await addCheck(ctx.db, farmId, bag, `${roots}T09:00:00.000Z`, { sprouts: "first_roots" });
  }
  // This season: started 9 days ago, checked on day 7. Weekly, its next check is day 14; the farm's roots from day 12
  // make it daily from day 9, which is today.
  const live = await addBag(ctx.db, farmId, { code: "RWTB22", lotId: lot, storeId: fridge, protocolId: protocol, start: day(-9) });
  await addCheck(ctx.db, farmId, live, `${day(-2)}T09:00:00.000Z`);
});
afterAll(async () => ctx.cleanup());

describe("the digest with the farm's own history", () => {
  it("lists the bag as due today, daily because of the farm's history", async () => {
    const digest = await buildFarmDigest(ctx.db, farmId, today, now);
    expect(digest.due.map((d) => [d.code, d.note])).toEqual([["RWT-B22", "On this farm roots have shown by now: check daily."]]);
  });

  it("lists nothing when those bags are removed (the weekly rhythm alone)", async () => {
    await ctx.db("bags").where({ farm_id: farmId }).whereLike("code", "HIST%").update({ deleted_at: now.toISOString() });
    const digest = await buildFarmDigest(ctx.db, farmId, today, now);
    expect(digest.due).toEqual([]);
  });
});
