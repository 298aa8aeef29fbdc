import { AppError } from "@/lib/errors";
import {
  computePullWindow,
  convertFromCelsius,
  defaultEffectiveBand,
  findOptimumBand,
  measureColdExposure,
  shiftPullWindow,
  type ColdExposure,
  type PullWindow,
  type TemperatureReading,
  type TemperatureUnit,
} from "@/lib/domain";
import type { ProtocolForPlan } from "@/lib/domain/schedule";
import type { TemperatureBand } from "@/lib/schemas/protocol";
import type { Reading } from "@/lib/schemas/reading";
import type { Bag } from "@/lib/schemas/bag";

// Pure wiring from a store's reading rows to lib/domain's cold exposure, for the store page and its chart.

type ReadingRow = Pick<Reading, "taken_at" | "temperature_c"> & { deleted_at?: string | null };

export function toTemperatureReadings(readings: readonly ReadingRow[]): TemperatureReading[] {
  return readings.filter((r) => !r.deleted_at).map((r) => ({ at: r.taken_at, value: r.temperature_c, unit: "C" as const }));
}

export interface ChartPoint {
  t: number;
  value: number;
}

/** Readings in time order, in the farm's unit, from `sinceMs` on (all when null). */
export function buildChartPoints(readings: readonly ReadingRow[], unit: TemperatureUnit, sinceMs: number | null): ChartPoint[] {
  return readings
    .filter((r) => !r.deleted_at)
    .map((r) => ({ t: Date.parse(r.taken_at), value: Math.round(convertFromCelsius(r.temperature_c, unit) * 10) / 10 }))
    .filter((p) => Number.isFinite(p.t) && (sinceMs === null || p.t >= sinceMs))
    .sort((a, b) => a.t - b.t);
}

export interface BandInUnit {
  band: { min: number; max: number };
  optimum: { min: number; max: number };
}

/** The effective band and its optimum, in the farm's unit, for shading the chart. */
export function describeBand(unit: TemperatureUnit, band: TemperatureBand = defaultEffectiveBand): BandInUnit {
  const optimum = findOptimumBand(band);
  const c = (v: number) => Math.round(convertFromCelsius(v, unit) * 10) / 10;
  return { band: { min: c(band.minC), max: c(band.maxC) }, optimum: { min: c(optimum.minC), max: c(optimum.maxC) } };
}

/** The store over the chosen period, against the default band (a store serves many protocols). */
export function measureStore(readings: readonly ReadingRow[], sinceMs: number | null): ColdExposure | null {
  const all = toTemperatureReadings(readings).filter((r) => sinceMs === null || Date.parse(r.at) >= sinceMs);
  if (all.length === 0) return null;
  return measureColdExposure(all);
}

export interface BagCold {
  exposure: ColdExposure | null;
  window: PullWindow | null;
  shifted: PullWindow | null;
  problem: string | null;
}

/** Local midnight of a day as a timestamp the domain accepts. */
function startOfDay(day: string): string {
  return new Date(`${day}T00:00:00`).toISOString();
}

/**
 * Effective cold days of a bag in this store (start to pull, or to now) within its protocol's band, and its pull
 * window moved later by the days it lost its cold.
 */
export function measureBagCold(
  bag: Pick<Bag, "start_date" | "pulled_on" | "discarded_on">,
  protocol: ProtocolForPlan | null,
  readings: readonly ReadingRow[],
  nowIso: string,
): BagCold {
  if (!bag.start_date) return { exposure: null, window: null, shifted: null, problem: "Not started yet." };
  try {
    const band = protocol?.effectiveBand ?? defaultEffectiveBand;
    const endDay = bag.pulled_on ?? bag.discarded_on;
    const to = endDay ? startOfDay(endDay) : nowIso;
    const from = startOfDay(bag.start_date);
    if (Date.parse(to) <= Date.parse(from)) return { exposure: null, window: null, shifted: null, problem: "Started today: nothing to measure yet." };
    const exposure = measureColdExposure(toTemperatureReadings(readings), { band, from, to });
    const window = protocol ? computePullWindow(protocol, bag.start_date) : null;
    const shifted = window ? shiftPullWindow(window, exposure.lostDays) : null;
    return { exposure, window, shifted, problem: null };
  } catch (e) {
    if (e instanceof AppError) return { exposure: null, window: null, shifted: null, problem: e.message };
    throw e;
  }
}
