import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { Temporal } from "@js-temporal/polyfill";
import type { ProtocolPhase } from "@/lib/schemas/protocol";
import type { BagState } from "@/lib/schemas/vocabulary";
import {
  adviseOnCheck,
  computePullWindow,
  determineBagState,
  planBagPhases,
  scheduleNextCheck,
  starterProtocols,
  type CheckFindings,
  type NextCheckInput,
  type PullWindow,
} from "@/lib/domain";

const plusDays = (day: string, n: number) => Temporal.PlainDate.from(day).add({ days: n }).toString();
const cold = (minDays: number, maxDays: number | null, citation = "Test source"): ProtocolPhase => ({
  kind: "cold_moist",
  note: "",
  sources: [{ citation, minDays, maxDays, band: null, note: "" }],
});
const protocolOf = (...phases: ProtocolPhase[]) => ({ species: "Test species", effectiveBand: null, phases });
const sambucus = starterProtocols.find((p) => p.key === "sambucus")!;

describe("pull window", () => {
  it("Sambucus from 2024-01-15: 90 days warm ends 2024-04-14 (REFERENCES.md date example), then 90 days cold", () => {
    const plan = planBagPhases(sambucus, "2024-01-15");
    expect(plan.phases.map((p) => [p.kind, p.startsOn, p.endsOn])).toEqual([
      ["warm_moist", "2024-01-15", "2024-04-14"],
      ["cold_moist", "2024-04-14", plusDays("2024-04-14", 90)], // cross-checked with Temporal PlainDate
    ]);
    expect(plan.window).toMatchObject({ opensOn: "2024-07-13", closesOn: "2024-07-13", plannedPullOn: "2024-07-13" });
    expect([plan.nextMoveOn, plan.nextMoveTo]).toEqual(["2024-04-14", "cold_moist"]);
  });

  it("counts the window from the day the bag really went into the cold", () => {
    const plan = planBagPhases(sambucus, "2024-01-15", "2024-04-20");
    expect(plan.window?.opensOn).toBe(plusDays("2024-04-20", 90));
    expect(plan.nextMoveOn).toBeNull();
  });

  it.each<[ProtocolPhase[], string, string, string | null, boolean]>([
    // [phases, start, opens, closes, disagree]
    [[cold(14, 28)], "2023-12-01", "2023-12-15", "2023-12-29", false], // A. speciosa 2–4 weeks (Kaye et al. 2018)
    [[cold(60, 60)], "2023-12-01", "2024-01-30", "2024-01-30", false], // REFERENCES.md: 2023-12-01 + 60 = 2024-01-30
    [[{ ...cold(14, 14), sources: [cold(14, 14).sources[0], cold(70, 70, "Other").sources[0]] }], "2024-01-01", "2024-01-15", "2024-03-11", true],
    [[cold(28, null)], "2024-01-01", "2024-01-29", null, false], // no upper limit (Lavandula row)
    [[{ kind: "scarify", note: "", sources: [] }, cold(70, 70)], "2024-01-01", "2024-03-11", "2024-03-11", false], // scarify takes no days
  ])("%j from %s opens %s closes %s", (phases, start, opensOn, closesOn, sourcesDisagree) => {
    // Common practice: the pull is planned for the earliest date (plannedPullOn = opensOn).
    expect(computePullWindow(protocolOf(...phases), start)).toEqual({ opensOn, closesOn, plannedPullOn: opensOn, sourcesDisagree });
  });

  it("no window for a species that needs no cold (Rudbeckia hirta)", () => {
    expect(computePullWindow(starterProtocols.find((p) => p.key === "rudbeckia-hirta")!, "2024-01-01")).toBeNull();
  });

  it("window start ≤ window end, and both are the start plus whole calendar days (property, Temporal cross-check)", () => {
    const phase = fc
      .tuple(fc.constantFrom("warm_moist", "cold_moist", "frozen") as fc.Arbitrary<ProtocolPhase["kind"]>, fc.array(fc.tuple(fc.nat({ max: 200 }), fc.nat({ max: 200 })), { minLength: 1, maxLength: 3 }))
      .map(([kind, ranges]): ProtocolPhase => ({
        kind,
        note: "",
        sources: ranges.map(([a, b]) => ({ citation: "s", minDays: Math.min(a, b), maxDays: Math.max(a, b), band: null, note: "" })),
      }));
    const day = fc.date({ min: new Date("2000-01-01"), max: new Date("2050-12-31"), noInvalidDate: true }).map((d) => d.toISOString().slice(0, 10));
    fc.assert(
      fc.property(fc.array(phase, { minLength: 1, maxLength: 3 }), day, (phases, start) => {
        const w = computePullWindow(protocolOf(...phases), start)!;
        expect(w.opensOn <= w.closesOn!).toBe(true);
        const minSum = phases.reduce((s, p) => s + Math.min(...p.sources.map((x) => x.minDays)), 0);
        const maxSum = phases.reduce((s, p) => s + Math.max(...p.sources.map((x) => x.maxDays!)), 0);
        expect(w.opensOn).toBe(plusDays(start, minSum));
        expect(w.closesOn).toBe(plusDays(start, maxSum));
      }),
    );
  });
});

