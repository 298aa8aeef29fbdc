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

/**
 * The live checks of some bags. A few bags: one indexed query; many: one pass over the checks table, which is far
 * cheaper than thousands of key look-ups (as loadLastChecks does; `npm run bench -- history`).
 */
export async function loadChecksOfBags(db: RimebookDB, bagIds: readonly string[]): Promise<Check[]> {
  if (bagIds.length === 0) return [];
  if (bagIds.length <= 50) return (await db.checks.where("bag_id").anyOf([...bagIds]).toArray()).filter((c) => !c.deleted_at);
  const wanted = new Set(bagIds);
  // One read of the whole table (getAll) is the cheapest; groupChecksByBag puts each bag's checks in time order.
  return (await db.checks.toArray()).filter((c) => !c.deleted_at && wanted.has(c.bag_id));
}

/** Every lot, bag and check of one species: the lots by species, then their bags (by index) and their checks. */
export async function loadSpeciesHistory(db: RimebookDB, species: string): Promise<SpeciesHistoryRows> {
  const key = speciesKey(species);
  const [allLots, stores] = await Promise.all([db.lots.toArray(), db.stores.toArray()]);
  const lots = allLots.filter((l) => !l.deleted_at && speciesKey(l.species) === key);
  // One indexed range per lot (an anyOf walks a cursor key by key, far slower for thousands of bags).
  const bags = (await Promise.all(lots.map((l) => db.bags.where("lot_id").equals(l.id).toArray()))).flat().filter((b) => !b.deleted_at);
  const checks = await loadChecksOfBags(db, bags.map((b) => b.id));
  return { lots, bags, stores: stores.filter((s) => !s.deleted_at), checksByBag: groupChecksByBag(checks) };
}

/** Every started bag's checks in one store (for its drying times). */
export async function loadStoreHistory(db: RimebookDB, storeId: string): Promise<{ bags: Bag[]; checksByBag: Map<string, HistoryCheck[]> }> {
  const bags = (await db.bags.where("store_id").equals(storeId).toArray()).filter((b) => !b.deleted_at && b.start_date);
  const checks = await loadChecksOfBags(db, bags.map((b) => b.id));
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
  const checks = await loadChecksOfBags(db, ended.map((b) => b.id));
  return buildSpeciesWindows({ bags: ended, lots: rows.lots }, groupChecksByBag(checks), today);
}
