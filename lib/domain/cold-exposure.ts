import type { TemperatureBand } from "@/lib/schemas/protocol";
import { DomainError } from "@/lib/errors";
import { addDaysToIsoDay } from "./dates";
import { defaultEffectiveBand, findOptimumBand } from "./protocols";
import type { PullWindow } from "./schedule";
import { convertToCelsius, formatTemperature, type TemperatureUnit } from "./units";

export interface TemperatureReading {
  /** ISO 8601 timestamp, e.g. "2024-01-15T08:00:00+01:00". */
  at: string;
  value: number;
  unit: TemperatureUnit;
}

/** How time without readings is counted. The choice is always stated back to the grower. */
export type GapAssumption = "in_band" | "last_reading" | "not_counted";

export interface ColdExposureOptions {
  band?: TemperatureBand;
  optimum?: TemperatureBand;
  /** Period to account for (ISO timestamps); defaults to the first and last reading. */
  from?: string;
  to?: string;
  /** A reading holds until the next one for at most this long; longer silences are gaps. */
  maxGapHours?: number;
  gapAssumption?: GapAssumption;
}

export interface Excursion {
  kind: "above" | "below";
  startAt: string;
  /** First reading back inside the band, or the last reading when it never came back. */
  endAt: string;
  ongoing: boolean;
  hours: number;
  /** Warmest (above) or coldest (below) reading, °C. */
  peakC: number;
  peakAt: string;
}

export interface ReadingGap {
  startAt: string;
  endAt: string;
  hours: number;
}

export interface ColdExposure {
  totalHours: number;
  hoursInBand: number;
  hoursInOptimum: number;
  hoursAbove: number;
  hoursBelow: number;
  /** Below 0 °C. */
  hoursFrozen: number;
  /** Gap hours counted as neither cold nor warm ("not_counted"). */
  hoursUnknown: number;
  calendarDays: number;
  effectiveColdDays: number;
  /** Whole days the bag missed its cold (rounded to the nearest day); the pull window moves by this much. */
  lostDays: number;
  excursions: Excursion[];
  gaps: ReadingGap[];
  /** Plain sentences that say what was assumed. */
  assumptions: string[];
  band: TemperatureBand;
  optimum: TemperatureBand;
}

const hourMs = 3_600_000;

export interface ParsedReading {
  t: number;
  c: number;
  at: string;
}

function parseTimestamp(at: string, what: string): number {
  const t = Date.parse(at);
  if (!Number.isFinite(t)) throw new DomainError(`${what} has a time "${at}" that is not a date and time.`, { at: "Use a date and time like 2024-01-15T08:00." });
  return t;
}

/** Sorts by time (input order does not matter) and converts °F to °C. */
export function normalizeReadings(readings: readonly TemperatureReading[]): ParsedReading[] {
  return readings
    .map((r, i) => ({ t: parseTimestamp(r.at, `Reading ${i + 1}`), c: convertToCelsius(r.value, r.unit), at: r.at }))
    // Two readings at the same moment: the colder first, so the order they were entered in never matters.
    .sort((a, b) => a.t - b.t || a.c - b.c);
}

function isInside(c: number, band: TemperatureBand): boolean {
  return c >= band.minC && c <= band.maxC;
}

function describeHours(h: number): string {
  return h >= 48 ? `${(h / 24).toFixed(1)} days` : `${h.toFixed(1)} h`;
}

/**
 * Hours a bag spent inside and outside its cold band, from its store's readings.
 * Each reading is taken to hold until the next; silences longer than maxGapHours are gaps, counted per gapAssumption.
 */
