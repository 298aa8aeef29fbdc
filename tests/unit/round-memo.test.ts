import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  buildBagRows,
  findEffectiveBagWindow,
  toTemperatureReadings,
  prepareReadingsByStore,
  StoreReadingsCache,
  type BagRow,
  type BagRowSources,
  type ReadingRow,
} from "@/lib/domain/rows/bag-rows";
import { buildRoundFromRows, cadenceFor, toRoundBag, type LastCheckRow } from "@/lib/domain/rows/round-input";
import { buildTodaysRound, type RoundBag } from "@/lib/domain/round";
import { findRootsWatchDay } from "@/lib/domain/farm-history";
import { addDaysToIsoDay, parseIsoDay } from "@/lib/domain/dates";
import { normalizeCrockford } from "@/lib/domain/bag-codes";
import { prepareStoreReadings } from "@/lib/domain/effective-window";
import { starterProtocols } from "@/lib/domain/starter-protocols";
import type { Bag } from "@/lib/schemas/bag";
import type { Lot } from "@/lib/schemas/lot";
import type { Store } from "@/lib/schemas/store";
import type { ProtocolRow } from "@/lib/client/db";

// The round shares one window and state among bags with the same inputs. Whatever the farm, that must give exactly
// what working every bag out on its own gives. Windows come from the starter library's published days (showy
// milkweed 14–28 days cold, Kaye; ramps 60 days and more, Native Plant Network; elder 90 warm + 90 cold, Young & Young
// 1992; black-eyed Susan no cold, Native Plant Network); the farms, readings and checks are random.

const sync = { farm_id: "f", created_at: "2026-01-01T00:00:00Z", updated_at: "2026-01-01T00:00:00Z", seq: 1, deleted_at: null };
const protocolRow = (key: string, id: string, over: Partial<ProtocolRow> = {}): ProtocolRow => {
  const p = starterProtocols.find((s) => s.key === key)!;
  return { ...sync, id, species: p.species, common_name: p.commonName, phases: p.phases, effective_band: p.effectiveBand, no_cold_reason: null, toxic_seed: p.toxicSeed, medicinal: p.medicinal, is_farm_own: false, starter_key: key, source_trial_id: null, note: null, ...over };
};
const protocols: ProtocolRow[] = [
  protocolRow("asclepias-speciosa", "p-showy"),
  protocolRow("allium-tricoccum", "p-ramps"),
  protocolRow("sambucus", "p-elder"),
  protocolRow("rudbeckia-hirta", "p-none"),
  protocolRow("asclepias-speciosa", "p-gone", { deleted_at: "2026-01-02T00:00:00Z" }),
];
const lot = (id: string, species: string, common: string | null, protocolId: string | null): Lot => ({
  ...sync, id, species, common_name: common, source: null, year: 2025, quantity: 100, protocol_id: protocolId, treated: false, notes: null,
});
const lots: Lot[] = [
  lot("l-showy", "Asclepias speciosa", "Showy milkweed", "p-showy"),
  lot("l-ramps", " Allium tricoccum", null, "p-ramps"),
  lot("l-elder", "Sambucus canadensis", "Elderberry", "p-elder"),
  lot("l-loose", "Asclepias speciosa", "Showy milkweed", null),
  lot("l-gone", "Asclepias speciosa", null, "p-gone"),
];
const stores: Store[] = [
  { ...sync, id: "s-barn", name: "Barn fridge", kind: "fridge", boxes: [], holds_food: false, notes: null },
  { ...sync, id: "s-shed", name: "Shed fridge", kind: "fridge", boxes: [], holds_food: true, notes: null },
  { ...sync, id: "s-ice", name: "Chest freezer", kind: "freezer", boxes: [], holds_food: false, notes: null },
  { ...sync, id: "s-frame", name: "North frame", kind: "cold_frame", boxes: [], holds_food: false, notes: null },
];
const storeIds = ["s-barn", "s-shed", "s-ice", "s-frame", "s-unknown", null] as const;
const base = "2025-10-01";
const dayAt = (n: number) => addDaysToIsoDay(base, n);

