import { DomainError } from "@/lib/errors";

/** Two-sided 95 % normal quantile, z = Φ⁻¹(0.975) (REFERENCES.md). */
export const z95 = 1.959963984540054;

export interface ProportionInterval {
  estimate: number;
  lower: number;
  upper: number;
}

function assertCounts(successes: number, trials: number, what = "count"): void {
  if (!Number.isInteger(successes) || !Number.isInteger(trials) || successes < 0 || trials < 0) {
    throw new DomainError(`Each ${what} must be a whole number, zero or more.`);
  }
  if (trials === 0) throw new DomainError("No seeds were sown, so there is nothing to compute.");
  if (successes > trials) throw new DomainError(`More seeds germinated (${successes}) than were sown (${trials}).`);
}

/**
 * Inverse standard normal CDF by Acklam's rational approximation (relative error below 1.2e-9), so intervals at
 * other confidence levels need no table. 95 % uses the exact constant z95.
 */
export function findNormalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new DomainError("A probability for the normal quantile must lie strictly between 0 and 1.");
  const a = [-39.69683028665376, 220.9460984245205, -275.9285104469687, 138.357751867269, -30.66479806614716, 2.506628277459239];
  const b = [-54.47609879822406, 161.5858368580409, -155.6989798598866, 66.80131188771972, -13.28068155288572];
  const c = [-0.007784894002430293, -0.3223964580411365, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
  const d = [0.007784695709041462, 0.3224671290700398, 2.445134137142996, 3.754408661907416];
  const low = 0.02425;
  let x: number;
  if (p < low) {
    const q = Math.sqrt(-2 * Math.log(p));
    x = (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  } else if (p <= 1 - low) {
    const q = p - 0.5;
    const r = q * q;
    x = ((((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q) / (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1);
  } else {
    const q = Math.sqrt(-2 * Math.log(1 - p));
    x = -(((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  }
  return x;
}

function zForConfidence(confidence: number): number {
  if (confidence === 0.95) return z95;
  if (!(confidence > 0 && confidence < 1)) throw new DomainError("Confidence must be between 0 and 1, e.g. 0.95.");
  return findNormalQuantile(1 - (1 - confidence) / 2);
}

/** Wilson score interval (Wilson 1927; Newcombe 1998a method 3), no continuity correction. */
export function computeWilsonInterval(successes: number, trials: number, confidence = 0.95): ProportionInterval {
  assertCounts(successes, trials);
  const z = zForConfidence(confidence);
  const n = trials;
  const p = successes / n;
  const z2 = z * z;
  const denom = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denom;
  const half = (z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n))) / denom;
  return {
    estimate: p,
    lower: successes === 0 ? 0 : Math.max(0, Math.min(p, centre - half)),
    upper: successes === n ? 1 : Math.min(1, Math.max(p, centre + half)),
  };
}

export interface DifferenceInterval {
  /** p1 − p2 */
  difference: number;
  lower: number;
  upper: number;
}

/** Difference of two independent proportions with Newcombe's method 10 (Wilson-based hybrid; Newcombe 1998b). */
export function compareProportions(x1: number, n1: number, x2: number, n2: number, confidence = 0.95): DifferenceInterval {
  const a = computeWilsonInterval(x1, n1, confidence);
  const b = computeWilsonInterval(x2, n2, confidence);
  const d = a.estimate - b.estimate;
  return {
    difference: d,
    lower: d - Math.sqrt((a.estimate - a.lower) ** 2 + (b.upper - b.estimate) ** 2),
    upper: d + Math.sqrt((a.upper - a.estimate) ** 2 + (b.estimate - b.lower) ** 2),
  };
}

/** 2×2 table [[a, b], [c, d]]: rows are treatments, columns germinated / not (or any two-way split). */
export type TwoByTwo = readonly [readonly [number, number], readonly [number, number]];

export interface FisherResult {
  /** P(X ≤ a): odds ratio < 1 (R alternative "less"). */
  pLess: number;
  /** P(X ≥ a): odds ratio > 1 (R alternative "greater"). */
  pGreater: number;
  /** Sum of tables no more likely than the one seen (R's rule, relative tolerance 1e-7). */
  pTwoSided: number;
  /** Sample odds ratio ad/bc (Infinity or NaN on zero cells). */
  sampleOddsRatio: number;
}

/** Hypergeometric probabilities of the top-left cell given the margins, computed in logs from the mode outward. */
function computeTablePmf(rowA: number, colA: number, total: number): { lo: number; pmf: number[] } {
  const lo = Math.max(0, rowA + colA - total);
  const hi = Math.min(rowA, colA);
  const logw: number[] = [0];
  for (let x = lo; x < hi; x++) {
    const ratio = ((rowA - x) * (colA - x)) / ((x + 1) * (total - rowA - colA + x + 1));
    logw.push(logw[logw.length - 1] + Math.log(ratio));
  }
  const max = Math.max(...logw);
  const w = logw.map((l) => Math.exp(l - max));
  const sum = w.reduce((s, v) => s + v, 0);
  return { lo, pmf: w.map((v) => v / sum) };
}

/** Fisher's exact test on a 2×2 table (Fisher 1935; as R's fisher.test for 2×2). */
export function testFisherExact(table: TwoByTwo): FisherResult {
  const [[a, b], [c, d]] = table;
  for (const v of [a, b, c, d]) {
    if (!Number.isInteger(v) || v < 0) throw new DomainError("Every cell of the table must be a whole number, zero or more.");
  }
  const total = a + b + c + d;
  if (total === 0) throw new DomainError("The table is empty.");
  const { lo, pmf } = computeTablePmf(a + b, a + c, total);
  const i = a - lo;
  let pLess = 0;
  let pGreater = 0;
  let pTwoSided = 0;
  const limit = pmf[i] * (1 + 1e-7);
  pmf.forEach((p, k) => {
    if (k <= i) pLess += p;
    if (k >= i) pGreater += p;
    if (p <= limit) pTwoSided += p;
  });
  return {
    pLess: Math.min(1, pLess),
    pGreater: Math.min(1, pGreater),
    pTwoSided: Math.min(1, pTwoSided),
    sampleOddsRatio: (a * d) / (b * c),
  };
}

export interface TrialArm {
  name: string;
  germinated: number;
  sown: number;
}

export interface TrialVerdict {
  /** What a grower would say about it, in one sentence; never claims more than the numbers allow. */
  headline: string;
  /** The numbers beneath: rates, the difference with its interval, Fisher's p. */
  numbers: string;
  /** Both together. */
  text: string;
  kind: "clear_difference" | "hint" | "no_clear_difference";
  better: TrialArm;
  other: TrialArm;
  /** better − other, as fractions. */
  difference: DifferenceInterval;
  fisher: FisherResult;
  cautions: string[];
}

function formatPoints(v: number): string {
  const points = v * 100;
  const r = Math.round(points);
  const text = r === 0 && points !== 0 && Math.abs(points) >= 0.05 ? points.toFixed(1) : String(r === 0 ? 0 : r);
  return text.replace("-", "−");
}

function formatPercent(x: number, n: number): string {
  return `${Math.round((100 * x) / n)} %`;
}

/** Plain words for a two-arm trial: Newcombe interval for the difference, Fisher's exact test for chance. */
export function describeTrialVerdict(armA: TrialArm, armB: TrialArm): TrialVerdict {
  const [better, other] = armA.germinated / armA.sown >= armB.germinated / armB.sown ? [armA, armB] : [armB, armA];
  const difference = compareProportions(better.germinated, better.sown, other.germinated, other.sown);
  const fisher = testFisherExact([
    [better.germinated, better.sown - better.germinated],
    [other.germinated, other.sown - other.germinated],
  ]);
  const pts = formatPoints(difference.difference);
  const range = `95 % interval ${formatPoints(difference.lower)} to ${formatPoints(difference.upper)} points`;
  const rates = `${better.name} ${formatPercent(better.germinated, better.sown)}, ${other.name} ${formatPercent(other.germinated, other.sown)}`;
  const numbers = `${rates}: ${pts} points apart (${range}; Fisher's exact p = ${fisher.pTwoSided < 0.001 ? "< 0.001" : fisher.pTwoSided.toFixed(3)}).`;
  let kind: TrialVerdict["kind"];
  let headline: string;
  if (difference.lower > 0 && fisher.pTwoSided < 0.05) {
    kind = "clear_difference";
    headline = `The ${better.name} bags came up better, and the difference is likely real.`;
  } else if (difference.lower > 0) {
    kind = "hint";
    headline = `The ${better.name} bags came up better, but it could still be chance: repeat with more seed.`;
  } else {
    kind = "no_clear_difference";
    headline =
      difference.difference === 0
        ? `Both came up the same (${formatPercent(better.germinated, better.sown)}).`
        : `The ${better.name} bags came up a little better, but that could easily be chance.`;
  }
  const text = `${headline} ${numbers}`;
  const cautions = ["One trial on one lot: repeat it before changing the protocol."];
  if (Math.min(better.sown, other.sown) < 30) cautions.push("Fewer than 30 seeds in an arm: the interval is wide.");
  return { headline, numbers, text, kind, better, other, difference, fisher, cautions };
}
