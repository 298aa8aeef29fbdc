import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { Temporal } from "@js-temporal/polyfill";
import { AppError } from "@/lib/errors";
import { convertZonedTimeToEpoch, decodeCsvBytes, findHeaderOffset, inferDateOrder, parseTimestamp, readCsvTable, splitHeaderWords, type TimestampOptions } from "@/lib/domain/csv";

const utc: TimestampOptions = { dateOrder: null, timeZone: "UTC" };
const iso = (ms: number) => new Date(ms).toISOString();

describe("parseTimestamp: formats growers' files use", () => {
  it.each([
    // [cell, options, expected UTC instant]
    ["2026-01-15T08:30:00Z", utc, "2026-01-15T08:30:00.000Z"], // ISO 8601 with Z
    ["2026-01-15T08:30:00+01:00", utc, "2026-01-15T07:30:00.000Z"], // ISO 8601 with offset
    ["2026-01-15T08:30:00.250-0500", utc, "2026-01-15T13:30:00.250Z"], // basic-format offset, fractions
    ["2026-01-15T08:30", utc, "2026-01-15T08:30:00.000Z"],
    ["2026-01-15 08:30", utc, "2026-01-15T08:30:00.000Z"], // yyyy-MM-dd HH:mm
    ["2026-01-15 08:30:45", utc, "2026-01-15T08:30:45.000Z"], // yyyy-MM-dd HH:mm:ss
    ["2026/01/15 8:30", utc, "2026-01-15T08:30:00.000Z"],
    ["15/01/2026 08:30", { ...utc, dateOrder: "dmy" }, "2026-01-15T08:30:00.000Z"], // dd/MM/yyyy HH:mm
    ["01/15/2026 08:30", { ...utc, dateOrder: "mdy" }, "2026-01-15T08:30:00.000Z"], // MM/dd/yyyy HH:mm
    ["03/04/2026 08:30", { ...utc, dateOrder: "dmy" }, "2026-04-03T08:30:00.000Z"],
    ["03/04/2026 08:30", { ...utc, dateOrder: "mdy" }, "2026-03-04T08:30:00.000Z"],
    ["15.01.2026 08:30:00", { ...utc, dateOrder: "dmy" }, "2026-01-15T08:30:00.000Z"],
    ["01/15/26 2:05:00 PM", { ...utc, dateOrder: "mdy" }, "2026-01-15T14:05:00.000Z"], // two-digit year, 12-hour clock
    ["01/15/2026 12:00 AM", { ...utc, dateOrder: "mdy" }, "2026-01-15T00:00:00.000Z"], // midnight on a 12-hour clock
    ["01/15/2026 12:00 PM", { ...utc, dateOrder: "mdy" }, "2026-01-15T12:00:00.000Z"],
    ["2026-01-15 08:30", { ...utc, timeZone: "America/New_York" }, "2026-01-15T13:30:00.000Z"], // EST is UTC−5
    ["2026-07-15 08:30", { ...utc, timeZone: "America/New_York" }, "2026-07-15T12:30:00.000Z"], // EDT is UTC−4
    ["2026-01-15 08:30", { ...utc, fixedOffsetMinutes: -300, timeZone: "Europe/Berlin" }, "2026-01-15T13:30:00.000Z"], // header offset wins
    ["2026-01-15 08:30Z", { ...utc, timeZone: "Europe/Berlin" }, "2026-01-15T08:30:00.000Z"], // the cell's own zone wins
  ] as const)("%s → %s", (cell, options, expected) => {
    const r = parseTimestamp(cell, options);
    expect(r.ok && iso(r.value)).toBe(expected);
  });

  it.each([
    ["", utc, "missing"],
    ["yesterday morning", utc, "not a date and time"],
    ["2026-02-30 08:00", utc, "February 2026 has no day 30"],
    ["2026-13-01 08:00", utc, "no month 13"],
    ["2026-01-15", utc, "no time of day"],
    ["2026-01-15 25:00", utc, "not real"],
    ["2026-01-15 13:00 PM", utc, "12-hour clock"],
    ["03/04/2026 08:00", utc, "day-first or month-first"],
    ["01/15/2026 08:00", { ...utc, dateOrder: "dmy" }, "no month 15"],
  ] as const)("refuses %j with words a grower can act on", (cell, options, words) => {
    const r = parseTimestamp(cell, options);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error).toContain(words);
  });
});