const bagArb = fc.record({
  lot_id: fc.constantFrom("l-showy", "l-ramps", "l-elder", "l-loose", "l-gone", "l-unknown"),
  protocol_id: fc.constantFrom(null, null, null, "p-showy", "p-elder", "p-none", "p-gone"),
  store_id: fc.constantFrom(...storeIds),
  box: fc.constantFrom(null, "", "Box 2", "Box 10"),
  start: fc.option(fc.integer({ min: 0, max: 160 }), { nil: null }),
  window_start: fc.option(fc.integer({ min: 0, max: 200 }), { nil: null }),
  window_end: fc.constantFrom(null, "", 10, 40),
  pulled: fc.option(fc.integer({ min: 0, max: 200 }), { nil: null, freq: 4 }),
  sown: fc.option(fc.integer({ min: 0, max: 200 }), { nil: null, freq: 6 }),
  discarded: fc.option(fc.integer({ min: 0, max: 200 }), { nil: null, freq: 6 }),
  check_every_days: fc.constantFrom(null, null, 3),
});
type Infer<A> = A extends fc.Arbitrary<infer T> ? T : never;
type BagSeed = Infer<typeof bagArb>;

const toBag = (s: BagSeed, id: string): Bag => {
  const windowStart = s.window_start === null ? null : dayAt(s.window_start);
  return {
    ...sync, id, code: id.toUpperCase(), lot_id: s.lot_id, protocol_id: s.protocol_id, store_id: s.store_id, box: s.box, medium: "paper_towel", seed_count: 40,
    start_date: s.start === null ? null : dayAt(s.start), planned_start_date: null,
    window_start: windowStart, window_end: typeof s.window_end === "number" && windowStart ? addDaysToIsoDay(windowStart, s.window_end) : (s.window_end as null | ""),
    pulled_on: s.pulled === null ? null : dayAt(s.pulled), sown_on: s.sown === null ? null : dayAt(s.sown), discarded_on: s.discarded === null ? null : dayAt(s.discarded),
    discard_reason: null, trial_arm_id: null, plan_item_id: null, check_every_days: s.check_every_days, note: null,
  };
};

/** A bag that differs from `b` in exactly one input of its window, state or check. */
const variants: ((b: Bag) => Partial<Bag>)[] = [
  (b) => ({ start_date: b.start_date ? addDaysToIsoDay(b.start_date, 1) : dayAt(5) }),
  (b) => ({ store_id: b.store_id === "s-barn" ? "s-shed" : "s-barn" }),
  (b) => ({ protocol_id: b.protocol_id === "p-showy" ? "p-elder" : "p-showy" }),
  (b) => ({ lot_id: b.lot_id === "l-ramps" ? "l-showy" : "l-ramps" }),
  (b) => ({ window_start: b.window_start ? addDaysToIsoDay(b.window_start, -2) : dayAt(30) }),
  (b) => ({ window_end: b.window_end === null ? "" : null }),
  (b) => ({ pulled_on: b.pulled_on ? null : dayAt(150) }),
  (b) => ({ sown_on: b.sown_on ? null : dayAt(151) }),
  (b) => ({ discarded_on: b.discarded_on ? null : dayAt(152) }),
  () => ({ deleted_at: "2026-01-03T00:00:00Z" }),
  (b) => ({ check_every_days: b.check_every_days === null ? 2 : null }),
  (b) => ({ box: b.box === "Box 2" ? "Box 10" : "Box 2" }),
];

