import { buildBagRows, type BagRow, type BagRowSources, type WindowClock } from "@/lib/domain/rows/bag-rows";
import { findLocalDayOfTimestamp, type IsoDay } from "@/lib/domain/dates";
import { buildTodaysRound, type RoundBag, type TodaysRound } from "@/lib/domain/round";
import { defaultCheckCadence, type CheckCadence, type CheckFindings, type NextCheckReason } from "@/lib/domain/schedule";
import { buildSowQueue, type PulledBag, type SowItem, type SowRule } from "@/lib/domain/sow-queue";
import type { Check } from "@/lib/schemas/check";
import type { StoreKind } from "@/lib/schemas/words";
import type { SheetTone } from "@/lib/domain/check-choice";
import { findRootsWatchDay, type FarmWindow } from "@/lib/domain/farm-history";

// From the phone store's rows to lib/domain's round: no numbers are worked out here, only the shapes change.

export type LastCheckRow = Pick<Check, "bag_id" | "checked_at" | "moisture" | "mould" | "sprouts" | "actions">;

/** The day a check was made, on the phone's own calendar (a check at 00:30 belongs to that morning). */
export function dayOfTimestamp(at: string): IsoDay {
  return findLocalDayOfTimestamp(at);
}

export function toCheckFindings(row: LastCheckRow): CheckFindings {
  return { on: dayOfTimestamp(row.checked_at), moisture: row.moisture, mould: row.mould, sprouts: row.sprouts, actions: row.actions ?? [] };
}

/** The farm's weekly rhythm (settings) over the default follow-ups. */
export function cadenceFor(weeklyCheckDays: number | null | undefined): CheckCadence {
  const days = weeklyCheckDays && Number.isInteger(weeklyCheckDays) && weeklyCheckDays >= 1 ? weeklyCheckDays : defaultCheckCadence.everyDaysBeforeWindow;
  return { ...defaultCheckCadence, everyDaysBeforeWindow: days };
}

const inTheCold = new Set(["chilling", "window_open", "overdue"]);
export const noStoreId = "no-store";

/** A bag row as lib/domain's round wants it, with its last check and the day it moves phase (warm → cold). */
export function toRoundBag(
  row: BagRow,
  bag: Pick<BagRowSources["bags"][number], "pulled_on" | "sown_on" | "discarded_on"> | undefined,
  lastCheck: LastCheckRow | null,
  nextMoveOn: IsoDay | null = row.nextMoveOn,
): RoundBag {
  return {
    id: row.id,
    code: row.code,
    storeId: row.storeId ?? noStoreId,
    storeName: row.storeName,
    box: row.box || "No box",
    species: row.commonName ? `${row.species} (${row.commonName})` : row.species,
    startedOn: row.startedOn,
    pulledOn: bag?.pulled_on ?? null,
    sownOn: bag?.sown_on ?? null,
    discardedOn: bag?.discarded_on ?? null,
    window: row.window,
    lastCheck: lastCheck ? toCheckFindings(lastCheck) : null,
    nextMoveOn,
    checkEveryDays: row.checkEveryDays,
  };
}

/**
 * The round for `today` from the phone store's rows (or the server's). `lastChecks`: each bag's latest check.
 * Windows and states are the bag rows' own (effective windows), so Today, the bags table and the digest agree.
 * `farmWindows`: each species' farm history (buildSpeciesWindows), so bags turn daily when roots may show.
 */
