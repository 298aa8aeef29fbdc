import Papa from "papaparse";
import { AppError } from "@/lib/errors";

// Shared pieces of the CSV imports (readings, lots): bytes → text, finding the header under a
// logger's preamble, rows with their spreadsheet row numbers, and timestamps in the formats
// growers' files really use. Pure: the phone's preview and the server run the same code.

/** The largest file we take, on the phone and on the server. */
export const maxCsvBytes = 5 * 1024 * 1024;

/** What happened to one data row; `row` is the line number a spreadsheet shows (1 = first line of the file). */
export interface CsvRowReport {
  row: number;
  status: "ok" | "error" | "duplicate";
  message?: string;
}

export interface CsvCounts {
  rows: number;
  ok: number;
  errors: number;
  duplicates: number;
}

/** Common shape of both import reports. */
export interface CsvReport {
  /** True when there is something to import and nothing wrong (file-level problems or bad rows). */
  ok: boolean;
  /** Problems with the file as a whole, in a grower's words. */
  problems: string[];
  /** What was read or assumed (columns, unit, day order, time zone), said back to the grower. */
  notes: string[];
  rows: CsvRowReport[];
  counts: CsvCounts;
}

export function countRows(rows: readonly CsvRowReport[]): CsvCounts {
  const counts: CsvCounts = { rows: rows.length, ok: 0, errors: 0, duplicates: 0 };
  for (const r of rows) {
    if (r.status === "ok") counts.ok++;
    else if (r.status === "error") counts.errors++;
    else counts.duplicates++;
  }
  return counts;
}

const notText = "This file is not a text CSV. Open it in your spreadsheet and save it as “CSV UTF-8 (comma delimited)”, then try again.";

/**
 * Bytes → text. Accepts UTF-8 (with or without a byte-order mark) and UTF-16 with its mark;
 * refuses binary files (a spreadsheet workbook, a picture) and text in another encoding, since a
 * wrongly guessed encoding would quietly turn "°F" into something else.
 */
export function decodeCsvBytes(bytes: Uint8Array): string {
  if (bytes.length >= 2 && bytes[0] === 0x50 && bytes[1] === 0x4b) {
    throw new AppError("unsupported_type", "This looks like a spreadsheet workbook (.xlsx), not a CSV. Save it as “CSV UTF-8” and try again.", undefined, 415);
  }
  let utf16: "utf-16le" | "utf-16be" | null = null;
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) utf16 = "utf-16le";
  else if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) utf16 = "utf-16be";
  let text: string;
  if (utf16) {
    text = new TextDecoder(utf16).decode(bytes);
  } else {
    if (bytes.includes(0)) throw new AppError("unsupported_type", notText, undefined, 415);
    try {
      text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
    } catch {
      throw new AppError(
        "unsupported_type",
        "This file is not saved as UTF-8 text, so signs like ° would be misread. In your spreadsheet choose “Save as… CSV UTF-8” and try again.",
        undefined,
        415,
      );
    }
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  // Control characters other than tab and line breaks do not belong in a CSV.
  if (/[\u0000-\u0008\u000e-\u001f]/.test(text)) throw new AppError("unsupported_type", notText, undefined, 415);
  return text;
}

/** Words of a column header: "Temperature (°F)" → ["temperature", "deg", "f"], "tempF" → ["temp", "f"]. */
export function splitHeaderWords(header: string): string[] {
  return header
    .replace(/([a-z])([A-Z])/g, "$1 $2")
    .toLowerCase()
    .replace(/[°º]/g, " deg ")
    .split(/[^a-z0-9]+/)
    .filter(Boolean);
}

export interface CsvLine {
  /** Line number in the file (1-based), as a spreadsheet numbers its rows. */
  row: number;
  cells: string[];
}

export interface CsvTable {
  delimiter: string;
  /** Null for a file without a header row. */
  header: string[] | null;
  headerRow: number | null;
  /** Lines before the header (a logger's serial number, start time …), skipped. */
  preambleLines: number;
  lines: CsvLine[];
}

// Tried in this order: a header that reads well split on tabs or semicolons is rarely a comma file
// (a semicolon file often writes decimal commas, "39,2").
const delimiters = ["\t", ";", ",", "|"] as const;
const maxPreambleLines = 60;

function splitLine(line: string, delimiter: string): string[] {
  const row = Papa.parse<string[]>(line, { delimiter, newline: "\n" }).data[0] ?? [];
  return row.map((c) => (typeof c === "string" ? c.trim() : ""));
}

/**
 * Finds the header within the first lines (a logger export may start with a preamble) and the
 * delimiter that makes it a header, then parses the rest with papaparse, keeping each row's line number.
 * `isHeader` decides whether a line's cells are the header; `isFirstDataLine` (optional) accepts a
 * headerless file whose first data line it recognises.
 */
