import "server-only";
import type { Knex } from "knex";
import { buildBagRows, type BagRow, type BagRowSources, type ReadingRow, type WindowClock } from "@/lib/domain/rows/bag-rows";
import { convertZonedTimeToEpoch } from "@/lib/domain/csv";
import { addDaysToIsoDay } from "@/lib/domain";
import { parseRow } from "./sync/rows";
import type { FarmWindow } from "@/lib/domain/farm-history";
import { buildSpeciesWindows, groupChecksByBag, pickEndedBagsOfLiveSpecies, type HistoryCheckRow } from "@/lib/domain/rows/farm-history-rows";

// The farm's bag rows on the server, built by the same lib/domain function the phone uses, so the digest and the
// exports give every bag the window and state Today and the bags table show (windows moved by cold lost in the store).

export type BagRowSourcesWithReadings = BagRowSources & { readings: ReadingRow[] };

/**
 * The farm's live bags, lots, protocols and stores, and the readings that can still move a window: from two days
 * before the earliest bag still in the cold, or `readingsFrom` if earlier. Older seasons are never read.
 */
export async function loadBagRowSources(db: Knex, farmId: string, readingsFrom: string): Promise<BagRowSourcesWithReadings> {
  const live = (t: string) => db(t).where({ farm_id: farmId }).whereNull("deleted_at");
  const [bags, lots, protocols, stores] = await Promise.all([live("bags"), live("lots"), live("protocols"), live("stores")]);
  const parse = (t: string, rows: Record<string, unknown>[]) => rows.map((r) => parseRow(t, r));
  const parsedBags = parse("bags", bags) as unknown as BagRowSources["bags"];
  let since = readingsFrom;
  for (const b of parsedBags) {
    if (!b.start_date || b.pulled_on || b.sown_on || b.discarded_on) continue;
    const from = addDaysToIsoDay(b.start_date, -2);
    if (from < since) since = from;
  }
  const readings: Record<string, unknown>[] = await live("readings").where("taken_at", ">=", since).select("store_id", "taken_at", "temperature_c");
  return {
    bags: parsedBags,
    lots: parse("lots", lots),
    protocols: parse("protocols", protocols),
    stores: parse("stores", stores),
    readings: readings.map((r) => ({ store_id: String(r.store_id), taken_at: String(r.taken_at), temperature_c: Number(r.temperature_c) })),
  } as unknown as BagRowSourcesWithReadings;
}

/** Cold lost up to `now`, on the farm's own calendar (its days start at midnight in its time zone). */
export function farmWindowClock(timezone: string, now: Date): WindowClock {
  return { asOf: now.getTime(), startOfDay: (d) => convertZonedTimeToEpoch(Date.parse(`${d}T00:00:00Z`), timezone) };
}

/** The farm's bag rows for its `day`, as the phone builds them. */
export async function loadFarmBagRows(db: Knex, farmId: string, day: string, timezone: string, now: Date): Promise<BagRow[]> {
  const sources = await loadBagRowSources(db, farmId, day);
  return buildBagRows(sources, day, farmWindowClock(timezone, now));
}

/** Each species' farm window for the round (the phone's loadSpeciesWindows, from the server's rows). */
export async function loadSpeciesWindows(db: Knex, farmId: string, sources: Pick<BagRowSources, "bags" | "lots">, day: string): Promise<Map<string, FarmWindow>> {
  const ended = pickEndedBagsOfLiveSpecies(sources.bags, sources.lots);
  if (ended.length === 0) return new Map();
  const checks: HistoryCheckRow[] = [];
  const ids = ended.map((b) => b.id);
  // In slices: SQLite caps the number of bound parameters.
  for (let i = 0; i < ids.length; i += 500) {
    const rows = await db("checks").where({ farm_id: farmId }).whereNull("deleted_at").whereIn("bag_id", ids.slice(i, i + 500)).select("bag_id", "checked_at", "moisture", "sprouts", "actions", "deleted_at");
    for (const r of rows) checks.push(parseRow("checks", r) as unknown as HistoryCheckRow);
  }
  return buildSpeciesWindows({ bags: ended, lots: sources.lots }, groupChecksByBag(checks), day);
}
