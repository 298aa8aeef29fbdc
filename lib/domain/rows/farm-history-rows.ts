import type { Bag } from "@/lib/schemas/bag";
import type { Check } from "@/lib/schemas/check";
import type { Lot } from "@/lib/schemas/lot";
import { addDaysToIsoDay, type IsoDay } from "@/lib/domain/dates";
import {
  describePublishedDays,
  findFarmWindow,
  findSeasonOf,
  measureDaysToRoots,
  measureDryingSpells,
  type FarmWindow,
  type HistoryCheck,
} from "@/lib/domain/farm-history";
import { estimateSurvival, type SurvivalCurve, type TimeObservation } from "@/lib/domain/survival";
import type { ReconciledProtocol } from "@/lib/domain/protocols";
import { dayOfTimestamp } from "./round-input";

// From the phone store's rows (or the server's) to lib/domain's farm history: only shapes change here.

export type HistoryBagRow = Pick<Bag, "id" | "lot_id" | "protocol_id" | "store_id" | "box" | "start_date" | "pulled_on" | "sown_on" | "discarded_on" | "deleted_at">;
export type HistoryCheckRow = Pick<Check, "bag_id" | "checked_at" | "moisture" | "sprouts" | "actions" | "deleted_at">;
export type HistoryLotRow = Pick<Lot, "id" | "species" | "protocol_id" | "deleted_at">;

/**
 * Each bag's live checks in time order, with the day on the phone's own calendar. One pass; a bag's list is sorted
 * only when its rows came out of order.
 */
export function groupChecksByBag(checks: readonly HistoryCheckRow[]): Map<string, HistoryCheck[]> {
  const byBag = new Map<string, (HistoryCheck & { at: string })[]>();
  const unsorted = new Set<string>();
  for (const c of checks) {
    if (c.deleted_at) continue;
    const entry = { at: c.checked_at, on: dayOfTimestamp(c.checked_at), moisture: c.moisture, sprouts: c.sprouts, actions: c.actions ?? [] };
    const list = byBag.get(c.bag_id);
    if (!list) byBag.set(c.bag_id, [entry]);
    else {
      if (entry.at < list[list.length - 1].at) unsorted.add(c.bag_id);
      list.push(entry);
    }
  }
  for (const id of unsorted) byBag.get(id)!.sort((a, b) => (a.at < b.at ? -1 : a.at > b.at ? 1 : 0));
  return byBag;
}

/** Narrow the history: a species always, and optionally one protocol, lot or store. */
export interface HistoryFilter {
  species: string;
  protocolId?: string | null;
  lotId?: string | null;
  storeId?: string | null;
}

function sameSpecies(a: string, b: string): boolean {
  return a.trim().toLowerCase() === b.trim().toLowerCase();
}

/** The bags a filter picks, with their lot (a bag's protocol is its own or its lot's). */
export function pickHistoryBags<B extends HistoryBagRow>(bags: readonly B[], lots: readonly HistoryLotRow[], filter: HistoryFilter): B[] {
  const lotById = new Map(lots.filter((l) => !l.deleted_at).map((l) => [l.id, l]));
  return bags.filter((b) => {
    if (b.deleted_at) return false;
    const lot = lotById.get(b.lot_id);
    if (!lot || !sameSpecies(lot.species, filter.species)) return false;
    if (filter.lotId && b.lot_id !== filter.lotId) return false;
    if (filter.storeId && b.store_id !== filter.storeId) return false;
    if (filter.protocolId && (b.protocol_id ?? lot.protocol_id) !== filter.protocolId) return false;
    return true;
  });
}

export interface RootsHistory {
  window: FarmWindow;
  /** Seasons the bags belong to (the spring each was sown in). */
  seasons: number[];
}

/** Time to first roots for the bags a filter picks, beside the protocol's published window. */
export function buildRootsHistory(
  sources: { bags: readonly HistoryBagRow[]; lots: readonly HistoryLotRow[] },
  checksByBag: ReadonlyMap<string, readonly HistoryCheck[]>,
  filter: HistoryFilter,
  protocol: ReconciledProtocol | null,
  today: IsoDay,
): RootsHistory {
  const observations: TimeObservation[] = [];
  const seasons = new Set<number>();
  for (const bag of pickHistoryBags(sources.bags, sources.lots, filter)) {
    const obs = measureDaysToRoots(toHistoryBag(bag), checksByBag.get(bag.id) ?? [], today);
    if (!obs) continue;
    observations.push(obs);
    seasons.add(findSeasonOf(bag.start_date!));
  }
  return { window: findFarmWindow(observations, protocol ? describePublishedDays(protocol) : null), seasons: [...seasons].sort((a, b) => a - b) };
}

function toHistoryBag(bag: HistoryBagRow) {
  return { startedOn: bag.start_date ?? null, pulledOn: bag.pulled_on, sownOn: bag.sown_on, discardedOn: bag.discarded_on };
}

