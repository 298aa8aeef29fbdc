import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  computeGerminationMetrics,
  computeT50,
  convertToPerInterval,
  type GerminationCount,
} from "@/lib/domain";
import { DomainError } from "@/lib/errors";

// Worked example of R package germinationmetrics (Aravind et al., ICAR-NBPGR), vignette and examples:
// daily counts for days 1–14, 50 seeds sown.
const perInterval = [0, 0, 0, 0, 4, 17, 10, 7, 1, 0, 1, 0, 0, 0];
const cumulative = [0, 0, 0, 0, 4, 21, 31, 38, 39, 39, 40, 40, 40, 40];
const toCounts = (xs: number[]): GerminationCount[] => xs.map((count, i) => ({ day: i + 1, count }));

describe("germination metrics: germinationmetrics worked example (Aravind et al.)", () => {
  const fromIntervals = computeGerminationMetrics({ sown: 50, counts: toCounts(perInterval), entry: "per_interval" });
  const fromCumulative = computeGerminationMetrics({ sown: 50, counts: toCounts(cumulative), entry: "cumulative" });

  // [metric, published value, digits of precision the package prints]
  const published: [keyof typeof fromIntervals, number, number][] = [
    ["germinationPercent", 80, 12], // ISTA Rules ch. 5 formula; germinationmetrics GermPercent = 80
    ["meanGerminationTime", 6.7, 12], // MeanGermTime = 6.7 (Ranal & Santana 2006)
    ["mgtVariance", 1.44615384615385, 13], // VarGermTime
    ["mgtStandardError", 0.190141647604743, 14], // SEGermTime
    ["mgtCoefficientOfVariation", 0.179486771488981, 14], // CVGermTime
    ["meanGerminationRate", 0.149253731343284, 14], // MeanGermRate = 1/MGT
    ["coefficientOfVelocity", 14.9253731343284, 12], // CVG (Kotowski 1926)
    ["t50Coolbear", 5.97058823529412, 13], // t50 method = "coolbear" (Coolbear et al. 1984)
    ["t50Farooq", 5.94117647058824, 13], // t50 method = "farooq" (Farooq et al. 2005)
    ["melvilleGerminationIndex", 5.84, 12], // GermIndex (Melville et al. 1980)
    ["maguireSpeed", 6.13892496392496, 13], // GermSpeed, count-based (Maguire 1962)
    ["synchrony", 0.2666667, 7], // GermSynchrony (Primack 1985), printed to 7 digits
    ["uncertainty", 2.062987, 6], // GermUncertainty, printed to 6 digits
  ];

  it.each(published)("%s = %d (germinationmetrics worked example)", (key, value, digits) => {
    const a = fromIntervals[key] as { value: number | null };
    const b = fromCumulative[key] as { value: number | null };
    expect(a.value).toBeCloseTo(value, digits);
    expect(b.value).toBeCloseTo(value, digits);
  });

  it("first/last/peak day = 5/11/6 (germinationmetrics FirstGermTime, LastGermTime, PeakGermTime)", () => {
    expect([fromIntervals.firstDay, fromIntervals.lastDay, fromIntervals.peakDays]).toEqual([5, 11, [6]]);
  });

  it("labels each index by its formula, never by the bare name 'germination index'", () => {
    expect(fromIntervals.melvilleGerminationIndex.label).toBe("Germination index (Melville)");
    expect(fromIntervals.melvilleGerminationIndex.formula).toBe("Σ(Tk − Ti)Ni/Nt");
    expect(fromIntervals.maguireSpeed.label).toBe("Speed of germination (Maguire)");
    expect(fromIntervals.maguireSpeed.formula).toBe("ΣNi/Ti");
    expect(fromIntervals.t50Coolbear.source).toMatch(/Coolbear/);
  });
});

