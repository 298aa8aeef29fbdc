import "fake-indexeddb/auto";
import { describe, expect, it } from "vitest";
import { RimebookDB } from "@/lib/client/db";
import { loadChecksOfBags, loadSpeciesHistory, loadSpeciesWindows } from "@/lib/client/history-reads";
import type { Bag } from "@/lib/schemas/bag";
import type { Check } from "@/lib/schemas/check";
import type { Lot } from "@/lib/schemas/lot";

// The farm's history from the phone store (fake-indexeddb). Invented rows.

const stamp = { farm_id: "f", created_at: "2026-01-01T00:00:00.000Z", updated_at: "2026-01-01T00:00:00.000Z", seq: 1, deleted_at: null };
const lot = (id: string, species: string) => ({ ...stamp, id, species, common_name: null, source: null, year: 2025, quantity: null, protocol_id: null, treated: false, notes: null }) as unknown as Lot;
const bag = (id: string, lotId: string, over: Partial<Bag> = {}) =>
  ({ ...stamp, id, code: id.slice(0, 8).toUpperCase(), lot_id: lotId, protocol_id: null, store_id: "s1", box: "Box A", medium: "paper_towel", seed_count: 10, start_date: "2025-11-01", planned_start_date: null, window_start: null, window_end: null, pulled_on: "2025-12-01", sown_on: null, discarded_on: null, discard_reason: null, trial_arm_id: null, plan_item_id: null, check_every_days: null, note: null, ...over }) as Bag;
const check = (bagId: string, day: string, over: Partial<Check> = {}) =>
  ({ ...stamp, id: crypto.randomUUID(), bag_id: bagId, checked_at: `${day}T09:00:00.000Z`, checked_by: null, moisture: "damp", mould: "clean", sprouts: "none", actions: [], note: null, temperature_c: null, ...over }) as Check;

describe("reading the farm's history on the phone", () => {
  it.each([3, 50, 51, 200])("%i bags: the checks of exactly those bags, tombstones left out, either way of reading", async (n) => {
    const db = new RimebookDB(`history-${crypto.randomUUID()}`);
    const ids = Array.from({ length: n }, () => crypto.randomUUID());
    await db.checks.bulkAdd([...ids.map((id) => check(id, "2025-11-10")), check(ids[0], "2025-11-11", { deleted_at: "2025-11-12T00:00:00Z" }), check("other", "2025-11-10")]);
    const got = await loadChecksOfBags(db, ids);
    expect(got.map((c) => c.bag_id).sort()).toEqual([...ids].sort());
    db.close();
  });

  it("loads one species across its lots (names matched without case), and gives Today the species' windows", async () => {
    const db = new RimebookDB(`history-${crypto.randomUUID()}`);
    const lots = [lot("L1", "Echinacea purpurea"), lot("L2", " echinacea PURPUREA"), lot("L3", "Asclepias syriaca")];
    const bags = [
      ...[18, 19, 20, 21, 22].map((d, i) => bag(`e${i}`, i % 2 ? "L1" : "L2")),
      bag("live", "L1", { pulled_on: null, start_date: "2026-11-20" }),
      bag("milkweed", "L3"),
    ];
    await db.lots.bulkAdd(lots);
    await db.bags.bulkAdd(bags);
    await db.checks.bulkAdd([
      ...[18, 19, 20, 21, 22].map((d, i) => check(`e${i}`, `2025-11-${d + 1}`, { sprouts: "first_roots" })),
      check("milkweed", "2025-11-15", { sprouts: "first_roots" }),
    ]);
    const history = await loadSpeciesHistory(db, "Echinacea Purpurea");
    expect(history.lots.map((l) => l.id).sort()).toEqual(["L1", "L2"]);
    expect(history.bags).toHaveLength(6);
    expect(history.checksByBag.get("e0")!.map((c) => c.on)).toEqual(["2025-11-19"]);
    const windows = await loadSpeciesWindows(db, { bags, lots }, "2026-12-04");
    // Only species with a bag in the cold: the milkweed has none.
    expect([...windows.keys()]).toEqual(["echinacea purpurea"]);
    expect(windows.get("echinacea purpurea")).toMatchObject({ finished: 5, earliest: 18, dailyFromDay: 15 });
    db.close();
  });
});
