import { DomainError } from "@/lib/errors";
import { addDaysToIsoDay, formatDayInWords, parseIsoDay, type IsoDay } from "./dates";
import { reconcileProtocol, type ReconciledProtocol } from "./protocols";
import type { ProtocolForPlan } from "./schedule";
import type { PhaseKind } from "@/lib/schemas/words";
import { computeWilsonInterval } from "./statistics";

export interface SowingRule {
  /** Weeks from the average last spring frost: negative = before (e.g. −6 indoors), positive = after. */
  weeksFromFrost: number;
  where: "indoor" | "outdoor";
}

/** What to expect of germination: a number the grower trusts, or the farm's own record for the species. */
export type GerminationExpectation =
  | { kind: "fraction"; value: number }
  /** Uses the Wilson lower bound (95 %) of the farm's own results: a cautious figure that grows with more data. */
  | { kind: "history"; germinated: number; sown: number };

export interface PhaseStartBy {
  kind: PhaseKind;
  /** Latest day to start this phase so its shortest time still ends by the sowing date. */
  startBy: IsoDay;
  /** Earliest sensible start: starting before this, even the longest time ends before sowing (the seed waits in the cold). */
  startFrom: IsoDay | null;
}

export type PlanWarningCode = "lot_too_small" | "start_by_passed" | "sow_date_passed" | "sources_disagree" | "no_cold_needed";

export interface PlanWarning {
  code: PlanWarningCode;
  message: string;
}

export interface SeasonPlanInput {
  protocol: ProtocolForPlan | ReconciledProtocol;
  today: IsoDay;
  /** A chosen sowing date wins over the frost rule. */
  sowOn?: IsoDay | null;
  lastFrostOn?: IsoDay | null;
  rule?: SowingRule | null;
  targetPlants: number;
  germination: GerminationExpectation;
  /** Share of seedlings expected to become plants (0–1]. */
  survival: number;
  /** Seeds in the lot this plan draws on, if known. */
  lotSeeds?: number | null;
}

export interface SeasonPlan {
  sowOn: IsoDay;
  where: "indoor" | "outdoor" | null;
  phases: PhaseStartBy[];
  /** Start-by of the first phase: the day the bag must be set up. Null when no pretreatment takes time. */
  startBy: IsoDay | null;
  seedsNeeded: number;
  expectedGermination: number;
  germinationBasis: string;
  warnings: PlanWarning[];
}

export function computeSowDate(lastFrostOn: IsoDay, rule: SowingRule): IsoDay {
  if (!Number.isInteger(rule.weeksFromFrost)) throw new DomainError("Weeks from the frost date must be a whole number.");
  return addDaysToIsoDay(lastFrostOn, rule.weeksFromFrost * 7);
}

/** Counts back from the sowing date through the timed phases, last phase first. */
export function countBackPhases(protocol: ProtocolForPlan | ReconciledProtocol, sowOn: IsoDay): PhaseStartBy[] {
  parseIsoDay(sowOn, "sowing date");
  const timed = ("timedPhases" in protocol ? protocol : reconcileProtocol(protocol)).timedPhases;
  const out: PhaseStartBy[] = [];
  let latest = sowOn;
  let earliest: IsoDay | null = sowOn;
  for (let i = timed.length - 1; i >= 0; i--) {
    latest = addDaysToIsoDay(latest, -timed[i].minDays);
    const maxDays = timed[i].maxDays;
    earliest = earliest === null || maxDays === null ? null : addDaysToIsoDay(earliest, -maxDays);
    out.unshift({ kind: timed[i].kind, startBy: latest, startFrom: earliest });
  }
  return out;
}

/** Seeds needed = ceil(target / (germination × survival)). */
export function computeSeedsNeeded(targetPlants: number, germination: number, survival: number): number {
  if (!Number.isInteger(targetPlants) || targetPlants < 0) throw new DomainError("Target plants must be a whole number, zero or more.");
  if (!(germination > 0 && germination <= 1)) throw new DomainError("Expected germination must be above 0 % and at most 100 %.");
  if (!(survival > 0 && survival <= 1)) throw new DomainError("Expected survival must be above 0 % and at most 100 %.");
  // The small tolerance keeps 100 / 0.4 from becoming 251 through floating-point noise.
  return Math.max(0, Math.ceil(targetPlants / (germination * survival) - 1e-9));
}

export function pickExpectedGermination(expectation: GerminationExpectation): { value: number; basis: string } {
  if (expectation.kind === "fraction") return { value: expectation.value, basis: `${Math.round(expectation.value * 100)} % as entered` };
  const w = computeWilsonInterval(expectation.germinated, expectation.sown);
  return {
    value: w.lower,
    basis: `${Math.round(w.lower * 100)} %: the cautious end (Wilson 95 % lower bound) of this farm's ${expectation.germinated} of ${expectation.sown}`,
  };
}

/** Sow date, start-by dates per phase, seeds needed and warnings for one species in the season plan. */
export function planSeason(input: SeasonPlanInput): SeasonPlan {
  let sowOn: IsoDay;
  if (input.sowOn) sowOn = input.sowOn;
  else if (input.lastFrostOn && input.rule) sowOn = computeSowDate(input.lastFrostOn, input.rule);
  else throw new DomainError("Give a sowing date, or the farm's last frost date with a sowing rule.", { sowOn: "Needed" });
  parseIsoDay(input.today, "today");
  const reconciled = "timedPhases" in input.protocol ? input.protocol : reconcileProtocol(input.protocol);
  const phases = countBackPhases(reconciled, sowOn);
  const germination = pickExpectedGermination(input.germination);
  if (germination.value <= 0) {
    throw new DomainError("The farm's record for this species shows no germination yet, so seeds needed cannot be worked out; enter an expected germination instead.");
  }
  const seedsNeeded = computeSeedsNeeded(input.targetPlants, germination.value, input.survival);
  const warnings: PlanWarning[] = [];
  const startBy = phases[0]?.startBy ?? null;
  if (!reconciled.needsCold) warnings.push({ code: "no_cold_needed", message: "This species needs no cold treatment: sow it directly." });
  if (sowOn < input.today) warnings.push({ code: "sow_date_passed", message: `The sowing date ${formatDayInWords(sowOn)} has passed.` });
  for (const p of phases) {
    if (p.startBy < input.today) {
      warnings.push({ code: "start_by_passed", message: `The ${p.kind.replace("_", "-")} phase should have started by ${formatDayInWords(p.startBy)}; starting now, the seed will be ready after the sowing date.` });
    }
  }
  if (reconciled.sourcesDisagree) {
    warnings.push({ code: "sources_disagree", message: "Sources disagree on the time: planned for the shortest, check daily from then (common practice)." });
  }
  if (input.lotSeeds != null && input.lotSeeds < seedsNeeded) {
    warnings.push({ code: "lot_too_small", message: `The lot holds ${input.lotSeeds} seeds but about ${seedsNeeded} are needed.` });
  }
  return {
    sowOn,
    where: input.rule?.where ?? null,
    phases,
    startBy,
    seedsNeeded,
    expectedGermination: germination.value,
    germinationBasis: germination.basis,
    warnings,
  };
}
