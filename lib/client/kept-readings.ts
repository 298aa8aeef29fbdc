import Dexie from "dexie";
import type { Reading } from "@/lib/schemas/reading";
import { StoreReadingsCache } from "@/lib/domain/rows/bag-rows";
import type { RimebookDB } from "./db";
import { META } from "./meta";

// A fridge logger's season is tens of thousands of readings, and Today reworks its round on every change in the
// phone store: reading them all again each time was most of Today's time on a phone. So the phone keeps the server's
// readings of each store it has read, and each round reads only what is new.
//
// Why that is enough: a server row's content changes only with a new seq (the farm's counter only grows), so every
// reading pulled since the last round has a seq above the highest kept. Rows this phone wrote (seq 0, until the
// server's copy replaces them) are few and read afresh every round. The table's count then tells whether anything
// else happened: if it is not the kept count plus the newer rows (a reading removed, or a server row replaced), or the
// farm is another, everything is read again.

/** A store's server readings (seq above 0) from `since` on, in the [store_id+taken_at] index's order. */
type KeptStore = { since: string; rows: Reading[] };

/** What the phone kept after one read; never changed afterwards (a later read makes a new one from it). */
interface Kept {
  farm: string;
  /** Rows in the table other than this phone's own (seq 0) when it was read. */
  count: number;
  maxSeq: number;
  stores: ReadonlyMap<string, KeptStore>;
}

const kept = new WeakMap<RimebookDB, Kept>();
const prepared = new WeakMap<RimebookDB, Map<string, StoreReadingsCache>>();

/** The phone's kept prepared readings for one screen's reads (`which`: Today's "in_cold", or "all"). */
export function keptReadingsCache(db: RimebookDB, which: string): StoreReadingsCache {
  let byWhich = prepared.get(db);
  if (!byWhich) prepared.set(db, (byWhich = new Map()));
  let cache = byWhich.get(which);
  if (!cache) byWhich.set(which, (cache = new StoreReadingsCache()));
  return cache;
}

/** Index order of the [store_id+taken_at] index within one store: time, then id. */
const byIndex = (a: Reading, b: Reading) => (a.taken_at < b.taken_at ? -1 : a.taken_at > b.taken_at ? 1 : a.id < b.id ? -1 : a.id > b.id ? 1 : 0);

/** First row whose time is at or after `since` (rows in index order). */
function firstFrom(rows: readonly Reading[], since: string): number {
  let lo = 0;
  let hi = rows.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (rows[mid].taken_at < since) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Two runs in index order, merged. */
function merge(a: readonly Reading[], b: readonly Reading[]): Reading[] {
  const out: Reading[] = new Array(a.length + b.length);
  let i = 0;
  let j = 0;
  let k = 0;
  while (i < a.length && j < b.length) out[k++] = byIndex(a[i], b[j]) <= 0 ? a[i++] : b[j++];
  while (i < a.length) out[k++] = a[i++];
  while (j < b.length) out[k++] = b[j++];
  return out;
}

/**
 * One store's live readings in time order, one read of its time index. `since`: leave out readings older than that
 * day (a reading more than 6 h before a bag's cold began never counts for it, so older seasons cost nothing).
 */
export async function loadStoreReadings(db: RimebookDB, storeId: string, since: string | null = null): Promise<Reading[]> {
  const rows = await db.readings
    .where("[store_id+taken_at]")
    .between([storeId, since ?? Dexie.minKey], [storeId, Dexie.maxKey], true, true)
    .toArray();
  return rows.filter((r) => !r.deleted_at);
}

/**
 * Each store's live readings from its day on (`sinceByStore`), the same rows as reading each store's time index,
 * reading only what changed since the last call on this phone store. A store's rows come back as the very same
 * array while nothing of it changed, so the round's prepared readings are kept too.
 */
export async function readKeptReadings(db: RimebookDB, sinceByStore: ReadonlyMap<string, string>): Promise<Reading[][]> {
  return db.transaction("r", db.readings, db.meta, async () => {
    const [identity, copy, total, own, top] = await Promise.all([
      db.meta.get(META.identity),
      db.meta.get(META.farmCopy),
      db.readings.count(),
      db.readings.where("seq").equals(0).toArray(),
      db.readings.orderBy("seq").lastKey(),
    ]);
    const farmValue = identity?.value as { farm?: { id?: string }; user?: { id?: string } } | undefined;
    // The farm, the person, and which copy of the farm (emptied and fetched again after a restore or a wipe).
    const farm = `${farmValue?.farm?.id ?? ""}/${farmValue?.user?.id ?? ""}/${String(copy?.value ?? "")}`;
    const count = total - own.length;
    const maxSeq = typeof top === "number" ? top : 0;
    const before = kept.get(db);
    const stores = new Map<string, KeptStore>();
    if (before && before.farm === farm) {
      const newer = before.maxSeq < maxSeq ? await db.readings.where("seq").above(before.maxSeq).toArray() : [];
      if (count === before.count + newer.length) {
        const added = new Map<string, Reading[]>();
        for (const r of newer) {
          const store = before.stores.get(r.store_id);
          if (!store || r.deleted_at || r.taken_at < store.since) continue;
          const list = added.get(r.store_id);
          if (list) list.push(r);
          else added.set(r.store_id, [r]);
        }
        for (const [id, store] of before.stores) {
          const more = added.get(id);
          stores.set(id, more ? { since: store.since, rows: merge(store.rows, more.sort(byIndex)) } : store);
        }
      }
    }
    const out: Reading[][] = [];
    for (const [id, since] of sinceByStore) {
      let store = stores.get(id);
      if (!store || store.since > since) {
        const rows = (await loadStoreReadings(db, id, since)).filter((r) => r.seq !== 0);
        stores.set(id, (store = { since, rows }));
      }
      const server = store.since === since ? store.rows : store.rows.slice(firstFrom(store.rows, since));
      const mine = own.filter((r) => r.store_id === id && !r.deleted_at && r.taken_at >= since);
      out.push(mine.length ? merge(server, mine.sort(byIndex)) : server);
    }
    kept.set(db, { farm, count, maxSeq, stores });
    return out;
  });
}

/** Forgets what the phone kept (tests, and a phone store emptied by hand). */
export function forgetKeptReadings(db: RimebookDB): void {
  kept.delete(db);
  prepared.delete(db);
}
