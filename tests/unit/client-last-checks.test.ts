import "fake-indexeddb/auto";
import { describe, expect, it } from "vitest";
import { RimebookDB } from "@/lib/client/db";
import { loadLastCheck, loadLastChecks } from "@/lib/client/fridge-reads";
import type { Check } from "@/lib/schemas/check";

function check(bagId: string, at: string, over: Partial<Check> = {}): Check {
  return {
    id: crypto.randomUUID(), farm_id: "f", created_at: at, updated_at: at, seq: 1, deleted_at: null, bag_id: bagId,
    checked_at: at, checked_by: null, moisture: "damp", mould: "clean", sprouts: "none", actions: [], note: null, temperature_c: null, ...over,
  };
}

describe("latest check per bag on the phone", () => {
  // Both ways of reading (a look-up per bag for a few bags, one pass for a whole round) give the same answer.
  it.each([5, 50, 51, 300])("%i bags: the one-pass read equals a look-up per bag", async (n) => {
    const db = new RimebookDB(`last-checks-${crypto.randomUUID()}`);
    const bagIds = Array.from({ length: n }, () => crypto.randomUUID());
    const rows: Check[] = [];
    bagIds.forEach((id, i) => {
      if (i % 7 === 3) return; // some bags were never checked
      rows.push(check(id, "2026-11-20T08:00:00.000Z"), check(id, "2026-11-27T08:00:00.000Z", { mould: i % 2 ? "spots" : "clean" }));
      // A deleted later check never speaks for the bag.
      if (i % 5 === 0) rows.push(check(id, "2026-11-30T08:00:00.000Z", { deleted_at: "2026-11-30T09:00:00.000Z", sprouts: "many" }));
    });
    rows.push(check("another-bag", "2026-12-01T08:00:00.000Z"));
    await db.checks.bulkAdd(rows.reverse());

    const got = await loadLastChecks(db, bagIds);
    for (const id of bagIds) {
      const one = await loadLastCheck(db, id);
      expect(got.get(id) ?? null).toEqual(one);
    }
    expect(got.has("another-bag")).toBe(false);
    expect([...got.values()].every((c) => c.checked_at === "2026-11-27T08:00:00.000Z")).toBe(true);
    db.close();
  });
});
