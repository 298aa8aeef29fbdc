import { AppError } from "@/lib/errors";
import { measureColdExposure, type ColdExposure, type TemperatureReading } from "@/lib/domain/cold-exposure";
import type { IsoDay } from "@/lib/domain/dates";
import { prepareStoreReadings, type StoreReadings } from "@/lib/domain/effective-window";
import { defaultEffectiveBand, findOptimumBand } from "@/lib/domain/protocols";
import type { PullWindow } from "@/lib/domain/schedule";
import { convertFromCelsius, type TemperatureUnit } from "@/lib/domain/units";
import { findEffectiveBagWindow, type BagForWindow } from "@/lib/domain/rows/bag-rows";
import type { ProtocolRow } from "@/lib/client/db";
import type { StoreKind } from "@/lib/schemas/words";
import type { TemperatureBand } from "@/lib/schemas/protocol";
import type { Reading } from "@/lib/schemas/reading";

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

/** The store over the chosen period, against its own kind's band (a fridge serves many protocols). */
export function measureStore(readings: readonly ReadingRow[], sinceMs: number | null, band: TemperatureBand = defaultEffectiveBand): ColdExposure | null {
  const all = toTemperatureReadings(readings).filter((r) => sinceMs === null || Date.parse(r.at) >= sinceMs);
  if (all.length === 0) return null;
  return measureColdExposure(all, { band });
}

export interface BagCold {
  /** Hours in and out of the band over the bag's time in the cold; only a fridge is held to a band. */
  exposure: ColdExposure | null;
  /** The planned window, and the one every screen uses (moved later by cold lost), from lib/domain. */
  window: PullWindow | null;
  shifted: PullWindow | null;
  lostDays: number;
  /** Plain words on why the window is where it is, or why nothing was measured. */
  reason: string;
}

// Every bag of a store reads the same readings: convert and sort them once per readings array, not once per bag.
const preparedReadings = new WeakMap<readonly ReadingRow[], { temperatureReadings: TemperatureReading[]; prepared: StoreReadings }>();
function prepareOnce(readings: readonly ReadingRow[]) {
  let hit = preparedReadings.get(readings);
  if (!hit) {
    const temperatureReadings = toTemperatureReadings(readings);
    preparedReadings.set(readings, (hit = { temperatureReadings, prepared: prepareStoreReadings(temperatureReadings) }));
  }
  return hit;
}

/**
 * A bag's cold in this store: its effective window (the same lib/domain function Today, the bags table, labels and
 * the digest use, so this page never disagrees with them) and, in a fridge, the hours behind it.
 */
export function measureBagCold(
  bag: BagForWindow,
  protocol: ProtocolRow | null,
  readings: readonly ReadingRow[],
  storeKind: StoreKind,
  today: IsoDay,
): BagCold {
  const { temperatureReadings, prepared } = prepareOnce(readings);
  const effective = findEffectiveBagWindow(bag, protocol, prepared, today, { storeKind });
  let exposure: ColdExposure | null = null;
  if (effective.span && storeKind === "fridge" && effective.span.to > effective.span.from) {
    try {
      exposure = measureColdExposure(temperatureReadings, { band: effective.band, from: new Date(effective.span.from).toISOString(), to: new Date(effective.span.to).toISOString() });
    } catch (e) {
      if (!(e instanceof AppError)) throw e;
    }
  }
  return { exposure, window: effective.planned, shifted: effective.window, lostDays: effective.lostDays, reason: effective.reason };
}

/** Said once for the whole store instead of under every bag: how far the cold it lost moves its bags' pull
 *  windows ("Cold lost here moves these 3 bags' pull windows 4 days later."; mixed amounts listed by size). */
export function describeStoreColdLoss(lostDays: readonly number[]): string | null {
  const moved = lostDays.filter((d) => d > 0);
  if (moved.length === 0) return null;
  const days = (n: number) => `${n} ${n === 1 ? "day" : "days"}`;
  const which = moved.length === lostDays.length ? (moved.length === 1 ? "this bag's pull window" : `these ${moved.length} bags' pull windows`) : `the pull windows of ${moved.length} of these ${lostDays.length} bags`;
  const by = new Map<number, number>();
  for (const d of moved) by.set(d, (by.get(d) ?? 0) + 1);
  if (by.size === 1) return `Cold lost here moves ${which} ${days(moved[0]!)} later.`;
  const parts = [...by.entries()].sort((a, b) => b[0] - a[0]).map(([d, n]) => `${n} by ${days(d)}`);
  return `Cold lost here moves ${which} later: ${parts.join(", ")}.`;
}
