import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { Temporal } from "@js-temporal/polyfill";
import { computeSeedsNeeded, computeSowDate, countBackPhases, planSeason, starterProtocols, type SeasonPlanInput } from "@/lib/domain";

const minus = (day: string, n: number) => Temporal.PlainDate.from(day).subtract({ days: n }).toString();
const starter = (key: string) => starterProtocols.find((p) => p.key === key)!;

describe("sowing date from the last spring frost", () => {
  it.each([
    ["2024-05-15", -6, "2024-04-03"], // six weeks before frost, indoors
    ["2024-05-15", 2, "2024-05-29"], // two weeks after, outdoors
    ["2024-03-20", -3, "2024-02-28"], // across a leap-year February
  ])("frost %s, %i weeks → %s", (frost, weeks, sow) => {
    expect(computeSowDate(frost, { weeksFromFrost: weeks, where: "indoor" })).toBe(sow);
  });
});

describe("start-by dates, counted back through the phases", () => {
  it("Sambucus (90 warm, then 90 cold; Young & Young 1992), sowing 2024-05-01", () => {
    const phases = countBackPhases(starter("sambucus"), "2024-05-01");
    const coldStart = minus("2024-05-01", 90); // Temporal PlainDate cross-check
    expect(phases).toEqual([
      { kind: "warm_moist", startBy: minus(coldStart, 90), startFrom: minus(coldStart, 90) },
      { kind: "cold_moist", startBy: coldStart, startFrom: coldStart },
    ]);
    expect(coldStart).toBe("2024-02-01");
  });

  it("A. speciosa 2–4 weeks (Kaye et al. 2018): start by 14 days before sowing, no earlier than 28", () => {
    expect(countBackPhases(starter("asclepias-speciosa"), "2024-04-03")).toEqual([{ kind: "cold_moist", startBy: "2024-03-20", startFrom: "2024-03-06" }]);
  });

  it("no earliest start when the source sets no upper limit (Lavandula row)", () => {
    expect(countBackPhases(starter("lavandula-angustifolia"), "2024-04-03")).toEqual([{ kind: "cold_moist", startBy: "2024-03-06", startFrom: null }]);
  });
});

describe("seeds needed = ceil(target / (germination × survival))", () => {
  it.each([
    [100, 0.8, 0.5, 250],
    [10, 0.3, 0.9, 38],
    [7, 0.7, 1, 10], // 7/0.7 is 10.000000000000002 in floating point: still 10
    [0, 0.5, 0.5, 0],
    [1, 1, 1, 1],
  ])("%i plants at %d germination, %d survival → %i seeds", (target, g, s, seeds) => {
    expect(computeSeedsNeeded(target, g, s)).toBe(seeds);
  });

  it.each([
    [10, 0, 0.5, /germination must be above 0 %/],
    [10, 1.2, 0.5, /at most 100 %/],
    [10, 0.5, 0, /survival/],
    [2.5, 0.5, 0.5, /whole number/],
  ])("refuses %d plants, %d, %d", (target, g, s, msg) => {
    expect(() => computeSeedsNeeded(target, g, s)).toThrow(msg);
  });

  it("is the smallest number of seeds that meets the target (property)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 5000 }), fc.integer({ min: 1, max: 100 }), fc.integer({ min: 1, max: 100 }), (target, gp, sp) => {
        const g = gp / 100;
        const s = sp / 100;
        const seeds = computeSeedsNeeded(target, g, s);
        expect(seeds * g * s).toBeGreaterThanOrEqual(target - 1e-6);
        expect((seeds - 1) * g * s).toBeLessThan(target);
      }),
    );
  });
});

describe("season plan", () => {
  const base: SeasonPlanInput = {
    protocol: starter("echinacea-purpurea"),
    today: "2024-01-10",
    lastFrostOn: "2024-05-15",
    rule: { weeksFromFrost: -6, where: "indoor" },
    targetPlants: 50,
    germination: { kind: "fraction", value: 0.5 },
    survival: 0.8,
  };

  it("Echinacea purpurea, 4 weeks at 5 °C (HortScience 1993): sow 2024-04-03, start the bag by 2024-03-06", () => {
    expect(planSeason(base)).toMatchObject({
      sowOn: "2024-04-03",
      where: "indoor",
      startBy: "2024-03-06",
      seedsNeeded: 125,
      warnings: [],
    });
  });

  it("a chosen sowing date wins over the frost rule", () => {
    expect(planSeason({ ...base, sowOn: "2024-04-20" }).startBy).toBe("2024-03-23");
  });

  it("uses the Wilson lower bound of the farm's own record (81/263 → 0.2553: Newcombe 1998a)", () => {
    const plan = planSeason({ ...base, germination: { kind: "history", germinated: 81, sown: 263 }, survival: 1 });
    expect(plan.expectedGermination).toBeCloseTo(0.2553, 4);
    expect(plan.seedsNeeded).toBe(Math.ceil(50 / plan.expectedGermination));
    expect(plan.germinationBasis).toMatch(/Wilson 95 % lower bound.*81 of 263/);
  });

  it.each<[string, Partial<SeasonPlanInput>, RegExp]>([
    ["lot_too_small", { lotSeeds: 100 }, /holds 100 seeds but about 125/],
    ["start_by_passed", { today: "2024-03-10" }, /should have started by 6 Mar 2024/],
    ["sow_date_passed", { today: "2024-04-05" }, /sowing date 3 Apr 2024 has passed/],
    ["no_cold_needed", { protocol: starter("rudbeckia-hirta") }, /needs no cold/],
    [
      "sources_disagree",
      {
        protocol: {
          species: "X",
          effectiveBand: null,
          phases: [{ kind: "cold_moist", note: "", sources: [{ citation: "A", minDays: 14, maxDays: 14, band: null, note: "" }, { citation: "B", minDays: 70, maxDays: 70, band: null, note: "" }] }],
        },
      },
      /common practice/,
    ],
  ])("warns: %s", (code, over, message) => {
    const w = planSeason({ ...base, ...over }).warnings.find((x) => x.code === code);
    expect(w?.message).toMatch(message);
  });

  it("asks for a date when neither a sowing date nor a frost rule is given", () => {
    expect(() => planSeason({ ...base, lastFrostOn: null })).toThrow(/Give a sowing date/);
  });

  it("refuses a history with no germination at all rather than dividing by zero", () => {
    expect(() => planSeason({ ...base, germination: { kind: "history", germinated: 0, sown: 40 } })).toThrow(/no germination yet/);
  });
});
