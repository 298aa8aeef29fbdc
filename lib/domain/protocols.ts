import type { Protocol, ProtocolPhase, ProtocolSource, TemperatureBand } from "@/lib/schemas/protocol";
import { timedPhaseKinds } from "@/lib/schemas/words";
import type { PhaseKind } from "@/lib/schemas/words";

/** Default band that counts as cold (product default; Chong et al. tables give 1–5 °C, some species do best at 10 °C). */
export const defaultEffectiveBand: TemperatureBand = { minC: 0, maxC: 10 };
/** Optimum shown to the grower: 1–5 °C (Chong et al., Handbook of Plant and Crop Physiology). */
export const defaultOptimumBand: TemperatureBand = { minC: 1, maxC: 5 };

export interface SourceReconciliation {
  /** Earliest minimum across sources. */
  minDays: number;
  /** Latest maximum across sources; null when a source sets no upper limit. */
  maxDays: number | null;
  /**
   * Planned duration. Common practice (no published source): when sources disagree, plan for the
   * earliest date and check daily from then, pulling as soon as the first roots show.
   */
  plannedDays: number;
  /** True when at least two sources give ranges that do not overlap. */
  sourcesDisagree: boolean;
  /** The days every source accepts, when they overlap. */
  agreedRange: { minDays: number; maxDays: number | null } | null;
  citations: string[];
}

export interface ReconciledPhase extends SourceReconciliation {
  kind: PhaseKind;
  timed: boolean;
  note: string;
}

export interface ReconciledProtocol {
  species: string;
  phases: ReconciledPhase[];
  /** Only the phases that take days in the bag, in order. */
  timedPhases: ReconciledPhase[];
  needsCold: boolean;
  effectiveBand: TemperatureBand;
  optimumBand: TemperatureBand;
  sourcesDisagree: boolean;
}

export function isTimedPhase(kind: PhaseKind): boolean {
  return (timedPhaseKinds as readonly PhaseKind[]).includes(kind);
}

export function reconcileSources(sources: readonly ProtocolSource[]): SourceReconciliation {
  if (sources.length === 0) {
    return { minDays: 0, maxDays: 0, plannedDays: 0, sourcesDisagree: false, agreedRange: null, citations: [] };
  }
  let minDays = Infinity;
  let maxDays: number | null = -Infinity;
  let latestMin = -Infinity;
  let earliestMax = Infinity;
  for (const s of sources) {
    minDays = Math.min(minDays, s.minDays);
    maxDays = s.maxDays === null || maxDays === null ? null : Math.max(maxDays, s.maxDays);
    latestMin = Math.max(latestMin, s.minDays);
    earliestMax = Math.min(earliestMax, s.maxDays ?? Infinity);
  }
  const overlap = latestMin <= earliestMax;
  return {
    minDays,
    maxDays,
    plannedDays: minDays,
    sourcesDisagree: !overlap,
    agreedRange: overlap ? { minDays: latestMin, maxDays: Number.isFinite(earliestMax) ? earliestMax : null } : null,
    citations: sources.map((s) => s.citation),
  };
}

export function reconcilePhase(phase: ProtocolPhase): ReconciledPhase {
  return { kind: phase.kind, timed: isTimedPhase(phase.kind), note: phase.note, ...reconcileSources(phase.sources) };
}

/** The optimum is 1–5 °C kept inside the protocol's own band (a 10 °C species keeps its band as optimum). */
export function findOptimumBand(effective: TemperatureBand): TemperatureBand {
  const minC = Math.max(effective.minC, defaultOptimumBand.minC);
  const maxC = Math.min(effective.maxC, defaultOptimumBand.maxC);
  return minC <= maxC ? { minC, maxC } : effective;
}

export function reconcileProtocol(protocol: Pick<Protocol, "species" | "phases" | "effectiveBand">): ReconciledProtocol {
  const phases = protocol.phases.map(reconcilePhase);
  const timedPhases = phases.filter((p) => p.timed);
  const effectiveBand = protocol.effectiveBand ?? defaultEffectiveBand;
  return {
    species: protocol.species,
    phases,
    timedPhases,
    needsCold: timedPhases.some((p) => (p.kind === "cold_moist" || p.kind === "frozen") && (p.maxDays === null || p.maxDays > 0)),
    effectiveBand,
    optimumBand: findOptimumBand(effectiveBand),
    sourcesDisagree: phases.some((p) => p.sourcesDisagree),
  };
}

/** One line for the protocol card, e.g. "Cold-moist 14–70 days (sources disagree: plan 14, check daily from then)". */
export function describeReconciledPhase(phase: ReconciledPhase, label: string): string {
  if (!phase.timed) return phase.note ? `${label}: ${phase.note}` : label;
  const range =
    phase.maxDays === null
      ? `${phase.minDays} days or more`
      : phase.minDays === phase.maxDays
        ? `${phase.minDays} days`
        : `${phase.minDays}–${phase.maxDays} days`;
  const disagree = phase.sourcesDisagree
    ? ` (sources disagree: plan for day ${phase.plannedDays} and check daily from then — common practice)`
    : "";
  return `${label} ${range}${disagree}`;
}
