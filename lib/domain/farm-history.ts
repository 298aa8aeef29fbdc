import type { CheckAction, Moisture, Sprouts } from "@/lib/schemas/words";
import { addDaysToIsoDay, countDaysBetween, type IsoDay } from "./dates";
import type { ReconciledProtocol } from "./protocols";
import { estimateSurvival, type SurvivalCurve, type TimeObservation } from "./survival";

// What the farm's own bags say: days in the cold to first roots, days for a damp bag to go dry, and a window that
// fits this farm beside the published one. Every unfinished bag counts as censored (never dropped, never as roots).

/** A bag's own dates, as far as its history needs them. */
export interface HistoryBag {
  startedOn: IsoDay | null;
  pulledOn?: IsoDay | null;
  sownOn?: IsoDay | null;
  discardedOn?: IsoDay | null;
}

export interface HistoryCheck {
  on: IsoDay;
  moisture: Moisture;
  sprouts: Sprouts;
  actions?: readonly CheckAction[];
}

/** Finished bags (roots seen) a species needs before the farm's own window is shown or suggested. */
export const farmWindowMinFinishedBags = 5;
/** Daily checks start this many days before the farm's earliest roots (common practice: start checking early). */
export const dailyChecksLeadDays = 3;

function isAfterStart(bag: HistoryBag, today: IsoDay): bag is HistoryBag & { startedOn: IsoDay } {
  return bag.startedOn !== null && bag.startedOn <= today;
}

/**
 * Days in the cold from the bag's start to the first check that saw roots. A bag pulled, sown or discarded without
 * roots seen, or still chilling, is censored at its last check day (day 0 when never checked). `checks` in day order.
 * Null for a bag not started by `today`.
 */
export function measureDaysToRoots(bag: HistoryBag, checks: readonly HistoryCheck[], today: IsoDay): TimeObservation | null {
  if (!isAfterStart(bag, today)) return null;
  let last: IsoDay | null = null;
  for (const c of checks) {
    if (c.on < bag.startedOn) continue;
    if (c.sprouts !== "none") return { time: countDaysBetween(bag.startedOn, c.on), event: true };
    last = c.on;
  }
  return { time: last ? countDaysBetween(bag.startedOn, last) : 0, event: false };
}

/**
 * Spells from a check that found the medium damp (or soggy, or was re-wetted) to the next check that found it dry.
 * A re-wetting starts a new spell; a bag that ends (or is still in the cold) before drying is censored at its last
 * check. `checks` in day order.
 */
export function measureDryingSpells(bag: HistoryBag, checks: readonly HistoryCheck[], today: IsoDay): TimeObservation[] {
  if (!isAfterStart(bag, today)) return [];
  const spells: TimeObservation[] = [];
  let wetSince: IsoDay | null = null;
  let last: IsoDay | null = null;
  for (const c of checks) {
    if (c.on < bag.startedOn) continue;
    last = c.on;
    const rewetted = (c.actions ?? []).includes("added_water") || (c.actions ?? []).includes("fresh_towel");
    if (c.moisture === "dry" && wetSince !== null) {
      spells.push({ time: countDaysBetween(wetSince, c.on), event: true });
      wetSince = null;
    }
    if (rewetted || (c.moisture !== "dry" && wetSince === null)) wetSince = c.on;
  }
  if (wetSince !== null && last !== null) spells.push({ time: countDaysBetween(wetSince, last), event: false });
  return spells;
}

/** The days a protocol's published window spans from a bag's start (all timed phases end to end). */
export interface PublishedDays {
  minDays: number;
  maxDays: number | null;
}

export function describePublishedDays(protocol: ReconciledProtocol): PublishedDays | null {
  if (protocol.timedPhases.length === 0) return null;
  let minDays = 0;
  let maxDays: number | null = 0;
  for (const p of protocol.timedPhases) {
    minDays += p.minDays;
    maxDays = maxDays === null || p.maxDays === null ? null : maxDays + p.maxDays;
  }
  return { minDays, maxDays };
}

