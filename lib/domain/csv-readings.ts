import { Reading } from "@/lib/schemas/reading";
import { DomainError } from "@/lib/errors";
import {
  countRows,
  findColumn,
  findHeaderOffset,
  inferDateOrder,
  isKnownTimeZone,
  parseTimestamp,
  readCsvTable,
  splitHeaderWords,
  type CsvReport,
  type CsvRowReport,
  type DateOrder,
} from "./csv";
import { parseTemperature, type TemperatureUnit } from "./units";

// A data logger's CSV (or a hand-kept sheet) → cold-store readings, with a report for every row.
// Pure: the phone shows the preview from this and the server imports from the very same result.

export interface ReadingsCsvOptions {
  /** Unit of the temperature column when its header does not say (e.g. the farm's unit). */
  unit?: TemperatureUnit;
  /** Day-first or month-first for dates like 03/04/2026; "auto" decides only when the dates leave no doubt. */
  dateOrder?: DateOrder | "auto";
  /** IANA zone for times written without an offset (the farm's zone); UTC by default. */
  timeZone?: string;
  /** Readings later than this instant (ISO) are refused as typos; the server passes "now" plus a day. */
  notAfter?: string;
}

export interface CsvReading {
  row: number;
  /** ISO 8601 in UTC, e.g. 2026-01-15T08:00:00.000Z. */
  takenAt: string;
  temperatureC: number;
}

export interface ReadingsCsvReport extends CsvReport {
  readings: CsvReading[];
  unit: TemperatureUnit;
  unitSource: "header" | "option" | "assumed";
  dateOrder: DateOrder | null;
  columns: { time: string; temperature: string } | null;
}

const timeWords = new Set(["timestamp", "datetime", "time", "date", "taken", "recorded", "logged", "when"]);
const temperatureWords = new Set(["temp", "temperature", "temperatures", "celsius", "fahrenheit", "centigrade"]);

/** "F" / "C" when the header names the unit: temp_f, Temperature (°F), tempC, Fahrenheit … */
export function findHeaderUnit(header: string): TemperatureUnit | null {
  const words = splitHeaderWords(header);
  if (words.some((w) => w === "f" || w === "fahrenheit" || w === "degf")) return "F";
  if (words.some((w) => w === "c" || w === "celsius" || w === "centigrade" || w === "degc")) return "C";
  return null;
}

const isTemperatureHeader = (words: string[]) => words.some((w) => temperatureWords.has(w));
// "°C" or "Value (°F)" alone, when no column says temperature.
const isUnitOnlyHeader = (words: string[], raw: string) => findHeaderUnit(raw) !== null && !words.some((w) => ["dew", "point", "humidity", "rh"].includes(w));
const isTimeHeader = (words: string[]) => words.some((w) => timeWords.has(w) || w === "at");
const isDateOnlyHeader = (words: string[]) => words.includes("date") && !words.includes("time");
const isClockOnlyHeader = (words: string[]) => words.includes("time") && !words.includes("date") && !words.includes("datetime") && !words.includes("timestamp");

interface Layout {
  /** One column, or a date column and a clock column. */
  time: number[];
  temperature: number;
}

function findLayout(header: readonly string[]): Layout | null {
  let temperature = findColumn(header, isTemperatureHeader);
  if (temperature < 0) temperature = findColumn(header, isUnitOnlyHeader);
  if (temperature < 0) return null;
  const dateCol = findColumn(header, isDateOnlyHeader, [temperature]);
  const clockCol = findColumn(header, isClockOnlyHeader, [temperature, dateCol]);
  if (dateCol >= 0 && clockCol >= 0) return { time: [dateCol, clockCol], temperature };
  const time = findColumn(header, isTimeHeader, [temperature]);
  return time < 0 ? null : { time: [time], temperature };
}

const looksLikeNumber = (s: string) => /^[+−-]?\d+([.,]\d+)?\s*(°|º)?\s*[cCfF]?$/.test(s.trim());

