import { describe, expect, it } from "vitest";
import { buildDryingHistory, buildRootsHistory, buildSpeciesWindows, findBoxesToLookAt, groupChecksByBag, type HistoryBagRow, type HistoryCheckRow, type HistoryLotRow } from "@/lib/domain/rows/farm-history-rows";
import { toCurvePoints } from "@/components/learn/curve-points";
import { buildFarmRecordProtocol, findFarmRecordProtocol } from "@/components/learn/farm-protocol";
import { reconcileProtocol, starterProtocols } from "@/lib/domain";
import type { ProtocolRow } from "@/lib/client/db";

// From phone-store rows to the farm's history (invented rows; the estimator itself is checked against R in
// tests/unit/domain/survival.test.ts). Checks are stamped at 09:00 UTC; the tests run in UTC.

const lots: HistoryLotRow[] = [
  { id: "L1", species: "Echinacea purpurea", protocol_id: "P1", deleted_at: null },
  { id: "L2", species: "echinacea purpurea ", protocol_id: "P2", deleted_at: null },
  { id: "L3", species: "Asclepias syriaca", protocol_id: null, deleted_at: null },
];
const bag = (id: string, over: Partial<HistoryBagRow> = {}): HistoryBagRow => ({
  id, lot_id: "L1", protocol_id: null, store_id: "S1", box: "Box A", start_date: "2025-11-01", pulled_on: "2025-12-10", sown_on: null, discarded_on: null, deleted_at: null, ...over,
});
const check = (bag_id: string, day: string, over: Partial<HistoryCheckRow> = {}): HistoryCheckRow => ({
  bag_id, checked_at: `${day}T09:00:00.000Z`, moisture: "damp", sprouts: "none", actions: [], deleted_at: null, ...over,
});
const today = "2026-12-04";

const bags = [
  bag("a"), bag("b", { store_id: "S2" }), bag("c", { lot_id: "L2" }), bag("d", { protocol_id: "P9" }), bag("e", { lot_id: "L3" }), bag("f", { deleted_at: "2025-12-01T00:00:00Z" }),
];
const checks = [
  check("a", "2025-11-21", { sprouts: "first_roots" }), // day 20
  check("b", "2025-11-23", { sprouts: "first_roots" }), // day 22
  check("c", "2025-11-08"), check("c", "2025-11-15"), // censored at 14
  check("d", "2025-11-26", { sprouts: "many" }), // day 25
  check("e", "2025-11-15", { sprouts: "first_roots" }),
  check("a", "2025-11-30", { sprouts: "none", deleted_at: "2025-12-01T00:00:00Z" }),
];

describe("the farm's roots history from rows", () => {
  const byBag = groupChecksByBag(checks);
  const curveOf = (filter: Parameters<typeof buildRootsHistory>[2]) => buildRootsHistory({ bags, lots }, byBag, filter, null, today).window;

  it.each([
    ["the whole species (lot names matched without case or spaces)", { species: "Echinacea purpurea" }, 4, 3],
    ["one lot", { species: "Echinacea purpurea", lotId: "L2" }, 1, 0],
    ["one store", { species: "Echinacea purpurea", storeId: "S2" }, 1, 1],
    ["one protocol (the bag's own, else its lot's)", { species: "Echinacea purpurea", protocolId: "P1" }, 2, 2],
    ["the bag's own protocol", { species: "Echinacea purpurea", protocolId: "P9" }, 1, 1],
  ] as const)("narrows to %s", (_name, filter, n, finished) => {
    expect(curveOf(filter)).toMatchObject({ bags: n, finished });
  });

  it("groups checks per bag in time order, tombstones left out", () => {
    expect(groupChecksByBag([check("x", "2025-11-15"), check("x", "2025-11-08")]).get("x")!.map((c) => c.on)).toEqual(["2025-11-08", "2025-11-15"]);
    expect(byBag.get("a")).toHaveLength(1);
  });

  it("gives each species its window, keyed by lowercased name", () => {
    const windows = buildSpeciesWindows({ bags, lots }, byBag, today);
    expect(windows.get("echinacea purpurea")).toMatchObject({ bags: 4, finished: 3, enough: false });
    expect(windows.get("asclepias syriaca")).toMatchObject({ bags: 1, finished: 1 });
  });

  it("draws the step curve from 100 % at day 0 to the last day followed", () => {
    expect(toCurvePoints(curveOf({ species: "Echinacea purpurea" })).map((p) => [p.day, Math.round(p.share)])).toEqual([
      [0, 100], [20, 67], [22, 33], [25, 0],
    ]);
  });
});

