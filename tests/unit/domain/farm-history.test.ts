import { describe, expect, it } from "vitest";
import { Temporal } from "@js-temporal/polyfill";
import {
  buildTodaysRound,
  dailyChecksLeadDays,
  describeFarmRecordSource,
  describeFarmRootsLine,
  describePublishedDays,
  describeSeasons,
  farmWindowMinFinishedBags,
  findFarmWindow,
  findRootsWatchDay,
  findSeasonOf,
  measureDaysToRoots,
  measureDryingSpells,
  reconcileProtocol,
  type HistoryCheck,
  type PullWindow,
  type RoundBag,
} from "@/lib/domain";

// The farm's own history. Days are calendar days (REFERENCES.md, Dates; cross-checked with Temporal PlainDate).
// Censoring rules follow Kaplan & Meier (1958): an unfinished bag counts to its last check, never as roots.
// Starting daily checks a few days before the earliest roots is common practice (no published source).

const days = (from: string, to: string) => Temporal.PlainDate.from(from).until(Temporal.PlainDate.from(to)).days;
const plus = (day: string, n: number) => Temporal.PlainDate.from(day).add({ days: n }).toString();
const c = (on: string, over: Partial<HistoryCheck> = {}): HistoryCheck => ({ on, moisture: "damp", sprouts: "none", actions: [], ...over });
const today = "2026-12-04";

describe("days to first roots for one bag", () => {
  const start = "2025-11-03";
  it.each([
    ["roots at the third check: an event that day", { startedOn: start, pulledOn: "2025-12-10" }, [c("2025-11-10"), c("2025-11-17"), c("2025-12-08", { sprouts: "first_roots" }), c("2025-12-10", { sprouts: "many" })], { time: days(start, "2025-12-08"), event: true }],
    ["pulled without roots: censored at the last check", { startedOn: start, pulledOn: "2025-12-20" }, [c("2025-11-10"), c("2025-12-15")], { time: days(start, "2025-12-15"), event: false }],
    ["discarded for mould: censored at the last check", { startedOn: start, discardedOn: "2025-11-21" }, [c("2025-11-10"), c("2025-11-21")], { time: 18, event: false }],
    ["still chilling: censored at the last check so far", { startedOn: "2026-11-20" }, [c("2026-11-27")], { time: 7, event: false }],
    ["never checked: censored at day 0, never dropped", { startedOn: start, sownOn: "2025-12-01" }, [], { time: 0, event: false }],
    ["a stray check before the start is ignored", { startedOn: start }, [c("2025-11-01", { sprouts: "first_roots" }), c("2025-11-10")], { time: 7, event: false }],
  ] as const)("%s", (_name, bag, checks, expected) => {
    expect(measureDaysToRoots(bag, checks, today)).toEqual(expected);
  });

  it("a planned bag (no start, or a start after today) gives nothing", () => {
    expect(measureDaysToRoots({ startedOn: null }, [], today)).toBeNull();
    expect(measureDaysToRoots({ startedOn: "2026-12-10" }, [], today)).toBeNull();
  });
});

describe("drying spells: damp (or re-wetted) to the next dry check", () => {
  const bag = { startedOn: "2025-11-01" };
  it.each([
    ["damp at day 7, dry at day 21: 14 days", [c("2025-11-08"), c("2025-11-15"), c("2025-11-22", { moisture: "dry" })], [{ time: 14, event: true }]],
    [
      "re-wetted at the dry check: a new spell starts there, censored at the last check",
      [c("2025-11-08"), c("2025-11-22", { moisture: "dry", actions: ["added_water"] }), c("2025-11-29")],
      [{ time: 14, event: true }, { time: 7, event: false }],
    ],
    ["re-wetting while damp restarts the clock", [c("2025-11-08"), c("2025-11-15", { actions: ["added_water"] }), c("2025-11-25", { moisture: "dry" })], [{ time: 10, event: true }]],
    ["dry at the first check: no spell began", [c("2025-11-08", { moisture: "dry" })], []],
    ["soggy counts as wet", [c("2025-11-08", { moisture: "soggy" }), c("2025-11-12", { moisture: "dry" })], [{ time: 4, event: true }]],
    ["pulled before drying: censored", [c("2025-11-08"), c("2025-11-20")], [{ time: 12, event: false }]],
  ] as const)("%s", (_name, checks, expected) => {
    expect(measureDryingSpells(bag, checks, today)).toEqual(expected);
  });
});

