import { countDaysBetween } from "@/lib/domain/dates";
import { reconcileProtocol } from "@/lib/domain/protocols";
import { computeWilsonInterval, describeTrialVerdict, type ProportionInterval, type TrialVerdict } from "@/lib/domain/statistics";
import type { ProtocolPhase } from "@/lib/schemas/protocol";
import { toFarmOwnProtocol } from "@/lib/domain/rows/protocol-row";
import { mutationTable, type MutationArgs } from "@/lib/schemas/mutations";
import type { Bag } from "@/lib/schemas/bag";
import type { Sowing } from "@/lib/schemas/sowing";
import type { Count } from "@/lib/schemas/count";
import type { Trial, TrialArm } from "@/lib/schemas/trial";
import type { StoreKind } from "@/lib/schemas/words";
import type { ProtocolRow } from "@/lib/client/db";
import { findFinalTotal } from "@/components/counts/count-series";

// Pure assembly of a trial's comparison table from the phone's rows; every number comes from lib/domain.

export interface ArmResult {
  arm: Pick<TrialArm, "id" | "label" | "treatment" | "position">;
  bagIds: string[];
  /** Sowings with at least one count. */
  countedSowings: number;
  uncountedSowings: number;
  germinated: number;
  sown: number;
  interval: ProportionInterval | null;
}

export interface ArmComparison {
  /** The arm compared against the best arm. */
  armId: string;
  verdict: TrialVerdict;
}

export interface TrialTable {
  arms: ArmResult[];
  best: ArmResult | null;
  comparisons: ArmComparison[];
  /** The best arm, when it beat every other counted arm clearly (interval above zero and Fisher p < 0.05). */
  winner: ArmResult | null;
  notes: string[];
}

type CountRow = Pick<Count, "sowing_id" | "counted_on" | "germinated_total" | "created_at">;

export function summarizeArm(
  arm: ArmResult["arm"],
  bags: readonly Pick<Bag, "id" | "trial_arm_id">[],
  sowings: readonly Pick<Sowing, "id" | "bag_id" | "seeds_sown">[],
  counts: readonly CountRow[],
): ArmResult {
  const bagIds = bags.filter((b) => b.trial_arm_id === arm.id).map((b) => b.id);
  let germinated = 0;
  let sown = 0;
  let countedSowings = 0;
  let uncountedSowings = 0;
  for (const s of sowings.filter((x) => bagIds.includes(x.bag_id))) {
    const own = counts.filter((c) => c.sowing_id === s.id);
    if (own.length === 0) {
      uncountedSowings++;
      continue;
    }
    countedSowings++;
    germinated += Math.min(findFinalTotal(own), s.seeds_sown);
    sown += s.seeds_sown;
  }
  return { arm, bagIds, countedSowings, uncountedSowings, germinated, sown, interval: sown > 0 ? computeWilsonInterval(germinated, sown) : null };
}

/** Each arm with its Wilson interval; every other arm compared with the best one (Newcombe interval, Fisher's exact p). */
export function assembleTrialTable(rows: {
  arms: readonly ArmResult["arm"][];
  bags: readonly Pick<Bag, "id" | "trial_arm_id">[];
  sowings: readonly Pick<Sowing, "id" | "bag_id" | "seeds_sown">[];
  counts: readonly CountRow[];
}): TrialTable {
  const arms = [...rows.arms].sort((a, b) => a.position - b.position).map((a) => summarizeArm(a, rows.bags, rows.sowings, rows.counts));
  const counted = arms.filter((a) => a.sown > 0);
  const notes: string[] = [];
  for (const a of arms) {
    if (a.bagIds.length === 0) notes.push(`${a.arm.label}: no bags assigned yet.`);
    else if (a.sown === 0) notes.push(`${a.arm.label}: no counted sowing yet.`);
    if (a.uncountedSowings > 0) notes.push(`${a.arm.label}: ${a.uncountedSowings} sowing${a.uncountedSowings === 1 ? "" : "s"} not counted yet, left out.`);
  }
  if (counted.length < 2) return { arms, best: counted[0] ?? null, comparisons: [], winner: null, notes };
  // Ties keep the arm order, so the verdict does not flip on a re-render.
  const best = counted.reduce((a, b) => (b.germinated / b.sown > a.germinated / a.sown ? b : a));
  const toName = (a: ArmResult) => ({ name: a.arm.label, germinated: a.germinated, sown: a.sown });
  const comparisons = counted
    .filter((a) => a !== best)
    .map((other) => ({ armId: other.arm.id, verdict: describeTrialVerdict(toName(best), toName(other)) }));
  if (counted.length > 2) notes.push("With more than two arms each comparison is a separate test; one of them can look clear by chance.");
  const winner = comparisons.every((c) => c.verdict.kind === "clear_difference") ? best : null;
  return { arms, best, comparisons, winner, notes };
}

