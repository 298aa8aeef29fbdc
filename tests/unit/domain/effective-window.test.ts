import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { Temporal } from "@js-temporal/polyfill";
import {
  findEffectiveWindow,
  measureColdExposure,
  measureLostCold,
  parseReadingTime,
  prepareStoreReadings,
  starterProtocols,
  type EffectiveWindowInput,
  type ProtocolForPlan,
  type TemperatureReading,
} from "@/lib/domain";

// The effective pull window: the planned one moved later by the cold days the store's readings show the bag lost.
// Windows come from the starter library's published days: showy milkweed 14–28 days cold-moist at 5 °C (Kaye, Sandlin
// & Bahm 2018, AoB PLANTS 10:ply018); elder 90 days warm then 90 days cold (Young & Young 1992). The cold band is the
// product default 0–10 °C (REFERENCES.md); a freezer at −18 °C (US FDA) is a different treatment, not more cold.
// Shifted dates are cross-checked with Temporal PlainDate (REFERENCES.md, Dates). Temperatures and times are invented.

const showy = starterProtocols.find((p) => p.key === "asclepias-speciosa")!;
const elder = starterProtocols.find((p) => p.key === "sambucus")!;
const frozenOnly: ProtocolForPlan = {
  species: "Example frozen",
  effectiveBand: null,
  phases: [{ kind: "frozen", note: "", sources: [{ citation: "Invented for the test", minDays: 30, maxDays: 30, band: null, note: "" }] }],
};

const utcDay = (d: string) => Date.parse(`${d}T00:00:00Z`);
const plus = (day: string, n: number) => Temporal.PlainDate.from(day).add({ days: n }).toString();

/** A reading every 6 h from `from` (inclusive) to `to` (exclusive), value by timestamp. */
function every6h(from: string, to: string, value: (at: string) => number): TemperatureReading[] {
  const out: TemperatureReading[] = [];
  for (let t = Date.parse(from); t < Date.parse(to); t += 6 * 3_600_000) {
    const at = new Date(t).toISOString();
    out.push({ at, value: value(at), unit: "C" });
  }
  return out;
}
const steady = every6h("2025-12-20T00:00:00Z", "2026-01-25T00:00:00Z", () => 4);
/** 4 °C, but 12 °C between `warmFrom` (inclusive) and `warmTo` (exclusive). */
const warmSpell = (warmFrom: string, warmTo: string, value = 12) =>
  every6h("2025-12-20T00:00:00Z", "2026-01-25T00:00:00Z", (at) => (at >= warmFrom && at < warmTo ? value : 4));

const base: EffectiveWindowInput = {
  bag: { startedOn: "2026-01-01" },
  protocol: showy,
  readings: prepareStoreReadings(steady),
  asOf: Date.parse("2026-01-20T12:00:00Z"),
  startOfDay: utcDay,
};
const showyPlanned = { opensOn: "2026-01-15", closesOn: "2026-01-29" };

