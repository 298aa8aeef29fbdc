import { describe, expect, it } from "vitest";
import { PlanForm, planFormToItem, planItemToForm } from "@/components/plan/plan-form";
import { PlanItemInput } from "@/lib/schemas/plan";
import { computePlanRow, findFrostDay, pickPlanProtocol, summarizeSpeciesHistory } from "@/components/plan/plan-rows";
import type { ProtocolForPlan } from "@/lib/domain/schedule";

// Cold-moist 14–28 days (the shape of Kaye et al. 2018's Asclepias speciosa row, REFERENCES.md).
const cold: ProtocolForPlan = {
  species: "Asclepias speciosa",
  phases: [{ kind: "cold_moist", note: "", sources: [{ citation: "Kaye, Sandlin & Bahm 2018, AoB PLANTS 10:ply018", minDays: 14, maxDays: 28, band: null, note: "" }] }],
  effectiveBand: null,
};
// Warm 90 then cold 90 (Young & Young 1992 for Sambucus, REFERENCES.md).
const warmCold: ProtocolForPlan = {
  species: "Sambucus canadensis",
  phases: [
    { kind: "warm_moist", note: "", sources: [{ citation: "Young & Young 1992", minDays: 90, maxDays: 90, band: null, note: "" }] },
    { kind: "cold_moist", note: "", sources: [{ citation: "Young & Young 1992", minDays: 90, maxDays: 90, band: null, note: "" }] },
  ],
  effectiveBand: null,
};

const item = (over: Partial<Parameters<typeof computePlanRow>[0]["item"]> = {}) => ({
  season: 2027,
  species: "Asclepias speciosa",
  target_plants: 100,
  sowing_rule: { anchor: "frost" as const, weeks: -6, place: "indoor" as const },
  expected_germination: 0.5,
  expected_survival: 0.8,
  ...over,
});

