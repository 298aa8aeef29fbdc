import Dexie from "dexie";
import type { Bag } from "@/lib/schemas/bag";
import type { Check } from "@/lib/schemas/check";
import type { Lot } from "@/lib/schemas/lot";
import type { Reading } from "@/lib/schemas/reading";
import type { Store } from "@/lib/schemas/store";
import { normalizeCrockford } from "@/lib/domain/bag-codes";
import { addDaysToIsoDay } from "@/lib/domain/dates";
import type { ReadingRow, StoreReadingsCache } from "@/lib/domain/rows/bag-rows";
import type { ProtocolRow, RimebookDB } from "./db";
import { META, readMeta } from "./meta";
import { keptReadingsCache, loadStoreReadings, readKeptReadings } from "./kept-readings";

export { loadStoreReadings };

// Reads for the screens at the fridge (Today, Scan, Check, Labels). Only reads: writes go through the
// repository functions. Components call these inside useLiveQuery so they follow the phone store live.

export interface FarmRows {
  bags: Bag[];
  lots: Lot[];
  protocols: ProtocolRow[];
  stores: Store[];
  /** Live readings of every store: the bags' windows move by the cold they lost (lib/domain effective window). */
  readings: Reading[];
  /** Keeps each store's prepared readings between rounds on this phone (buildBagRows reads it). */
  readingsCache: StoreReadingsCache;
}

/**
 * Which bags' readings to read: "all" started bags (the bags table, labels: a pulled bag's window stays as it was), or
 * only those still "in_cold" (Today: years of pulled bags never make a fridge's whole history load).
 */
export type ReadingsFor = "all" | "in_cold";

/**
 * Readings of the fridges that hold a started bag, one read per store, from two days before its earliest start.
 * Freezers and cold frames are their own treatment (their readings never move a window), so they are not read here.
 */
export async function loadReadingsOfBagStores(
  db: RimebookDB,
  bags: readonly Pick<Bag, "store_id" | "start_date" | "deleted_at" | "pulled_on" | "sown_on" | "discarded_on">[],
  stores: readonly Pick<Store, "id" | "kind">[],
  which: ReadingsFor = "all",
): Promise<Reading[]> {
  const fridges = new Set(stores.filter((s) => s.kind === "fridge").map((s) => s.id));
  const earliest = new Map<string, string>();
  for (const b of bags) {
    if (b.deleted_at || !b.start_date || !b.store_id || !fridges.has(b.store_id)) continue;
    if (which === "in_cold" && (b.pulled_on || b.sown_on || b.discarded_on)) continue;
    const seen = earliest.get(b.store_id);
    if (!seen || b.start_date < seen) earliest.set(b.store_id, b.start_date);
  }
  // Two days' margin: a bag's day starts at local midnight, a reading's time may carry any offset.
  const since = new Map([...earliest].map(([id, day]) => [id, addDaysToIsoDay(day, -2)]));
  // Only what changed since the last read is read again (lib/client/kept-readings).
  return (await readKeptReadings(db, since)).flat();
}

export async function loadFarmRows(db: RimebookDB, readingsFor: ReadingsFor = "all"): Promise<FarmRows> {
  const [bags, lots, protocols, stores] = await Promise.all([db.bags.toArray(), db.lots.toArray(), db.protocols.toArray(), db.stores.toArray()]);
  const readings = await loadReadingsOfBagStores(db, bags, stores, readingsFor);
  // Each store's prepared readings are kept between rounds too, while its readings stay the same.
  return { bags, lots, protocols, stores, readings, readingsCache: keptReadingsCache(db, readingsFor) };
}

/** The latest check of one bag (checks are append-only; the newest one speaks for the bag). */
export async function loadLastCheck(db: RimebookDB, bagId: string): Promise<Check | null> {
  const rows = await db.checks
    .where("[bag_id+checked_at]")
    .between([bagId, Dexie.minKey], [bagId, Dexie.maxKey])
    .reverse()
    .toArray();
  return rows.find((c) => !c.deleted_at) ?? null;
}

/** Latest check per bag, for the bags still in the cold. A few bags: one indexed look-up each; a full round:
 *  one pass over the checks table, which is far cheaper than thousands of look-ups (see `npm run bench -- today`). */
export async function loadLastChecks(db: RimebookDB, bagIds: readonly string[]): Promise<Map<string, Check>> {
  if (bagIds.length <= 50) {
    const found = await Promise.all(bagIds.map(async (id) => [id, await loadLastCheck(db, id)] as const));
    return new Map(found.filter((f): f is readonly [string, Check] => f[1] !== null));
  }
  const wanted = new Set(bagIds);
  const last = new Map<string, Check>();
  // One getAll, not a cursor: a browser's IndexedDB answers each cursor step on its own, far slower per row.
  for (const c of await db.checks.toArray()) {
    if (c.deleted_at || !wanted.has(c.bag_id)) continue;
    const prev = last.get(c.bag_id);
    if (!prev || c.checked_at > prev.checked_at) last.set(c.bag_id, c);
  }
  return last;
}

export interface BagForSheet {
  bag: Bag;
  lot: Lot | null;
  protocol: ProtocolRow | null;
  store: Store | null;
  lastCheck: Check | null;
  /** The bag's store's live readings, so the sheet shows the same effective window as Today. */
  readings: ReadingRow[];
}

/** One bag by id or by code (as the label carries it), with what its check sheet shows. */
export async function loadBagForSheet(db: RimebookDB, ref: { bagId?: string | null; code?: string | null }): Promise<BagForSheet | null> {
  let bag: Bag | undefined;
  if (ref.bagId) bag = await db.bags.get(ref.bagId);
  else if (ref.code) {
    const code = normalizeCrockford(ref.code);
    bag = (await db.bags.where("code").equals(code).toArray()).find((b) => !b.deleted_at);
  }
  if (!bag || bag.deleted_at) return null;
  const lot = (await db.lots.get(bag.lot_id)) ?? null;
  const protocolId = bag.protocol_id ?? lot?.protocol_id ?? null;
  const [protocol, store, lastCheck, readings] = await Promise.all([
    protocolId ? db.protocols.get(protocolId) : undefined,
    bag.store_id ? db.stores.get(bag.store_id) : undefined,
    loadLastCheck(db, bag.id),
    bag.store_id && bag.start_date ? loadStoreReadings(db, bag.store_id, addDaysToIsoDay(bag.start_date, -2)) : [],
  ]);
  return { bag, lot, protocol: protocol && !protocol.deleted_at ? protocol : null, store: store ?? null, lastCheck, readings };
}

/** Whether the farm has been fetched onto this phone at least once (before that, "no such bag" means "not yet"). */
export { loadFarmFetched } from "./meta";