/** Each species' farm window (no published window: the round only needs the day to turn daily). Keyed by lowercased species. */
export function buildSpeciesWindows(
  sources: { bags: readonly HistoryBagRow[]; lots: readonly HistoryLotRow[] },
  checksByBag: ReadonlyMap<string, readonly HistoryCheck[]>,
  today: IsoDay,
): Map<string, FarmWindow> {
  const speciesOfLot = new Map(sources.lots.filter((l) => !l.deleted_at).map((l) => [l.id, l.species.trim().toLowerCase()]));
  const bySpecies = new Map<string, TimeObservation[]>();
  for (const bag of sources.bags) {
    if (bag.deleted_at) continue;
    const species = speciesOfLot.get(bag.lot_id);
    if (!species) continue;
    const obs = measureDaysToRoots(toHistoryBag(bag), checksByBag.get(bag.id) ?? [], today);
    if (!obs) continue;
    const list = bySpecies.get(species);
    if (list) list.push(obs);
    else bySpecies.set(species, [obs]);
  }
  return new Map([...bySpecies].map(([species, obs]) => [species, findFarmWindow(obs, null)]));
}

export function speciesKey(species: string): string {
  return species.trim().toLowerCase();
}

/**
 * The bags whose checks Today's farm windows need: the finished bags (pulled, sown, discarded) of species that have a
 * bag in the cold. Only bags that showed roots move the day to turn daily, and roots end a bag.
 */
export function pickEndedBagsOfLiveSpecies<B extends HistoryBagRow>(bags: readonly B[], lots: readonly HistoryLotRow[]): B[] {
  const lotSpecies = new Map(lots.map((l) => [l.id, speciesKey(l.species)]));
  const ended = (b: HistoryBagRow) => Boolean(b.pulled_on || b.sown_on || b.discarded_on);
  const live = new Set<string>();
  for (const b of bags) if (!b.deleted_at && b.start_date && !ended(b)) live.add(lotSpecies.get(b.lot_id) ?? "");
  return bags.filter((b) => !b.deleted_at && b.start_date && ended(b) && live.has(lotSpecies.get(b.lot_id) ?? ""));
}

export interface DryingHistory {
  storeId: string;
  box: string;
  curve: SurvivalCurve;
}

/** Damp → dry spells per store and per box ("" = the whole store), each with its curve. */
export function buildDryingHistory(bags: readonly HistoryBagRow[], checksByBag: ReadonlyMap<string, readonly HistoryCheck[]>, today: IsoDay): DryingHistory[] {
  const groups = new Map<string, { storeId: string; box: string; spells: TimeObservation[] }>();
  const add = (storeId: string, box: string, spells: TimeObservation[]) => {
    const key = `${storeId}|${box}`;
    let g = groups.get(key);
    if (!g) groups.set(key, (g = { storeId, box, spells: [] }));
    g.spells.push(...spells);
  };
  for (const bag of bags) {
    if (bag.deleted_at || !bag.store_id) continue;
    const spells = measureDryingSpells(toHistoryBag(bag), checksByBag.get(bag.id) ?? [], today);
    if (spells.length === 0) continue;
    add(bag.store_id, "", spells);
    if (bag.box) add(bag.store_id, bag.box, spells);
  }
  return [...groups.values()].map((g) => ({ storeId: g.storeId, box: g.box, curve: estimateSurvival(g.spells) }));
}

/**
 * For bags still in the cold: the day each box is likely to need a look for dryness (the earliest bag's damp spell
 * start + the box's median drying days, else the store's; today when that day has passed with no check since).
 * "Look at Box B by Tuesday."
 */
export function findBoxesToLookAt(
  bags: readonly HistoryBagRow[],
  checksByBag: ReadonlyMap<string, readonly HistoryCheck[]>,
  history: readonly DryingHistory[],
  today: IsoDay,
): { box: string; by: IsoDay; medianDays: number }[] {
  const medianOf = (storeId: string, box: string) =>
    history.find((h) => h.storeId === storeId && h.box === box)?.curve.median ?? history.find((h) => h.storeId === storeId && h.box === "")?.curve.median ?? null;
  const byBox = new Map<string, { by: IsoDay; medianDays: number }>();
  for (const bag of bags) {
    if (bag.deleted_at || !bag.store_id || bag.pulled_on || bag.sown_on || bag.discarded_on) continue;
    const checks = checksByBag.get(bag.id) ?? [];
    const spells = measureDryingSpells(toHistoryBag(bag), checks, today);
    const open = spells[spells.length - 1];
    if (!open || open.event || checks.length === 0) continue;
    const box = bag.box ?? "";
    const medianDays = medianOf(bag.store_id, box);
    if (medianDays === null) continue;
    const lastOn = checks[checks.length - 1].on;
    const wetSince = addDaysToIsoDay(lastOn, -open.time);
    const due = addDaysToIsoDay(wetSince, medianDays);
    // Still damp at a check after the typical drying day: this bag outlasts the others, its routine check covers it.
    if (due <= lastOn) continue;
    const by = due < today ? today : due;
    const seen = byBox.get(box);
    if (!seen || by < seen.by) byBox.set(box, { by, medianDays });
  }
  return [...byBox].map(([box, v]) => ({ box, ...v })).sort((a, b) => (a.by < b.by ? -1 : a.by > b.by ? 1 : 0));
}