export function measureColdExposure(readings: readonly TemperatureReading[], options: ColdExposureOptions = {}): ColdExposure {
  const band = options.band ?? defaultEffectiveBand;
  const optimum = options.optimum ?? findOptimumBand(band);
  const maxGapMs = (options.maxGapHours ?? 6) * hourMs;
  const gapAssumption = options.gapAssumption ?? "in_band";
  const sorted = normalizeReadings(readings);
  const from = options.from !== undefined ? parseTimestamp(options.from, "The start") : sorted[0]?.t;
  const to = options.to !== undefined ? parseTimestamp(options.to, "The end") : sorted[sorted.length - 1]?.t;
  const result: ColdExposure = {
    totalHours: 0,
    hoursInBand: 0,
    hoursInOptimum: 0,
    hoursAbove: 0,
    hoursBelow: 0,
    hoursFrozen: 0,
    hoursUnknown: 0,
    calendarDays: 0,
    effectiveColdDays: 0,
    lostDays: 0,
    excursions: [],
    gaps: [],
    assumptions: [],
    band,
    optimum,
  };
  if (from === undefined || to === undefined) {
    result.assumptions.push("No readings and no period: nothing was measured.");
    return result;
  }
  if (to < from) throw new DomainError("The end of the period is before its start.");
  const inPeriod = sorted.filter((r) => r.t >= from && r.t <= to);
  // The reading just before the period still describes its first hours.
  const before = sorted.filter((r) => r.t < from).pop();
  const points = before ? [before, ...inPeriod] : inPeriod;

  const addSpan = (ms: number, c: number) => {
    const h = ms / hourMs;
    if (isInside(c, band)) result.hoursInBand += h;
    else if (c > band.maxC) result.hoursAbove += h;
    else result.hoursBelow += h;
    if (isInside(c, optimum)) result.hoursInOptimum += h;
    if (c < 0) result.hoursFrozen += h;
  };
  const addGap = (start: number, end: number, lastC: number | null) => {
    if (end <= start) return;
    const hours = (end - start) / hourMs;
    result.gaps.push({ startAt: new Date(start).toISOString(), endAt: new Date(end).toISOString(), hours });
    if (gapAssumption === "in_band") result.hoursInBand += hours;
    else if (gapAssumption === "last_reading" && lastC !== null) addSpan(end - start, lastC);
    else result.hoursUnknown += hours;
  };

  // Walk the period as pieces [start, end) each described by one reading, or by none (a gap).
  let cursor = from;
  if (points.length === 0) addGap(from, to, null);
  for (let i = 0; i < points.length && cursor < to; i++) {
    const p = points[i];
    const nextT = i + 1 < points.length ? points[i + 1].t : to;
    if (p.t > cursor) {
      // Before the first reading: short lead-ins take the first reading's value.
      if (p.t - cursor <= maxGapMs) addSpan(p.t - cursor, p.c);
      else addGap(cursor, p.t, null);
      cursor = p.t;
    }
    const end = Math.min(nextT, to);
    if (end > cursor) {
      if (end - p.t <= maxGapMs) addSpan(end - cursor, p.c);
      else addGap(cursor, end, p.c);
      cursor = end;
    }
  }

  result.totalHours = (to - from) / hourMs;
  result.calendarDays = result.totalHours / 24;
  result.effectiveColdDays = Math.min(result.hoursInBand / 24, result.calendarDays);
  result.lostDays = Math.max(0, Math.round(result.calendarDays - result.effectiveColdDays));
  result.excursions = findExcursions(points, band);

  if (points.length > 0) result.assumptions.push("Each reading is taken to hold until the next one.");
  if (result.gaps.length > 0) {
    const total = result.gaps.reduce((s, g) => s + g.hours, 0);
    const how =
      gapAssumption === "in_band"
        ? `assumed the store stayed between ${formatTemperature(band.minC)} and ${formatTemperature(band.maxC)}, as a working fridge does`
        : gapAssumption === "last_reading"
          ? "assumed the store stayed at its last reading"
          : "not counted as cold";
    result.assumptions.push(
      `No readings for ${describeHours(total)} in ${result.gaps.length} gap${result.gaps.length === 1 ? "" : "s"} (longer than ${describeHours(maxGapMs / hourMs)}): ${how}.`,
    );
  }
  return result;
}

/** Runs of consecutive readings outside the band, each with start, end and peak. */
export function findExcursions(points: readonly ParsedReading[], band: TemperatureBand): Excursion[] {
  const out: Excursion[] = [];
  let open: Excursion | null = null;
  for (const p of points) {
    const kind = p.c > band.maxC ? "above" : p.c < band.minC ? "below" : null;
    if (open && open.kind !== kind) {
      open.endAt = p.at;
      open.ongoing = false;
      open.hours = (Date.parse(p.at) - Date.parse(open.startAt)) / hourMs;
      out.push(open);
      open = null;
    }
    if (kind && !open) open = { kind, startAt: p.at, endAt: p.at, ongoing: true, hours: 0, peakC: p.c, peakAt: p.at };
    if (open && (kind === "above" ? p.c > open.peakC : p.c < open.peakC)) {
      open.peakC = p.c;
      open.peakAt = p.at;
    }
    if (open) {
      open.endAt = p.at;
      open.hours = (p.t - Date.parse(open.startAt)) / hourMs;
    }
  }
  if (open) out.push(open);
  return out;
}

/** Moves the pull window later by the days the bag lost its cold (calendar days). */
export function shiftPullWindow(window: PullWindow, lostDays: number): PullWindow {
  if (!Number.isInteger(lostDays) || lostDays < 0) throw new DomainError("Lost days must be a whole number, zero or more.");
  return {
    ...window,
    opensOn: addDaysToIsoDay(window.opensOn, lostDays),
    closesOn: window.closesOn === null ? null : addDaysToIsoDay(window.closesOn, lostDays),
    plannedPullOn: addDaysToIsoDay(window.plannedPullOn, lostDays),
  };
}