describe("computePlanRow: plan rows through lib/domain's planSeason", () => {
  it.each([
    {
      name: "6 weeks before a 10 May frost, cold 14 days",
      row: item(), frost: "05-10", protocol: cold, lot: { quantity: 500 }, history: null,
      // 2027-05-10 − 42 days = 2027-03-29; − 14 = 2027-03-15 (calendar arithmetic, checkable with Temporal PlainDate)
      sow: "2027-03-29", startBy: ["2027-03-15"], seeds: 250, enough: true,
    },
    {
      name: "a fixed sowing date wins over the frost date",
      row: item({ sowing_rule: { anchor: "date", date: "2027-04-14", place: "outdoor" } }), frost: null, protocol: warmCold, lot: null, history: null,
      // 2027-04-14 − 90 = 2027-01-14 (cold); − 90 = 2026-10-16 (warm). REFERENCES.md: 2024-01-15 + 90 = 2024-04-14, same span.
      sow: "2027-04-14", startBy: ["2026-10-16", "2027-01-14"], seeds: 250, enough: null,
    },
    {
      name: "the lot is too small",
      row: item({ target_plants: 300 }), frost: "05-10", protocol: cold, lot: { quantity: 200 }, history: null,
      sow: "2027-03-29", startBy: ["2027-03-15"], seeds: 750, enough: false, warning: "lot_too_small",
    },
    {
      name: "the farm's own history (Wilson lower bound of 81/263, Newcombe 1998a: 0.2553) when no figure is entered",
      row: item({ expected_germination: null, expected_survival: null }), frost: "05-10", protocol: cold, lot: { quantity: 1000 },
      history: { germinated: 81, sown: 263, sowings: 3 },
      // ceil(100 / 0.25531) = 392 (recomputed from the published lower bound)
      sow: "2027-03-29", startBy: ["2027-03-15"], seeds: 392, enough: true, basis: "Wilson",
    },
    {
      name: "no figure and no history: dates but no seed count",
      row: item({ expected_germination: null }), frost: "05-10", protocol: cold, lot: { quantity: 10 }, history: null,
      sow: "2027-03-29", startBy: ["2027-03-15"], seeds: null, enough: null, basis: "unknown",
    },
  ])("$name", ({ row, frost, protocol, lot, history, sow, startBy, seeds, enough, warning, basis }) => {
    const r = computePlanRow({ item: row, lastFrost: frost, today: "2026-12-01", protocol, lot, history });
    expect(r.problem).toBeNull();
    expect(r.plan?.sowOn).toBe(sow);
    expect(r.plan?.phases.map((p) => p.startBy)).toEqual(startBy);
    expect(r.seedsNeeded).toBe(seeds);
    expect(r.lotHasEnough).toBe(enough);
    if (warning) expect(r.warnings.map((w) => w.code)).toContain(warning);
    else expect(r.warnings.map((w) => w.code)).not.toContain("lot_too_small");
    if (basis) expect(r.germinationBasis).toContain(basis);
  });

  it("says plainly when no survival was entered (no self-contradicting 'none lost')", () => {
    const none = computePlanRow({ item: item({ expected_survival: null }), lastFrost: "05-10", today: "2026-12-01", protocol: cold, lot: null, history: null });
    expect(`survival ${none.survivalBasis}.`).toBe("survival not entered, so every seedling is counted as a plant (enter one to add a margin).");
    const entered = computePlanRow({ item: item({ expected_survival: 0.8 }), lastFrost: "05-10", today: "2026-12-01", protocol: cold, lot: null, history: null });
    expect(entered.survivalBasis).toBe("80 % as entered");
  });

  it.each([
    { name: "frost rule without a frost date", frost: null, today: "2026-12-01", problem: "frost date in Settings" },
    { name: "29 Feb frost in a common year", frost: "02-29", today: "2026-12-01", problem: "not a real calendar date" },
  ])("$name → a message", ({ frost, today, problem }) => {
    const r = computePlanRow({ item: item(), lastFrost: frost, today, protocol: cold, lot: null, history: null });
    expect(r.plan).toBeNull();
    expect(r.problem).toContain(problem);
  });

  it.each([
    { today: "2027-03-16", codes: ["start_by_passed"] },
    { today: "2027-03-30", codes: ["start_by_passed", "sow_date_passed"] },
    { today: "2027-03-15", codes: [] },
  ])("warnings on $today", ({ today, codes }) => {
    const r = computePlanRow({ item: item(), lastFrost: "05-10", today, protocol: cold, lot: null, history: null });
    expect(r.warnings.map((w) => w.code).sort()).toEqual([...codes].sort());
  });

  it("without a protocol it asks for one rather than saying no cold is needed", () => {
    const r = computePlanRow({ item: item(), lastFrost: "05-10", today: "2026-12-01", protocol: null, lot: null, history: null });
    expect(r.plan?.phases).toEqual([]);
    expect(r.warnings[0].message).toContain("No protocol");
  });
});

describe("summarizeSpeciesHistory", () => {
  const lots = [{ id: "l1", species: "Echinacea purpurea" }, { id: "l2", species: " echinacea PURPUREA" }, { id: "l3", species: "Other" }];
  const bags = [{ id: "b1", lot_id: "l1" }, { id: "b2", lot_id: "l2" }, { id: "b3", lot_id: "l3" }, { id: "b4", lot_id: "l1" }];
  const sowings = [
    { id: "s1", bag_id: "b1", seeds_sown: 50 },
    { id: "s2", bag_id: "b2", seeds_sown: 30 },
    { id: "s3", bag_id: "b3", seeds_sown: 99 },
    { id: "s4", bag_id: "b4", seeds_sown: 40 }, // not counted yet: left out
  ];
  const c = (sowing_id: string, counted_on: string, germinated_total: number) => ({ sowing_id, counted_on, germinated_total, created_at: "2026-01-01T00:00:00Z" });
  const counts = [c("s1", "2026-03-05", 10), c("s1", "2026-03-09", 37), c("s2", "2026-03-05", 12), c("s3", "2026-03-05", 90)];
  it.each([
    { species: "Echinacea purpurea", want: { germinated: 49, sown: 80, sowings: 2 } },
    { species: "Other", want: { germinated: 90, sown: 99, sowings: 1 } },
    { species: "Unknown", want: null },
  ])("$species", ({ species, want }) => expect(summarizeSpeciesHistory(species, { lots, bags, sowings, counts })).toEqual(want));
});