describe("findEffectiveWindow: the window every screen uses", () => {
  it.each([
    ["a store with no readings: the planned window, and the assumption said", { readings: prepareStoreReadings([]) }, "no_readings", 0, showyPlanned, /assuming the store held 0\.0 °C to 10\.0 °C/],
    ["no cold store at all: the planned window", { readings: null }, "no_store", 0, showyPlanned, /Not in a cold store/],
    ["a steady 4 °C fridge (US FDA ≤ 4 °C): kept its cold", {}, "kept_cold", 0, showyPlanned, /kept its cold/],
    [
      "a 2-day warm spell at 12 °C: shifted 2 days",
      { readings: prepareStoreReadings(warmSpell("2026-01-05T00:00:00Z", "2026-01-07T00:00:00Z")) },
      "shifted", 2, { opensOn: plus("2026-01-15", 2), closesOn: plus("2026-01-29", 2) }, /About 2 days of cold lost.*moves 2 days later/,
    ],
    [
      "10 h warm rounds to no day (as measureColdExposure rounds)",
      { readings: prepareStoreReadings([...steady.filter((r) => r.at < "2026-01-05T00:00:00Z" || r.at > "2026-01-05T12:00:00Z"), { at: "2026-01-05T02:00:00Z", value: 12, unit: "C" }, { at: "2026-01-05T06:00:00Z", value: 12, unit: "C" }, { at: "2026-01-05T12:00:00Z", value: 4, unit: "C" }]) },
      "kept_cold", 0, showyPlanned, /kept its cold/,
    ],
    [
      "a fridge that froze to −18 °C (a freezer's setting, US FDA) for 3 days: freezing is not more cold, 3 days lost",
      { readings: prepareStoreReadings(warmSpell("2026-01-03T00:00:00Z", "2026-01-06T00:00:00Z", -18)) },
      "shifted", 3, { opensOn: plus("2026-01-15", 3), closesOn: plus("2026-01-29", 3) }, /About 3 days/,
    ],
    [
      "a warm spell before the bag started is ignored",
      { readings: prepareStoreReadings(warmSpell("2025-12-20T00:00:00Z", "2025-12-31T18:00:00Z")) },
      "kept_cold", 0, showyPlanned, /kept its cold/,
    ],
    [
      "a warm spell after the pull is ignored",
      { bag: { startedOn: "2026-01-01", pulledOn: "2026-01-16" }, readings: prepareStoreReadings(warmSpell("2026-01-16T00:00:00Z", "2026-01-20T00:00:00Z")) },
      "kept_cold", 0, showyPlanned, /kept its cold/,
    ],
    [
      "a warm spell after `asOf` (readings from the future) is ignored",
      { asOf: Date.parse("2026-01-10T00:00:00Z"), readings: prepareStoreReadings(warmSpell("2026-01-10T00:00:00Z", "2026-01-14T00:00:00Z")) },
      "kept_cold", 0, showyPlanned, /kept its cold/,
    ],
    [
      "a bag kept in a freezer: a different treatment, the fridge band does not move it",
      { storeKind: "freezer", readings: prepareStoreReadings(every6h("2025-12-20T00:00:00Z", "2026-01-25T00:00:00Z", () => -18)) },
      "freezer", 0, showyPlanned, /different treatment/,
    ],
    [
      "a bag in a cold frame: its frosts and thaws are the treatment",
      { storeKind: "cold_frame", readings: prepareStoreReadings(warmSpell("2026-01-03T00:00:00Z", "2026-01-06T00:00:00Z", -6)) },
      "cold_frame", 0, showyPlanned, /cold frame/,
    ],
    ["a bag not started yet: the stored window, unmeasured", { bag: { startedOn: null }, protocol: null, storedWindow: { opensOn: "2026-03-01", closesOn: null, plannedPullOn: "2026-03-01", sourcesDisagree: false } }, "not_started", 0, { opensOn: "2026-03-01", closesOn: null }, /not started/],
    ["started after `asOf`: nothing to count yet", { bag: { startedOn: "2026-01-21" } }, "not_cold_yet", 0, { opensOn: "2026-02-04", closesOn: "2026-02-18" }, /not begun/],
    ["a frozen final phase is not measured against a fridge band", { protocol: frozenOnly, readings: prepareStoreReadings(warmSpell("2026-01-05T00:00:00Z", "2026-01-08T00:00:00Z")) }, "frozen_phase", 0, { opensOn: "2026-01-31", closesOn: "2026-01-31" }, /Frozen phase/],
    ["no protocol and no stored window: no window", { protocol: null }, "no_window", 0, null, /No pull window/],
  ] as const)("%s", (_, over, basis, lostDays, window, reason) => {
    const r = findEffectiveWindow({ ...base, ...over } as EffectiveWindowInput);
    expect(r.basis).toBe(basis);
    expect(r.lostDays).toBe(lostDays);
    expect(r.shifted).toBe(lostDays > 0);
    if (window === null) expect(r.window).toBeNull();
    else expect(r.window).toMatchObject(window);
    expect(r.reason).toMatch(reason);
  });

  it("keeps the planned window beside the shifted one, with the planned pull day moved too", () => {
    const r = findEffectiveWindow({ ...base, readings: prepareStoreReadings(warmSpell("2026-01-05T00:00:00Z", "2026-01-07T00:00:00Z")) });
    expect(r.planned).toEqual({ opensOn: "2026-01-15", closesOn: "2026-01-29", plannedPullOn: "2026-01-15", sourcesDisagree: false });
    expect(r.window).toEqual({ opensOn: "2026-01-17", closesOn: "2026-01-31", plannedPullOn: "2026-01-17", sourcesDisagree: false });
  });

  it("warm-then-cold (elder, Young & Young 1992): the warm phase's 15 °C is the treatment, only the cold phase is measured", () => {
    // 90 days warm from 1 Jun 2025 end on 30 Aug; the cold phase runs 90 days to 28 Nov.
    const coldStarts = plus("2025-06-01", 90);
    const readings = every6h("2025-06-01T00:00:00Z", "2025-10-01T00:00:00Z", (at) => (at < `${coldStarts}T00:00:00Z` ? 15 : 4));
    const r = findEffectiveWindow({ ...base, bag: { startedOn: "2025-06-01" }, protocol: elder, readings: prepareStoreReadings(readings), asOf: Date.parse("2025-10-01T00:00:00Z") });
    expect(r).toMatchObject({ basis: "kept_cold", lostDays: 0, window: { opensOn: plus("2025-06-01", 180), closesOn: plus("2025-06-01", 180) } });
    expect(r.span?.from).toBe(utcDay(coldStarts));
    // The same warm days inside the cold phase would move the window.
    const late = every6h("2025-06-01T00:00:00Z", "2025-10-01T00:00:00Z", (at) => (at >= "2025-09-10T00:00:00Z" && at < "2025-09-14T00:00:00Z" ? 15 : 4));
    expect(findEffectiveWindow({ ...base, bag: { startedOn: "2025-06-01" }, protocol: elder, readings: prepareStoreReadings(late), asOf: Date.parse("2025-10-01T00:00:00Z") }).lostDays).toBe(4);
  });

  it("reads the input in any order and °F as °C (53.6 °F = 12 °C, NIST SP 811 conversion)", () => {
    const readings = warmSpell("2026-01-05T00:00:00Z", "2026-01-07T00:00:00Z").map((r) => (r.value === 12 ? { ...r, value: 53.6, unit: "F" as const } : r));
    const shuffled = [...readings].reverse();
    expect(findEffectiveWindow({ ...base, readings: prepareStoreReadings(shuffled) }).lostDays).toBe(2);
  });
});

