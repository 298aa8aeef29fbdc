import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { jStat } from "jstat";
import normalQuantile from "@stdlib/stats-base-dists-normal-quantile";
import hypergeometricPmf from "@stdlib/stats-base-dists-hypergeometric-pmf";
import hypergeometricCdf from "@stdlib/stats-base-dists-hypergeometric-cdf";
import {
  compareProportions,
  computeWilsonInterval,
  describeTrialVerdict,
  findNormalQuantile,
  testFisherExact,
  z95,
  type TwoByTwo,
} from "@/lib/domain";

describe("Wilson score interval (Wilson 1927; Newcombe 1998a, Stat. Med. 17:857–872, method 3)", () => {
  it.each([
    [81, 263, 0.2553, 0.3662], // Newcombe 1998a, table II example
    [15, 148, 0.0624, 0.1605], // Newcombe 1998a, table II example
  ])("%i/%i → %d to %d", (x, n, lower, upper) => {
    const w = computeWilsonInterval(x, n);
    expect(w.lower).toBeCloseTo(lower, 4);
    expect(w.upper).toBeCloseTo(upper, 4);
  });

  it("z for 95 % matches @stdlib normal quantile (independent cross-check)", () => {
    expect(z95).toBeCloseTo(normalQuantile(0.975, 0, 1), 14);
  });

  it("the normal quantile matches @stdlib on generated probabilities", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-9, max: 1 - 1e-9, noNaN: true }), (p) => {
        const ours = findNormalQuantile(p);
        const ref = normalQuantile(p, 0, 1);
        expect(Math.abs(ours - ref)).toBeLessThan(1e-8 * Math.max(1, Math.abs(ref)));
      }),
    );
  });

  it("bounds are where the score statistic equals z (cross-check with jstat's normal CDF)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 2000 }).chain((n) => fc.tuple(fc.integer({ min: 1, max: n - 1 > 0 ? n - 1 : 1 }), fc.constant(n))), ([x, n]) => {
        fc.pre(x < n);
        const w = computeWilsonInterval(x, n);
        const p = x / n;
        for (const bound of [w.lower, w.upper]) {
          const score = Math.abs(p - bound) / Math.sqrt((bound * (1 - bound)) / n);
          expect(2 * (1 - jStat.normal.cdf(score, 0, 1))).toBeCloseTo(0.05, 8);
        }
      }),
    );
  });

  it("contains the estimate and stays within [0, 1] (property)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 5000 }).chain((n) => fc.tuple(fc.integer({ min: 0, max: n }), fc.constant(n))), ([x, n]) => {
        const w = computeWilsonInterval(x, n);
        expect(w.lower).toBeGreaterThanOrEqual(0);
        expect(w.upper).toBeLessThanOrEqual(1);
        expect(w.lower).toBeLessThanOrEqual(w.estimate);
        expect(w.upper).toBeGreaterThanOrEqual(w.estimate);
      }),
    );
  });

  it("0/n starts at exactly 0 and n/n ends at exactly 1", () => {
    expect(computeWilsonInterval(0, 10).lower).toBe(0);
    expect(computeWilsonInterval(10, 10).upper).toBe(1);
  });

  it.each([
    [0, 0, /No seeds were sown/],
    [5, 4, /More seeds germinated/],
    [-1, 4, /whole number/],
    [1.5, 4, /whole number/],
  ])("refuses %d/%d with a grower's message", (x, n, msg) => {
    expect(() => computeWilsonInterval(x, n)).toThrow(msg);
  });

  it("a 90 % interval is narrower than the 95 % one", () => {
    const a = computeWilsonInterval(30, 100, 0.9);
    const b = computeWilsonInterval(30, 100);
    expect(a.upper - a.lower).toBeLessThan(b.upper - b.lower);
  });
});

describe("difference of two proportions, Newcombe 1998b (Stat. Med. 17:873–890) method 10", () => {
  it("56/70 − 48/80 → +0.0524 to +0.3339 (Newcombe 1998b worked example)", () => {
    const d = compareProportions(56, 70, 48, 80);
    expect(d.difference).toBeCloseTo(0.2, 12);
    expect(d.lower).toBeCloseTo(0.0524, 4);
    expect(d.upper).toBeCloseTo(0.3339, 4);
  });

  it("contains the difference and stays within [−1, 1] (property)", () => {
    const arm = fc.integer({ min: 1, max: 500 }).chain((n) => fc.tuple(fc.integer({ min: 0, max: n }), fc.constant(n)));
    fc.assert(
      fc.property(arm, arm, ([x1, n1], [x2, n2]) => {
        const d = compareProportions(x1, n1, x2, n2);
        expect(d.lower).toBeLessThanOrEqual(d.difference + 1e-12);
        expect(d.upper).toBeGreaterThanOrEqual(d.difference - 1e-12);
        expect(d.lower).toBeGreaterThanOrEqual(-1 - 1e-12);
        expect(d.upper).toBeLessThanOrEqual(1 + 1e-12);
      }),
    );
  });
});

