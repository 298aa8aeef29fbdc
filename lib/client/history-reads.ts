import type { Bag } from "@/lib/schemas/bag";
import type { Check } from "@/lib/schemas/check";
import type { Lot } from "@/lib/schemas/lot";
import type { Store } from "@/lib/schemas/store";
import type { IsoDay } from "@/lib/domain/dates";
import type { FarmWindow, HistoryCheck } from "@/lib/domain/farm-history";
import { buildSpeciesWindows, groupChecksByBag, pickEndedBagsOfLiveSpecies, speciesKey } from "@/lib/domain/rows/farm-history-rows";
import type { RimebookDB } from "./db";

// Reads of the farm's own history from the phone store (works with no signal). Only reads.

export interface SpeciesHistoryRows {
  lots: Lot[];
  bags: Bag[];
  stores: Store[];
  checksByBag: Map<string, HistoryCheck[]>;
}

/** Every lot, bag and check of one species: the lots by species, then their bags and checks through indexes. */
export async function loadSpeciesHistory(db: RimebookDB, species: string): Promise<SpeciesHistoryRows> {
  const key = speciesKey(species);
  const [allLots, stores] = await Promise.all([db.lots.toArray(), db.stores.toArray()]);
  const lots = allLots.filter((l) => !l.deleted_at && speciesKey(l.species) === key);
  const bags = (await db.bags.where("lot_id").anyOf(lots.map((l) => l.id)).toArray()).filter((b) => !b.deleted_at);
  const checks = await db.checks.where("bag_id").anyOf(bags.map((b) => b.id)).toArray();
  return { lots, bags, stores: stores.filter((s) => !s.deleted_at), checksByBag: groupChecksByBag(checks) };
}

/** Every started bag's checks in one store (for its drying times). */
export async function loadStoreHistory(db: RimebookDB, storeId: string): Promise<{ bags: Bag[]; checksByBag: Map<string, HistoryCheck[]> }> {
  const bags = (await db.bags.where("store_id").equals(storeId).toArray()).filter((b) => !b.deleted_at && b.start_date);
  const checks: Check[] = await db.checks.where("bag_id").anyOf(bags.map((b) => b.id)).toArray();
  return { bags, checksByBag: groupChecksByBag(checks) };
}

/** Each species' farm window for Today (see pickEndedBagsOfLiveSpecies for which bags' checks are read). */
export async function loadSpeciesWindows(
  db: RimebookDB,
  rows: { bags: readonly Bag[]; lots: readonly Lot[] },
  today: IsoDay,
): Promise<Map<string, FarmWindow>> {
  const ended = pickEndedBagsOfLiveSpecies(rows.bags, rows.lots);
  if (ended.length === 0) return new Map();
  const checks = await db.checks.where("bag_id").anyOf(ended.map((b) => b.id)).toArray();
  return buildSpeciesWindows({ bags: ended, lots: rows.lots }, groupChecksByBag(checks), today);
}
