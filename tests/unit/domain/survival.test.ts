import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { estimateSurvival, readSurvivalAt, type TimeObservation } from "@/lib/domain";

// Kaplan–Meier product-limit estimator (Kaplan & Meier 1958, JASA 53:457–481), Greenwood (1926) standard errors,
// 95 % interval on the log scale (R survival::survfit default, conf.type = "log"). REFERENCES.md, "Time to an event".

const obs = (spec: string): TimeObservation[] =>
  spec.split(/[ ,]+/).filter(Boolean).map((t) => ({ time: Number(t.replace("+", "")), event: !t.endsWith("+") }));

const eventSteps = (o: TimeObservation[]) => estimateSurvival(o).steps.filter((s) => s.events > 0);

describe("R's worked example: survival package, aml data (Miller 1981), group \"Maintained\"", () => {
  // Source: R survival::aml documentation and survfit(Surv(time, status) ~ x, aml), as given in REFERENCES.md.
  const aml = obs("9, 13, 13+, 18, 23, 28+, 31, 34, 45+, 48, 161+");
  const published = [
    [9, 0.9091, 0.0867],
    [13, 0.8182, 0.1163],
    [18, 0.7159, 0.1397],
    [23, 0.6136, 0.1526],
    [31, 0.4909, 0.1642],
    [34, 0.3682, 0.1627],
    [48, 0.1841, 0.1535],
  ] as const;

  it.each(published)("day %i: survival %f, Greenwood SE %f (R survfit, aml Maintained)", (time, survival, se) => {
    const step = eventSteps(aml).find((s) => s.time === time)!;
    expect(step.survival).toBeCloseTo(survival, 4);
    expect(step.stdErr).toBeCloseTo(se, 4);
  });

  it("has exactly those seven event times, median 31 (R survfit print), 11 cases", () => {
    const curve = estimateSurvival(aml);
    expect(eventSteps(aml).map((s) => s.time)).toEqual(published.map((p) => p[0]));
    expect(curve.median).toBe(31);
    expect(curve.n).toBe(11);
    expect(curve.events).toBe(7);
    expect([curve.earliestEvent, curve.latestEvent]).toEqual([9, 48]);
  });

  it("counts the event before the censoring at the tie on day 13 (as R does): 10 at risk on day 13", () => {
    const step = estimateSurvival(aml).steps.find((s) => s.time === 13)!;
    expect(step).toMatchObject({ atRisk: 10, events: 1, censored: 1 });
  });

  it("log-scale interval: S·exp(±1.96·√Σd/(n(n−d))), upper capped at 1 (recomputed here from the formula, not read in R)", () => {
    const s9 = eventSteps(aml)[0];
    const seLog = Math.sqrt(1 / (11 * 10));
    expect(s9.lower).toBeCloseTo((10 / 11) * Math.exp(-1.959963984540054 * seLog), 10);
    expect(s9.upper).toBe(1);
  });
});

/** The textbook formula, written independently: for each distinct event time t, n = cases with time ≥ t, d = events at t. */
function textbook(o: TimeObservation[]) {
  const times = [...new Set(o.filter((x) => x.event).map((x) => x.time))].sort((a, b) => a - b);
  let s = 1;
  let v = 0;
  return times.map((t) => {
    const n = o.filter((x) => x.time >= t).length;
    const d = o.filter((x) => x.time === t && x.event).length;
    s = s * ((n - d) / n);
    v = v + (n === d ? Infinity : d / (n * (n - d)));
    return { time: t, survival: s, stdErr: s === 0 ? 0 : s * Math.sqrt(v) };
  });
}

const observations = fc.array(fc.record({ time: fc.integer({ min: 0, max: 60 }), event: fc.boolean() }), { minLength: 1, maxLength: 80 });

