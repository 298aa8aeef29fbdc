import { DomainError } from "@/lib/errors";

/** One count after sowing: `day` = time since sowing (days; uneven spacing allowed). */
export interface GerminationCount {
  day: number;
  count: number;
}

/** Per-interval: seeds newly germinated since the previous count. Cumulative: running total. */
export type CountEntry = "per_interval" | "cumulative";

export interface GerminationInput {
  sown: number;
  counts: readonly GerminationCount[];
  entry: CountEntry;
}

/** A value with the formula that produced it, so "germination index" is never shown bare. */
export interface LabelledValue {
  value: number | null;
  /** Name shown next to the number. */
  label: string;
  formula: string;
  source: string;
}

export interface GerminationMetrics {
  sown: number;
  germinated: number;
  germinationPercent: LabelledValue;
  meanGerminationTime: LabelledValue;
  mgtVariance: LabelledValue;
  mgtStandardError: LabelledValue;
  mgtCoefficientOfVariation: LabelledValue;
  meanGerminationRate: LabelledValue;
  coefficientOfVelocity: LabelledValue;
  t50Coolbear: LabelledValue;
  t50Farooq: LabelledValue;
  melvilleGerminationIndex: LabelledValue;
  maguireSpeed: LabelledValue;
  synchrony: LabelledValue;
  uncertainty: LabelledValue;
  firstDay: number | null;
  lastDay: number | null;
  peakDays: number[];
}

/**
 * Puts counts in day order as per-interval numbers (Ni). Cumulative series are differenced and refused
 * when they go down; days must be distinct and after sowing.
 */
export function convertToPerInterval(counts: readonly GerminationCount[], entry: CountEntry): GerminationCount[] {
  const sorted = [...counts].sort((a, b) => a.day - b.day);
  sorted.forEach((c, i) => {
    if (!Number.isFinite(c.day) || c.day <= 0) throw new DomainError(`Count days are counted from sowing and must be after it (got day ${c.day}).`);
    if (!Number.isInteger(c.count) || c.count < 0) throw new DomainError(`A count must be a whole number, zero or more (got ${c.count} on day ${c.day}).`);
    if (i > 0 && sorted[i - 1].day === c.day) throw new DomainError(`Day ${c.day} was counted twice; keep one count per day.`);
  });
  if (entry === "per_interval") return sorted.map((c) => ({ day: c.day, count: c.count }));
  return sorted.map((c, i) => {
    const previous = i === 0 ? 0 : sorted[i - 1].count;
    if (c.count < previous) {
      throw new DomainError(
        `The running total went down from ${previous} on day ${sorted[i - 1].day} to ${c.count} on day ${c.day}; a cumulative count can only stay or rise.`,
        { counts: "Cumulative counts must not decrease." },
      );
    }
    return { day: c.day, count: c.count - previous };
  });
}

function sumCounts(intervals: readonly GerminationCount[]): number {
  return intervals.reduce((s, c) => s + c.count, 0);
}

/** Germination % = 100·N/Nt (ISTA Rules, ch. 5). */
export function computeGerminationPercent(germinated: number, sown: number): number {
  if (!Number.isInteger(sown) || sown <= 0) throw new DomainError("Say how many seeds were sown (a whole number above zero).");
  if (germinated > sown) throw new DomainError(`More seeds germinated (${germinated}) than were sown (${sown}).`);
  return (100 * germinated) / sown;
}

export interface MeanGerminationTime {
  mgt: number | null;
  variance: number | null;
  standardError: number | null;
  coefficientOfVariation: number | null;
}

/** MGT = ΣNiTi/ΣNi with s² = ΣNi(Ti−MGT)²/(N−1), SE = √(s²/N), CV = s/MGT (Ranal & Santana 2006). */
export function computeMeanGerminationTime(intervals: readonly GerminationCount[]): MeanGerminationTime {
  const n = sumCounts(intervals);
  if (n === 0) return { mgt: null, variance: null, standardError: null, coefficientOfVariation: null };
  const mgt = intervals.reduce((s, c) => s + c.count * c.day, 0) / n;
  if (n < 2) return { mgt, variance: null, standardError: null, coefficientOfVariation: null };
  const variance = intervals.reduce((s, c) => s + c.count * (c.day - mgt) ** 2, 0) / (n - 1);
  return { mgt, variance, standardError: Math.sqrt(variance / n), coefficientOfVariation: Math.sqrt(variance) / mgt };
}

export type T50Method = "coolbear" | "farooq";

/**
 * Median germination time by linear interpolation between the adjacent counts around the half value:
 * (N+1)/2 for Coolbear, Francis & Grierson 1984; N/2 for Farooq et al. 2005. Null when there is no germination or
 * the first count already reaches the half value (as germinationmetrics). When a count hits the half value exactly,
 * that count's day is returned (the interpolation's limit).
 */
export function computeT50(intervals: readonly GerminationCount[], method: T50Method): number | null {
  const n = sumCounts(intervals);
  if (n === 0) return null;
  const half = method === "coolbear" ? (n + 1) / 2 : n / 2;
  let running = 0;
  let previous: { day: number; total: number } | null = null;
  for (const c of intervals) {
    const total = running + c.count;
    if (total >= half) {
      if (!previous) return null;
      if (total === half) return c.day;
      return previous.day + ((half - previous.total) * (c.day - previous.day)) / (total - previous.total);
    }
    running = total;
    previous = { day: c.day, total };
  }
  return null;
}