describe("convertZonedTimeToEpoch matches Temporal's 'compatible' rule (independent cross-check: @js-temporal/polyfill)", () => {
  const zones = ["UTC", "America/New_York", "Europe/London", "Europe/Berlin", "Australia/Sydney", "Asia/Kolkata", "Australia/Lord_Howe"];
  it.each([
    ["America/New_York", "2026-03-08T02:30"], // skipped hour (spring forward)
    ["America/New_York", "2026-11-01T01:30"], // repeated hour (fall back)
    ["Europe/Berlin", "2026-03-29T02:30"],
    ["Europe/Berlin", "2026-10-25T02:30"],
    ["Australia/Lord_Howe", "2026-04-05T01:45"], // half-hour change
  ])("%s %s", (zone, wall) => {
    const expected = Temporal.PlainDateTime.from(wall).toZonedDateTime(zone, { disambiguation: "compatible" }).epochMilliseconds;
    expect(convertZonedTimeToEpoch(Date.parse(`${wall}:00Z`), zone)).toBe(expected);
  });

  it("on generated wall-clock times", () => {
    fc.assert(
      fc.property(
        fc.constantFrom(...zones),
        fc.date({ min: new Date(Date.UTC(2000, 0, 1)), max: new Date(Date.UTC(2040, 0, 1)), noInvalidDate: true }),
        (zone, d) => {
          const wall = Math.floor(d.getTime() / 60_000) * 60_000;
          const pdt = Temporal.PlainDateTime.from(new Date(wall).toISOString().slice(0, 16));
          expect(convertZonedTimeToEpoch(wall, zone)).toBe(pdt.toZonedDateTime(zone, { disambiguation: "compatible" }).epochMilliseconds);
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe("inferDateOrder decides only when the dates leave no doubt", () => {
  it.each([
    [["13/01/2026 08:00", "01/02/2026 08:00"], { order: "dmy", needsChoice: false, conflict: false }],
    [["01/13/2026 08:00", "02/01/2026 08:00"], { order: "mdy", needsChoice: false, conflict: false }],
    [["01/02/2026 08:00", "03/04/2026 08:00"], { order: null, needsChoice: true, conflict: false }],
    [["13/01/2026 08:00", "01/13/2026 08:00"], { order: null, needsChoice: true, conflict: true }],
    [["2026-01-13 08:00"], { order: null, needsChoice: false, conflict: false }], // ISO needs no choice
  ])("%j", (texts, expected) => {
    expect(inferDateOrder(texts)).toEqual(expected);
  });
});

describe("header words and offsets", () => {
  it.each([
    ["Temperature (°F)", ["temperature", "deg", "f"]],
    ["temp_f", ["temp", "f"]],
    ["tempC", ["temp", "c"]],
    ["Date/Time", ["date", "time"]],
  ])("splitHeaderWords(%j)", (h, words) => expect(splitHeaderWords(h)).toEqual(words));

  it.each([
    ["Date Time, GMT-05:00", -300],
    ["Time (UTC+1)", 60],
    ["Time (UTC)", 0],
    ["Timestamp", null],
  ])("findHeaderOffset(%j) = %j", (h, offset) => expect(findHeaderOffset(h)).toBe(offset));
});

describe("decodeCsvBytes", () => {
  const enc = (s: string) => new TextEncoder().encode(s);
  it.each([
    ["plain UTF-8", enc("Time,Temp °C\n"), "Time,Temp °C\n"],
    ["UTF-8 with a byte-order mark", new Uint8Array([0xef, 0xbb, 0xbf, ...enc("a,b")]), "a,b"],
    ["UTF-16LE with its mark (spreadsheet 'Unicode text')", new Uint8Array([0xff, 0xfe, 0x61, 0x00, 0x2c, 0x00, 0x62, 0x00]), "a,b"],
  ])("reads %s", (_name, bytes, text) => expect(decodeCsvBytes(bytes)).toBe(text));

  it.each([
    ["Windows-1252 text (° as a lone 0xB0 byte)", new Uint8Array([...enc("Time,Temp "), 0xb0, ...enc("F\n")]), "UTF-8"],
    ["a spreadsheet workbook (zip)", new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0, 0, 1]), "workbook"],
    ["a binary file with NUL bytes", new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0]), "not a text CSV"],
  ])("refuses %s with 415", (_name, bytes, words) => {
    let caught: unknown;
    try {
      decodeCsvBytes(bytes);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(AppError);
    expect((caught as AppError).status).toBe(415);
    expect((caught as AppError).message).toContain(words);
  });
});

describe("readCsvTable keeps spreadsheet row numbers", () => {
  const isHeader = (cells: string[]) => cells[0] === "Time";
  it("under a preamble, with mixed line endings, blank lines and a quoted line break", () => {
    const text = 'Logger 7\r\nStarted 2026-01-01\r\nTime,Temp\r\n1,"a\nb"\n\n2,c\r3,d';
    const t = readCsvTable(text, isHeader)!;
    expect(t.headerRow).toBe(3);
    expect(t.preambleLines).toBe(2);
    expect(t.lines).toEqual([
      { row: 4, cells: ["1", "a\nb"] },
      { row: 7, cells: ["2", "c"] },
      { row: 8, cells: ["3", "d"] },
    ]);
  });

  it.each([
    ["Time;Temp\n1;4,5", ";", ["1", "4,5"]], // semicolons with decimal commas
    ["Time\tTemp\n1\t4.5", "\t", ["1", "4.5"]],
    ['"Time","Temp, °C"\n1,4.5', ",", ["1", "4.5"]], // quoted header with a comma inside
  ])("finds the delimiter of %j", (text, delimiter, cells) => {
    const t = readCsvTable(text, isHeader)!;
    expect(t.delimiter).toBe(delimiter);
    expect(t.lines[0].cells).toEqual(cells);
  });

  it("returns null when no line is a header", () => expect(readCsvTable("a,b\nc,d", isHeader)).toBeNull());
});