describe("measureLostCold counts exactly as measureColdExposure does (its defaults: 6 h hold, silences as cold)", () => {
  const t0 = Date.parse("2026-01-01T00:00:00Z");
  const band = { minC: 0, maxC: 10 };
  const reading = fc.record({ minute: fc.integer({ min: 0, max: 10 * 24 * 60 }), value: fc.integer({ min: -60, max: 160 }).map((v) => v / 10) });

  it("gives the same hours outside the band for any readings and any span (property test against the full walk)", () => {
    fc.assert(
      fc.property(fc.array(reading, { maxLength: 60 }), fc.integer({ min: -24 * 60, max: 11 * 24 * 60 }), fc.integer({ min: 1, max: 11 * 24 * 60 }), (rs, fromMin, lengthMin) => {
        const readings: TemperatureReading[] = rs.map((r) => ({ at: new Date(t0 + r.minute * 60_000).toISOString(), value: r.value, unit: "C" }));
        const from = t0 + fromMin * 60_000;
        const to = from + lengthMin * 60_000;
        const full = measureColdExposure(readings, { band, from: new Date(from).toISOString(), to: new Date(to).toISOString() });
        const fast = measureLostCold(prepareStoreReadings(readings), band, from, to);
        expect(fast.lostMs / 3_600_000).toBeCloseTo(full.hoursAbove + full.hoursBelow, 6);
        const days = fast.lostMs / 86_400_000;
        // Away from an exact half day, the rounded days agree too (the full walk sums float hours).
        if (Math.abs(days - Math.floor(days) - 0.5) > 1e-6) expect(Math.round(days)).toBe(full.lostDays);
      }),
      { numRuns: 400 },
    );
  });

  it.each([
    ["no readings", [], 24, 0],
    ["a warm reading 2 h before a 3 h span holds through it (5 h after it was taken)", [[-2, 12]], 3, 3],
    ["a warm reading 2 h before a 24 h span, then silence: the whole silence counts as cold", [[-2, 12]], 24, 0],
    ["a warm reading 3 h into the span: its 3 h lead-in takes its value; the silence after is cold", [[3, 12]], 24, 3],
    ["warm readings 4 h apart: each holds until the next", [[0, 12], [4, 12], [8, 4], [12, 4]], 24, 8],
    ["readings 8 h apart: each piece is a silence", [[0, 12], [8, 12], [16, 4]], 24, 0],
    ["frozen counts as lost too (below the band)", [[0, -2], [5, -2], [10, 4]], 12, 10],
  ] as const)("%s", (_, points, spanHours, hours) => {
    const from = t0;
    const to = from + spanHours * 3_600_000;
    const readings: TemperatureReading[] = points.map(([h, value]) => ({ at: new Date(t0 + h * 3_600_000).toISOString(), value, unit: "C" }));
    const fast = measureLostCold(prepareStoreReadings(readings), band, from, to);
    expect(fast.lostMs / 3_600_000).toBe(hours);
    const full = measureColdExposure(readings, { band, from: new Date(from).toISOString(), to: new Date(to).toISOString() });
    expect(full.hoursAbove + full.hoursBelow).toBeCloseTo(hours, 9);
  });
});

describe("parseReadingTime reads stored timestamps as Date.parse does (ECMAScript date-time string format)", () => {
  it("for any instant written by toISOString (property)", () => {
    fc.assert(
      fc.property(fc.date({ min: new Date("1000-01-01T00:00:00Z"), max: new Date("9999-12-31T23:59:59.999Z"), noInvalidDate: true }), (d) => {
        const at = d.toISOString();
        expect(parseReadingTime(at)).toBe(Date.parse(at));
      }),
      { numRuns: 500 },
    );
  });

  it.each([
    "2024-02-29T12:00:00.000Z", // leap day
    "2023-02-29T12:00:00.000Z", // no such day
    "2026-13-01T00:00:00.000Z",
    "2026-01-01T24:00:00.000Z",
    "2026-01-05T06:00:00+01:00",
    "2026-01-05T06:00:00Z",
    "2026-01-05 06:00",
    "not a time at all, honestly",
  ])("%s", (at) => {
    expect(Object.is(parseReadingTime(at), Date.parse(at))).toBe(true);
  });
});