export interface FarmWindow {
  curve: SurvivalCurve;
  /** Bags the curve rests on, and how many of them showed roots. */
  bags: number;
  finished: number;
  /** At least `farmWindowMinFinishedBags` bags showed roots: enough to show the farm's own window. */
  enough: boolean;
  earliest: number | null;
  median: number | null;
  latest: number | null;
  published: PublishedDays | null;
  /** Start daily checks from this day in the cold (a few days before the farm's earliest roots); null: not enough history. */
  dailyFromDay: number | null;
  /** The farm's history says to start daily checks before the published window opens. */
  suggestsEarlier: boolean;
}

/** This farm's window beside the published one. */
export function findFarmWindow(observations: readonly TimeObservation[], published: PublishedDays | null): FarmWindow {
  const curve = estimateSurvival(observations);
  const enough = curve.events >= farmWindowMinFinishedBags;
  const dailyFromDay = enough && curve.earliestEvent !== null ? Math.max(0, curve.earliestEvent - dailyChecksLeadDays) : null;
  return {
    curve,
    bags: curve.n,
    finished: curve.events,
    enough,
    earliest: curve.earliestEvent,
    median: curve.median,
    latest: curve.latestEvent,
    published,
    dailyFromDay,
    suggestsEarlier: dailyFromDay !== null && (published === null || dailyFromDay < published.minDays),
  };
}

/** The day a bag started on `startedOn` should turn daily by the farm's history; null when history says nothing. */
export function findRootsWatchDay(startedOn: IsoDay | null, window: Pick<FarmWindow, "dailyFromDay"> | null): IsoDay | null {
  if (!startedOn || !window || window.dailyFromDay === null) return null;
  return addDaysToIsoDay(startedOn, window.dailyFromDay);
}

/** The season a bag belongs to: the spring it is sown in (bags started from July count for the next year). */
export function findSeasonOf(startedOn: IsoDay): number {
  const year = Number(startedOn.slice(0, 4));
  return Number(startedOn.slice(5, 7)) >= 7 ? year + 1 : year;
}

export function describeSeasons(seasons: Iterable<number>): string {
  const list = [...new Set(seasons)].sort((a, b) => a - b);
  if (list.length === 0) return "no seasons";
  if (list.length === 1) return `season ${list[0]}`;
  const consecutive = list.every((s, i) => i === 0 || s === list[i - 1] + 1);
  return consecutive ? `seasons ${list[0]}–${list[list.length - 1]}` : `seasons ${list.slice(0, -1).join(", ")} and ${list[list.length - 1]}`;
}

/** The source line a farm-own protocol cites when the grower accepts the farm's window. */
export function describeFarmRecordSource(window: FarmWindow, seasons: Iterable<number>): string {
  const parts = [`This farm's record, ${window.bags} ${window.bags === 1 ? "bag" : "bags"}, ${describeSeasons(seasons)}`];
  if (window.earliest !== null) parts.push(`first roots from day ${window.earliest}`);
  if (window.median !== null) parts.push(`half the bags by day ${window.median}`);
  return `${parts.join("; ")} (Kaplan–Meier, unfinished bags counted to their last check).`.slice(0, 500);
}

/** One line for the bag page and check sheet, e.g. "On this farm, half the Echinacea bags showed roots by day 41 (12 bags)." */
export function describeFarmRootsLine(window: FarmWindow, speciesName: string): string | null {
  if (window.finished === 0) return null;
  const bags = `${window.bags} ${window.bags === 1 ? "bag" : "bags"}`;
  if (window.median !== null) return `On this farm, half the ${speciesName} bags showed roots by day ${window.median} (${bags}; earliest day ${window.earliest}).`;
  return `On this farm, ${window.finished} of ${bags} of ${speciesName} showed roots, the earliest on day ${window.earliest}.`;
}
