import { AppError } from "@/lib/errors";
import { addDaysToIsoDay, countDaysBetween, type IsoDay } from "@/lib/domain/dates";
import { computeGerminationMetrics, computeWilsonInterval, convertToPerInterval, type GerminationCount, type GerminationMetrics, type ProportionInterval } from "@/lib/domain";
import type { Count } from "@/lib/schemas/count";
import type { Sowing } from "@/lib/schemas/sowing";

// Pure wiring between the phone's count rows and lib/domain: no React, no Dexie, so it is unit-tested.

type CountRow = Pick<Count, "counted_on" | "germinated_total" | "created_at"> & { deleted_at?: string | null };

export interface DailyTotal {
  countedOn: IsoDay;
  total: number;
}

/**
 * One running total per day. Counts are append-only, so a recount on the same day is a new row:
 * the latest entered row of that day stands.
 */
export function pickDailyTotals(counts: readonly CountRow[]): DailyTotal[] {
  const byDay = new Map<string, CountRow>();
  for (const c of counts) {
    if (c.deleted_at) continue;
    const seen = byDay.get(c.counted_on);
    if (!seen || c.created_at >= seen.created_at) byDay.set(c.counted_on, c);
  }
  return [...byDay.values()]
    .sort((a, b) => (a.counted_on < b.counted_on ? -1 : a.counted_on > b.counted_on ? 1 : 0))
    .map((c) => ({ countedOn: c.counted_on, total: c.germinated_total }));
}

/** The seedlings up at the last count (0 before the first count). */
export function findFinalTotal(counts: readonly CountRow[]): number {
  const days = pickDailyTotals(counts);
  return days.length ? days[days.length - 1].total : 0;
}

/** Counts as lib/domain wants them: day = calendar days since sowing, cumulative. Sowing-day counts are left out (day 0). */
export function toGerminationCounts(sownOn: IsoDay, totals: readonly DailyTotal[]): GerminationCount[] {
  return totals.map((t) => ({ day: countDaysBetween(sownOn, t.countedOn), count: t.total })).filter((c) => c.day > 0);
}

export type StepperVerdict = { ok: true } | { ok: false; message: string };

/**
 * Rules for saving a running total on a day: a whole number, not below an earlier day's total nor above a later
 * day's, not more than were sown, and only on a day after sowing and not in the future.
 */
export function judgeCountEntry(input: {
  sownOn: IsoDay;
  seedsSown: number;
  today: IsoDay;
  countedOn: IsoDay;
  total: number;
  totals: readonly DailyTotal[];
  /** How days are written in the messages (the screen passes "27 Nov"). */
  formatDay?: (day: IsoDay) => string;
}): StepperVerdict {
  const { sownOn, seedsSown, today, countedOn, total, totals } = input;
  const day = input.formatDay ?? ((d: IsoDay) => d);
  if (!Number.isInteger(total) || total < 0) return { ok: false, message: "A count is a whole number, zero or more." };
  if (countedOn <= sownOn) return { ok: false, message: `Counts start the day after sowing (sown ${day(sownOn)}).` };
  if (countedOn > today) return { ok: false, message: "That day has not come yet; count on the day itself." };
  if (total > seedsSown) return { ok: false, message: `Only ${seedsSown} seeds were sown, so at most ${seedsSown} can be up.` };
  const before = [...totals].reverse().find((t) => t.countedOn < countedOn);
  if (before && total < before.total) {
    return {
      ok: false,
      message: `${before.total} were already up on ${day(before.countedOn)}. The count is a running total, so it cannot go below that; count every seedling up so far, including earlier ones.`,
    };
  }
  const after = totals.find((t) => t.countedOn > countedOn);
  if (after && total > after.total) {
    return { ok: false, message: `A later count (${day(after.countedOn)}) had only ${after.total}; a running total on an earlier day cannot be higher.` };
  }
  return { ok: true };
}

/** The value a stepper shows for a day: that day's saved total, else the last total before it, else 0. */
export function findStartingTotal(totals: readonly DailyTotal[], countedOn: IsoDay): number {
  const same = totals.find((t) => t.countedOn === countedOn);
  if (same) return same.total;
  const before = [...totals].reverse().find((t) => t.countedOn < countedOn);
  return before?.total ?? 0;
}

/** A step of the stepper, kept between 0 and the seeds sown. */
export function stepTotal(current: number, delta: number, seedsSown: number): number {
  return Math.min(seedsSown, Math.max(0, current + delta));
}

export interface SowingSummary {
  sown: number;
  germinated: number;
  interval: ProportionInterval | null;
  metrics: GerminationMetrics | null;
  /** Cumulative germination % by day since sowing, starting at day 0 with 0 %. */
  curve: { day: number; percent: number; countedOn: IsoDay | null }[];
  problem: string | null;
}

/** Metrics, interval and curve for one sowing, all from lib/domain. A broken series gives a message, not a crash. */
export function summarizeSowing(sowing: Pick<Sowing, "sown_on" | "seeds_sown">, counts: readonly CountRow[]): SowingSummary {
  const totals = pickDailyTotals(counts);
  const series = toGerminationCounts(sowing.sown_on, totals);
  const germinated = totals.length ? totals[totals.length - 1].total : 0;
  const empty: SowingSummary = { sown: sowing.seeds_sown, germinated, interval: null, metrics: null, curve: [], problem: null };
  try {
    const perInterval = convertToPerInterval(series, "cumulative");
    const metrics = series.length ? computeGerminationMetrics({ sown: sowing.seeds_sown, counts: series, entry: "cumulative" }) : null;
    const interval = computeWilsonInterval(Math.min(germinated, sowing.seeds_sown), sowing.seeds_sown);
    let running = 0;
    const curve: SowingSummary["curve"] = [{ day: 0, percent: 0, countedOn: sowing.sown_on }];
    for (const c of perInterval) {
      running += c.count;
      curve.push({ day: c.day, percent: (100 * running) / sowing.seeds_sown, countedOn: addDaysToIsoDay(sowing.sown_on, c.day) });
    }
    return { ...empty, germinated: metrics?.germinated ?? germinated, interval, metrics, curve };
  } catch (e) {
    if (e instanceof AppError) return { ...empty, problem: e.message };
    throw e;
  }
}