export function buildRoundFromRows(
  sources: BagRowSources,
  lastChecks: ReadonlyMap<string, LastCheckRow>,
  today: IsoDay,
  cadence?: CheckCadence,
  clock?: WindowClock,
  farmWindows?: ReadonlyMap<string, Pick<FarmWindow, "dailyFromDay">>,
): TodaysRound {
  // Only bags that can be in the cold on `today` (started by then, not pulled, sown, discarded or deleted): every
  // other bag's state is settled without its window, so its window is not worked out.
  const coldBags = sources.bags.filter((b) => !b.deleted_at && !b.discarded_on && !b.sown_on && !b.pulled_on && !!b.start_date && b.start_date <= today);
  const bagById = new Map(coldBags.map((b) => [b.id, b]));
  // The farm's own history of each species (keyed as lib/domain/rows/farm-history-rows speciesKey), looked up once.
  const historyOf = new Map<string, Pick<FarmWindow, "dailyFromDay"> | null>();
  const roundBags: RoundBag[] = [];
  for (const row of buildBagRows({ ...sources, bags: coldBags }, today, clock)) {
    if (!inTheCold.has(row.state)) continue;
    const bag = toRoundBag(row, bagById.get(row.id), lastChecks.get(row.id) ?? null);
    let history = historyOf.get(row.species);
    if (history === undefined) historyOf.set(row.species, (history = farmWindows?.get(row.species.trim().toLowerCase()) ?? null));
    if (history) bag.rootsWatchFrom = findRootsWatchDay(row.startedOn, history);
    roundBags.push(bag);
  }
  return buildTodaysRound(roundBags, today, cadence);
}

/** The summary chips at the top of Today, most urgent first. A follow-up after mould gets its own chip. */
export type RoundChipKind = NextCheckReason | "mould_follow_up";

export const roundChipLabels: Record<RoundChipKind, string> = {
  discard_now: "Mould spreading",
  mould_follow_up: "Mould spots",
  pull_now: "Roots showing",
  overdue: "Past latest pull",
  window_opens: "Window opens",
  follow_up: "Moisture follow-up",
  move_to_next_phase: "Move to cold",
  window_daily: "Window open",
  roots_watch: "Roots may show",
  weekly: "Routine",
};

/** Each chip's tone, the same as the cards it counts (chooseSheetSteps): trouble (mould spreading), work to do now
 *  (past the latest pull, roots showing, a follow-up after mould spots or a wet bag), a decision (a window opening or
 *  open), routine. */
export const roundChipTones: Record<RoundChipKind, Exclude<SheetTone, "closed">> = {
  discard_now: "trouble",
  mould_follow_up: "act",
  overdue: "act",
  pull_now: "act",
  follow_up: "act",
  move_to_next_phase: "act",
  window_opens: "decide",
  window_daily: "decide",
  roots_watch: "routine",
  weekly: "routine",
};

/** Chips that ask for action before the routine checks (trouble, and work to do now). */
export const urgentChipKinds: ReadonlySet<RoundChipKind> = new Set(
  (Object.keys(roundChipTones) as RoundChipKind[]).filter((k) => roundChipTones[k] === "trouble" || roundChipTones[k] === "act"),
);

export function chipKindOf(item: TodaysRound["items"][number]): RoundChipKind {
  const mould = item.bag.lastCheck?.mould;
  return item.next.reason === "follow_up" && mould && mould !== "clean" ? "mould_follow_up" : item.next.reason;
}

export function summarizeRound(round: TodaysRound): { kind: RoundChipKind; label: string; count: number; urgent: boolean; tone: Exclude<SheetTone, "closed"> }[] {
  const counts = new Map<RoundChipKind, number>();
  for (const item of round.items) counts.set(chipKindOf(item), (counts.get(chipKindOf(item)) ?? 0) + 1);
  return (Object.keys(roundChipLabels) as RoundChipKind[])
    .filter((k) => counts.has(k))
    .map((kind) => ({ kind, label: roundChipLabels[kind], count: counts.get(kind)!, urgent: urgentChipKinds.has(kind), tone: roundChipTones[kind] }));
}

/** Bags in a store group, for the group's count. */
export function countStoreBags(store: TodaysRound["stores"][number]): number {
  return store.boxes.reduce((n, b) => n + b.items.length, 0);
}

/** A pulled bag as the sowing queue wants it. */
export interface PulledBagRow extends PulledBag {
  storeName: string;
  box: string;
}

/**
 * Today's "To sow" group from the phone store's rows (or the server's): live bags pulled and not yet sown or
 * discarded, with their last check's sprouts, ordered by lib/domain's sowing rule.
 */
