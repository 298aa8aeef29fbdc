import { describe, expect, it } from "vitest";
import { findHeaderUnit, parseReadingsCsv, type ReadingsCsvOptions } from "@/lib/domain/csv-readings";

// °F → °C: t/°C = (t/°F − 32)/1.8 (NIST Special Publication 811, Guide for the Use of the SI, appendix B.8).
// FDA food-safety figures (REFERENCES.md): 40 °F ≈ 4.4 °C (fridge), 0 °F ≈ −17.8 °C (freezer).

describe("findHeaderUnit", () => {
  it.each([
    ["temp_f", "F"],
    ["Temperature (°F)", "F"],
    ["Temp [°C]", "C"],
    ["tempC", "C"],
    ["Fahrenheit", "F"],
    ["Celsius", "C"],
    ["Temperature", null],
    ["Value", null],
  ])("%j → %j", (h, unit) => expect(findHeaderUnit(h)).toBe(unit));
});

describe("parseReadingsCsv: files that import", () => {
  const cases: [string, string, ReadingsCsvOptions, { takenAt: string; temperatureC: number }[]][] = [
    [
      "ISO times, °C in the header",
      "timestamp,temperature_c\n2026-01-15T08:00:00Z,4.1\n2026-01-15T09:00:00Z,3.9\n",
      {},
      [
        { takenAt: "2026-01-15T08:00:00.000Z", temperatureC: 4.1 },
        { takenAt: "2026-01-15T09:00:00.000Z", temperatureC: 3.9 },
      ],
    ],
    [
      "°F from a temp_f header, converted (NIST SP 811; FDA 40 °F ≈ 4.4 °C, 0 °F ≈ −17.8 °C)",
      "taken_at,temp_f\n2026-01-15 08:00,40\n2026-01-15 09:00,0\n2026-01-15 10:00,32\n2026-01-15 11:00,39.2\n",
      {},
      [
        { takenAt: "2026-01-15T08:00:00.000Z", temperatureC: 4.44 },
        { takenAt: "2026-01-15T09:00:00.000Z", temperatureC: -17.78 },
        { takenAt: "2026-01-15T10:00:00.000Z", temperatureC: 0 },
        { takenAt: "2026-01-15T11:00:00.000Z", temperatureC: 4 },
      ],
    ],
    [
      "°F from the unit option when the header does not say",
      "Time,Temperature\n2026-01-15 08:00,50\n",
      { unit: "F" },
      [{ takenAt: "2026-01-15T08:00:00.000Z", temperatureC: 10 }],
    ],
    [
      "a logger export: preamble, semicolons, decimal commas, day-first inferred from 13/01",
      "Logger;Barn fridge\nSerial;A-1234\n\nDate/Time;Temperature (°C)\n12/01/2026 23:00;4,5\n13/01/2026 00:00;−0,5\n",
      {},
      [
        { takenAt: "2026-01-12T23:00:00.000Z", temperatureC: 4.5 },
        { takenAt: "2026-01-13T00:00:00.000Z", temperatureC: -0.5 },
      ],
    ],
    [
      "separate Date and Time columns, month-first chosen, 12-hour clock",
      "Date,Time,Temp (°F)\n01/02/2026,8:00 AM,38\n01/02/2026,8:00 PM,38.5\n",
      { dateOrder: "mdy" },
      [
        { takenAt: "2026-01-02T08:00:00.000Z", temperatureC: 3.33 },
        { takenAt: "2026-01-02T20:00:00.000Z", temperatureC: 3.61 },
      ],
    ],
    [
      "the offset named in the header (quoted, with a comma)",
      '"#","Date Time, GMT-05:00","Temp, °F"\n1,2026-01-15 08:00:00,41\n',
      {},
      [{ takenAt: "2026-01-15T13:00:00.000Z", temperatureC: 5 }],
    ],
    [
      "local times in the farm's zone (Europe/Berlin is UTC+1 in winter)",
      "time,temp\n2026-01-15 08:00,3\n",
      { timeZone: "Europe/Berlin" },
      [{ takenAt: "2026-01-15T07:00:00.000Z", temperatureC: 3 }],
    ],
    [
      "no header at all: time then temperature",
      "2026-01-15 08:00,4\n2026-01-15 08:30,4.2\n",
      {},
      [
        { takenAt: "2026-01-15T08:00:00.000Z", temperatureC: 4 },
        { takenAt: "2026-01-15T08:30:00.000Z", temperatureC: 4.2 },
      ],
    ],
    [
      "the temperature column, not the dew point or humidity beside it",
      "Time,Dew point (°C),Humidity (%RH),Temperature (°C)\n2026-01-15 08:00,1.5,80,4.5\n",
      {},
      [{ takenAt: "2026-01-15T08:00:00.000Z", temperatureC: 4.5 }],
    ],
    [
      "a unit-only header",
      "Timestamp,°F\n2026-01-15 08:00,50\n",
      {},
      [{ takenAt: "2026-01-15T08:00:00.000Z", temperatureC: 10 }],
    ],
    [
      "a freezer in °C with a unit in each cell",
      "Time,Temperature\n2026-01-15 08:00,-18 °C\n",
      {},
      [{ takenAt: "2026-01-15T08:00:00.000Z", temperatureC: -18 }],
    ],
  ];
  it.each(cases)("%s", (_name, text, options, expected) => {
    const r = parseReadingsCsv(text, options);
    expect(r.problems).toEqual([]);
    expect(r.rows.filter((row) => row.status !== "ok")).toEqual([]);
    expect(r.ok).toBe(true);
    expect(r.readings.map(({ takenAt, temperatureC }) => ({ takenAt, temperatureC }))).toEqual(expected);
  });

  it("says back what it read and assumed", () => {
    const r = parseReadingsCsv("Serial 9\nTime,Temp (°F)\n2026-01-15 08:00,40\n", { unit: "C" });
    expect(r.unit).toBe("F");
    expect(r.unitSource).toBe("header");
    expect(r.notes.join(" ")).toMatch(/Skipped 1 line above the header/);
    expect(r.notes.join(" ")).toMatch(/header says °F/);
  });
});