describe("this farm's window", () => {
  // Published: 28 days (HortScience 28(9):899, 1993: best after 4 weeks at 5 °C) — the starter row for Echinacea purpurea.
  const published = describePublishedDays(
    reconcileProtocol({ species: "Echinacea purpurea", effectiveBand: null, phases: [{ kind: "cold_moist", note: "", sources: [{ citation: "HortScience 28(9):899 (1993)", minDays: 28, maxDays: 28, band: null, note: "" }] }] }),
  );

  it("sums the timed phases for the published days (warm then cold: 90 + 90, Young & Young 1992)", () => {
    const elder = reconcileProtocol({
      species: "Sambucus",
      effectiveBand: null,
      phases: [
        { kind: "warm_moist", note: "", sources: [{ citation: "Young & Young 1992", minDays: 90, maxDays: 90, band: null, note: "" }] },
        { kind: "cold_moist", note: "", sources: [{ citation: "Young & Young 1992", minDays: 90, maxDays: null, band: null, note: "" }] },
      ],
    });
    expect(describePublishedDays(elder)).toEqual({ minDays: 180, maxDays: null });
    expect(published).toEqual({ minDays: 28, maxDays: 28 });
  });

  const finished = (times: number[]) => times.map((time) => ({ time, event: true }));

  it(`needs ${farmWindowMinFinishedBags} bags with roots before it shows or suggests anything`, () => {
    const four = findFarmWindow([...finished([20, 21, 22, 24]), { time: 30, event: false }], published);
    expect(four).toMatchObject({ enough: false, dailyFromDay: null, suggestsEarlier: false, bags: 5, finished: 4 });
    const five = findFarmWindow(finished([20, 21, 22, 24, 26]), published);
    expect(five).toMatchObject({ enough: true, earliest: 20, median: 22, latest: 26, dailyFromDay: 20 - dailyChecksLeadDays, suggestsEarlier: true });
  });

  it("does not suggest earlier checks when the farm's roots come after the published window opens", () => {
    const late = findFarmWindow(finished([33, 34, 35, 38, 40]), published);
    expect(late).toMatchObject({ enough: true, dailyFromDay: 30, suggestsEarlier: false });
  });

  it("names its source: the farm's record, bag count and seasons", () => {
    const w = findFarmWindow([...finished([20, 21, 22, 24, 26]), { time: 15, event: false }], published);
    expect(describeFarmRecordSource(w, [2025, 2024, 2025])).toBe(
      "This farm's record, 6 bags, seasons 2024–2025; first roots from day 20; half the bags by day 22 (Kaplan–Meier, unfinished bags counted to their last check).",
    );
    expect(describeFarmRootsLine(w, "Echinacea purpurea")).toBe("On this farm, half the Echinacea purpurea bags showed roots by day 22 (6 bags; earliest day 20).");
    expect(describeFarmRootsLine(findFarmWindow([{ time: 9, event: false }], published), "x")).toBeNull();
  });

  it.each([
    ["2025-11-03", 2026],
    ["2026-02-10", 2026],
    ["2026-07-01", 2027],
  ])("a bag started %s belongs to the %i season (the spring it is sown in)", (day, season) => {
    expect(findSeasonOf(day)).toBe(season);
  });

  it.each([
    [[2025], "season 2025"],
    [[2026, 2025], "seasons 2025–2026"],
    [[2022, 2025], "seasons 2022 and 2025"],
  ] as const)("describes seasons %j as %s", (list, words) => {
    expect(describeSeasons(list)).toBe(words);
  });
});

describe("Today's cadence takes the farm's history as an input", () => {
  // Weekly while chilling, daily once the window opens: common practice. Published window opens on day 28.
  const startedOn = "2026-11-02";
  const window: PullWindow = { opensOn: plus(startedOn, 28), closesOn: plus(startedOn, 28), plannedPullOn: plus(startedOn, 28), sourcesDisagree: false };
  const bag: RoundBag = {
    id: "b1", code: "K7M4QZXA", storeId: "s1", storeName: "Barn fridge", box: "Box A", startedOn, window,
    lastCheck: { on: "2026-11-23", moisture: "damp", mould: "clean", sprouts: "none" },
  };
  const farm = findFarmWindow([20, 21, 22, 24, 26].map((time) => ({ time, event: true })), null);

  it("without history the bag is next due weekly (2026-11-30), so it is not on today's round", () => {
    const round = buildTodaysRound([bag], "2026-11-24");
    expect(round.items).toHaveLength(0);
  });

  it("with the farm's roots from day 20 the same bag is due daily from day 17 (2026-11-19): due on 2026-11-24, and again the next day", () => {
    const watch = findRootsWatchDay(startedOn, farm);
    expect(watch).toBe(plus(startedOn, 20 - dailyChecksLeadDays));
    const round = buildTodaysRound([{ ...bag, rootsWatchFrom: watch }], "2026-11-24");
    expect(round.items.map((i) => [i.next.on, i.next.reason])).toEqual([["2026-11-24", "roots_watch"]]);
    expect(round.items[0].next.note).toMatch(/On this farm roots have shown by now: check daily/);
    const nextDay = buildTodaysRound([{ ...bag, rootsWatchFrom: watch, lastCheck: { ...bag.lastCheck!, on: "2026-11-24" } }], "2026-11-25");
    expect(nextDay.items.map((i) => i.next.reason)).toEqual(["roots_watch"]);
  });

  it("a watch day after the window opens changes nothing (the window already asks for daily checks)", () => {
    const round = buildTodaysRound([{ ...bag, rootsWatchFrom: plus(startedOn, 40) }], "2026-11-30");
    expect(round.items.map((i) => i.next.reason)).toEqual(["window_opens"]);
  });

  it("not enough history: no watch day", () => {
    expect(findRootsWatchDay(startedOn, findFarmWindow([{ time: 20, event: true }], null))).toBeNull();
  });
});