const farmArb = fc.record({
  seeds: fc.array(bagArb, { minLength: 1, maxLength: 8 }),
  /** How many identical copies of each seed (they share every group). */
  copies: fc.array(fc.integer({ min: 1, max: 4 }), { minLength: 8, maxLength: 8 }),
  /** For each seed, which single input its variant changes (or none). */
  variantOf: fc.array(fc.option(fc.integer({ min: 0, max: variants.length - 1 }), { nil: null }), { minLength: 8, maxLength: 8 }),
  readings: fc.array(
    fc.record({
      store: fc.constantFrom("s-barn", "s-shed", "s-ice", "s-frame"),
      hour: fc.integer({ min: 0, max: 200 * 24 }),
      celsius: fc.constantFrom(-1, 2, 3.5, 5, 12.5),
      deleted: fc.integer({ min: 0, max: 7 }).map((n) => n === 0),
    }),
    { maxLength: 120 },
  ),
  sortReadings: fc.boolean(),
  checks: fc.array(
    fc.record({
      pick: fc.nat(),
      day: fc.integer({ min: 0, max: 200 }),
      moisture: fc.constantFrom("damp", "dry", "soggy"),
      mould: fc.constantFrom("clean", "spots", "spreading"),
      sprouts: fc.constantFrom("none", "none", "first_roots"),
    }),
    { maxLength: 10 },
  ),
  today: fc.integer({ min: 0, max: 200 }),
  dailyFrom: fc.option(fc.integer({ min: 10, max: 40 }), { nil: null }),
});

function makeFarm(f: Infer<typeof farmArb>) {
  const bags: Bag[] = [];
  f.seeds.forEach((seed, i) => {
    for (let c = 0; c < f.copies[i]; c++) bags.push(toBag(seed, `b${i}c${c}`));
    const v = f.variantOf[i];
    if (v !== null) {
      const orig = toBag(seed, `b${i}v`);
      bags.push({ ...orig, ...variants[v](orig) });
    }
  });
  const readings: ReadingRow[] = f.readings.map((r) => ({
    store_id: r.store,
    taken_at: new Date(parseIsoDay(base).getTime() + r.hour * 3_600_000).toISOString(),
    temperature_c: r.celsius,
    deleted_at: r.deleted ? "2026-01-05T00:00:00Z" : null,
  }));
  if (f.sortReadings) readings.sort((a, b) => (a.store_id < b.store_id ? -1 : a.store_id > b.store_id ? 1 : a.taken_at < b.taken_at ? -1 : a.taken_at > b.taken_at ? 1 : 0));
  const lastChecks = new Map<string, LastCheckRow>();
  for (const c of f.checks) {
    const b = bags[c.pick % bags.length];
    lastChecks.set(b.id, { bag_id: b.id, checked_at: `${dayAt(c.day)}T09:00:00.000Z`, moisture: c.moisture as LastCheckRow["moisture"], mould: c.mould as LastCheckRow["mould"], sprouts: c.sprouts as LastCheckRow["sprouts"], actions: [] });
  }
  const sources: BagRowSources = { bags, lots, protocols, stores, readings };
  const farmWindows = new Map([["allium tricoccum", { dailyFromDay: f.dailyFrom }], ["asclepias speciosa", { dailyFromDay: 12 }]]);
  return { sources, lastChecks, today: dayAt(f.today), farmWindows };
}

const inTheCold = new Set(["chilling", "window_open", "overdue"]);

/** The round worked out bag by bag, each bag alone (nothing to share), then ordered and grouped by lib/domain. */
function plainRound(sources: BagRowSources, lastChecks: ReadonlyMap<string, LastCheckRow>, today: string, farmWindows: ReadonlyMap<string, { dailyFromDay: number | null }>) {
  const roundBags: RoundBag[] = [];
  for (const bag of sources.bags) {
    const [row] = buildBagRows({ ...sources, bags: [bag] }, today);
    if (!row || !inTheCold.has(row.state)) continue;
    const rb = toRoundBag(row, bag, lastChecks.get(bag.id) ?? null);
    const history = farmWindows.get(row.species.trim().toLowerCase()) ?? null;
    roundBags.push(history ? { ...rb, rootsWatchFrom: findRootsWatchDay(row.startedOn, history) } : rb);
  }
  return buildTodaysRound(roundBags, today, cadenceFor(7));
}

