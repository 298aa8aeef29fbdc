import type { TemperatureBand } from "@/lib/schemas/protocol";
import type { StoreKind } from "@/lib/schemas/words";
import { convertToCelsius, formatTemperature } from "./units";
import { parseIsoDay, type IsoDay } from "./dates";
import { defaultEffectiveBand, reconcileProtocol, type ReconciledProtocol } from "./protocols";
import { planBagPhases, type BagPlan, type BagRecord, type ProtocolForPlan, type PullWindow } from "./schedule";
import { shiftPullWindow, type TemperatureReading } from "./cold-exposure";

// The pull window every screen uses: the planned one, moved later by the cold days the bag lost in its store.
// The readings of a store are sorted once; each bag then costs two binary searches and a subtraction, so a round
// of 10,000 bags stays cheap. The counting rules are measureColdExposure's defaults, so the bag page's cold-day
// details and the window always agree (tests/unit/domain/effective-window.test.ts checks this).

const dayMs = 86_400_000;
/** measureColdExposure's default: a reading holds until the next for at most 6 h; longer silences count as cold. */
const maxGapMs = 6 * 3_600_000;

export interface StoreReadings {
  /** Milliseconds since 1970, ascending; equal times keep the colder reading first (as normalizeReadings sorts). */
  times: Float64Array;
  celsius: Float64Array;
  /** Out-of-band time before each reading, per band; built on first use, then shared by every bag in the store. */
  outBefore: Map<string, Float64Array>;
}

/**
 * A store's readings as parallel arrays (ms since 1970, °C), sorted once: by time, the colder first at equal times
 * (as normalizeReadings sorts). Readings whose time cannot be read are left out. Already-sorted input (the phone
 * reads a store by its time index) costs one pass.
 */
export function sortStoreReadings(times: Float64Array, celsius: Float64Array): StoreReadings {
  // The usual case (the phone reads by the time index, every value readable) allocates nothing.
  let clean = true;
  for (let i = 0; i < times.length && clean; i++) {
    if (!Number.isFinite(times[i]) || !Number.isFinite(celsius[i])) clean = false;
    else if (i > 0 && (times[i] < times[i - 1] || (times[i] === times[i - 1] && celsius[i] < celsius[i - 1]))) clean = false;
  }
  if (clean) return { times, celsius, outBefore: new Map() };
  const keep: number[] = [];
  let sorted = true;
  for (let i = 0; i < times.length; i++) {
    if (!Number.isFinite(times[i]) || !Number.isFinite(celsius[i])) continue;
    const last = keep.length ? keep[keep.length - 1] : -1;
    if (last >= 0 && (times[i] < times[last] || (times[i] === times[last] && celsius[i] < celsius[last]))) sorted = false;
    keep.push(i);
  }
  if (!sorted) keep.sort((a, b) => times[a] - times[b] || celsius[a] - celsius[b]);
  if (sorted && keep.length === times.length) return { times, celsius, outBefore: new Map() };
  return { times: Float64Array.from(keep, (i) => times[i]), celsius: Float64Array.from(keep, (i) => celsius[i]), outBefore: new Map() };
}

const isoShape = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/;
const num = (s: string, from: number, to: number) => {
  let n = 0;
  for (let i = from; i < to; i++) n = n * 10 + s.charCodeAt(i) - 48;
  return n;
};

/**
 * Milliseconds of an ISO timestamp. The usual stored shape ("2026-01-05T06:00:00.000Z", as toISOString writes it) is
 * read by hand, several times faster than Date.parse for a logger's season of readings; any other shape, or a field
 * out of its range, goes to Date.parse.
 */
export function parseReadingTime(at: string): number {
  if (at.length !== 24 || !isoShape.test(at)) return Date.parse(at);
  const year = num(at, 0, 4);
  const month = num(at, 5, 7);
  const day = num(at, 8, 10);
  const hour = num(at, 11, 13);
  const minute = num(at, 14, 16);
  const second = num(at, 17, 19);
  const leap = year % 4 === 0 && (year % 100 !== 0 || year % 400 === 0);
  const daysInMonth = month === 2 ? (leap ? 29 : 28) : month === 4 || month === 6 || month === 9 || month === 11 ? 30 : 31;
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth || hour > 23 || minute > 59 || second > 59 || year < 1000) return Date.parse(at);
  return daysFromCivil(year, month, day) * dayMs + hour * 3_600_000 + minute * 60_000 + second * 1000 + num(at, 20, 23);
}

/** Days from 1970-01-01 to a proleptic Gregorian date, as Date.UTC counts them (H. Hinnant's days_from_civil), in a
 *  fraction of Date.UTC's time: a logger's season is tens of thousands of readings per round. */
