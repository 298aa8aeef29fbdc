import { DomainError } from "@/lib/errors";

// Times to an event when some cases are unfinished (a bag pulled before roots showed, one still in the fridge).
// Kaplan, E. L. & Meier, P. (1958), JASA 53:457–481 (product-limit estimator); Greenwood, M. (1926) for its
// variance; the 95 % interval on the log scale as R's survival::survfit does by default (conf.type = "log").

/** One case: the day it ended, and whether the event was seen then (false: unfinished, censored at that day). */
export interface TimeObservation {
  time: number;
  event: boolean;
}

export interface SurvivalStep {
  time: number;
  /** Cases still without the event just before `time`. */
  atRisk: number;
  events: number;
  censored: number;
  /** Share still without the event after `time`. */
  survival: number;
  /** Greenwood standard error of `survival`. */
  stdErr: number;
  /** 95 % interval, log scale (upper capped at 1); null once the curve reaches 0 (R gives NA there). */
  lower: number | null;
  upper: number | null;
}

export interface SurvivalCurve {
  /** Cases the curve rests on. */
  n: number;
  events: number;
  /** One step per distinct time (events or censorings only), in time order. */
  steps: SurvivalStep[];
  /** First time the curve is at or below 0.5; null when it never is. */
  median: number | null;
  earliestEvent: number | null;
  latestEvent: number | null;
}

const z95 = 1.959963984540054;

/**
 * The product-limit curve. At a tie the events count before the censorings (a case censored on the day of an event
 * was still at risk for it), as R does. Linear after one sort.
 */
export function estimateSurvival(observations: readonly TimeObservation[]): SurvivalCurve {
  for (const o of observations) {
    if (!Number.isFinite(o.time) || o.time < 0) throw new DomainError(`A time to an event must be a number of days of 0 or more (got ${o.time}).`);
  }
  const sorted = [...observations].sort((a, b) => a.time - b.time || Number(b.event) - Number(a.event));
  const steps: SurvivalStep[] = [];
  let atRisk = sorted.length;
  let survival = 1;
  let greenwood = 0; // Σ d / (n (n − d))
  let events = 0;
  let median: number | null = null;
  let earliestEvent: number | null = null;
  let latestEvent: number | null = null;
  let i = 0;
  while (i < sorted.length) {
    const time = sorted[i].time;
    let d = 0;
    let c = 0;
    while (i < sorted.length && sorted[i].time === time) {
      if (sorted[i].event) d++;
      else c++;
      i++;
    }
    if (d > 0) {
      survival *= 1 - d / atRisk;
      greenwood += atRisk === d ? Infinity : d / (atRisk * (atRisk - d));
      events += d;
      earliestEvent ??= time;
      latestEvent = time;
      // A product of fractions can land a hair above 0.5 (0.75 × 2/3); R compares with a tolerance too.
      if (median === null && survival <= 0.5 + 1e-9) median = time;
    }
    const seLog = Math.sqrt(greenwood);
    const open = survival > 0 && Number.isFinite(seLog);
    steps.push({
      time,
      atRisk,
      events: d,
      censored: c,
      survival,
      stdErr: open ? survival * seLog : 0,
      lower: open ? survival * Math.exp(-z95 * seLog) : null,
      upper: open ? Math.min(1, survival * Math.exp(z95 * seLog)) : null,
    });
    atRisk -= d + c;
  }
  return { n: sorted.length, events, steps, median, earliestEvent, latestEvent };
}

/** The curve's value at `time` (1 before the first event): a step function, right-continuous. */
export function readSurvivalAt(curve: SurvivalCurve, time: number): number {
  let s = 1;
  for (const step of curve.steps) {
    if (step.time > time) break;
    s = step.survival;
  }
  return s;
}