/** Melville et al. 1980 germination index: Σ(Tk − Ti)Ni/Nt, Tk = day of the last count. */
export function computeMelvilleIndex(intervals: readonly GerminationCount[], sown: number): number {
  const lastDay = intervals.length ? intervals[intervals.length - 1].day : 0;
  return intervals.reduce((s, c) => s + (lastDay - c.day) * c.count, 0) / sown;
}

/** Maguire 1962 speed of germination: ΣNi/Ti (AOSA 1983). */
export function computeMaguireSpeed(intervals: readonly GerminationCount[]): number {
  return intervals.reduce((s, c) => s + c.count / c.day, 0);
}

function choose2(k: number): number {
  return (k * (k - 1)) / 2;
}

/** Primack 1985 synchrony Z = ΣC(Ni,2)/C(N,2); null with fewer than two seeds. */
export function computeSynchrony(intervals: readonly GerminationCount[]): number | null {
  const n = sumCounts(intervals);
  if (n < 2) return null;
  return intervals.reduce((s, c) => s + choose2(c.count), 0) / choose2(n);
}

/** Uncertainty U = −Σ fi·log2 fi, fi = Ni/N (as in Ranal & Santana 2006); null with no germination. */
export function computeUncertainty(intervals: readonly GerminationCount[]): number | null {
  const n = sumCounts(intervals);
  if (n === 0) return null;
  // 0 − sum, not −sum: a single germination day gives 0, not −0.
  return 0 - intervals.reduce((s, c) => (c.count > 0 ? s + (c.count / n) * Math.log2(c.count / n) : s), 0);
}

export function findGerminationDays(intervals: readonly GerminationCount[]): { firstDay: number | null; lastDay: number | null; peakDays: number[] } {
  const germinating = intervals.filter((c) => c.count > 0);
  if (germinating.length === 0) return { firstDay: null, lastDay: null, peakDays: [] };
  const peak = Math.max(...germinating.map((c) => c.count));
  return {
    firstDay: germinating[0].day,
    lastDay: germinating[germinating.length - 1].day,
    peakDays: germinating.filter((c) => c.count === peak).map((c) => c.day),
  };
}

function label(value: number | null, name: string, formula: string, source: string): LabelledValue {
  return { value, label: name, formula, source };
}

/** Every germination metric from one set of counts, each labelled by its formula and source. */
export function computeGerminationMetrics(input: GerminationInput): GerminationMetrics {
  const intervals = convertToPerInterval(input.counts, input.entry);
  const germinated = sumCounts(intervals);
  const percent = computeGerminationPercent(germinated, input.sown);
  const mgt = computeMeanGerminationTime(intervals);
  const rs = "Ranal & Santana 2006, Rev. Bras. Bot. 29:1–11";
  return {
    sown: input.sown,
    germinated,
    germinationPercent: label(percent, "Germination", "100·N/Nt", "ISTA International Rules for Seed Testing, ch. 5"),
    meanGerminationTime: label(mgt.mgt, "Mean germination time (MGT)", "ΣNiTi/ΣNi", rs),
    mgtVariance: label(mgt.variance, "Variance of germination time", "ΣNi(Ti−MGT)²/(N−1)", rs),
    mgtStandardError: label(mgt.standardError, "Standard error of MGT", "√(s²/N)", rs),
    mgtCoefficientOfVariation: label(mgt.coefficientOfVariation, "Coefficient of variation of germination time", "s/MGT", rs),
    meanGerminationRate: label(mgt.mgt === null ? null : 1 / mgt.mgt, "Mean germination rate", "1/MGT", rs),
    coefficientOfVelocity: label(mgt.mgt === null ? null : 100 / mgt.mgt, "Coefficient of velocity (Kotowski)", "100/MGT", "Kotowski 1926; " + rs),
    t50Coolbear: label(computeT50(intervals, "coolbear"), "T50 (Coolbear)", "Ti + ((N+1)/2 − ni)(Tj − Ti)/(nj − ni)", "Coolbear, Francis & Grierson 1984, J. Exp. Bot. 35:1609–1617"),
    t50Farooq: label(computeT50(intervals, "farooq"), "T50 (Farooq)", "Ti + (N/2 − ni)(Tj − Ti)/(nj − ni)", "Farooq et al. 2005, J. Integr. Plant Biol. 47:187–193"),
    melvilleGerminationIndex: label(computeMelvilleIndex(intervals, input.sown), "Germination index (Melville)", "Σ(Tk − Ti)Ni/Nt", "Melville et al. 1980, HortScience 15:749"),
    maguireSpeed: label(computeMaguireSpeed(intervals), "Speed of germination (Maguire)", "ΣNi/Ti", "Maguire 1962; AOSA 1983"),
    synchrony: label(computeSynchrony(intervals), "Synchrony (Z)", "ΣC(Ni,2)/C(N,2)", "Primack 1985"),
    uncertainty: label(computeUncertainty(intervals), "Uncertainty (U)", "−Σfi·log2 fi", rs),
    ...findGerminationDays(intervals),
  };
}