describe("Fisher's exact test on a 2×2 table", () => {
  it("R fisher.test documentation (after Agresti), tea tasting [[3,1],[1,3]]: greater p = 17/70 = 0.2429", () => {
    const f = testFisherExact([
      [3, 1],
      [1, 3],
    ]);
    expect(f.pGreater).toBeCloseTo(17 / 70, 14);
    expect(f.pGreater).toBeCloseTo(0.2429, 4);
    // Recomputed from the same hypergeometric (not printed in R's docs): two-sided = 34/70, less = 69/70.
    expect(f.pTwoSided).toBeCloseTo(34 / 70, 14);
    expect(f.pLess).toBeCloseTo(69 / 70, 14);
  });

  const table = fc
    .tuple(fc.nat({ max: 40 }), fc.nat({ max: 40 }), fc.nat({ max: 40 }), fc.nat({ max: 40 }))
    .filter(([a, b, c, d]) => a + b + c + d > 0)
    .map(([a, b, c, d]) => [[a, b], [c, d]] as TwoByTwo);

  it("one-sided p-values match @stdlib's hypergeometric CDF on generated tables", () => {
    fc.assert(
      fc.property(table, ([[a, b], [c, d]]) => {
        const total = a + b + c + d;
        const f = testFisherExact([[a, b], [c, d]]);
        // X = top-left cell; population total, a+c "successes", a+b drawn.
        const less = hypergeometricCdf(a, total, a + c, a + b);
        const greater = 1 - hypergeometricCdf(a - 1, total, a + c, a + b);
        expect(f.pLess).toBeCloseTo(less, 10);
        expect(f.pGreater).toBeCloseTo(greater, 10);
      }),
    );
  });

  it("two-sided p matches a sum of @stdlib hypergeometric PMFs using R's rule (≤ p_obs·(1+1e−7))", () => {
    fc.assert(
      fc.property(table, ([[a, b], [c, d]]) => {
        const total = a + b + c + d;
        const K = a + c;
        const n = a + b;
        const observed = hypergeometricPmf(a, total, K, n);
        let p = 0;
        for (let x = Math.max(0, n + K - total); x <= Math.min(n, K); x++) {
          const px = hypergeometricPmf(x, total, K, n);
          if (px <= observed * (1 + 1e-7)) p += px;
        }
        expect(testFisherExact([[a, b], [c, d]]).pTwoSided).toBeCloseTo(Math.min(1, p), 9);
      }),
    );
  });

  it("jstat's hypergeometric agrees on the tea-tasting table (second independent source)", () => {
    // jStat.hypgeom.pdf(k, N, m, n): k successes in n draws from N with m successes.
    expect(jStat.hypgeom.pdf(3, 8, 4, 4) + jStat.hypgeom.pdf(4, 8, 4, 4)).toBeCloseTo(17 / 70, 12);
  });

  it("refuses negative or fractional cells", () => {
    expect(() => testFisherExact([[1, -1], [2, 2]])).toThrow(/whole number/);
    expect(() => testFisherExact([[0, 0], [0, 0]])).toThrow(/empty/);
  });
});

describe("trial verdict in plain words (never overstates)", () => {
  it.each([
    // [armA, armB, kind, text pattern]
    [
      { name: "Freezer arm", germinated: 56, sown: 70 },
      { name: "Fridge arm", germinated: 48, sown: 80 },
      "clear_difference",
      /^The Freezer arm bags came up better, and the difference is likely real\. Freezer arm 80 %, Fridge arm 60 %: 20 points apart \(95 % interval 5 to 33 points; Fisher's exact p = 0\.0\d+\)\.$/,
    ],
    [
      { name: "Towel", germinated: 12, sown: 20 },
      { name: "Sand", germinated: 10, sown: 20 },
      "no_clear_difference",
      /^The Towel bags came up a little better, but that could easily be chance\. Towel 60 %, Sand 50 %: 10 points apart \(95 % interval −\d+ to \d+ points; Fisher's exact p = [\d.]+\)\.$/,
    ],
    [
      { name: "30 days", germinated: 10, sown: 20 },
      { name: "60 days", germinated: 10, sown: 20 },
      "no_clear_difference",
      /^Both came up the same \(50 %\)\./,
    ],
  ] as const)("%o vs %o → %s", (a, b, kind, pattern) => {
    const v = describeTrialVerdict(a, b);
    expect(v.kind).toBe(kind);
    expect(v.text).toMatch(pattern);
    expect(v.text).not.toMatch(/prove|significant|certain/i);
  });

  it("names the better arm first whichever order the arms come in", () => {
    const v = describeTrialVerdict({ name: "Fridge arm", germinated: 48, sown: 80 }, { name: "Freezer arm", germinated: 56, sown: 70 });
    expect(v.better.name).toBe("Freezer arm");
    expect(v.difference.lower).toBeCloseTo(0.0524, 4); // Newcombe 1998b
  });

  it("says 'likely real' only when the interval excludes 0 and Fisher's two-sided p < 0.05 (property)", () => {
    const arm = fc.integer({ min: 1, max: 120 }).chain((n) => fc.record({ germinated: fc.integer({ min: 0, max: n }), sown: fc.constant(n) }));
    fc.assert(
      fc.property(arm, arm, (a, b) => {
        const v = describeTrialVerdict({ name: "A", ...a }, { name: "B", ...b });
        if (v.headline.includes("likely real")) {
          expect(v.difference.lower).toBeGreaterThan(0);
          expect(v.fisher.pTwoSided).toBeLessThan(0.05);
        }
        if (v.difference.lower <= 0) expect(v.headline).toMatch(/chance|the same/);
      }),
    );
  });

  it("warns when arms are small", () => {
    expect(describeTrialVerdict({ name: "A", germinated: 9, sown: 10 }, { name: "B", germinated: 1, sown: 10 }).cautions.join(" ")).toMatch(/Fewer than 30 seeds/);
  });
});
