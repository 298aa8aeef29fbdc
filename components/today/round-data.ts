import { getLocalDb } from "@/lib/client/db";
import { loadFarmFetched, loadFarmRows, loadLastChecks } from "@/lib/client/fridge-reads";
import { loadIdentity } from "@/lib/client/identity";
import { loadSpeciesWindows } from "@/lib/client/history-reads";
import {
  buildRoundFromRows,
  buildSowQueueFromRows,
  cadenceFor,
  chipKindOf,
  countStoreBags,
  describeRoundCount,
  isWaitingToSow,
  roundHeadline,
  summarizeRound,
  summarizeSowQueue,
  urgentChipKinds,
} from "@/lib/domain/rows/round-input";
import { formatShortDay } from "@/components/bags/format-day";
import { listFirstSteps } from "./first-steps";

// Today's round read from the phone store and worked out: loaded beside the screen's hydration (TodayRound),
// never in its first load. Everything the screen draws from the round is worked out here.

export type RoundData = Awaited<ReturnType<typeof loadRound>>;

export async function loadRound(today: string) {
  const db = getLocalDb();
  // Readings only from the fridges' bags still in the cold: the round never shows a pulled bag.
  const [rows, identity, fetched] = await Promise.all([loadFarmRows(db, "in_cold"), loadIdentity(db), loadFarmFetched(db)]);
  const live = rows.bags.filter((b) => !b.deleted_at && b.start_date && !b.pulled_on && !b.sown_on && !b.discarded_on);
  const toSow = rows.bags.filter(isWaitingToSow);
  const [lastChecks, farmWindows] = await Promise.all([loadLastChecks(db, [...live, ...toSow].map((b) => b.id)), loadSpeciesWindows(db, rows, today)]);
  // Windows move by the cold lost up to now (each store's readings, read once): the same rows as the bags table.
  // The farm's own history turns a bag daily from the day its species' roots have shown here.
  const round = buildRoundFromRows(rows, lastChecks, today, cadenceFor(identity?.farm.weekly_check_days), { asOf: Date.now() }, farmWindows);
  // The same bags the red chips count, so the sentence and the chips agree.
  const urgent = round.items.filter((i) => urgentChipKinds.has(chipKindOf(i))).length;
  // Pulled bags waiting to be sown: their own group, most urgent first (lib/domain sowing rule).
  const sowQueue = buildSowQueueFromRows(rows, lastChecks, today, undefined, formatShortDay);
  const kindOf = new Map(rows.stores.map((st) => [st.id, st.kind]));
  const headline = roundHeadline(
    round.counts.due,
    round.stores.map((st) => ({ name: st.storeName, kind: kindOf.get(st.storeId) ?? "fridge" })),
    sowQueue.length,
  );
  const alive = <T extends { deleted_at?: string | null }>(xs: readonly T[]) => xs.filter((x) => !x.deleted_at).length;
  const firstSteps = listFirstSteps({ stores: alive(rows.stores), lots: alive(rows.lots), bags: alive(rows.bags) });
  const countText = describeRoundCount(round.counts.due, urgent, sowQueue);
  const chips = [...summarizeSowQueue(sowQueue), ...summarizeRound(round)];
  const storeDue = new Map(round.stores.map((st) => [st.storeId, countStoreBags(st)]));
  return { round, sowQueue, identity, fetched, urgent, headline, firstSteps, bagCount: rows.bags.length, countText, chips, storeDue };
}
