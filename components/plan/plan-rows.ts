import { AppError } from "@/lib/errors";
import { planSeason, type GerminationExpectation, type PlanWarning, type SeasonPlan } from "@/lib/domain/planning";
import type { IsoDay } from "@/lib/domain/dates";
import type { ProtocolForPlan } from "@/lib/domain/schedule";
import type { PlanItem } from "@/lib/schemas/plan";
import type { Lot } from "@/lib/schemas/lot";
import type { Bag } from "@/lib/schemas/bag";
import type { Sowing } from "@/lib/schemas/sowing";
import type { Count } from "@/lib/schemas/count";
import type { ProtocolRow } from "@/lib/client/db";
import { findFinalTotal } from "@/components/counts/count-series";
import { matchProtocolBySpecies } from "@/lib/domain/rows/protocol-row";

// Pure wiring from a plan row (as stored on the phone) to lib/domain's planSeason.

export interface GerminationHistory {
  germinated: number;
  sown: number;
  sowings: number;
}

const sameSpecies = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();

/** The farm's own record for a species: every sowing of its lots, with the last running total of each. */
export function summarizeSpeciesHistory(
  species: string,
  rows: {
    lots: readonly Pick<Lot, "id" | "species">[];
    bags: readonly Pick<Bag, "id" | "lot_id">[];
    sowings: readonly Pick<Sowing, "id" | "bag_id" | "seeds_sown">[];
    counts: readonly Pick<Count, "sowing_id" | "counted_on" | "germinated_total" | "created_at">[];
  },
): GerminationHistory | null {
  const lotIds = new Set(rows.lots.filter((l) => sameSpecies(l.species, species)).map((l) => l.id));
  const bagIds = new Set(rows.bags.filter((b) => lotIds.has(b.lot_id)).map((b) => b.id));
  const sowings = rows.sowings.filter((s) => bagIds.has(s.bag_id));
  let germinated = 0;
  let sown = 0;
  let counted = 0;
  for (const s of sowings) {
    const counts = rows.counts.filter((c) => c.sowing_id === s.id);
    if (counts.length === 0) continue; // a sowing nobody has counted yet says nothing about germination
    germinated += Math.min(findFinalTotal(counts), s.seeds_sown);
    sown += s.seeds_sown;
    counted++;
  }
  return counted > 0 ? { germinated, sown, sowings: counted } : null;
}

/** The protocol a plan row uses: its own, else its lot's, else the farm's for the species (as the new-bag form picks). */
export function pickPlanProtocol<P extends Pick<ProtocolRow, "id" | "species" | "is_farm_own" | "deleted_at">>(
  item: Pick<PlanItem, "protocol_id" | "species">,
  lot: Pick<Lot, "protocol_id"> | null,
  protocols: readonly P[],
): P | null {
  const byId = (id: string | null | undefined) => (id ? (protocols.find((p) => p.id === id && !p.deleted_at) ?? null) : null);
  return byId(item.protocol_id) ?? byId(lot?.protocol_id) ?? matchProtocolBySpecies(item.species, protocols);
}

/** "05-10" in season 2027 → 2027-05-10; null when the farm has not set its frost date. */
export function findFrostDay(season: number, lastFrost: string | null | undefined): IsoDay | null {
  return lastFrost ? `${season}-${lastFrost}` : null;
}

export interface PlanRowResult {
  plan: SeasonPlan | null;
  /** Null while no germination figure is known (nothing entered, no history). */
  seedsNeeded: number | null;
  germinationBasis: string;
  survival: number;
  survivalBasis: string;
  /** Null when the lot's seed count is unknown or seeds needed cannot be worked out. */
  lotHasEnough: boolean | null;
  warnings: PlanWarning[];
  /** Why nothing could be computed, in grower words. */
  problem: string | null;
}

/** Sow date, start-by per phase, seeds needed and warnings for one plan row. */
export function computePlanRow(input: {
  item: Pick<PlanItem, "season" | "species" | "target_plants" | "sowing_rule" | "expected_germination" | "expected_survival">;
  lastFrost: string | null | undefined;
  today: IsoDay;
  protocol: ProtocolForPlan | null;
  lot: Pick<Lot, "quantity"> | null;
  history: GerminationHistory | null;
}): PlanRowResult {
  const { item, protocol, lot, history } = input;
  const rule = item.sowing_rule;
  const survival = item.expected_survival ?? 1;
  const survivalBasis = item.expected_survival == null ? "not entered, so every seedling is counted as a plant (enter one to add a margin)" : `${Math.round(survival * 100)} % as entered`;
  let expectation: GerminationExpectation | null = null;
  if (item.expected_germination != null) expectation = { kind: "fraction", value: item.expected_germination };
  else if (history && history.sown > 0 && history.germinated > 0) expectation = { kind: "history", germinated: history.germinated, sown: history.sown };
  const base: PlanRowResult = {
    plan: null, seedsNeeded: null, germinationBasis: "", survival, survivalBasis, lotHasEnough: null, warnings: [], problem: null,
  };
  const frostOn = findFrostDay(item.season, input.lastFrost);
  if (rule.anchor === "frost" && !frostOn) {
    return { ...base, problem: "Set the farm's average last spring frost date in Settings to date this row." };
  }
  try {
    const plan = planSeason({
      protocol: protocol ?? { species: item.species, phases: [], effectiveBand: null },
      today: input.today,
      sowOn: rule.anchor === "date" ? rule.date : null,
      lastFrostOn: frostOn,
      rule: rule.anchor === "frost" ? { weeksFromFrost: rule.weeks, where: rule.place } : null,
      targetPlants: item.target_plants,
      // Without a figure the dates are still worth showing; the seeds-needed outputs are blanked below.
      germination: expectation ?? { kind: "fraction", value: 1 },
      survival,
      lotSeeds: expectation ? (lot?.quantity ?? null) : null,
    });
    let warnings = plan.warnings;
    if (!protocol) {
      warnings = warnings.filter((w) => w.code !== "no_cold_needed");
      warnings.unshift({ code: "no_cold_needed", message: "No protocol for this species yet: pick one (or write the farm's own) to get start-by dates." });
    }
    const seedsNeeded = expectation ? plan.seedsNeeded : null;
    return {
      ...base,
      plan: { ...plan, warnings },
      seedsNeeded,
      germinationBasis: expectation
        ? plan.germinationBasis
        : history
          ? `unknown: nothing came up yet in the farm's ${history.sown} seeds sown; enter an expected germination`
          : "unknown: enter an expected germination, or record counts to build the farm's own history",
      lotHasEnough: seedsNeeded === null || lot?.quantity == null ? null : lot.quantity >= seedsNeeded,
      warnings,
    };
  } catch (e) {
    if (e instanceof AppError) return { ...base, problem: e.message };
    throw e;
  }
}
