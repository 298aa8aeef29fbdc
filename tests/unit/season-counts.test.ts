import { describe, expect, it } from "vitest";
import { addDaysToIsoDay } from "@/lib/domain/dates";
import { judgeCountEntry, pickDailyTotals } from "@/lib/domain/count-rules";
import {
  findFinalTotal,
  findStartingTotal,
  stepTotal,
  summarizeSowing,
  toGerminationCounts,
} from "@/components/counts/count-series";

const at = (n: number) => `2026-03-01T08:00:0${n}.000Z`;

describe("pickDailyTotals: the latest entry of a day stands (counts are append-only)", () => {
  it.each([
    { name: "one per day, out of order", rows: [["2026-03-05", 4, 0], ["2026-03-03", 1, 0]], want: [["2026-03-03", 1], ["2026-03-05", 4]] },
    { name: "a recount on the same day", rows: [["2026-03-05", 4, 0], ["2026-03-05", 6, 1]], want: [["2026-03-05", 6]] },
    { name: "recount entered before (older created_at) loses", rows: [["2026-03-05", 6, 2], ["2026-03-05", 4, 1]], want: [["2026-03-05", 6]] },
    { name: "nothing counted", rows: [], want: [] },
  ] as { name: string; rows: [string, number, number][]; want: [string, number][] }[])("$name", ({ rows, want }) => {
    const counts = rows.map(([d, t, c]) => ({ counted_on: d, germinated_total: t, created_at: at(c) }));
    expect(pickDailyTotals(counts).map((x) => [x.countedOn, x.total])).toEqual(want);
    expect(findFinalTotal(counts)).toBe(want.length ? want[want.length - 1][1] : 0);
  });
});

describe("judgeCountEntry: rules of the +/− stepper", () => {
  const totals = [
    { countedOn: "2026-03-05", total: 4 },
    { countedOn: "2026-03-08", total: 10 },
  ];
  const base = { sownOn: "2026-03-01", seedsSown: 50, today: "2026-03-09", totals };
  it.each([
    { name: "rising after the last count", countedOn: "2026-03-09", total: 12, ok: true },
    { name: "same as the last count", countedOn: "2026-03-09", total: 10, ok: true },
    { name: "below the previous count", countedOn: "2026-03-09", total: 9, ok: false, says: "cannot go below" },
    { name: "between two counts, within", countedOn: "2026-03-06", total: 7, ok: true },
    { name: "between two counts, above the later one", countedOn: "2026-03-06", total: 11, ok: false, says: "cannot be higher" },
    { name: "more than were sown", countedOn: "2026-03-09", total: 51, ok: false, says: "Only 50 seeds" },
    { name: "on the sowing day", countedOn: "2026-03-01", total: 0, ok: false, says: "day after sowing" },
    { name: "in the future", countedOn: "2026-03-10", total: 10, ok: false, says: "not come yet" },
    { name: "negative", countedOn: "2026-03-09", total: -1, ok: false, says: "whole number" },
    { name: "a fraction", countedOn: "2026-03-09", total: 10.5, ok: false, says: "whole number" },
  ])("$name", ({ countedOn, total, ok, says }) => {
    const v = judgeCountEntry({ ...base, countedOn, total });
    expect(v.ok).toBe(ok);
    if (!v.ok && says) expect(v.message).toContain(says);
  });

  it("writes days the screen's way", () => {
    const v = judgeCountEntry({ ...base, countedOn: "2026-03-09", total: 3, formatDay: (d) => `the ${d.slice(8)}th` });
    expect(v.ok ? "" : v.message).toContain("10 were already up on the 08th");
  });

  it.each([
    { day: "2026-03-09", want: 10 },
    { day: "2026-03-08", want: 10 },
    { day: "2026-03-06", want: 4 },
    { day: "2026-03-02", want: 0 },
  ])("starts the stepper for $day at $want", ({ day, want }) => expect(findStartingTotal(totals, day)).toBe(want));

  it.each([
    { current: 0, delta: -1, sown: 50, want: 0 },
    { current: 49, delta: 5, sown: 50, want: 50 },
    { current: 10, delta: 1, sown: 50, want: 11 },
  ])("steps $current by $delta to $want", ({ current, delta, sown, want }) => expect(stepTotal(current, delta, sown)).toBe(want));
});

describe("summarizeSowing wires counts into lib/domain", () => {
  // germinationmetrics (Aravind et al., ICAR-NBPGR) worked example, REFERENCES.md: daily counts days 1–14,
  // 50 seeds sown; published germination 80 %, MGT 6.7, T50 (Coolbear) 5.97058823529412.
  const daily = [0, 0, 0, 0, 4, 17, 10, 7, 1, 0, 1, 0, 0, 0];
  const sownOn = "2026-03-30"; // across the spring clock change in many zones: days must stay calendar days
  let running = 0;
  const counts = daily.map((n, i) => {
    running += n;
    return { counted_on: addDaysToIsoDay(sownOn, i + 1), germinated_total: running, created_at: at(0) };
  });
  const s = summarizeSowing({ sown_on: sownOn, seeds_sown: 50 }, counts);

  it("matches the published example", () => {
    expect(s.problem).toBeNull();
    expect(s.metrics?.germinationPercent.value).toBeCloseTo(80, 10);
    expect(s.metrics?.meanGerminationTime.value).toBeCloseTo(6.7, 10);
    expect(s.metrics?.t50Coolbear.value).toBeCloseTo(5.97058823529412, 10);
    expect(s.metrics?.maguireSpeed.value).toBeCloseTo(6.13892496392496, 10);
  });

  it("days are counted from sowing and the curve ends at the germination %", () => {
    expect(toGerminationCounts(sownOn, pickDailyTotals(counts))[0]).toEqual({ day: 1, count: 0 });
    expect(s.curve[0]).toEqual({ day: 0, percent: 0, countedOn: sownOn });
    expect(s.curve[s.curve.length - 1].percent).toBeCloseTo(80, 10);
    expect(s.curve).toHaveLength(15);
  });

  it("gives the Wilson interval of 40/50 (recomputed with the Wilson 1927 formula, not read in a source)", () => {
    // Wilson: centre (p + z²/2n)/(1 + z²/n), half-width z√(p(1−p)/n + z²/4n²)/(1 + z²/n), z = 1.959963984540054
    const z = 1.959963984540054, n = 50, p = 0.8, d = 1 + (z * z) / n;
    const centre = (p + (z * z) / (2 * n)) / d, half = (z * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n))) / d;
    expect(s.interval?.lower).toBeCloseTo(centre - half, 12);
    expect(s.interval?.upper).toBeCloseTo(centre + half, 12);
  });

  it.each([
    { name: "a series that went down (two phones disagreeing)", totals: [5, 3], problem: "went down" },
    { name: "no counts yet", totals: [], problem: null },
  ])("$name gives a message, not a crash", ({ totals, problem }) => {
    const rows = totals.map((t, i) => ({ counted_on: addDaysToIsoDay(sownOn, i + 2), germinated_total: t, created_at: at(0) }));
    const r = summarizeSowing({ sown_on: sownOn, seeds_sown: 50 }, rows);
    if (problem) expect(r.problem).toContain(problem);
    else {
      expect(r.problem).toBeNull();
      expect(r.metrics).toBeNull();
      expect(r.interval?.estimate).toBe(0);
    }
  });
});
