import { describe, expect, it } from "vitest";
import { assembleTrialTable, buildTrialProtocol, summarizeArm } from "@/components/trials/trial-table";

// One bag and one sowing per arm, counted to `final` (the last running total stands).
function rowsFor(arms: { id: string; label: string; germinated: number | null; sown: number }[]) {
  const bags = arms.map((a) => ({ id: `bag-${a.id}`, trial_arm_id: a.id }));
  const sowings = arms.map((a) => ({ id: `sow-${a.id}`, bag_id: `bag-${a.id}`, seeds_sown: a.sown }));
  const counts = arms.flatMap((a) =>
    a.germinated === null
      ? []
      : [
          { sowing_id: `sow-${a.id}`, counted_on: "2026-03-05", germinated_total: Math.floor(a.germinated / 2), created_at: "2026-03-05T08:00:00Z" },
          { sowing_id: `sow-${a.id}`, counted_on: "2026-03-09", germinated_total: a.germinated, created_at: "2026-03-09T08:00:00Z" },
        ],
  );
  return { arms: arms.map((a, i) => ({ id: a.id, label: a.label, treatment: null, position: i })), bags, sowings, counts };
}

describe("assembleTrialTable", () => {
  it.each([
    {
      // Newcombe 1998b (Stat. Med. 17:873–890) method 10: 56/70 − 48/80 → +0.0524 to +0.3339 (REFERENCES.md).
      name: "Newcombe's published example, best arm first",
      arms: [{ id: "a", label: "A", germinated: 56, sown: 70 }, { id: "b", label: "B", germinated: 48, sown: 80 }],
      best: "a", lower: 0.0524, upper: 0.3339,
    },
    {
      name: "the same example with the arms swapped: the best arm is found, not assumed",
      arms: [{ id: "b", label: "B", germinated: 48, sown: 80 }, { id: "a", label: "A", germinated: 56, sown: 70 }],
      best: "a", lower: 0.0524, upper: 0.3339,
    },
  ])("$name", ({ arms, best, lower, upper }) => {
    const t = assembleTrialTable(rowsFor(arms));
    expect(t.best?.arm.id).toBe(best);
    expect(t.comparisons).toHaveLength(1);
    expect(t.comparisons[0].verdict.difference.lower).toBeCloseTo(lower, 4);
    expect(t.comparisons[0].verdict.difference.upper).toBeCloseTo(upper, 4);
  });

  it("takes Fisher's p from lib/domain: R fisher.test doc table [[3,1],[1,3]], one-sided greater p = 17/70", () => {
    const t = assembleTrialTable(rowsFor([{ id: "a", label: "Guess", germinated: 3, sown: 4 }, { id: "b", label: "Other", germinated: 1, sown: 4 }]));
    expect(t.comparisons[0].verdict.fisher.pGreater).toBeCloseTo(17 / 70, 12);
    expect(t.winner).toBeNull(); // 4 seeds an arm cannot show a clear difference
    expect(t.comparisons[0].verdict.kind).toBe("no_clear_difference");
  });

  it.each([
    { name: "clear winner (74 % vs 48 % of 50)", arms: [[37, 50], [24, 50]], winner: "a0" },
    { name: "no clear difference", arms: [[26, 50], [24, 50]], winner: null },
    { name: "three arms, best beats both", arms: [[45, 50], [20, 50], [15, 50]], winner: "a0" },
    { name: "three arms, best beats only one", arms: [[45, 50], [42, 50], [15, 50]], winner: null },
  ])("$name", ({ arms, winner }) => {
    const t = assembleTrialTable(rowsFor(arms.map(([g, s], i) => ({ id: `a${i}`, label: `Arm ${i}`, germinated: g, sown: s }))));
    expect(t.winner?.arm.id ?? null).toBe(winner);
    expect(t.comparisons).toHaveLength(arms.length - 1);
    if (arms.length > 2) expect(t.notes.join(" ")).toContain("separate test");
  });

  it.each([
    { name: "an arm not counted yet", arms: [{ id: "a", label: "A", germinated: 10, sown: 20 }, { id: "b", label: "B", germinated: null, sown: 20 }], note: "not counted yet" },
  ])("$name is left out and said so", ({ arms, note }) => {
    const t = assembleTrialTable(rowsFor(arms));
    expect(t.comparisons).toHaveLength(0);
    expect(t.winner).toBeNull();
    expect(t.notes.join(" ")).toContain(note);
    expect(t.arms[1].interval).toBeNull();
  });

  it("Wilson interval per arm: 81/263 → 0.2553–0.3662 (Newcombe 1998a, method 3)", () => {
    const r = rowsFor([{ id: "a", label: "A", germinated: 81, sown: 263 }]);
    const arm = summarizeArm(r.arms[0], r.bags, r.sowings, r.counts);
    expect(arm.interval?.lower).toBeCloseTo(0.2553, 4);
    expect(arm.interval?.upper).toBeCloseTo(0.3662, 4);
  });
});

describe("buildTrialProtocol: make this our protocol", () => {
  const table = assembleTrialTable(rowsFor([{ id: "fridge", label: "Fridge 4 weeks", germinated: 37, sown: 50 }, { id: "freezer", label: "Freezer 4 weeks", germinated: 24, sown: 50 }]));
  const base = {
    species: "Echinacea purpurea",
    common_name: "Purple coneflower",
    phases: [{ kind: "cold_moist" as const, note: "", sources: [{ citation: "HortScience 28(9):899 (1993)", minDays: 28, maxDays: 28, band: { minC: 4, maxC: 6 }, note: "" }] }],
    effective_band: null,
    toxic_seed: null,
    medicinal: true,
  };
  const trial = { id: "7d6f1a3e-1c1b-4a5e-9a5e-1f1f1f1f1f1f", name: "Coneflower: fridge or freezer?" };
  const id = "0b6f1a3e-1c1b-4a5e-9a5e-1f1f1f1f1f1f";

  it.each([
    { name: "days from the winning bags, fridge kept cold-moist", bags: [["2026-01-01", "2026-01-31", "fridge"], ["2026-01-03", "2026-02-05", "fridge"]], kind: "cold_moist", min: 30, max: 33 },
    { name: "freezer bags make it a frozen phase", bags: [["2026-01-01", "2026-01-29", "freezer"]], kind: "frozen", min: 28, max: 28 },
    { name: "no pulled bags keep the base days", bags: [["2026-01-01", null, "fridge"]], kind: "cold_moist", min: 28, max: 28 },
  ] as { name: string; bags: [string, string | null, "fridge" | "freezer"][]; kind: string; min: number; max: number }[])("$name", ({ bags, kind, min, max }) => {
    const p = buildTrialProtocol({
      id, trial, table, base, species: "Echinacea purpurea", today: "2026-12-02",
      winnerBags: bags.map(([start_date, pulled_on, storeKind]) => ({ start_date, pulled_on, storeKind })),
    });
    expect(p.isFarmOwn).toBe(true);
    expect(p.source_trial_id).toBe(trial.id);
    expect(p.phases[0].kind).toBe(kind);
    expect(p.phases[0].sources).toHaveLength(1);
    expect(p.phases[0].sources[0].citation).toContain("Coneflower: fridge or freezer?");
    expect(p.phases[0].sources[0].citation).toContain("37/50");
    expect([p.phases[0].sources[0].minDays, p.phases[0].sources[0].maxDays]).toEqual([min, max]);
    expect(p.medicinal).toBe(true);
  });
});