/** Parses a readings CSV into readings plus a report per row. Never throws for bad content. */
export function parseReadingsCsv(text: string, options: ReadingsCsvOptions = {}): ReadingsCsvReport {
  const timeZone = options.timeZone ?? "UTC";
  const report: ReadingsCsvReport = {
    ok: false,
    problems: [],
    notes: [],
    rows: [],
    counts: { rows: 0, ok: 0, errors: 0, duplicates: 0 },
    readings: [],
    unit: options.unit ?? "C",
    unitSource: options.unit ? "option" : "assumed",
    dateOrder: null,
    columns: null,
  };
  if (!isKnownTimeZone(timeZone)) {
    report.problems.push(`The time zone "${timeZone}" is not one we know; set the farm's time zone in settings.`);
    return report;
  }

  const table = readCsvTable(
    text,
    (cells) => findLayout(cells) !== null,
    // A file without a header: time in the first column, temperature in the second.
    (cells) =>
      cells.length >= 2 &&
      looksLikeNumber(cells[1]) &&
      (["dmy", "mdy"] as const).some((dateOrder) => parseTimestamp(cells[0], { dateOrder, timeZone: "UTC" }).ok),
  );
  if (!table) {
    report.problems.push(
      "We could not find the time and temperature columns. The file needs a header row such as “Time, Temperature (°C)”, or the time in the first column and the temperature in the second.",
    );
    return report;
  }
  const layout: Layout = table.header ? findLayout(table.header)! : { time: [0], temperature: 1 };
  const header = table.header;
  const timeName = header ? layout.time.map((i) => header[i]).join(" + ") : "column 1";
  const temperatureName = header ? header[layout.temperature] : "column 2";
  report.columns = { time: timeName, temperature: temperatureName };
  if (table.preambleLines > 0) report.notes.push(`Skipped ${table.preambleLines} line${table.preambleLines === 1 ? "" : "s"} above the header (the logger's own details).`);
  if (!header) report.notes.push("No header row: read the first column as the time and the second as the temperature.");
  else report.notes.push(`Read the time from “${timeName}” and the temperature from “${temperatureName}”.`);

  const headerUnit = header ? findHeaderUnit(header[layout.temperature]) : null;
  if (headerUnit) {
    if (options.unit && options.unit !== headerUnit) {
      report.notes.push(`The column header says °${headerUnit}, so the file was read in °${headerUnit} rather than °${options.unit}.`);
    }
    report.unit = headerUnit;
    report.unitSource = "header";
  }
  report.notes.push(
    report.unitSource === "header"
      ? `Temperatures are in °${report.unit} (from the column header)${report.unit === "F" ? " and were converted to °C" : ""}.`
      : report.unitSource === "option"
        ? `Temperatures read as °${report.unit}, as chosen.`
        : "The file does not say °C or °F; temperatures were read as °C.",
  );

  const timeText = (cells: string[]) => layout.time.map((i) => cells[i] ?? "").join(" ").trim();
  const fixedOffsetMinutes = header ? (layout.time.map((i) => findHeaderOffset(header[i])).find((o) => o !== null) ?? null) : null;
  if (fixedOffsetMinutes !== null) {
    const sign = fixedOffsetMinutes < 0 ? "−" : "+";
    const abs = Math.abs(fixedOffsetMinutes);
    report.notes.push(`Times without their own offset were read as UTC${sign}${String(Math.floor(abs / 60)).padStart(2, "0")}:${String(abs % 60).padStart(2, "0")}, as the header says.`);
  } else {
    report.notes.push(`Times without a time zone were read as ${timeZone === "UTC" ? "UTC" : `the farm's local time (${timeZone})`}.`);
  }

  // Day-first or month-first: the grower's choice, or the dates themselves when they leave no doubt.
  if (options.dateOrder && options.dateOrder !== "auto") {
    report.dateOrder = options.dateOrder;
  } else {
    const inferred = inferDateOrder(table.lines.map((l) => timeText(l.cells)));
    if (inferred.conflict) {
      report.problems.push("Some dates read day-first and others month-first. Choose which order the file uses.");
    } else if (inferred.needsChoice) {
      report.problems.push("Dates like 03/04/2026 could mean 3 April or March 4. Choose day-first or month-first.");
    }
    report.dateOrder = inferred.order;
    if (inferred.order) report.notes.push(`Dates read ${inferred.order === "dmy" ? "day-first (dd/mm/yyyy)" : "month-first (mm/dd/yyyy)"}, the only order that fits every date.`);
  }

  const notAfter = options.notAfter ? Date.parse(options.notAfter) : Number.POSITIVE_INFINITY;
  const seen = new Map<number, number>();
  const tsOptions = { dateOrder: report.dateOrder, timeZone, fixedOffsetMinutes };
  for (const line of table.lines) {
    const rowReport = readRow(line.cells);
    report.rows.push(rowReport);

    function readRow(cells: string[]): CsvRowReport {
      const row = line.row;
      const when = parseTimestamp(timeText(cells), tsOptions);
      if (!when.ok) return { row, status: "error", message: when.error };
      if (when.value > notAfter) return { row, status: "error", message: "This time is in the future; check the date (and the day/month order)." };
      if (when.value < Date.UTC(1990, 0, 1)) return { row, status: "error", message: "This date is before 1990; check the year." };
      const cell = cells[layout.temperature] ?? "";
      if (!cell) return { row, status: "error", message: "The temperature is missing." };
      let celsius: number;
      try {
        celsius = parseTemperature(cell, report.unit).celsius;
      } catch (err) {
        return { row, status: "error", message: err instanceof DomainError ? err.message : `"${cell}" is not a temperature.` };
      }
      const range = Reading.shape.temperature_c.safeParse(celsius);
      if (!range.success) return { row, status: "error", message: range.error.issues[0]?.message ?? "This temperature is out of range." };
      const firstRow = seen.get(when.value);
      if (firstRow !== undefined) return { row, status: "duplicate", message: `Same time as row ${firstRow}; the first was kept.` };
      seen.set(when.value, row);
      report.readings.push({ row, takenAt: new Date(when.value).toISOString(), temperatureC: Math.round(celsius * 100) / 100 });
      return { row, status: "ok" };
    }
  }

  report.counts = countRows(report.rows);
  if (report.rows.length === 0) report.problems.push("The file has a header but no readings under it.");
  if (report.unitSource !== "header" && report.unit === "C" && report.readings.length >= 3) {
    const sorted = report.readings.map((r) => r.temperatureC).sort((a, b) => a - b);
    const median = sorted[Math.floor(sorted.length / 2)];
    if (median >= 30 && median <= 50) {
      const words = "These temperatures look like °F (a fridge runs near 38 °F, not 38 °C).";
      if (report.unitSource === "assumed") report.problems.push(`${words} Choose °C or °F and preview again.`);
      else report.notes.push(`${words} If so, choose °F and preview again.`);
    }
  }
  report.ok = report.problems.length === 0 && report.counts.errors === 0 && report.readings.length > 0;
  return report;
}