describe("Today's round shares work among bags with the same inputs, and gives exactly the bag-by-bag answer", () => {
  it("bag rows: the shared windows and states equal each bag worked out alone, and its effective window (property)", () => {
    fc.assert(
      fc.property(farmArb, (f) => {
        const { sources, today } = makeFarm(f);
        const shared = buildBagRows(sources, today);
        const alone: BagRow[] = sources.bags.flatMap((b) => buildBagRows({ ...sources, bags: [b] }, today));
        expect(shared).toStrictEqual(alone);
        // And against the per-bag effective window itself, from the store's readings prepared on their own.
        for (const row of shared) {
          const bag = sources.bags.find((b) => b.id === row.id)!;
          const lotRow = lots.find((l) => l.id === bag.lot_id);
          const protocol = protocols.find((p) => p.id === (bag.protocol_id ?? lotRow?.protocol_id ?? null)) ?? null;
          const store = stores.find((s) => s.id === bag.store_id);
          const own = (sources.readings ?? []).filter((r) => r.store_id === bag.store_id);
          const effective = findEffectiveBagWindow(bag, protocol, own.length ? prepareStoreReadings(toTemperatureReadings(own)) : null, today, { storeKind: store?.kind ?? null });
          expect([row.window, row.plannedWindow, row.lostColdDays, row.windowBasis, row.windowNote, row.nextMoveOn]).toStrictEqual([
            effective.window, effective.planned, effective.lostDays, effective.basis, effective.reason, effective.nextMoveOn,
          ]);
        }
      }),
      { numRuns: 150 },
    );
  });

  it("the round (items, order, stores, counts) equals the round worked out bag by bag (property)", () => {
    fc.assert(
      fc.property(farmArb, (f) => {
        const { sources, lastChecks, today, farmWindows } = makeFarm(f);
        expect(buildRoundFromRows(sources, lastChecks, today, cadenceFor(7), undefined, farmWindows)).toStrictEqual(plainRound(sources, lastChecks, today, farmWindows));
      }),
      { numRuns: 150 },
    );
  });

  // Between rounds a reading is added, changed (time or temperature), tombstoned, brought back or removed, in any
  // store: the round with each store's prepared readings kept must still equal the round prepared afresh.
  const changeArb = fc.record({
    kind: fc.constantFrom("add", "temperature", "time", "tombstone", "revive", "remove", "same_copy", "none"),
    pick: fc.nat(),
    store: fc.constantFrom("s-barn", "s-shed"),
    hour: fc.integer({ min: 0, max: 200 * 24 }),
    celsius: fc.constantFrom(-1, 2, 3.5, 5, 12.5),
  });
  type Change = Infer<typeof changeArb>;
  function change(readings: ReadingRow[], c: Change): ReadingRow[] {
    const at = new Date(parseIsoDay(base).getTime() + c.hour * 3_600_000).toISOString();
    if (c.kind === "add") return [...readings, { store_id: c.store, taken_at: at, temperature_c: c.celsius, deleted_at: null }];
    if (!readings.length || c.kind === "none") return readings;
    const i = c.pick % readings.length;
    const r = readings[i];
    const next = [...readings];
    if (c.kind === "remove") next.splice(i, 1);
    // Fresh objects with the same content (as a new read of the phone store gives) are the same readings.
    else if (c.kind === "same_copy") return readings.map((x) => ({ ...x }));
    else if (c.kind === "temperature") next[i] = { ...r, temperature_c: r.temperature_c === c.celsius ? c.celsius + 0.5 : c.celsius };
    else if (c.kind === "time") next[i] = { ...r, taken_at: at };
    else if (c.kind === "tombstone") next[i] = { ...r, deleted_at: "2026-01-06T00:00:00Z" };
    else next[i] = { ...r, deleted_at: null };
    return next;
  }

  it("kept prepared readings: each round after readings change equals the round prepared afresh (property)", () => {
    fc.assert(
      fc.property(farmArb, fc.array(changeArb, { minLength: 1, maxLength: 6 }), (f, changes) => {
        const { sources, lastChecks, today, farmWindows } = makeFarm(f);
        const cache = new StoreReadingsCache();
        let readings = [...(sources.readings ?? [])];
        for (const c of [null, ...changes]) {
          if (c) readings = change(readings, c);
          if (f.sortReadings) readings.sort((a, b) => (a.store_id < b.store_id ? -1 : a.store_id > b.store_id ? 1 : 0));
          expect(cache.prepare(readings)).toStrictEqual(prepareReadingsByStore(readings));
          const kept = buildRoundFromRows({ ...sources, readings, readingsCache: cache }, lastChecks, today, cadenceFor(7), undefined, farmWindows);
          expect(kept).toStrictEqual(buildRoundFromRows({ ...sources, readings }, lastChecks, today, cadenceFor(7), undefined, farmWindows));
        }
      }),
      { numRuns: 150 },
    );
  });

  it("kept prepared readings: only a store whose readings changed is prepared again", () => {
    const at = (h: number) => new Date(parseIsoDay(base).getTime() + h * 3_600_000).toISOString();
    const barn: ReadingRow[] = [0, 6, 12].map((h) => ({ store_id: "s-barn", taken_at: at(h), temperature_c: 3, deleted_at: null }));
    const shed: ReadingRow[] = [0, 6].map((h) => ({ store_id: "s-shed", taken_at: at(h), temperature_c: 4, deleted_at: null }));
    const cache = new StoreReadingsCache();
    const first = cache.prepare([...barn, ...shed]);
    expect(cache.preparedLastTime).toBe(2);
    const again = cache.prepare([...barn.map((r) => ({ ...r })), ...shed]);
    expect(cache.preparedLastTime).toBe(0);
    expect(again.get("s-barn")).toBe(first.get("s-barn"));
    const warmer = cache.prepare([...barn, { ...shed[0], temperature_c: 9 }, shed[1]]);
    expect(cache.preparedLastTime).toBe(1);
    expect(warmer.get("s-barn")).toBe(first.get("s-barn"));
    expect([...warmer.get("s-shed")!.celsius]).toEqual([9, 4]);
  });

  it("two bags differing only in their start day, store or pulled day get their own windows", () => {
    const bag = (id: string, over: Partial<Bag>): Bag => ({ ...toBag({ lot_id: "l-showy", protocol_id: null, store_id: "s-barn", box: null, start: 0, window_start: null, window_end: null, pulled: null, sown: null, discarded: null, check_every_days: null }, id), ...over });
    // Showy milkweed 14–28 days cold (Kaye): started 1 Oct, the window is 15–29 Oct.
    const rows = buildBagRows({ bags: [bag("a", {}), bag("b", { start_date: "2025-10-02" }), bag("c", {})], lots, protocols, stores }, "2025-10-20");
    expect(rows.map((r) => r.window?.opensOn)).toEqual(["2025-10-15", "2025-10-16", "2025-10-15"]);
    expect(rows[0].window).toBe(rows[2].window);
    expect(rows[1].window).not.toBe(rows[0].window);
  });
});

describe("bag codes are read in one pass, as the three replacements read them", () => {
  const byRegex = (text: string) => text.toUpperCase().replace(/[\s-]+/g, "").replace(/O/g, "0").replace(/[IL]/g, "1");
  const chars = fc.constantFrom(..."0123456789ABCDEFGHJKMNPQRSTVWXYZabcoilOIL-*~$=U ß\t\n\u00a0\u2007\u3000\ufeff\u0131\u017f");
  it("for any typed or scanned text (property)", () => {
    fc.assert(
      fc.property(fc.oneof(fc.string({ unit: chars, maxLength: 14 }), fc.string({ maxLength: 14, unit: "binary" })), (text) => {
        expect(normalizeCrockford(text)).toBe(byRegex(text));
      }),
      { numRuns: 2000 },
    );
  });
  it("a stored code comes back as it is", () => {
    expect(normalizeCrockford("K7M44QZX")).toBe("K7M44QZX");
    expect(normalizeCrockford(" k7m4-4qzx ")).toBe("K7M44QZX");
  });
});
