import { AppError } from "@/lib/errors";
import { addDaysToIsoDay, countDaysBetween, type IsoDay } from "@/lib/domain/dates";
import { computeGerminationMetrics, convertToPerInterval, type GerminationCount, type GerminationMetrics } from "@/lib/domain/germination";
import { computeWilsonInterval, type ProportionInterval } from "@/lib/domain/statistics";
import { pickDailyTotals, type CountRowForTotals, type DailyTotal } from "@/lib/domain/count-rules";
import type { Sowing } from "@/lib/schemas/sowing";

// Pure wiring between the phone's count rows and lib/domain: no React, no Dexie, so it is unit-tested.
// The rule for a running total (judgeCountEntry) lives in lib/domain: the server re-checks pushed counts with it.

type CountRow = CountRowForTotals;

/** The seedlings up at the last count (0 before the first count). */
export function findFinalTotal(counts: readonly CountRow[]): number {
  const days = pickDailyTotals(counts);
  return days.length ? days[days.length - 1].total : 0;
}

/** Counts as lib/domain wants them: day = calendar days since sowing, cumulative. Sowing-day counts are left out (day 0). */
export function toGerminationCounts(sownOn: IsoDay, totals: readonly DailyTotal[]): GerminationCount[] {
  return totals.map((t) => ({ day: countDaysBetween(sownOn, t.countedOn), count: t.total })).filter((c) => c.day > 0);
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
