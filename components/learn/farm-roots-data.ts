import { getLocalDb } from "@/lib/client/db";
import { loadSpeciesHistory } from "@/lib/client/history-reads";
import { formatIsoDay, type IsoDay } from "@/lib/domain/dates";
import { describeFarmRootsLine, findRootsWatchDay } from "@/lib/domain/farm-history";
import { buildRootsHistory } from "@/lib/domain/rows/farm-history-rows";

// The farm's own roots history for one species, read and worked out (useFarmRoots loads this beside hydration).

export async function readFarmRoots(species: string, startedOn: IsoDay | null): Promise<{ line: string | null; watchFrom: IsoDay | null }> {
  const today = formatIsoDay(new Date());
  const rows = await loadSpeciesHistory(getLocalDb(), species);
  const { window } = buildRootsHistory(rows, rows.checksByBag, { species }, null, today);
  return { line: describeFarmRootsLine(window, species), watchFrom: findRootsWatchDay(startedOn, window) };
}
