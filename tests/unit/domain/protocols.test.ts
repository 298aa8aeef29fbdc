import { describe, expect, it } from "vitest";
import { Protocol } from "@/lib/schemas/protocol";
import {
  copyStarterProtocols,
  describeReconciledPhase,
  findToxicSeedFlag,
  listCautions,
  reconcileProtocol,
  reconcileSources,
  starterProtocols,
} from "@/lib/domain";

const src = (minDays: number, maxDays: number | null, citation = "Test source") => ({ citation, minDays, maxDays, band: null, note: "" });

describe("reconciling sources (window = earliest minimum to latest maximum)", () => {
  it.each([
    // [sources, min, max, planned, disagree, agreed]
    [[src(14, 28)], 14, 28, 14, false, { minDays: 14, maxDays: 28 }],
    [[src(14, 28), src(21, 42)], 14, 42, 14, false, { minDays: 21, maxDays: 28 }],
    [[src(14, 14), src(70, 70)], 14, 70, 14, true, null], // two weeks vs ten: sources disagree
    [[src(28, null), src(30, 60)], 28, null, 28, false, { minDays: 30, maxDays: 60 }], // no upper limit in one source
    [[src(28, 28), src(28, 28)], 28, 28, 28, false, { minDays: 28, maxDays: 28 }], // touching ranges overlap
  ])("%j", (sources, minDays, maxDays, plannedDays, sourcesDisagree, agreedRange) => {
    // Planning for the earliest date is common practice (no published source), REFERENCES.md.
    expect(reconcileSources(sources)).toMatchObject({ minDays, maxDays, plannedDays, sourcesDisagree, agreedRange });
  });

  it("says so in words when sources disagree", () => {
    const p = reconcileProtocol({ species: "X", effectiveBand: null, phases: [{ kind: "cold_moist", note: "", sources: [src(14, 14), src(70, 70)] }] });
    expect(p.sourcesDisagree).toBe(true);
    expect(describeReconciledPhase(p.timedPhases[0], "Cold-moist")).toBe(
      "Cold-moist 14–70 days (sources disagree: plan for day 14 and check daily from then — common practice)",
    );
  });

  it("defaults to the 0–10 °C band with a 1–5 °C optimum (REFERENCES.md product default; Chong et al.)", () => {
    const p = reconcileProtocol({ species: "X", effectiveBand: null, phases: [] });
    expect(p.effectiveBand).toEqual({ minC: 0, maxC: 10 });
    expect(p.optimumBand).toEqual({ minC: 1, maxC: 5 });
    expect(p.needsCold).toBe(false);
    expect(reconcileProtocol({ species: "X", effectiveBand: { minC: 6, maxC: 10 }, phases: [] }).optimumBand).toEqual({ minC: 6, maxC: 10 });
  });
});

describe("protocol schema", () => {
  it.each([
    [{ species: "", phases: [] }, "Name the species."],
    [{ species: "X", phases: [{ kind: "cold_moist", sources: [] }] }, "A warm, cold or frozen phase needs at least one source with its days."],
    [{ species: "X", phases: [{ kind: "cold_moist", sources: [{ citation: "", minDays: 1, maxDays: 2 }] }] }, "Say where these numbers come from"],
    [{ species: "X", phases: [{ kind: "cold_moist", sources: [{ citation: "a", minDays: 30, maxDays: 20 }] }] }, "The shortest time must not be longer than the longest."],
    [{ species: "X", phases: [{ kind: "cold_moist", sources: [{ citation: "a", minDays: 1.5, maxDays: 2 }] }] }, "Days must be a whole number."],
    [{ species: "X", effectiveBand: { minC: 5, maxC: 1 }, phases: [] }, "The lowest temperature must not be above the highest."],
  ])("explains %j", (input, message) => {
    const r = Protocol.safeParse(input);
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => i.message).join(" | ")).toContain(message);
  });

  it("fills defaults: a protocol a grower writes is the farm's own", () => {
    const p = Protocol.parse({ species: "Viola pedata", phases: [{ kind: "cold_moist", sources: [{ citation: "Our 2023 bags", minDays: 30, maxDays: 60 }] }] });
    expect(p.isFarmOwn).toBe(true);
    expect(p.phases[0].sources[0].band).toBeNull();
  });
});

