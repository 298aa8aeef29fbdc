import { afterAll, describe, expect, it } from "vitest";
import fc from "fast-check";
import { Temporal } from "@js-temporal/polyfill";
import { addDaysToIsoDay, clearDayArithmeticCache, compareIsoDays, countDaysBetween, formatDayInWords, isIsoDay, parseIsoDay } from "@/lib/domain";

// Calendar arithmetic must not depend on the device's time zone or its daylight-saving changes.
const zones = ["UTC", "America/New_York", "Europe/London", "Australia/Sydney", "America/Santiago", "Asia/Kolkata", "Australia/Lord_Howe"];
const originalTz = process.env.TZ;
afterAll(() => {
  if (originalTz === undefined) delete process.env.TZ;
  else process.env.TZ = originalTz;
});

const isoDay = fc
  .date({ min: new Date(Date.UTC(1990, 0, 1)), max: new Date(Date.UTC(2060, 11, 31)), noInvalidDate: true })
  .map((d) => d.toISOString().slice(0, 10));

describe.each(zones)("calendar days in time zone %s", (zone) => {
  it.each([
    ["2024-01-15", 90, "2024-04-14"], // REFERENCES.md date example (checked with Temporal PlainDate)
    ["2023-12-01", 60, "2024-01-30"], // REFERENCES.md date example
    ["2024-03-09", 2, "2024-03-11"], // across the US spring-forward night (47 hours apart)
    ["2024-03-30", 2, "2024-04-01"], // across the EU spring-forward night
    ["2024-10-26", 2, "2024-10-28"], // across the EU fall-back night (49 hours apart)
    ["2024-02-28", 1, "2024-02-29"], // leap day
    ["2024-04-14", -90, "2024-01-15"],
  ])("%s + %i days = %s", (from, days, to) => {
    process.env.TZ = zone;
    clearDayArithmeticCache();
    expect(addDaysToIsoDay(from, days)).toBe(to);
    expect(countDaysBetween(from, to)).toBe(days);
  });

  it("matches @js-temporal/polyfill PlainDate on generated dates (independent cross-check)", () => {
    process.env.TZ = zone;
    clearDayArithmeticCache();
    fc.assert(
      fc.property(isoDay, fc.integer({ min: -400, max: 400 }), (day, n) => {
        const expected = Temporal.PlainDate.from(day).add({ days: n }).toString();
        expect(addDaysToIsoDay(day, n)).toBe(expected);
        expect(countDaysBetween(day, expected)).toBe(n);
      }),
      { numRuns: 300 },
    );
  });
});

describe("day strings", () => {
  it.each(["2024-02-30", "2023-02-29", "2024-13-01", "24-01-01", "2024-1-5", "", "2024-01-15T00:00"])("refuses %j", (s) => {
    expect(isIsoDay(s)).toBe(false);
    expect(() => parseIsoDay(s)).toThrow(/date/);
  });

  it("refuses fractional day counts (no hours/24 sneaking in)", () => {
    expect(() => addDaysToIsoDay("2024-01-01", 1.5)).toThrow(/whole/);
  });

  it("string order is date order (property)", () => {
    fc.assert(
      fc.property(isoDay, isoDay, (a, b) => {
        expect(Math.sign(compareIsoDays(a, b))).toBe(Math.sign(Temporal.PlainDate.compare(a, b)));
      }),
    );
  });
});

describe("days in words", () => {
  it.each([
    ["2024-03-06", "6 Mar 2024"],
    ["2026-11-09", "9 Nov 2026"],
    ["2025-12-31", "31 Dec 2025"],
  ])("%s reads %s", (day, words) => {
    expect(formatDayInWords(day)).toBe(words);
  });
});