describe("cross-checks and properties (fast-check)", () => {
  it("matches the textbook product-limit and Greenwood formulas on random bags", () => {
    fc.assert(
      fc.property(observations, (o) => {
        const got = eventSteps(o);
        const want = textbook(o);
        expect(got.map((s) => s.time)).toEqual(want.map((w) => w.time));
        got.forEach((s, i) => {
          expect(s.survival).toBeCloseTo(want[i].survival, 12);
          expect(s.stdErr).toBeCloseTo(want[i].stdErr, 12);
        });
      }),
    );
  });

  it("never rises, stays within 0–1, and its interval holds the curve", () => {
    fc.assert(
      fc.property(observations, (o) => {
        let prev = 1;
        for (const s of estimateSurvival(o).steps) {
          expect(s.survival).toBeLessThanOrEqual(prev);
          expect(s.survival).toBeGreaterThanOrEqual(0);
          if (s.lower !== null) expect(s.lower).toBeLessThanOrEqual(s.survival + 1e-12);
          if (s.upper !== null) expect(s.upper).toBeGreaterThanOrEqual(s.survival - 1e-12);
          prev = s.survival;
        }
      }),
    );
  });

  it("with no censoring equals the empirical share still without roots, and the median is the first day at or below half", () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 60 }), { minLength: 1, maxLength: 80 }), (times) => {
        const curve = estimateSurvival(times.map((time) => ({ time, event: true })));
        for (let t = 0; t <= 61; t++) expect(readSurvivalAt(curve, t)).toBeCloseTo(times.filter((x) => x > t).length / times.length, 12);
        const firstHalf = [...new Set(times)].sort((a, b) => a - b).find((t) => times.filter((x) => x > t).length / times.length <= 0.5);
        expect(curve.median).toBe(firstHalf);
      }),
    );
  });
});

describe("censoring at every place", () => {
  it.each([
    ["first bag censored before any roots", "2+, 5, 7, 9", [[5, 2 / 3], [7, 1 / 3], [9, 0]], 7],
    ["last bag censored after the last roots", "5, 7, 9, 12+", [[5, 3 / 4], [7, 2 / 4], [9, 1 / 4]], 7],
    ["tie: roots and censoring on one day (roots first)", "5, 7, 7+, 9", [[5, 3 / 4], [7, 2 / 4], [9, 0]], 7],
    ["tie: two roots and one censored on one day", "4, 4, 4+, 8, 10+", [[4, 3 / 5], [8, 3 / 10]], 8],
    ["every bag censored but one", "3+, 6+, 8, 9+", [[8, 1 / 2]], 8],
  ] as const)("%s", (_name, spec, expected, median) => {
    const steps = eventSteps(obs(spec));
    expect(steps.map((s) => [s.time, s.survival])).toEqual(expected.map(([t, s]) => [t, expect.closeTo(s, 12)]));
    expect(estimateSurvival(obs(spec)).median).toBe(median);
  });

  it("all censored: the curve stays at 1, no median, no earliest", () => {
    const curve = estimateSurvival(obs("10+, 12+, 20+"));
    expect(curve.steps.every((s) => s.survival === 1)).toBe(true);
    expect(curve).toMatchObject({ median: null, earliestEvent: null, events: 0, n: 3 });
  });

  it("a single bag with roots on day 21: the curve drops to 0, median 21, no interval at 0 (R gives NA)", () => {
    const curve = estimateSurvival(obs("21"));
    expect(curve.steps).toEqual([{ time: 21, atRisk: 1, events: 1, censored: 0, survival: 0, stdErr: 0, lower: null, upper: null }]);
    expect(curve.median).toBe(21);
  });

  it("a single unfinished bag: no median", () => {
    expect(estimateSurvival(obs("21+")).median).toBeNull();
  });

  it("no bags: an empty curve", () => {
    expect(estimateSurvival([])).toMatchObject({ n: 0, steps: [], median: null });
  });

  it("refuses a negative time in words", () => {
    expect(() => estimateSurvival([{ time: -1, event: true }])).toThrow(/0 or more/);
  });
});