describe("parseReadingsCsv: a report for every row", () => {
  it("mixed good and bad rows: each bad row named by its spreadsheet row, in grower words", () => {
    const text = [
      "Time,Temperature (°C)", // row 1
      "2026-01-15 08:00,4.0", // 2 ok
      "2026-01-15 09:00,warm", // 3 not a temperature
      "2026-02-30 10:00,4.0", // 4 no such day
      "2026-01-15 11:00,", // 5 missing temperature
      "2026-01-15 12:00,95", // 6 out of range
      "", // 7 blank: skipped, not reported
      "2026-01-15 08:00,4.4", // 8 duplicate of row 2
      "2026-01-15 13:00,3.8", // 9 ok
    ].join("\n");
    const r = parseReadingsCsv(text);
    expect(r.ok).toBe(false);
    expect(r.rows.map((row) => [row.row, row.status])).toEqual([
      [2, "ok"], [3, "error"], [4, "error"], [5, "error"], [6, "error"], [8, "duplicate"], [9, "ok"],
    ]);
    const message = (n: number) => r.rows.find((row) => row.row === n)?.message;
    expect(message(3)).toMatch(/not a temperature/);
    expect(message(4)).toMatch(/February 2026 has no day 30/);
    expect(message(5)).toMatch(/temperature is missing/);
    expect(message(6)).toMatch(/Hotter than any store/);
    expect(message(8)).toMatch(/Same time as row 2; the first was kept/);
    expect(r.counts).toEqual({ rows: 7, ok: 2, errors: 4, duplicates: 1 });
  });

  it.each([
    ["no time or temperature column", "name,colour\nbarn,blue\n", {}, /could not find the time and temperature columns/],
    ["dates that could be either order", "Time,Temp C\n01/02/2026 08:00,4\n03/04/2026 08:00,4\n", {}, /could mean 3 April or March 4/],
    ["dates in both orders", "Time,Temp C\n13/01/2026 08:00,4\n01/13/2026 08:00,4\n", {}, /day-first and others month-first/],
    ["a header with nothing under it", "Time,Temp C\n", {}, /no readings under it/],
    ["°F numbers with no unit given", "Time,Temperature\n2026-01-15 08:00,38\n2026-01-15 09:00,39\n2026-01-15 10:00,37\n", {}, /look like °F/],
    ["an unknown time zone", "Time,Temp C\n2026-01-15 08:00,4\n", { timeZone: "Mars/Olympus" }, /time zone "Mars\/Olympus"/],
  ] as const)("file-level problem: %s", (_name, text, options, words) => {
    const r = parseReadingsCsv(text, options);
    expect(r.ok).toBe(false);
    expect(r.problems.join(" ")).toMatch(words);
  });

  it("refuses readings in the future (a day/month mix-up) when told the present", () => {
    const r = parseReadingsCsv("Time,Temp C\n2030-01-15 08:00,4\n", { notAfter: "2026-12-03T00:00:00Z" });
    expect(r.rows[0]).toMatchObject({ row: 2, status: "error" });
    expect(r.rows[0].message).toMatch(/in the future/);
  });

  it("an explicit order overrides inference, and a date that does not fit it is a row error", () => {
    const r = parseReadingsCsv("Time,Temp C\n13/01/2026 08:00,4\n", { dateOrder: "mdy" });
    expect(r.rows[0].message).toMatch(/^There is no month 13 \(read as month-first\)\.$/);
  });
});