describe("pickPlanProtocol and findFrostDay", () => {
  const protocols = [
    { id: "p1", species: "Echinacea purpurea", is_farm_own: false, deleted_at: null },
    { id: "p2", species: "Echinacea purpurea", is_farm_own: true, deleted_at: null },
    { id: "p3", species: "Baptisia australis", is_farm_own: false, deleted_at: null },
    { id: "p4", species: "Sambucus spp.", is_farm_own: false, deleted_at: null },
    { id: "p5", species: "Lavandula angustifolia", is_farm_own: true, deleted_at: "2026-01-01T00:00:00Z" },
  ];
  it.each([
    { name: "its own protocol", item: { protocol_id: "p3", species: "Echinacea purpurea" }, lot: null, want: "p3" },
    { name: "the lot's protocol", item: { protocol_id: null, species: "Echinacea purpurea" }, lot: { protocol_id: "p1" }, want: "p1" },
    { name: "the farm's own for the species", item: { protocol_id: null, species: "echinacea purpurea" }, lot: null, want: "p2" },
    { name: "a genus-wide row for a species of that genus", item: { protocol_id: null, species: "Sambucus canadensis" }, lot: null, want: "p4" },
    { name: "a removed protocol is not used", item: { protocol_id: "p5", species: "Lavandula angustifolia" }, lot: null, want: null },
    { name: "none", item: { protocol_id: null, species: "Nothing" }, lot: null, want: null },
  ])("$name", ({ item, lot, want }) => expect(pickPlanProtocol(item, lot, protocols)?.id ?? null).toBe(want));

  it.each([
    { season: 2027, frost: "05-10", want: "2027-05-10" },
    { season: 2027, frost: null, want: null },
  ])("frost $frost in $season", ({ season, frost, want }) => expect(findFrostDay(season, frost)).toBe(want));
});

describe("plan form ↔ stored plan row", () => {
  it.each([
    { name: "frost rule with shares", rule: { anchor: "frost" as const, weeks: -6, place: "indoor" as const }, germ: 0.6, surv: 0.8, pct: [60, 80] },
    { name: "set date, farm history", rule: { anchor: "date" as const, date: "2027-04-14", place: "outdoor" as const }, germ: null, surv: null, pct: [null, null] },
  ])("$name survives the round trip", ({ rule, germ, surv, pct }) => {
    const stored = { species: "Baptisia australis", lot_id: null, protocol_id: null, target_plants: 40, note: null, sowing_rule: rule, expected_germination: germ, expected_survival: surv };
    const form = planItemToForm(stored);
    expect([form.germinationPct, form.survivalPct]).toEqual(pct);
    const parsed = PlanForm.parse(form);
    const back = planFormToItem(parsed, { season: 2027, bag_id: null });
    expect(back).toMatchObject({ ...stored, season: 2027 });
    expect(PlanItemInput.safeParse({ ...back, id: "0b6f1a3e-1c1b-4a5e-9a5e-1f1f1f1f1f1f" }).success).toBe(true);
  });

  it.each([
    { field: "germinationPct", value: 0, says: "above 0" },
    { field: "germinationPct", value: 120, says: "at most 100" },
    { field: "weeks", value: 2.5, says: "whole weeks" },
  ])("refuses $field = $value", ({ field, value, says }) => {
    const r = PlanForm.safeParse({ ...planItemToForm(), species: "X", [field]: value });
    expect(r.success).toBe(false);
    expect(r.error?.issues.map((i) => i.message).join(" ")).toContain(says);
  });

  it("a set-date row needs its date", () => {
    const r = PlanForm.safeParse({ ...planItemToForm(), species: "X", anchor: "date", date: "" });
    expect(r.error?.issues[0].message).toBe("Pick the sowing date.");
  });
});