describe("bag state", () => {
  const window: PullWindow = { opensOn: "2024-02-01", closesOn: "2024-02-14", plannedPullOn: "2024-02-01", sourcesDisagree: false };
  it.each([
    [{ startedOn: null }, "2024-01-10", "planned"],
    [{ startedOn: "2024-01-20" }, "2024-01-10", "planned"],
    [{ startedOn: "2024-01-01" }, "2024-01-31", "chilling"],
    [{ startedOn: "2024-01-01" }, "2024-02-01", "window_open"],
    [{ startedOn: "2024-01-01" }, "2024-02-14", "window_open"],
    [{ startedOn: "2024-01-01" }, "2024-02-15", "overdue"],
    [{ startedOn: "2024-01-01", pulledOn: "2024-02-03" }, "2024-02-20", "pulled"],
    [{ startedOn: "2024-01-01", pulledOn: "2024-02-03", sownOn: "2024-02-04" }, "2024-02-20", "sown"],
    [{ startedOn: "2024-01-01", discardedOn: "2024-01-09" }, "2024-01-10", "discarded"],
  ] as const)("%j on %s is %s", (bag, today, state) => {
    expect(determineBagState(bag, window, today)).toBe(state);
  });

  it("never overdue when the source sets no upper limit", () => {
    expect(determineBagState({ startedOn: "2024-01-01" }, { ...window, closesOn: null }, "2025-01-01")).toBe("window_open");
  });

  it("moves only forward through planned → chilling → window open → overdue as days pass (property)", () => {
    const order: BagState[] = ["planned", "chilling", "window_open", "overdue"];
    fc.assert(
      fc.property(fc.integer({ min: -30, max: 90 }), fc.integer({ min: 0, max: 30 }), (offset, step) => {
        const a = plusDays("2024-01-01", offset);
        const b = plusDays(a, step);
        const sa = determineBagState({ startedOn: "2024-01-01" }, window, a);
        const sb = determineBagState({ startedOn: "2024-01-01" }, window, b);
        expect(order.indexOf(sb)).toBeGreaterThanOrEqual(order.indexOf(sa));
      }),
    );
  });
});