export function describeTrialSource(trial: Pick<Trial, "name">, table: TrialTable, day: string): string {
  const w = table.winner ?? table.best;
  const parts = table.arms.filter((a) => a.sown > 0).map((a) => `${a.arm.label} ${a.germinated}/${a.sown}`);
  const text = `Farm trial "${trial.name}" (${day}): ${parts.join(" vs ")} germinated${w ? `; ${w.arm.label} kept` : ""}.`;
  return text.length > 500 ? `${text.slice(0, 497)}...` : text;
}

/**
 * The farm's own protocol from a trial's winning arm: the base protocol's phases, with the last timed phase set
 * to what the winning bags really had (days from start to pull, the earlier phases' planned days taken off;
 * frozen when every bag sat in a freezer) and the trial as its only source.
 */
export function buildTrialProtocol(input: {
  id: string;
  trial: Pick<Trial, "id" | "name">;
  table: TrialTable;
  base: Pick<ProtocolRow, "species" | "common_name" | "phases" | "effective_band" | "toxic_seed" | "medicinal"> | null;
  species: string;
  winnerBags: readonly (Pick<Bag, "start_date" | "pulled_on"> & { storeKind: StoreKind | null })[];
  today: string;
}): MutationArgs<"protocol.upsert"> {
  const winner = input.table.winner ?? input.table.best;
  const citation = describeTrialSource(input.trial, input.table, input.today);
  const basePhases: ProtocolPhase[] = input.base?.phases ?? [];
  const reconciled = reconcileProtocol({ species: input.species, phases: basePhases, effectiveBand: input.base?.effective_band ?? null });
  const timedIdx = basePhases.map((p, i) => (reconciled.phases[i]?.timed ? i : -1)).filter((i) => i >= 0);
  const lastIdx = timedIdx.length ? timedIdx[timedIdx.length - 1] : -1;
  const earlierDays = timedIdx.slice(0, -1).reduce((s, i) => s + reconciled.phases[i].plannedDays, 0);
  const bagDays = input.winnerBags
    .filter((b) => b.start_date && b.pulled_on)
    .map((b) => countDaysBetween(b.start_date!, b.pulled_on!) - earlierDays)
    .filter((d) => d > 0);
  const allFrozen = input.winnerBags.length > 0 && input.winnerBags.every((b) => b.storeKind === "freezer");
  const lastBase = lastIdx >= 0 ? reconciled.phases[lastIdx] : null;
  const minDays = bagDays.length ? Math.min(...bagDays) : (lastBase?.minDays ?? 0);
  const maxDays = bagDays.length ? Math.max(...bagDays) : (lastBase?.maxDays ?? null);
  const band = allFrozen ? null : (input.base?.phases[lastIdx]?.sources[0]?.band ?? null);
  const trialPhase: ProtocolPhase = {
    kind: allFrozen ? "frozen" : lastIdx >= 0 ? basePhases[lastIdx].kind : "cold_moist",
    sources: [{ citation, minDays, maxDays, band, note: winner?.arm.treatment ?? "" }],
    note: winner ? `As in the trial arm "${winner.arm.label}".` : "",
  };
  const phases = lastIdx >= 0 ? basePhases.map((p, i) => (i === lastIdx ? trialPhase : p)) : [...basePhases, trialPhase];
  const note = winner ? `The farm's own protocol from the trial "${input.trial.name}": ${winner.arm.label}${winner.arm.treatment ? ` (${winner.arm.treatment})` : ""}.` : "";
  const protocol = toFarmOwnProtocol(input.base, input.species, phases, note);
  // Parsed by the mutation's own schema: a protocol the server would refuse is refused here, in the same words.
  return mutationTable["protocol.upsert"].args.parse({ ...protocol, id: input.id, starter_key: null, source_trial_id: input.trial.id });
}
