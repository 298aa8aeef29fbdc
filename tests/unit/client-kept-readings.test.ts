import "fake-indexeddb/auto";
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { RimebookDB } from "@/lib/client/db";
import { loadFarmRows, loadLastChecks } from "@/lib/client/fridge-reads";
import { loadStoreReadings } from "@/lib/client/kept-readings";
import { adoptIdentity, refetchFarmCopy } from "@/lib/client/identity";
import { applyEffectsLocally, applyPulledPage, type LocalStamp } from "@/lib/client/local-apply";
import { META } from "@/lib/client/meta";
import { buildRoundFromRows, cadenceFor } from "@/lib/domain/rows/round-input";
import { addDaysToIsoDay } from "@/lib/domain/dates";
import type { Bag } from "@/lib/schemas/bag";
import type { Reading } from "@/lib/schemas/reading";
import type { Store } from "@/lib/schemas/store";
import type { Lot } from "@/lib/schemas/lot";
import type { ProtocolRow } from "@/lib/client/db";
import { starterProtocols } from "@/lib/domain/starter-protocols";

// The phone keeps each store's readings between rounds and reads only what is new. Whatever happens in between (a
// reading recorded here, pulled, changed on the server, tombstoned, the farm's copy emptied and fetched again, another
// farm opened), the next round must read exactly what a fresh read of each store gives, and give the same round.
// Windows come from the starter library's showy milkweed, 14–28 days cold (Kaye); the farms and readings are invented.

const day0 = "2026-10-01";
const today = "2026-11-10";
const stamp: LocalStamp = { farmId: "farm-a", userId: "u-1", at: "2026-11-10T08:00:00.000Z" };
const sync = (farm: string, seq: number) => ({ farm_id: farm, created_at: "2026-10-01T00:00:00.000Z", updated_at: "2026-10-01T00:00:00.000Z", seq, deleted_at: null });
const showy = starterProtocols.find((p) => p.key === "asclepias-speciosa")!;

function farmRows(farm: string) {
  const protocol: ProtocolRow = { ...sync(farm, 1), id: `${farm}-p`, species: showy.species, common_name: showy.commonName, phases: showy.phases, effective_band: showy.effectiveBand, no_cold_reason: null, toxic_seed: showy.toxicSeed, medicinal: showy.medicinal, is_farm_own: false, starter_key: showy.key, source_trial_id: null, note: null };
  const lot: Lot = { ...sync(farm, 2), id: `${farm}-l`, species: showy.species, common_name: showy.commonName, source: null, year: 2025, quantity: 100, protocol_id: protocol.id, treated: false, notes: null };
  const stores: Store[] = ["barn", "shed", "ice"].map((name, i) => ({ ...sync(farm, 3 + i), id: `${farm}-${name}`, name, kind: name === "ice" ? "freezer" : "fridge", boxes: [], holds_food: false, notes: null }));
  const bags: Bag[] = Array.from({ length: 12 }, (_, i) => ({
    ...sync(farm, 10 + i), id: `${farm}-b${i}`, code: `${farm}B${i}`.toUpperCase(), lot_id: lot.id, protocol_id: null, store_id: stores[i % 3].id, box: null, medium: "paper_towel", seed_count: 40,
    start_date: addDaysToIsoDay(day0, (i * 3) % 20), planned_start_date: null, window_start: null, window_end: null, pulled_on: i === 5 ? "2026-11-01" : null, sown_on: null, discarded_on: null,
    discard_reason: null, trial_arm_id: null, plan_item_id: null, check_every_days: null, note: null,
  }));
  return { protocol, lot, stores, bags };
}

const hourAt = (h: number) => new Date(Date.parse(`${addDaysToIsoDay(day0, -5)}T00:00:00.000Z`) + h * 3_600_000).toISOString();
const reading = (farm: string, store: string, h: number, c: number, seq: number): Reading => ({
  ...sync(farm, seq), id: crypto.randomUUID(), store_id: `${farm}-${store}`, taken_at: hourAt(h), temperature_c: c, origin: "import", check_id: null,
});

async function openFarm(name: string, farm = "farm-a") {
  const db = new RimebookDB(`kept-readings-${name}-${crypto.randomUUID()}`);
  const { protocol, lot, stores, bags } = farmRows(farm);
  await db.protocols.put(protocol);
  await db.lots.put(lot);
  await db.stores.bulkPut(stores);
  await db.bags.bulkPut(bags);
  await db.meta.put({ key: META.identity, value: { user: { id: "u-1", name: "Wren", email: "wren@bramblewick.example" }, farm: { id: farm, name: "Bramblewick" }, role: "owner" } });
  return db;
}