export function buildSowQueueFromRows(
  sources: Pick<BagRowSources, "bags" | "lots" | "stores">,
  lastChecks: ReadonlyMap<string, Pick<LastCheckRow, "sprouts">>,
  today: IsoDay,
  rule?: SowRule,
  formatDay?: (d: IsoDay) => string,
): SowItem<PulledBagRow>[] {
  const lotById = new Map(sources.lots.map((l) => [l.id, l]));
  const storeById = new Map(sources.stores.map((s) => [s.id, s]));
  const pulled: PulledBagRow[] = [];
  for (const b of sources.bags) {
    if (!isWaitingToSow(b)) continue;
    const lot = lotById.get(b.lot_id);
    pulled.push({
      id: b.id,
      code: b.code,
      species: lot ? (lot.common_name ? `${lot.species} (${lot.common_name})` : lot.species) : "",
      pulledOn: b.pulled_on!,
      sprouts: lastChecks.get(b.id)?.sprouts ?? "none",
      storeName: (b.store_id && storeById.get(b.store_id)?.name) || "No store",
      box: b.box ?? "",
    });
  }
  return buildSowQueue(pulled, today, rule, formatDay);
}

/** Pulled, not sown, not discarded, not deleted: a bag still waiting for someone to sow it. */
export function isWaitingToSow(b: Pick<BagRowSources["bags"][number], "deleted_at" | "pulled_on" | "sown_on" | "discarded_on">): boolean {
  return !b.deleted_at && !!b.pulled_on && !b.sown_on && !b.discarded_on;
}

/** The "To sow" chip at the top of Today: urgent when a bag is late or has roots showing. */
export function summarizeSowQueue(queue: readonly SowItem[]): { kind: string; label: string; count: number; urgent: boolean; tone: Exclude<SheetTone, "closed"> }[] {
  if (queue.length === 0) return [];
  const late = queue.filter((i) => i.isLate).length;
  const urgent = queue.some((i) => i.isLate || i.sprouted);
  return [{ kind: "to_sow", label: late ? `To sow (${late} late)` : "To sow", count: queue.length, urgent, tone: late ? "trouble" : urgent ? "act" : "routine" }];
}

/** Today's summary sentence: the checks due and the pulled bags waiting to be sown. */
export function describeRoundCount(due: number, urgent: number, queue: readonly SowItem[]): string {
  const checks = due === 0 ? null : `${due} ${due === 1 ? "bag" : "bags"} to check${urgent ? `, ${urgent} needing action first` : ""}`;
  const late = queue.filter((i) => i.isLate).length;
  const sow = queue.length === 0 ? null : `${queue.length} pulled ${queue.length === 1 ? "bag" : "bags"} to sow${late ? ` (${late} late)` : ""}`;
  if (!checks && !sow) return "No bags due for a check.";
  if (!checks) return `No bags due for a check; ${sow}.`;
  return `${checks}${sow ? `; ${sow}` : ""}.`;
}

const kindPlurals: Record<StoreKind, string> = { fridge: "fridges", freezer: "freezers", cold_frame: "cold frames" };

/** Today's heading, said as a grower would at the fridge door: "4 bags due in 2 fridges", "1 bag due in Barn
 *  fridge", "2 pulled bags to sow", "Nothing due today". `stores` are the stores that have a bag due. */
export function roundHeadline(due: number, stores: readonly { name: string; kind: StoreKind }[], toSow: number): string {
  const bags = (n: number) => `${n} ${n === 1 ? "bag" : "bags"}`;
  const sow = toSow ? `${toSow} pulled ${toSow === 1 ? "bag" : "bags"} to sow` : "";
  if (due === 0) return sow ? sow.charAt(0).toUpperCase() + sow.slice(1) : "Nothing due today";
  const kinds = new Set(stores.map((s) => s.kind));
  const where =
    stores.length === 1
      ? stores[0]!.name
      : kinds.size === 1
        ? `${stores.length} ${kindPlurals[[...kinds][0]!]}`
        : `${stores.length} cold stores`;
  return `${bags(due)} due in ${where}${toSow ? `, ${toSow} to sow` : ""}`;
}