describe("starter protocol library (REFERENCES.md 'Starter protocol rows' only)", () => {
  // Species and sources exactly as listed in REFERENCES.md.
  const expected: [string, string[]][] = [
    ["Asclepias syriaca", ["Kaye, Sandlin & Bahm 2018, AoB PLANTS 10:ply018"]],
    ["Asclepias speciosa", ["Kaye, Sandlin & Bahm 2018, AoB PLANTS 10:ply018"]],
    ["Asclepias fascicularis", ["Kaye, Sandlin & Bahm 2018, AoB PLANTS 10:ply018"]],
    ["Echinacea purpurea", ["HortScience 28(9):899 (1993)"]],
    ["Baptisia australis", ["Boyle & Hladun 2005, HortScience 40:1846", "HortScience 28:899 (1993)"]],
    ["Lavandula angustifolia", ["Dobrowolska & Zawadzińska, Int. J. Plant & Soil Sci."]],
    ["Hypericum perforatum", ["Proc. Fla. State Hort. Soc."]],
    ["Fragaria vesca", ["Univ. of Washington plant data sheet (after Native Plant Network)"]],
    ["Allium tricoccum", ["Native Plant Network protocol (USDA FS)"]],
    ["Sambucus spp.", ["Young & Young 1992, Seeds of Woody Plants in North America"]],
    ["Rudbeckia hirta", ["Native Plant Network protocol (USDA NRCS)"]],
    ["Silybum marianum", ["Weed Science (milk thistle germination study)"]],
  ];

  it("holds exactly the listed species, each with its source", () => {
    expect(starterProtocols.map((p) => [p.species, p.citations])).toEqual(expected);
  });

  it.each(starterProtocols.map((p) => [p.species, p] as const))("%s is a valid protocol, not the farm's own, every source cited", (_s, p) => {
    expect(Protocol.parse(p)).toMatchObject({ species: p.species, isFarmOwn: false });
    for (const phase of p.phases) for (const s of phase.sources) expect(s.citation.length).toBeGreaterThan(0);
  });

  it.each([
    ["Asclepias syriaca", 14, 14], // 2 weeks at 5 °C (Kaye et al. 2018)
    ["Asclepias speciosa", 14, 28], // 2–4 weeks
    ["Asclepias fascicularis", 28, 42], // 4–6 weeks
    ["Echinacea purpurea", 28, 28], // 4 weeks (HortScience 1993)
    ["Baptisia australis", 70, 70], // 10 weeks
    ["Lavandula angustifolia", 28, null], // 4 weeks too short: no upper limit given
    ["Hypericum perforatum", 30, 30], // 30 days at 10 °C
    ["Fragaria vesca", 85, 85], // 85 days
    ["Allium tricoccum", 60, null], // up to 2 months or more
  ])("%s cold-moist %i–%s days", (species, min, max) => {
    const p = reconcileProtocol(starterProtocols.find((s) => s.species === species)!);
    const cold = p.timedPhases.find((t) => t.kind === "cold_moist")!;
    expect([cold.minDays, cold.maxDays]).toEqual([min, max]);
  });

  it("Sambucus: 90 days warm, then 90 days cold (Young & Young 1992)", () => {
    const p = reconcileProtocol(starterProtocols.find((s) => s.key === "sambucus")!);
    expect(p.timedPhases.map((t) => [t.kind, t.minDays, t.maxDays])).toEqual([
      ["warm_moist", 90, 90],
      ["cold_moist", 90, 90],
    ]);
  });

  it.each(["Rudbeckia hirta", "Silybum marianum"])("%s needs no cold and says so", (species) => {
    const s = starterProtocols.find((p) => p.species === species)!;
    expect(reconcileProtocol(s).needsCold).toBe(false);
    expect(s.noColdReason).toMatch(/No cold treatment required/);
  });

  it("flags toxic seed: elder with its source; milkweeds and Baptisia from memory, unverified", () => {
    const flag = (species: string) => starterProtocols.find((p) => p.species === species)!.toxicSeed;
    expect(flag("Sambucus spp.")).toMatchObject({ verified: true, citation: expect.stringContaining("MMWR 1984") }); // CDC MMWR 1984
    for (const s of ["Asclepias syriaca", "Asclepias speciosa", "Asclepias fascicularis", "Baptisia australis"]) {
      expect(flag(s)).toMatchObject({ verified: false, citation: "" });
    }
    expect(flag("Echinacea purpurea")).toBeNull();
    expect(findToxicSeedFlag("Prunus avium")?.flag.citation).toBe("EFSA Journal 2016;14(4):4424");
  });

  it("marks medicinal herbs", () => {
    const medicinal = starterProtocols.filter((p) => p.medicinal).map((p) => p.species);
    expect(medicinal).toEqual(expect.arrayContaining(["Echinacea purpurea", "Hypericum perforatum", "Lavandula angustifolia", "Silybum marianum"]));
  });

  it("gives each farm its own copy", () => {
    const copy = copyStarterProtocols();
    copy[0].phases[0].sources[0].minDays = 999;
    expect(starterProtocols[0].phases[0].sources[0].minDays).toBe(14);
  });
});

describe("cautions", () => {
  it("warns about toxic seed in a food fridge and shows the source only when verified", () => {
    const elder = listCautions({ species: "Sambucus nigra", storeHoldsFood: true, medicinal: true });
    expect(elder[0]).toMatch(/toxic \(CDC, MMWR 1984.*also holds food/);
    expect(elder).toContain("Growing information only, not medical advice.");
    expect(listCautions({ species: "Asclepias syriaca" })[0]).toMatch(/flag not yet verified/);
    expect(listCautions({ species: "Viola pedata", treatedSeed: true })[0]).toMatch(/^Treated seed is poisonous/);
    expect(listCautions({ species: "Viola pedata" })).toHaveLength(1);
  });
});
