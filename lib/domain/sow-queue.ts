import type { BagState, Sprouts } from "@/lib/schemas/words";
import { addDaysToIsoDay, countDaysBetween, type IsoDay } from "./dates";

// Pulled bags waiting to be sown: Today's "To sow" group, the sowing queue and the digest share this rule.

/**
 * How many days a pulled bag may wait out of the cold before it is late to sow. Common practice (no published
 * source): sow within a few days of the pull, and a bag with roots showing the same day or the next, because
 * sprouted roots break and dry easily. A farm may tighten these; the product's defaults are these.
 */
export interface SowRule {
  /** Days after the pull a bag with no roots showing may wait (late from the day after). */
  plainDays: number;
  /** Days after the pull a bag with roots showing may wait. */
  sproutedDays: number;
}

export const defaultSowRule: SowRule = { plainDays: 3, sproutedDays: 1 };

export interface PulledBag {
  id: string;
  code: string;
  species?: string;
  pulledOn: IsoDay;
  /** What the bag's last check saw (roots at the pull make it urgent). */
  sprouts: Sprouts;
}

export interface SowItem<B extends PulledBag = PulledBag> {
  bag: B;
  /** Calendar days since the pull (0 on the day of the pull). */
  daysOut: number;
  sprouted: boolean;
  /** Last day to sow within the rule. */
  sowBy: IsoDay;
  /** Past `sowBy`: flagged on Today and in the digest. */
  isLate: boolean;
  /** Short calm words for the row. */
  note: string;
}

const plural = (n: number, one: string) => `${n} ${one}${n === 1 ? "" : "s"}`;

/** How long a bag has been out of the cold, in words ("pulled today", "3 days out of the cold"). */
export function describeTimeOut(daysOut: number): string {
  if (daysOut <= 0) return "Pulled today";
  if (daysOut === 1) return "Pulled yesterday";
  return `${plural(daysOut, "day")} out of the cold`;
}

/** One pulled bag against the rule on `today`. `formatDay` writes dates in the note (the phone: "14 Nov"). */
export function judgeSowing<B extends PulledBag>(bag: B, today: IsoDay, rule: SowRule = defaultSowRule, formatDay: (d: IsoDay) => string = (d) => d): SowItem<B> {
  const sprouted = bag.sprouts !== "none";
  const daysOut = Math.max(0, countDaysBetween(bag.pulledOn, today));
  const sowBy = addDaysToIsoDay(bag.pulledOn, sprouted ? rule.sproutedDays : rule.plainDays);
  const isLate = today > sowBy;
  const timeOut = describeTimeOut(daysOut);
  const left = countDaysBetween(today, sowBy);
  const when = left <= 0 ? "today" : left === 1 ? "by tomorrow" : `by ${formatDay(sowBy)}`;
  const note = isLate
    ? `${timeOut}: late to sow (sow by ${formatDay(sowBy)}${sprouted ? ", roots showing" : ""}). Sow now, or note why it waits.`
    : sprouted
      ? `${timeOut}, roots showing: sow ${when}; the young roots break easily.`
      : `${timeOut}: sow ${when}.`;
  return { bag, daysOut, sprouted, sowBy, isLate, note };
}

/**
 * The "To sow" group: every pulled bag not yet sown, most urgent first — late bags, then sprouted before plain
 * pulls, then the longest out of the cold, then by code. `bags` must hold only pulled, unsown, live bags.
 */
export function buildSowQueue<B extends PulledBag>(
  bags: readonly B[],
  today: IsoDay,
  rule: SowRule = defaultSowRule,
  formatDay?: (d: IsoDay) => string,
): SowItem<B>[] {
  return bags
    .map((b) => judgeSowing(b, today, rule, formatDay))
    .sort(
      (a, b) =>
        Number(b.isLate) - Number(a.isLate) ||
        Number(b.sprouted) - Number(a.sprouted) ||
        b.daysOut - a.daysOut ||
        (a.bag.code < b.bag.code ? -1 : a.bag.code > b.bag.code ? 1 : 0),
    );
}

/** What a bag's badge says: its state, except a bag still in the cold whose last check found roots says so. */
export type BadgeKind = BagState | "roots_showing";

export function findBadgeKind(state: BagState, lastSprouts: Sprouts | null | undefined): BadgeKind {
  const inCold = state === "chilling" || state === "window_open" || state === "overdue";
  return inCold && lastSprouts && lastSprouts !== "none" ? "roots_showing" : state;
}
