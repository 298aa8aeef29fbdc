"use client";

import { useLiveQuery } from "dexie-react-hooks";
import { getLocalDb } from "@/lib/client/db";
import { loadSpeciesHistory } from "@/lib/client/history-reads";
import { formatIsoDay, type IsoDay } from "@/lib/domain/dates";
import { describeFarmRootsLine, findRootsWatchDay } from "@/lib/domain/farm-history";
import { buildRootsHistory } from "@/lib/domain/rows/farm-history-rows";

/**
 * The farm's own roots history for one bag's species: one line for the bag page and check sheet, and the day the
 * bag turns daily (the same rule Today uses). Undefined while reading the phone store.
 */
export function useFarmRoots(species: string | null | undefined, startedOn: IsoDay | null): { line: string | null; watchFrom: IsoDay | null } | undefined {
  return useLiveQuery(async () => {
    if (!species) return { line: null, watchFrom: null };
    const today = formatIsoDay(new Date());
    const rows = await loadSpeciesHistory(getLocalDb(), species);
    const { window } = buildRootsHistory(rows, rows.checksByBag, { species }, null, today);
    return { line: describeFarmRootsLine(window, species), watchFrom: findRootsWatchDay(startedOn, window) };
  }, [species, startedOn]);
}