const key = (r: Reading) => `${r.store_id} ${r.taken_at} ${r.id} ${r.temperature_c} ${r.seq}`;

/** The round's readings (kept) against each store read afresh from the same day, and the rounds built from both. */
async function expectSameAsFresh(db: RimebookDB) {
  const rows = await loadFarmRows(db, "in_cold");
  const fridges = new Set(rows.stores.filter((s) => s.kind === "fridge").map((s) => s.id));
  const earliest = new Map<string, string>();
  for (const b of rows.bags) {
    if (b.deleted_at || !b.start_date || !b.store_id || !fridges.has(b.store_id) || b.pulled_on || b.sown_on || b.discarded_on) continue;
    if (!earliest.has(b.store_id) || b.start_date < earliest.get(b.store_id)!) earliest.set(b.store_id, b.start_date);
  }
  const fresh = (await Promise.all([...earliest].map(([s, d]) => loadStoreReadings(db, s, addDaysToIsoDay(d, -2))))).flat();
  expect(rows.readings.map(key).sort()).toEqual(fresh.map(key).sort());
  const lastChecks = await loadLastChecks(db, rows.bags.map((b) => b.id));
  const kept = buildRoundFromRows(rows, lastChecks, today, cadenceFor(7), { asOf: Date.parse(`${today}T12:00:00.000Z`) });
  const plain = buildRoundFromRows({ ...rows, readings: fresh, readingsCache: undefined }, lastChecks, today, cadenceFor(7), { asOf: Date.parse(`${today}T12:00:00.000Z`) });
  expect(kept).toStrictEqual(plain);
  return rows;
}