describe("drying spells per store and box", () => {
  const rows = [bag("a", { pulled_on: null }), bag("b", { box: "Box B" })];
  const byBag = groupChecksByBag([
    check("a", "2026-11-08"), check("a", "2026-11-20", { moisture: "dry", actions: ["added_water"] }), check("a", "2026-11-27"),
    check("b", "2025-11-08"), check("b", "2025-11-18", { moisture: "dry" }),
  ]);
  const history = buildDryingHistory(rows, byBag, today);

  it("has one curve per store and one per box", () => {
    expect(history.map((h) => [h.storeId, h.box, h.curve.n, h.curve.events, h.curve.median])).toEqual([
      ["S1", "", 3, 2, 10], // 7+, 10, 12: half dry by day 10
      ["S1", "Box A", 2, 1, 12],
      ["S1", "Box B", 1, 1, 10],
    ]);
  });

  it("says which box to look at, and by when: the open damp spell's start plus the box's median (today once that has passed)", () => {
    // Wet since 2026-11-20 + 12 days = 2026-12-02, already past on 2026-12-04 with no check since: today.
    expect(findBoxesToLookAt(rows, byBag, history, today)).toEqual([{ box: "Box A", by: today, medianDays: 12 }]);
    expect(findBoxesToLookAt(rows, byBag, history, "2026-11-28")).toEqual([{ box: "Box A", by: "2026-12-02", medianDays: 12 }]);
    // Still damp at a check after the typical day: no guess for that bag.
    const longDamp = groupChecksByBag([check("a", "2026-11-08"), check("a", "2026-11-20", { moisture: "dry", actions: ["added_water"] }), check("a", "2026-12-03")]);
    expect(findBoxesToLookAt(rows, longDamp, history, today)).toEqual([]);
  });
});

describe("accepting the farm's window", () => {
  const starter = starterProtocols.find((p) => p.species === "Echinacea purpurea")!;
  const base = { species: starter.species, common_name: starter.commonName, phases: starter.phases, effective_band: starter.effectiveBand, toxic_seed: starter.toxicSeed, medicinal: starter.medicinal } as unknown as ProtocolRow;
  const byBag = groupChecksByBag(
    ["a", "b", "c", "d", "e"].map((id, i) => check(id, `2025-11-${19 + i}`, { sprouts: "first_roots" })),
  );
  const five = ["a", "b", "c", "d", "e"].map((id) => bag(id));
  const history = buildRootsHistory({ bags: five, lots }, byBag, { species: "Echinacea purpurea" }, reconcileProtocol({ species: base.species, phases: base.phases, effectiveBand: base.effective_band }), today);

  it("saves a farm-own protocol citing the farm's record first, the published source kept beside it", () => {
    expect(history.window).toMatchObject({ earliest: 18, dailyFromDay: 15, suggestsEarlier: true });
    const args = buildFarmRecordProtocol({ id: "00000000-0000-4000-8000-000000000001", species: "Echinacea purpurea", base, history });
    expect(args).toMatchObject({ isFarmOwn: true, starter_key: null, source_trial_id: null, species: "Echinacea purpurea" });
    const sources = args.phases[0].sources;
    expect(sources[0]).toMatchObject({ minDays: 15, maxDays: 28 });
    expect(sources[0].citation).toBe("This farm's record, 5 bags, season 2026; first roots from day 18; half the bags by day 20 (Kaplan–Meier, unfinished bags counted to their last check).");
    expect(sources.slice(1).map((s) => s.citation)).toEqual(starter.phases[0].sources.map((s) => s.citation));
    // Planned for the earlier start of daily checks (common practice when sources disagree).
    expect(reconcileProtocol(args).timedPhases[0].plannedDays).toBe(15);
    const saved = { ...args, id: args.id, is_farm_own: true, deleted_at: null, phases: args.phases } as unknown as ProtocolRow;
    expect(findFarmRecordProtocol(" echinacea purpurea", [saved])?.id).toBe(args.id);
  });

  it("refuses when too few bags showed roots", () => {
    const thin = buildRootsHistory({ bags: five.slice(0, 2), lots }, byBag, { species: "Echinacea purpurea" }, null, today);
    expect(() => buildFarmRecordProtocol({ id: "00000000-0000-4000-8000-000000000002", species: "Echinacea purpurea", base, history: thin })).toThrow(/Not enough/);
  });
});