function daysFromCivil(year: number, month: number, day: number): number {
  const y = month <= 2 ? year - 1 : year;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (month > 2 ? month - 3 : month + 9) + 2) / 5) + day - 1;
  return era * 146_097 + yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy - 719_468;
}

/** Prepares a store's readings once for every bag in it (input order does not matter; °F becomes °C). */
export function prepareStoreReadings(readings: readonly TemperatureReading[]): StoreReadings {
  const times = new Float64Array(readings.length);
  const celsius = new Float64Array(readings.length);
  readings.forEach((r, i) => {
    times[i] = parseReadingTime(r.at);
    celsius[i] = convertToCelsius(r.value, r.unit);
  });
  return sortStoreReadings(times, celsius);
}

const isOut = (c: number, band: TemperatureBand) => c < band.minC || c > band.maxC;

/** outBefore[k]: out-of-band ms over the pieces between readings 0..k (a piece longer than 6 h is a gap, counted as cold). */
function findOutBefore(store: StoreReadings, band: TemperatureBand): Float64Array {
  const key = `${band.minC}|${band.maxC}`;
  let sums = store.outBefore.get(key);
  if (sums) return sums;
  const { times, celsius } = store;
  sums = new Float64Array(times.length);
  for (let i = 1; i < times.length; i++) {
    const dt = times[i] - times[i - 1];
    sums[i] = sums[i - 1] + (dt <= maxGapMs && isOut(celsius[i - 1], band) ? dt : 0);
  }
  store.outBefore.set(key, sums);
  return sums;
}

