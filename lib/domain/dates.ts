import { addDays, differenceInCalendarDays } from "date-fns";
import { DomainError } from "@/lib/errors";

/** A calendar day as "yyyy-MM-dd". Days are counted on the calendar, never as hours/24. */
export type IsoDay = string;

const isoDayPattern = /^(\d{4})-(\d{2})-(\d{2})$/;

function pad2(n: number): string {
  return n < 10 ? `0${n}` : String(n);
}

/** Local midnight of the day; date-fns then adds calendar days, so DST changes cannot shift it. */
export function parseIsoDay(day: IsoDay, field = "date"): Date {
  const m = isoDayPattern.exec(day);
  if (!m) throw new DomainError(`The ${field} "${day}" is not a date like 2024-03-21.`, { [field]: "Use yyyy-mm-dd." });
  const y = Number(m[1]);
  const mo = Number(m[2]);
  const d = Number(m[3]);
  const date = new Date(y, mo - 1, d);
  // new Date rolls 2024-02-30 over to March; a real date survives the round trip.
  if (date.getFullYear() !== y || date.getMonth() !== mo - 1 || date.getDate() !== d) {
    throw new DomainError(`The ${field} "${day}" is not a real calendar date.`, { [field]: "No such day." });
  }
  return date;
}

/** Formats by hand: the same result as date-fns format(d, "yyyy-MM-dd"), and much faster for a round of 10,000 bags. */
export function formatIsoDay(date: Date): IsoDay {
  const y = date.getFullYear();
  const ys = y >= 0 && y < 10000 ? String(y).padStart(4, "0") : String(y);
  return `${ys}-${pad2(date.getMonth() + 1)}-${pad2(date.getDate())}`;
}

export function isIsoDay(day: string): boolean {
  try {
    parseIsoDay(day);
    return true;
  } catch {
    return false;
  }
}

// A round of 10,000 bags asks for the same few hundred (day, offset) pairs; the answer never depends on the time zone.
// Keyed by offset, then day, so a look-up builds no key string.
const addDaysCache = new Map<number, Map<IsoDay, IsoDay>>();
let addDaysCacheSize = 0;

// Timestamps of the same minute and zone fall on the same local day: years of checks convert each minute once.
const dayOfMinute = new Map<string, IsoDay>();

/** Empties the memos (tests that switch time zones use it to prove the arithmetic itself is zone-proof). */
export function clearDayArithmeticCache(): void {
  addDaysCache.clear();
  addDaysCacheSize = 0;
  dayOfMinute.clear();
}

/** The local calendar day of an ISO timestamp (a check at 00:30 belongs to that morning). */
export function findLocalDayOfTimestamp(at: string): IsoDay {
  // "2026-11-02T09:15:30.000Z": memoised by "2026-11-02T09:15"; other shapes are converted each time.
  if (at.length !== 24 || at.charCodeAt(23) !== 90 /* Z */) return formatIsoDay(new Date(at));
  const key = at.slice(0, 16);
  let day = dayOfMinute.get(key);
  if (day === undefined) {
    if (dayOfMinute.size >= 50_000) dayOfMinute.clear();
    dayOfMinute.set(key, (day = formatIsoDay(new Date(at))));
  }
  return day;
}

export function addDaysToIsoDay(day: IsoDay, days: number): IsoDay {
  if (!Number.isInteger(days)) throw new DomainError(`A number of days must be whole (got ${days}).`);
  let byDay = addDaysCache.get(days);
  const cached = byDay?.get(day);
  if (cached !== undefined) return cached;
  const result = formatIsoDay(addDays(parseIsoDay(day), days));
  if (addDaysCacheSize >= 20_000) {
    addDaysCache.clear();
    addDaysCacheSize = 0;
    byDay = undefined;
  }
  if (!byDay) addDaysCache.set(days, (byDay = new Map()));
  byDay.set(day, result);
  addDaysCacheSize++;
  return result;
}

/** The day's number since 1970-01-01 on the calendar itself (UTC has no daylight saving, so no hour is lost). */
function numberDay(day: IsoDay): number {
  const m = isoDayPattern.exec(day);
  if (m) {
    const y = Number(m[1]);
    const mo = Number(m[2]);
    const d = Number(m[3]);
    const ms = Date.UTC(y, mo - 1, d);
    const back = new Date(ms);
    if (back.getUTCFullYear() === y && back.getUTCMonth() === mo - 1 && back.getUTCDate() === d) return ms / 86_400_000;
  }
  // Not a real day: parseIsoDay refuses it in the grower's words.
  return differenceInCalendarDays(parseIsoDay(day), 0);
}

/** Calendar days from `from` to `to` (positive when `to` is later). Whole-day arithmetic, fast enough for years of checks. */
export function countDaysBetween(from: IsoDay, to: IsoDay): number {
  return numberDay(to) - numberDay(from);
}

/** yyyy-MM-dd strings sort as dates, so comparisons need no parsing. */
export function compareIsoDays(a: IsoDay, b: IsoDay): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

export function pickEarlierDay(a: IsoDay, b: IsoDay): IsoDay {
  return a <= b ? a : b;
}

export function pickLaterDay(a: IsoDay, b: IsoDay): IsoDay {
  return a >= b ? a : b;
}

const monthWords = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];

/** "2024-03-06" → "6 Mar 2024": how a day is written in any sentence a grower reads. */
export function formatDayInWords(day: IsoDay): string {
  const [y, m, d] = day.split("-").map(Number);
  return `${d} ${monthWords[m - 1]} ${y}`;
}