describe("readings kept between rounds on the phone", () => {
  it("a reading recorded here, pulled, changed, tombstoned or removed shows in the next round", async () => {
    const db = await openFarm("steps");
    // A cold season with a warm spell every few days, in both fridges (and the freezer, which is never read).
    const season: Reading[] = [];
    let seq = 100;
    for (let h = 0; h < 50 * 24; h += 6) for (const s of ["barn", "shed", "ice"]) season.push(reading("farm-a", s, h, h % 96 < 12 ? 11 : 3, seq++));
    await db.readings.bulkPut(season);
    const first = await expectSameAsFresh(db);
    expect(first.readings.length).toBeGreaterThan(100);
    // Nothing changed: the same rows, the same array of prepared readings.
    const again = await expectSameAsFresh(db);
    expect(again.readingsCache.preparedLastTime).toBe(0);

    // Recorded on this phone (seq 0 until the server's copy comes back).
    const mine = { ...reading("farm-a", "barn", 40 * 24, 14, 0), id: "mine" };
    await db.transaction("rw", [db.readings, db.meta, db.audit_log], () => applyEffectsLocally(db, [{ op: "insert", table: "readings", row: mine, appendOnly: true }], stamp));
    expect((await expectSameAsFresh(db)).readings.some((r) => r.id === "mine")).toBe(true);
    // The server's copy replaces it.
    await db.readings.put({ ...mine, seq: seq++ });
    await expectSameAsFresh(db);
    // Pulled from another phone.
    await db.readings.put(reading("farm-a", "shed", 41 * 24, 15, seq++));
    await expectSameAsFresh(db);
    // Changed on the server (a new seq), in the middle of the season.
    const changed = first.readings.find((r) => r.store_id === "farm-a-barn" && r.temperature_c === 3)!;
    await db.readings.put({ ...changed, temperature_c: 12, seq: seq++ });
    expect((await expectSameAsFresh(db)).readings.find((r) => r.id === changed.id)?.temperature_c).toBe(12);
    // Tombstoned on the server: the pull removes it.
    await applyPulledPage(db, [{ table: "readings", row: { ...changed, deleted_at: "2026-11-10T09:00:00.000Z", seq: seq++ } }], stamp);
    expect((await expectSameAsFresh(db)).readings.some((r) => r.id === changed.id)).toBe(false);
    // Removed and another pulled between two rounds: the count alone would not tell.
    const gone = first.readings.find((r) => r.store_id === "farm-a-shed")!;
    await db.readings.delete(gone.id);
    await db.readings.put(reading("farm-a", "shed", 42 * 24, 2, seq++));
    expect((await expectSameAsFresh(db)).readings.some((r) => r.id === gone.id)).toBe(false);
    // A bag started earlier in the barn: its older readings are read too.
    await db.bags.put({ ...(await db.bags.get("farm-a-b0"))!, start_date: addDaysToIsoDay(day0, -3), seq: seq++ });
    await expectSameAsFresh(db);
    // The farm's copy emptied and fetched again (after a restore): as many readings, at the same seqs, other values.
    const held = await db.readings.toArray();
    await refetchFarmCopy(db);
    const { protocol, lot, stores, bags } = farmRows("farm-a");
    await db.protocols.put(protocol);
    await db.lots.put(lot);
    await db.stores.bulkPut(stores);
    await db.bags.bulkPut(bags);
    await db.readings.bulkPut(held.map((r) => ({ ...r, temperature_c: r.temperature_c === 3 ? 9 : 3 })));
    expect((await expectSameAsFresh(db)).readings.every((r) => r.temperature_c === 9 || r.temperature_c === 3)).toBe(true);
    db.close();
  });

  it("another farm opened on the phone: its readings, never the kept ones of the first", async () => {
    const db = await openFarm("switch");
    await db.readings.bulkPut(Array.from({ length: 200 }, (_, h) => reading("farm-a", "barn", h * 6, 3, 100 + h)));
    await expectSameAsFresh(db);
    await adoptIdentity({ user: { id: "u-1", name: "Wren", email: "wren@bramblewick.example" }, farm: { id: "farm-b", name: "Other" }, role: "owner" }, db);
    const { protocol, lot, stores, bags } = farmRows("farm-b");
    await db.protocols.put(protocol);
    await db.lots.put(lot);
    await db.stores.bulkPut(stores);
    await db.bags.bulkPut(bags);
    // The same count and seqs as the first farm's: only the farm tells them apart.
    await db.readings.bulkPut(Array.from({ length: 200 }, (_, h) => reading("farm-b", "barn", h * 6, 12, 100 + h)));
    const rows = await expectSameAsFresh(db);
    expect(rows.readings.length).toBeGreaterThan(0);
    expect(rows.readings.every((r) => r.farm_id === "farm-b")).toBe(true);
    db.close();
  });

  it("any sequence of recorded, pulled, changed and removed readings: each round reads what a fresh read gives (property)", async () => {
    const step = fc.record({
      kind: fc.constantFrom("record", "pull", "confirm", "change", "tombstone", "remove", "start_earlier", "nothing"),
      store: fc.constantFrom("barn", "shed", "ice"),
      hour: fc.integer({ min: 0, max: 50 * 24 }),
      c: fc.constantFrom(-2, 3, 6, 12),
      pick: fc.nat(),
      rounds: fc.constantFrom(1, 1, 2),
    });
    await fc.assert(
      fc.asyncProperty(fc.array(step, { minLength: 1, maxLength: 10 }), async (steps) => {
        const db = await openFarm("property");
        let seq = 1000;
        await db.readings.bulkPut(Array.from({ length: 60 }, (_, i) => reading("farm-a", ["barn", "shed", "ice"][i % 3], i * 12, i % 5 ? 3 : 10, seq++)));
        await expectSameAsFresh(db);
        for (const s of steps) {
          const all = await db.readings.toArray();
          const picked = all.length ? all[s.pick % all.length] : null;
          if (s.kind === "record") await db.readings.put(reading("farm-a", s.store, s.hour, s.c, 0));
          else if (s.kind === "pull") await db.readings.put(reading("farm-a", s.store, s.hour, s.c, seq++));
          else if (s.kind === "confirm" && picked) await db.readings.put({ ...picked, seq: seq++ });
          else if (s.kind === "change" && picked) await db.readings.put({ ...picked, temperature_c: s.c, taken_at: hourAt(s.hour), seq: picked.seq === 0 ? 0 : seq++ });
          else if (s.kind === "tombstone" && picked) await applyPulledPage(db, [{ table: "readings", row: { ...picked, deleted_at: "2026-11-10T00:00:00.000Z", seq: seq++ } }], stamp);
          else if (s.kind === "remove" && picked) await db.readings.delete(picked.id);
          else if (s.kind === "start_earlier") await db.bags.put({ ...(await db.bags.get(`farm-a-b${s.pick % 12}`))!, start_date: addDaysToIsoDay(day0, -(s.hour % 9)) });
          for (let i = 0; i < s.rounds; i++) await expectSameAsFresh(db);
        }
        db.close();
      }),
      { numRuns: 40 },
    );
  });
});