export function readCsvTable(
  text: string,
  isHeader: (cells: string[]) => boolean,
  isFirstDataLine?: (cells: string[]) => boolean,
): CsvTable | null {
  const normalized = text.replace(/\r\n?/g, "\n");
  const firstLines = normalized.split("\n", maxPreambleLines);
  let start: { index: number; delimiter: string; header: boolean } | null = null;
  search: for (const [kind, test] of [["header", isHeader], ["data", isFirstDataLine]] as const) {
    if (!test) continue;
    for (let i = 0; i < firstLines.length; i++) {
      for (const d of delimiters) {
        // A one-column file (a list of species) has no delimiter at all: read it as commas.
        if (!firstLines[i].includes(d) && d !== ",") continue;
        if (test(splitLine(firstLines[i], d))) {
          start = { index: i, delimiter: d, header: kind === "header" };
          break search;
        }
      }
    }
  }
  if (!start) return null;

  let offset = 0;
  for (let i = 0; i < start.index; i++) offset += firstLines[i].length + 1;
  const body = normalized.slice(offset);
  const lines: CsvLine[] = [];
  const clean = (row: unknown[]) => row.map((c) => (typeof c === "string" ? c.trim() : ""));
  if (!body.includes('"')) {
    // No quotes, so no cell spans lines: row i is line i (the fast path for logger files).
    const rows = Papa.parse<string[]>(body, { delimiter: start.delimiter, newline: "\n", skipEmptyLines: false }).data;
    rows.forEach((row, i) => lines.push({ row: start.index + 1 + i, cells: clean(row) }));
  } else {
    let line = start.index + 1;
    let cursor = 0;
    Papa.parse<string[]>(body, {
      delimiter: start.delimiter,
      newline: "\n",
      skipEmptyLines: false,
      step: (result) => {
        lines.push({ row: line, cells: clean(result.data) });
        const end = result.meta.cursor;
        for (let i = cursor; i < end; i++) if (body.charCodeAt(i) === 10) line++;
        // The cursor stops before the line break that ends the row.
        if (body.charCodeAt(end) === 10) line++;
        cursor = end + 1;
      },
    });
  }
  const header = start.header ? (lines.shift()?.cells ?? null) : null;
  return {
    delimiter: start.delimiter,
    header,
    headerRow: start.header ? start.index + 1 : null,
    preambleLines: start.index,
    lines: lines.filter((l) => l.cells.some((c) => c !== "")),
  };
}

/** Header cells → index of the first column whose words pass `test`, or -1. */
export function findColumn(header: readonly string[], test: (words: string[], raw: string) => boolean, skip: readonly number[] = []): number {
  return header.findIndex((h, i) => !skip.includes(i) && test(splitHeaderWords(h), h));
}

// ---- Timestamps ----

/** Which number comes first in "03/04/2026": the day (dmy) or the month (mdy). */
export type DateOrder = "dmy" | "mdy";

export interface TimestampOptions {
  dateOrder: DateOrder | null;
  /** IANA time zone for times written without an offset (the farm's zone). */
  timeZone: string;
  /** Minutes east of UTC for times without an offset, when the column header named one ("Time, GMT-05:00"). Wins over timeZone. */
  fixedOffsetMinutes?: number | null;
}

interface TimestampParts {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
  ms: number;
  /** Minutes east of UTC written in the text itself, or null. */
  offsetMinutes: number | null;
  hasTime: boolean;
}

type Parsed<T> = { ok: true; value: T } | { ok: false; error: string };