describe("next check", () => {
  const window: PullWindow = { opensOn: "2024-01-29", closesOn: "2024-02-12", plannedPullOn: "2024-01-29", sourcesDisagree: false };
  const base: NextCheckInput = { state: "chilling", startedOn: "2024-01-01", window };
  const check = (on: string, over: Partial<CheckFindings> = {}): CheckFindings => ({ on, moisture: "damp", mould: "clean", sprouts: "none", ...over });

  it.each([
    ["weekly before the window (common practice)", {}, "2024-01-08", "weekly"],
    ["weekly from the last check", { lastCheck: check("2024-01-10") }, "2024-01-17", "weekly"],
    ["never past the day the window opens", { lastCheck: check("2024-01-24") }, "2024-01-29", "window_opens"],
    ["daily inside the window", { state: "window_open", lastCheck: check("2024-01-29") }, "2024-01-30", "window_daily"],
    ["daily and overdue after it", { state: "overdue", lastCheck: check("2024-02-12") }, "2024-02-13", "overdue"],
    ["next day after soggy medium", { lastCheck: check("2024-01-08", { moisture: "soggy" }) }, "2024-01-09", "follow_up"],
    ["two days after dry medium", { lastCheck: check("2024-01-08", { moisture: "dry" }) }, "2024-01-10", "follow_up"],
    ["next day after mould spots", { lastCheck: check("2024-01-08", { mould: "spots" }) }, "2024-01-09", "follow_up"],
    ["at once after spreading mould", { lastCheck: check("2024-01-08", { mould: "spreading" }) }, "2024-01-08", "discard_now"],
    ["next day after a mould rescue", { lastCheck: check("2024-01-08", { mould: "spreading", actions: ["removed_mouldy_seed"] }) }, "2024-01-09", "follow_up"],
    ["pull now on first roots (about 10 % chitted: Forest Research)", { lastCheck: check("2024-01-20", { sprouts: "first_roots" }) }, "2024-01-20", "pull_now"],
    ["every 3 days when configured", { cadence: { everyDaysBeforeWindow: 3, followUpDays: { soggy: 1, dry: 2, mouldSpots: 1, mouldRescued: 1 } } }, "2024-01-04", "weekly"],
    ["move to the cold when the warm phase ends", { lastCheck: check("2024-01-05"), nextMoveOn: "2024-01-10" }, "2024-01-10", "move_to_next_phase"],
    ["keeps asking for a move not yet recorded", { lastCheck: check("2024-01-12"), nextMoveOn: "2024-01-10" }, "2024-01-10", "move_to_next_phase"],
  ] as const)("%s", (_name, over, on, reason) => {
    expect(scheduleNextCheck({ ...base, ...over } as NextCheckInput)).toMatchObject({ on, reason });
  });

  it.each(["planned", "pulled", "sown", "discarded"] as const)("nothing to check when %s", (state) => {
    expect(scheduleNextCheck({ ...base, state })).toBeNull();
  });

  it("the next check is never before the last one, and never more than a week after it (property)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 60 }),
        fc.constantFrom("dry", "damp", "soggy"),
        fc.constantFrom("clean", "spots", "spreading"),
        fc.constantFrom("none", "first_roots", "many"),
        (offset, moisture, mould, sprouts) => {
          const on = plusDays("2024-01-01", offset);
          const state = determineBagState({ startedOn: "2024-01-01" }, window, on);
          const next = scheduleNextCheck({ ...base, state, lastCheck: { on, moisture, mould, sprouts } })!;
          expect(next.on >= on).toBe(true);
          expect(Temporal.PlainDate.from(on).until(next.on).days).toBeLessThanOrEqual(7);
        },
      ),
    );
  });
});

describe("advice for a check", () => {
  it("gives first roots and many sprouts their own words, in the advice and on the round", () => {
    expect(adviseOnCheck({ moisture: "damp", mould: "clean", sprouts: "first_roots" }).steps.join(" ")).not.toMatch(/earlier/);
    const next = (sprouts: "first_roots" | "many") =>
      scheduleNextCheck({ state: "window_open", startedOn: "2024-01-01", window: null, lastCheck: { on: "2024-02-01", moisture: "damp", mould: "clean", sprouts } })!;
    expect(next("first_roots").note).toBe("First roots were showing: pull now and sow.");
    expect(next("many").note).toBe("Many seeds had sprouted: pull and sow today, before the roots tangle.");
  });

  it.each([
    [{ moisture: "damp", mould: "clean", sprouts: "none" }, "fine", /All good/, []],
    [{ moisture: "damp", mould: "clean", sprouts: "first_roots" }, "act_now", /pull now and sow/, [/break easily/]],
    // "Many" is past the usual sign (sow when about 10 % of the seed is chitted: Forest Research species pages).
    [{ moisture: "damp", mould: "clean", sprouts: "many" }, "act_now", /Many seeds have sprouted: pull and sow today/, [/tangle/, /pull this species earlier/]],
    [{ moisture: "damp", mould: "spreading", sprouts: "none" }, "act_now", /discard/, [/sealed/, /not .*sniff/, /Wash your hands/]],
    [{ moisture: "soggy", mould: "clean", sprouts: "none" }, "attention", /soggy/, [/Blot/]],
    [{ moisture: "dry", mould: "clean", sprouts: "none" }, "attention", /dried out/, [/few drops/]],
    [{ moisture: "soggy", mould: "spots", sprouts: "none" }, "attention", /mould spots/, [/Lift out/, /Wash your hands/, /Blot/]],
  ] as const)("%j → %s", (findings, level, headline, steps) => {
    const a = adviseOnCheck(findings);
    expect(a.level).toBe(level);
    expect(a.headline).toMatch(headline);
    for (const s of steps) expect(a.steps.join(" ")).toMatch(s);
  });
});
