import { randomUUID } from "node:crypto";
import type { Knex } from "knex";

// Rows of an invented farm (Bramblewick-style fridges, lots and bags) written straight into the
// test database, for the import, export and digest route tests.

const at = "2026-11-01T09:00:00.000Z";
let seq = 1_000_000; // far above anything a test writes through the real functions
const stamps = (farmId: string) => ({ farm_id: farmId, created_at: at, updated_at: at, seq: seq++, deleted_at: null });

export async function addStore(db: Knex, farmId: string, values: Partial<{ name: string; kind: string; holds_food: boolean }> = {}): Promise<string> {
  const id = randomUUID();
  await db("stores").insert({ id, name: values.name ?? "Barn fridge", kind: values.kind ?? "fridge", boxes: JSON.stringify(["Box A"]), holds_food: values.holds_food ?? false, notes: null, ...stamps(farmId) });
  return id;
}

export async function addReading(db: Knex, farmId: string, storeId: string, takenAt: string, temperatureC: number): Promise<string> {
  const id = randomUUID();
  await db("readings").insert({ id, store_id: storeId, taken_at: takenAt, temperature_c: temperatureC, origin: "manual", check_id: null, ...stamps(farmId) });
  return id;
}

export async function addLot(db: Knex, farmId: string, values: Partial<{ species: string; source: string | null; year: number | null; quantity: number | null; treated: boolean }> = {}): Promise<string> {
  const id = randomUUID();
  await db("lots").insert({
    id,
    species: values.species ?? "Asclepias syriaca",
    common_name: null,
    source: values.source === undefined ? "Bramblewick hedgerow" : values.source,
    year: values.year === undefined ? 2025 : values.year,
    quantity: values.quantity === undefined ? 400 : values.quantity,
    protocol_id: null,
    treated: values.treated ?? false,
    notes: null,
    ...stamps(farmId),
  });
  return id;
}

export async function addProtocol(db: Knex, farmId: string, species: string, coldDays: [number, number | null], band: { minC: number; maxC: number } | null = null): Promise<string> {
  const id = randomUUID();
  const phases = [{ kind: "cold_moist", sources: [{ citation: "Test source", minDays: coldDays[0], maxDays: coldDays[1], band: null, note: "" }], note: "" }];
  await db("protocols").insert({
    id, species, common_name: null, phases: JSON.stringify(phases), effective_band: band ? JSON.stringify(band) : null, no_cold_reason: null,
    toxic_seed: null, medicinal: false, is_farm_own: true, starter_key: null, source_trial_id: null, note: null, ...stamps(farmId),
  });
  return id;
}

export type BagValues = {
  code: string;
  lotId: string;
  storeId: string | null;
  protocolId?: string | null;
  box?: string | null;
  start?: string | null;
  windowStart?: string | null;
  windowEnd?: string | null;
  pulledOn?: string | null;
  sownOn?: string | null;
  discardedOn?: string | null;
};

export async function addBag(db: Knex, farmId: string, v: BagValues): Promise<string> {
  const id = randomUUID();
  await db("bags").insert({
    id, code: v.code, lot_id: v.lotId, protocol_id: v.protocolId ?? null, store_id: v.storeId, box: v.box ?? "Box A", medium: "paper_towel",
    seed_count: 100, start_date: v.start ?? null, planned_start_date: null, window_start: v.windowStart ?? null, window_end: v.windowEnd ?? null,
    pulled_on: v.pulledOn ?? null, sown_on: v.sownOn ?? null, discarded_on: v.discardedOn ?? null, discard_reason: null,
    trial_arm_id: null, plan_item_id: null, check_every_days: null, note: null, ...stamps(farmId),
  });
  return id;
}

export async function addCheck(
  db: Knex,
  farmId: string,
  bagId: string,
  checkedAt: string,
  findings: Partial<{ moisture: string; mould: string; sprouts: string; note: string | null; checkedBy: string | null }> = {},
): Promise<string> {
  const id = randomUUID();
  await db("checks").insert({
    id, bag_id: bagId, checked_at: checkedAt, checked_by: findings.checkedBy ?? null, moisture: findings.moisture ?? "damp",
    mould: findings.mould ?? "clean", sprouts: findings.sprouts ?? "none", actions: "[]", note: findings.note ?? null, temperature_c: null, ...stamps(farmId),
  });
  return id;
}

export async function addSowing(db: Knex, farmId: string, bagId: string, sownOn: string, seedsSown: number): Promise<string> {
  const id = randomUUID();
  await db("sowings").insert({ id, bag_id: bagId, sown_on: sownOn, tray: "T1", cells: 72, seeds_sown: seedsSown, note: null, ...stamps(farmId) });
  return id;
}

export async function addCount(db: Knex, farmId: string, sowingId: string, countedOn: string, total: number): Promise<string> {
  const id = randomUUID();
  await db("counts").insert({ id, sowing_id: sowingId, counted_on: countedOn, germinated_total: total, note: null, ...stamps(farmId) });
  return id;
}