describe("germination input rules", () => {
  it.each([
    ["decreasing cumulative series", [{ day: 1, count: 3 }, { day: 2, count: 2 }], "cumulative", /went down from 3 on day 1 to 2 on day 2/],
    ["the same day twice", [{ day: 2, count: 1 }, { day: 2, count: 1 }], "per_interval", /counted twice/],
    ["a count on the sowing day", [{ day: 0, count: 1 }], "per_interval", /after/],
    ["a negative count", [{ day: 1, count: -1 }], "per_interval", /whole number/],
    ["a fractional count", [{ day: 1, count: 1.5 }], "per_interval", /whole number/],
  ] as const)("refuses %s", (_name, counts, entry, message) => {
    expect(() => convertToPerInterval(counts, entry)).toThrow(DomainError);
    expect(() => convertToPerInterval(counts, entry)).toThrow(message);
  });

  it("refuses more germinated than sown", () => {
    expect(() => computeGerminationMetrics({ sown: 3, counts: [{ day: 1, count: 4 }], entry: "per_interval" })).toThrow(/More seeds germinated/);
  });

  it("accepts uneven intervals and unsorted entry (days 3, 7, 14, 21)", () => {
    // Recomputed by hand: MGT = (2·3 + 6·7 + 2·14)/10 = 7.6; Maguire = 2/3 + 6/7 + 2/14.
    const m = computeGerminationMetrics({
      sown: 20,
      counts: [{ day: 14, count: 2 }, { day: 3, count: 2 }, { day: 21, count: 0 }, { day: 7, count: 6 }],
      entry: "per_interval",
    });
    expect(m.meanGerminationTime.value).toBeCloseTo(7.6, 12);
    expect(m.maguireSpeed.value).toBeCloseTo(2 / 3 + 6 / 7 + 2 / 14, 12);
    // Melville with Tk = 21: ((21−3)·2 + (21−7)·6 + (21−14)·2)/20
    expect(m.melvilleGerminationIndex.value).toBeCloseTo((18 * 2 + 14 * 6 + 7 * 2) / 20, 12);
    // Coolbear half = 5.5, between cumulative 2 (day 3) and 8 (day 7): 3 + 3.5·4/6
    expect(m.t50Coolbear.value).toBeCloseTo(3 + (3.5 * 4) / 6, 12);
  });

  it("leaves undefined metrics empty instead of inventing them", () => {
    const none = computeGerminationMetrics({ sown: 10, counts: [{ day: 5, count: 0 }], entry: "per_interval" });
    expect(none.germinationPercent.value).toBe(0);
    expect([none.meanGerminationTime.value, none.t50Coolbear.value, none.synchrony.value, none.uncertainty.value, none.firstDay]).toEqual([null, null, null, null, null]);
    const one = computeGerminationMetrics({ sown: 10, counts: [{ day: 5, count: 1 }], entry: "per_interval" });
    expect(one.mgtVariance.value).toBeNull();
    expect(one.uncertainty.value).toBe(0);
  });

  // germinationmetrics: "t50 cannot be computed as more than half the seeds have germinated at first interval".
  it("T50 is undefined when the first count already reaches the half value (as germinationmetrics)", () => {
    expect(computeT50([{ day: 1, count: 6 }, { day: 2, count: 4 }], "farooq")).toBeNull();
    expect(computeT50([{ day: 1, count: 5 }, { day: 2, count: 5 }], "farooq")).toBeNull();
  });
});

describe("germination properties (fast-check)", () => {
  const series = fc
    .array(fc.nat({ max: 30 }), { minLength: 1, maxLength: 25 })
    .chain((counts) =>
      fc
        .uniqueArray(fc.integer({ min: 1, max: 120 }), { minLength: counts.length, maxLength: counts.length })
        .map((days) => days.sort((a, b) => a - b).map((day, i) => ({ day, count: counts[i] }))),
    );

  it("metrics are the same whether counts are entered per interval or cumulatively", () => {
    fc.assert(
      fc.property(series, fc.nat({ max: 200 }), (counts, extra) => {
        const total = counts.reduce((s, c) => s + c.count, 0);
        const sown = total + extra + 1;
        let running = 0;
        const cum = counts.map((c) => ({ day: c.day, count: (running += c.count) }));
        const a = computeGerminationMetrics({ sown, counts, entry: "per_interval" });
        const b = computeGerminationMetrics({ sown, counts: [...cum].reverse(), entry: "cumulative" });
        expect(b).toEqual(a);
      }),
    );
  });

  it("T50 lies between the first and last germination day; Coolbear ≥ Farooq", () => {
    fc.assert(
      fc.property(series, (counts) => {
        const t50c = computeT50(counts, "coolbear");
        const t50f = computeT50(counts, "farooq");
        const germinating = counts.filter((c) => c.count > 0);
        if (t50c !== null) {
          expect(t50c).toBeGreaterThanOrEqual(counts[0].day);
          expect(t50c).toBeLessThanOrEqual(germinating[germinating.length - 1].day);
        }
        if (t50c !== null && t50f !== null) expect(t50c).toBeGreaterThanOrEqual(t50f - 1e-12);
      }),
    );
  });
});