/** First index whose time is >= t (or > t when `after`). */
function searchTimes(times: Float64Array, t: number, after: boolean): number {
  let lo = 0;
  let hi = times.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (after ? times[mid] <= t : times[mid] < t) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

export interface LostCold {
  /** Milliseconds outside the band within [from, to). */
  lostMs: number;
  /** Readings taken inside [from, to]. */
  readingsInSpan: number;
}

/**
 * Time outside the band between `from` and `to`, counted exactly as measureColdExposure counts it with its defaults:
 * each reading holds until the next (the one just before `from` describes the first hours), a short lead-in takes the
 * first reading's value, and a silence longer than 6 h is a gap assumed to be cold.
 */
export function measureLostCold(store: StoreReadings, band: TemperatureBand, from: number, to: number): LostCold {
  const { times: t, celsius: c } = store;
  if (t.length === 0 || to <= from) return { lostMs: 0, readingsInSpan: 0 };
  const lo = searchTimes(t, from, false);
  const hi = searchTimes(t, to, true) - 1;
  const start = lo > 0 ? lo - 1 : lo;
  const readingsInSpan = Math.max(0, hi - lo + 1);
  if (start > hi) return { lostMs: 0, readingsInSpan };
  let lost = 0;
  let cursor = from;
  if (t[start] > from) {
    if (t[start] - from <= maxGapMs && isOut(c[start], band)) lost += t[start] - from;
    cursor = t[start];
  }
  const firstEnd = start < hi ? t[start + 1] : to;
  if (firstEnd > cursor && firstEnd - t[start] <= maxGapMs && isOut(c[start], band)) lost += firstEnd - cursor;
  if (hi > start) {
    const sums = findOutBefore(store, band);
    lost += sums[hi] - sums[start + 1];
    if (to > t[hi] && to - t[hi] <= maxGapMs && isOut(c[hi], band)) lost += to - t[hi];
  }
  return { lostMs: lost, readingsInSpan };
}

/** What the window rests on, for the words beside it. */
export type WindowBasis =
  | "no_window"
  | "not_started"
  | "not_cold_yet"
  | "frozen_phase"
  | "freezer"
  | "cold_frame"
  | "no_store"
  | "no_readings"
  | "kept_cold"
  | "shifted";

export interface EffectiveWindow {
  /** The window every screen shows and every rule uses (state, round, labels, digest). */
  window: PullWindow | null;
  planned: PullWindow | null;
  shifted: boolean;
  /** Whole days of cold lost (rounded to the nearest day, as measureColdExposure rounds). */
  lostDays: number;
  basis: WindowBasis;
  /** Plain words: why the window is where it is, and what was assumed. */
  reason: string;
  /** The bag's time in the cold the readings were counted over (ms); null when nothing was counted. */
  span: { from: number; to: number } | null;
  band: TemperatureBand;
  /** When a warm-then-cold bag should move to the cold store (still ahead or not yet recorded). */
  nextMoveOn: IsoDay | null;
}

export interface EffectiveWindowInput {
  bag: BagRecord;
  /** Reconcile once per protocol and pass the result when many bags share it. Null: no protocol. */
  protocol: ProtocolForPlan | ReconciledProtocol | null;
  /** The window stored with the bag, used when no protocol gives one. */
  storedWindow?: PullWindow | null;
  /** planBagPhases(protocol, startedOn), when the caller already has it (bags started together share one). */
  plan?: BagPlan | null;
  /** The bag's store's readings (prepareStoreReadings); null when the bag is in no store. */
  readings: StoreReadings | null;
  /** Only a fridge is held to the protocol's cold band; a freezer or cold frame is its own treatment. */
  storeKind?: StoreKind | null;
  /** Count readings up to this moment (ms), or to the pull/discard day when that came first. */
  asOf: number;
  /** Start of a calendar day in ms; local midnight unless the farm's time zone is given. */
  startOfDay?: (day: IsoDay) => number;
}

const localStartOfDay = (day: IsoDay) => parseIsoDay(day).getTime();
const plural = (n: number) => (n === 1 ? "1 day" : `${n} days`);
// Thousands of bags share a few bands: their words are made once.
const bandWordsCache = new Map<string, string>();
function describeBand(band: TemperatureBand): string {
  const key = `${band.minC}|${band.maxC}`;
  let words = bandWordsCache.get(key);
  if (words === undefined) bandWordsCache.set(key, (words = `${formatTemperature(band.minC)} to ${formatTemperature(band.maxC)}`));
  return words;
}

/**
 * The bag's effective pull window: the planned one, shifted later by the cold days its fridge's readings show it lost
 * during its cold phase (readings outside that span are ignored); the planned one, with the assumption said, when
 * there is nothing to count. A frozen final phase, a freezer or a cold frame is not measured against a fridge band.
 */
export function findEffectiveWindow(input: EffectiveWindowInput): EffectiveWindow {
  const { bag, readings, asOf } = input;
  const startOfDay = input.startOfDay ?? localStartOfDay;
  const reconciled = input.protocol ? ("timedPhases" in input.protocol ? input.protocol : reconcileProtocol(input.protocol)) : null;
  const band = reconciled?.effectiveBand ?? defaultEffectiveBand;
  const plan = input.plan !== undefined ? input.plan : reconciled && bag.startedOn ? planBagPhases(reconciled, bag.startedOn) : null;
  const planned = plan?.window ?? input.storedWindow ?? null;
  const nextMoveOn = plan?.nextMoveOn ?? null;
  const keep = (basis: WindowBasis, reason: string, span: EffectiveWindow["span"] = null): EffectiveWindow => ({
    window: planned, planned, shifted: false, lostDays: 0, basis, reason, span, band, nextMoveOn,
  });
  if (!planned) return keep("no_window", "No pull window: no protocol window or no start date yet.");
  if (!bag.startedOn) return keep("not_started", "Planned window: the bag has not started yet.");
  const lastPhase = plan?.phases[plan.phases.length - 1];
  if (lastPhase?.kind === "frozen") return keep("frozen_phase", "Frozen phase: the window is not moved by a fridge's cold band.");

  const from = startOfDay(lastPhase?.startsOn ?? bag.startedOn);
  const endDay = bag.pulledOn ?? bag.sownOn ?? bag.discardedOn ?? null;
  const to = Math.min(asOf, endDay ? startOfDay(endDay) : asOf);
  if (to <= from) return keep("not_cold_yet", "The bag's time in the cold has not begun: the window stays as planned.");
  const span = { from, to };
  if (!readings) return keep("no_store", "Not in a cold store, so no readings: the window stays as planned.");
  // A freezer is a different treatment, not more cold (US FDA freezer −18 °C vs fridge ≤ 4 °C); a cold frame's frosts
  // and thaws are its treatment. Neither is measured against a fridge band (the digest holds them to their own).
  if (input.storeKind === "freezer") return keep("freezer", "In a freezer: a different treatment from a fridge, not more cold, so the window is not moved by the fridge band.", span);
  if (input.storeKind === "cold_frame") return keep("cold_frame", "In a cold frame: its frosts and thaws are the treatment, so the window is not moved by a fridge band.", span);
  const { lostMs, readingsInSpan } = measureLostCold(readings, band, from, to);
  const lostDays = Math.max(0, Math.round(lostMs / dayMs));
  const bandWords = describeBand(band);
  if (lostDays === 0) {
    return readingsInSpan === 0
      ? keep("no_readings", `No readings from the store while the bag was in the cold: the window stays as planned, assuming the store held ${bandWords}.`, span)
      : keep("kept_cold", `Readings show the bag kept its cold (${bandWords}; silences over 6 h counted as cold): the window stays as planned.`, span);
  }
  return {
    window: shiftPullWindow(planned, lostDays),
    planned,
    shifted: true,
    lostDays,
    basis: "shifted",
    reason: `About ${plural(lostDays)} of cold lost (readings outside ${bandWords}): the window moves ${plural(lostDays)} later.`,
    span,
    band,
    nextMoveOn,
  };
}
