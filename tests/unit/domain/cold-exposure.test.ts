import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { measureColdExposure, shiftPullWindow, type TemperatureReading } from "@/lib/domain";

const start = Date.parse("2024-01-15T00:00:00Z");
const hourly = (values: number[], unit: "C" | "F" = "C"): TemperatureReading[] =>
  values.map((value, h) => ({ at: new Date(start + h * 3_600_000).toISOString(), value, unit }));
const at = (h: number) => new Date(start + h * 3_600_000).toISOString();

describe("cold exposure from store readings (default band 0–10 °C, optimum 1–5 °C: REFERENCES.md product default)", () => {
  it("a steady 4 °C fridge (US FDA: at or below 4 °C) gives every hour as cold", () => {
    const r = measureColdExposure(hourly(Array(49).fill(4)));
    expect(r).toMatchObject({ totalHours: 48, hoursInBand: 48, hoursInOptimum: 48, hoursAbove: 0, hoursFrozen: 0, effectiveColdDays: 2, lostDays: 0, excursions: [], gaps: [] });
  });

  it("reads °F: 39.2 °F = 4 °C, and a −18 °C / 0 °F freezer (US FDA) counts as frozen, not as more cold", () => {
    const fridge = measureColdExposure(hourly(Array(25).fill(39.2), "F"));
    expect(fridge.hoursInOptimum).toBeCloseTo(24, 12);
    const freezer = measureColdExposure(hourly(Array(25).fill(0), "F"));
    expect(freezer).toMatchObject({ hoursInBand: 0, hoursBelow: 24, hoursFrozen: 24, effectiveColdDays: 0, lostDays: 1 });
  });

  it("lists an excursion with start, end and peak, and counts its hours above", () => {
    const values = [4, 14, 16, 12, 4, ...Array(20).fill(4)];
    const r = measureColdExposure(hourly(values));
    expect(r.hoursAbove).toBe(3);
    expect(r.hoursInBand).toBe(21); // 24 hours in all
    expect(r.excursions).toEqual([{ kind: "above", startAt: at(1), endAt: at(4), ongoing: false, hours: 3, peakC: 16, peakAt: at(2) }]);
  });

  it("an excursion still running at the last reading is marked ongoing", () => {
    const r = measureColdExposure(hourly([4, 4, 12, 13]));
    expect(r.excursions[0]).toMatchObject({ kind: "above", startAt: at(2), endAt: at(3), ongoing: true, peakC: 13 });
  });

  it("handles unsorted input", () => {
    const values = [4, 14, 16, 12, 4, 3, -1, 2, 5];
    const readings = hourly(values);
    const shuffled = [readings[5], readings[0], readings[8], readings[2], readings[7], readings[1], readings[4], readings[3], readings[6]];
    expect(measureColdExposure(shuffled)).toEqual(measureColdExposure(readings));
  });

  it.each([
    ["in_band", { hoursInBand: 31, hoursUnknown: 0, lostDays: 0 }],
    ["not_counted", { hoursInBand: 2, hoursUnknown: 29, lostDays: 1 }],
    ["last_reading", { hoursInBand: 2, hoursAbove: 29, lostDays: 1 }],
  ] as const)("states the assumption for a gap (%s)", (gapAssumption, expected) => {
    const readings: TemperatureReading[] = [
      { at: at(0), value: 4, unit: "C" },
      { at: at(1), value: 12, unit: "C" },
      { at: at(30), value: 4, unit: "C" },
      { at: at(31), value: 4, unit: "C" },
    ];
    const r = measureColdExposure(readings, { gapAssumption, maxGapHours: 6 });
    expect(r.gaps).toEqual([{ startAt: at(1), endAt: at(30), hours: 29 }]);
    expect(r).toMatchObject({ totalHours: 31, ...expected });
    expect(r.assumptions.join(" ")).toMatch(/No readings for 29\.0 h in 1 gap/);
    if (gapAssumption === "in_band") expect(r.assumptions.join(" ")).toMatch(/stayed between 0\.0 °C and 10\.0 °C/);
  });

  it("with no readings at all, the whole period is a gap and says so", () => {
    const r = measureColdExposure([], { from: at(0), to: at(48), gapAssumption: "not_counted" });
    expect(r).toMatchObject({ totalHours: 48, hoursUnknown: 48, effectiveColdDays: 0, lostDays: 2 });
    expect(r.assumptions[0]).toMatch(/No readings for 2\.0 days/);
  });

  it("uses the reading taken just before the period for its first hours", () => {
    const r = measureColdExposure([{ at: at(-2), value: 4, unit: "C" }, { at: at(3), value: 4, unit: "C" }], { from: at(0), to: at(4) });
    expect(r).toMatchObject({ totalHours: 4, hoursInBand: 4, gaps: [] });
  });

  it("counts real elapsed hours across a daylight-saving change (23-hour day in New York, 2024-03-10)", () => {
    const r = measureColdExposure(
      [
        { at: "2024-03-10T00:00:00-05:00", value: 4, unit: "C" },
        { at: "2024-03-10T12:00:00-04:00", value: 4, unit: "C" },
        { at: "2024-03-11T00:00:00-04:00", value: 4, unit: "C" },
      ],
      { maxGapHours: 12 },
    );
    expect(r.totalHours).toBe(23);
  });

  it("uses the protocol's own band (Hypericum perforatum did best at 10 °C: Proc. Fla. State Hort. Soc.)", () => {
    const r = measureColdExposure(hourly(Array(25).fill(9)), { band: { minC: 5, maxC: 12 } });
    expect(r).toMatchObject({ hoursInBand: 24, optimum: { minC: 5, maxC: 5 }, hoursInOptimum: 0 });
  });

  it("refuses a reading whose time cannot be read", () => {
    expect(() => measureColdExposure([{ at: "yesterday", value: 4, unit: "C" }])).toThrow(/Reading 1 has a time "yesterday"/);
  });

  it("effective days ≤ calendar days, and every hour is counted exactly once (property)", () => {
    const readings = fc.array(
      fc.record({ minutes: fc.integer({ min: 0, max: 60 * 24 * 30 }), value: fc.double({ min: -25, max: 25, noNaN: true }) }),
      { minLength: 1, maxLength: 60 },
    );
    fc.assert(
      fc.property(readings, fc.constantFrom("in_band", "not_counted", "last_reading") as fc.Arbitrary<"in_band" | "not_counted" | "last_reading">, (rs, gapAssumption) => {
        const input = rs.map((r) => ({ at: new Date(start + r.minutes * 60_000).toISOString(), value: r.value, unit: "C" as const }));
        const e = measureColdExposure(input, { gapAssumption, from: at(-5), to: at(24 * 31) });
        expect(e.effectiveColdDays).toBeLessThanOrEqual(e.calendarDays + 1e-9);
        expect(e.hoursInBand + e.hoursAbove + e.hoursBelow + e.hoursUnknown).toBeCloseTo(e.totalHours, 6);
        expect(e.hoursFrozen).toBeLessThanOrEqual(e.hoursBelow + 1e-9);
        expect(measureColdExposure([...input].reverse(), { gapAssumption, from: at(-5), to: at(24 * 31) })).toEqual(e);
      }),
    );
  });
});

describe("shifting the pull window by lost days", () => {
  it.each([
    [0, "2024-01-15", "2024-01-29"],
    [3, "2024-01-18", "2024-02-01"],
    [20, "2024-02-04", "2024-02-18"],
  ])("by %i days", (lost, opensOn, closesOn) => {
    const w = shiftPullWindow({ opensOn: "2024-01-15", closesOn: "2024-01-29", plannedPullOn: "2024-01-15", sourcesDisagree: false }, lost);
    expect(w).toEqual({ opensOn, closesOn, plannedPullOn: opensOn, sourcesDisagree: false });
  });

  it("keeps an open-ended window open-ended", () => {
    expect(shiftPullWindow({ opensOn: "2024-01-15", closesOn: null, plannedPullOn: "2024-01-15", sourcesDisagree: false }, 2).closesOn).toBeNull();
  });
});