const isoLike =
  /^(\d{4})[-/](\d{1,2})[-/](\d{1,2})(?:(?:T|\s+)(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?\s*(am|pm|a\.m\.|p\.m\.)?)?\s*(Z|UTC|GMT|[+-]\d{2}(?::?\d{2})?)?$/i;
const yearLast =
  /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4}|\d{2})(?:(?:T|\s+|,\s*)(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?\s*(am|pm|a\.m\.|p\.m\.)?)?\s*(Z|UTC|GMT|[+-]\d{2}(?::?\d{2})?)?$/i;

function parseOffset(text: string | undefined): number | null {
  if (!text) return null;
  if (/^(z|utc|gmt)$/i.test(text)) return 0;
  const m = /^([+-])(\d{2}):?(\d{2})?$/.exec(text);
  if (!m) return null;
  const minutes = Number(m[2]) * 60 + Number(m[3] ?? 0);
  return m[1] === "-" ? -minutes : minutes;
}

/** "GMT-05:00", "UTC+1", "(UTC)" in a column header → minutes east of UTC; null when the header names none. */
export function findHeaderOffset(header: string): number | null {
  const m = /\b(?:gmt|utc)\s*(?:([+-])\s*(\d{1,2})(?::?(\d{2}))?)?/i.exec(header);
  if (!m) return null;
  if (!m[1]) return 0;
  const minutes = Number(m[2]) * 60 + Number(m[3] ?? 0);
  return m[1] === "-" ? -minutes : minutes;
}

function applyClock(parts: Omit<TimestampParts, "hour" | "minute" | "second" | "ms" | "hasTime" | "offsetMinutes">, m: RegExpExecArray, from: number): Parsed<TimestampParts> {
  const [h, mi, s, frac, ampm, zone] = [m[from], m[from + 1], m[from + 2], m[from + 3], m[from + 4], m[from + 5]];
  let hour = h === undefined ? 0 : Number(h);
  if (ampm) {
    if (hour < 1 || hour > 12) return { ok: false, error: `"${h} ${ampm}" is not a time on a 12-hour clock.` };
    const pm = ampm.toLowerCase().startsWith("p");
    hour = (hour % 12) + (pm ? 12 : 0);
  }
  const minute = mi === undefined ? 0 : Number(mi);
  const second = s === undefined ? 0 : Number(s);
  if (hour > 23 || minute > 59 || second > 59) return { ok: false, error: "The time of day is not real (hours 0–23, minutes and seconds 0–59)." };
  const ms = frac ? Math.round(Number(`0.${frac}`) * 1000) : 0;
  return { ok: true, value: { ...parts, hour, minute, second, ms: Math.min(ms, 999), offsetMinutes: parseOffset(zone), hasTime: h !== undefined } };
}

const monthNames = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"];

function checkCalendar(year: number, month: number, day: number): string | null {
  if (month < 1 || month > 12) return `There is no month ${month}.`;
  const last = new Date(Date.UTC(year, month, 0)).getUTCDate();
  if (day < 1 || day > last) return `${monthNames[month - 1]} ${year} has no day ${day}.`;
  return null;
}

/** The two leading numbers of a year-last date ("03/04/2026" → [3, 4]), or null for other forms. */
export function readLeadingPair(text: string): [number, number] | null {
  const m = yearLast.exec(text.trim());
  return m ? [Number(m[1]), Number(m[2])] : null;
}

/**
 * Decides day-first or month-first from the dates themselves, only when they leave no doubt:
 * a first number above 12 means day-first, a second number above 12 means month-first.
 */
export function inferDateOrder(texts: Iterable<string>): { order: DateOrder | null; needsChoice: boolean; conflict: boolean } {
  let dayFirst = false;
  let monthFirst = false;
  let any = false;
  for (const t of texts) {
    const pair = readLeadingPair(t);
    if (!pair) continue;
    any = true;
    if (pair[0] > 12 && pair[1] <= 12) dayFirst = true;
    if (pair[1] > 12 && pair[0] <= 12) monthFirst = true;
  }
  if (dayFirst && monthFirst) return { order: null, needsChoice: true, conflict: true };
  if (dayFirst) return { order: "dmy", needsChoice: false, conflict: false };
  if (monthFirst) return { order: "mdy", needsChoice: false, conflict: false };
  return { order: null, needsChoice: any, conflict: false };
}

function parseTimestampParts(text: string, dateOrder: DateOrder | null): Parsed<TimestampParts> {
  const t = text.trim().replace(/\s+/g, " ");
  let m = isoLike.exec(t);
  if (m) {
    const [year, month, day] = [Number(m[1]), Number(m[2]), Number(m[3])];
    const bad = checkCalendar(year, month, day);
    if (bad) return { ok: false, error: bad };
    return applyClock({ year, month, day }, m, 4);
  }
  m = yearLast.exec(t);
  if (m) {
    if (!dateOrder) return { ok: false, error: `"${t}" could be day-first or month-first; choose which your file uses.` };
    const a = Number(m[1]);
    const b = Number(m[2]);
    const year = m[3].length === 2 ? 2000 + Number(m[3]) : Number(m[3]);
    const [day, month] = dateOrder === "dmy" ? [a, b] : [b, a];
    const bad = checkCalendar(year, month, day);
    if (bad) return { ok: false, error: `${bad.replace(/\.$/, "")} (read as ${dateOrder === "dmy" ? "day-first" : "month-first"}).` };
    return applyClock({ year, month, day }, m, 4);
  }
  return {
    ok: false,
    error: `"${text.trim().slice(0, 40)}" is not a date and time we can read. Use 2026-01-15 08:30, or day/month/year with the time.`,
  };
}

const zoneFormatters = new Map<string, Intl.DateTimeFormat>();

/** True when the runtime knows this IANA time zone. */
export function isKnownTimeZone(zone: string): boolean {
  try {
    zoneFormatter(zone);
    return true;
  } catch {
    return false;
  }
}

function zoneFormatter(zone: string): Intl.DateTimeFormat {
  let f = zoneFormatters.get(zone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", {
      timeZone: zone,
      hourCycle: "h23",
      year: "numeric",
      month: "2-digit",
      day: "2-digit",
      hour: "2-digit",
      minute: "2-digit",
      second: "2-digit",
    });
    zoneFormatters.set(zone, f);
  }
  return f;
}

const offsetCache = new Map<string, number>();
const quarterHour = 900_000;

/** Milliseconds the zone's wall clock is ahead of UTC at instant `t`. */
function zoneOffsetMs(t: number, zone: string): number {
  if (zone === "UTC") return 0;
  // Offsets change only on quarter-hour boundaries, so one answer serves a whole quarter hour (a logger file has thousands).
  const key = `${zone}|${Math.floor(t / quarterHour)}`;
  let offset = offsetCache.get(key);
  if (offset === undefined) {
    if (offsetCache.size > 50_000) offsetCache.clear();
    offset = measureZoneOffset(Math.floor(t / quarterHour) * quarterHour, zone);
    offsetCache.set(key, offset);
  }
  return offset;
}

function measureZoneOffset(t: number, zone: string): number {
  const parts: Record<string, number> = {};
  for (const p of zoneFormatter(zone).formatToParts(new Date(t))) if (p.type !== "literal") parts[p.type] = Number(p.value);
  const wall = Date.UTC(parts.year, parts.month - 1, parts.day, parts.hour, parts.minute, parts.second);
  return wall - Math.floor(t / 1000) * 1000;
}

/**
 * The instant a wall-clock time in `zone` names, resolved as Temporal's "compatible" rule does:
 * in the repeated autumn hour the earlier instant, in the hour skipped in spring the clock is read
 * with the offset before the change (so 02:30 becomes 03:30 summer time).
 */
export function convertZonedTimeToEpoch(wallAsUtc: number, zone: string): number {
  const before = zoneOffsetMs(wallAsUtc - 86_400_000, zone);
  const after = zoneOffsetMs(wallAsUtc + 86_400_000, zone);
  const fits = [before, after].map((o) => wallAsUtc - o).filter((t) => zoneOffsetMs(t, zone) === wallAsUtc - t);
  if (fits.length) return Math.min(...fits);
  return wallAsUtc - before;
}

/** A timestamp cell → milliseconds since 1970 (UTC), or a grower-readable reason it cannot be read. */
export function parseTimestamp(text: string, options: TimestampOptions): Parsed<number> {
  if (!text.trim()) return { ok: false, error: "The date and time are missing." };
  const parsed = parseTimestampParts(text, options.dateOrder);
  if (!parsed.ok) return parsed;
  const p = parsed.value;
  if (!p.hasTime) return { ok: false, error: `"${text.trim()}" has a date but no time of day; add the time of the reading.` };
  const wall = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second, p.ms);
  const offset = p.offsetMinutes ?? options.fixedOffsetMinutes ?? null;
  if (offset !== null) return { ok: true, value: wall - offset * 60_000 };
  return { ok: true, value: convertZonedTimeToEpoch(wall, options.timeZone) };
}

/** The calendar day (yyyy-MM-dd) it is in `zone` at instant `at`: a farm's "today". */
export function findZonedDay(at: Date, zone: string): string {
  const parts: Record<string, string> = {};
  for (const p of zoneFormatter(zone).formatToParts(at)) parts[p.type] = p.value;
  return `${parts.year}-${parts.month}-${parts.day}`;
}

// Writing CSV. A cell a spreadsheet would read as a formula starts with = + - @, a tab or a carriage return
// (OWASP, "CSV Injection"); it gets a leading apostrophe whatever follows, line breaks included (Papa's own
// escapeFormulae checks only the first line). Numbers stay numbers: -1.25 °C is data.
const formulaStart = /^[=+\-@\t\r]/;

/** One cell, safe to open in a spreadsheet. */
export function escapeCsvCell<T>(value: T): T | string {
  return typeof value === "string" && formulaStart.test(value) ? `'${value}` : value;
}

/** The one way the app writes CSV: a header row, every cell through escapeCsvCell, CRLF line ends. */
export function writeCsv(columns: readonly string[], rows: readonly (readonly unknown[])[]): string {
  return Papa.unparse({ fields: columns.map(escapeCsvCell), data: rows.map((r) => r.map(escapeCsvCell)) }, { escapeFormulae: false, newline: "\r\n" });
}

/** The farm's wall clock at `at`: its calendar day, hour (0–23) and ISO weekday (Monday 1 … Sunday 7). */
export function readZonedClock(at: Date, zone: string): { day: string; hour: number; weekday: number } {
  const parts: Record<string, string> = {};
  for (const p of zoneFormatter(zone).formatToParts(at)) parts[p.type] = p.value;
  const day = `${parts.year}-${parts.month}-${parts.day}`;
  return { day, hour: Number(parts.hour), weekday: new Date(`${day}T12:00:00Z`).getUTCDay() || 7 };
}
