import { describe, expect, it } from "vitest";
import {
  countDownLane,
  countDownSeason,
  describeDaysAway,
  describeWeeksBefore,
  formatDayWithWeekday,
  placeOnScale,
  type SeasonLaneInput,
} from "@/components/plan/timeline";
import { planSeason } from "@/lib/domain";
import type { ProtocolForPlan } from "@/lib/domain/schedule";

// The season view's arithmetic: weeks counted back from the last frost, the day each bag must go in, and the cold
// still needed from today. Dates in the tables are written as a grower reads them ("Sat 13 Mar 2027"); `day`
// turns them into calendar days and refuses a weekday that does not match the date (checked against the
// proleptic Gregorian calendar of ISO 8601, as Python's datetime.date and Temporal.PlainDate compute it).

const monthIndex = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"];
const weekdayIndex = ["Sun", "Mon", "Tue", "Wed", "Thu", "Fri", "Sat"];
function day(words: string): string {
  const m = /^(\w{3}) (\d{1,2}) (\w{3}) (\d{4})$/.exec(words);
  if (!m) throw new Error(`not a day in words: ${words}`);
  const date = new Date(Date.UTC(Number(m[4]), monthIndex.indexOf(m[3]), Number(m[2])));
  if (weekdayIndex[date.getUTCDay()] !== m[1]) throw new Error(`${words}: that day is a ${weekdayIndex[date.getUTCDay()]}`);
  return date.toISOString().slice(0, 10);
}

// Cold-moist 14–28 days: the range of Kaye, Sandlin & Bahm 2018 (AoB PLANTS 10:ply018) for Asclepias speciosa.
const milkweed: ProtocolForPlan = {
  species: "Asclepias speciosa",
  phases: [{ kind: "cold_moist", note: "", sources: [{ citation: "Kaye, Sandlin & Bahm 2018", minDays: 14, maxDays: 28, band: null, note: "" }] }],
  effectiveBand: null,
};
// Warm-moist 90 days then cold-moist 90 days: Young & Young 1992 for Sambucus canadensis.
const elder: ProtocolForPlan = {
  species: "Sambucus canadensis",
  phases: [
    { kind: "warm_moist", note: "", sources: [{ citation: "Young & Young 1992", minDays: 90, maxDays: 90, band: null, note: "" }] },
    { kind: "cold_moist", note: "", sources: [{ citation: "Young & Young 1992", minDays: 90, maxDays: 90, band: null, note: "" }] },
  ],
  effectiveBand: null,
};

// The demo farm's average last frost is 8 May (invented); the 2027 season's frost day is a Saturday.
const frost = day("Sat 8 May 2027");

/** A plan row through lib/domain's planSeason: sown `weeks` from the frost, as the plan screen does it. */
function lane(protocol: ProtocolForPlan, weeks: number, bag: SeasonLaneInput["bag"] = null): SeasonLaneInput {
  const plan = planSeason({
    protocol, today: day("Sat 5 Dec 2026"), lastFrostOn: frost, rule: { weeksFromFrost: weeks, where: "indoor" },
    targetPlants: 10, germination: { kind: "fraction", value: 1 }, survival: 1,
  });
  return { id: protocol.species, label: protocol.species, sowOn: plan.sowOn, phases: plan.phases, bag };
}

describe("countDownLane: when the bag goes in and the cold still to come, in words", () => {
  // Milkweed sown 6 weeks before frost: Sat 27 Mar; shortest cold 14 days → in by Sat 13 Mar, 8 weeks before
  // frost; longest 28 days → not before Sat 27 Feb.
  it.each([
    {
      name: "months ahead: not started, with the day it may go in",
      input: lane(milkweed, -6), today: "Sat 5 Dec 2026",
      // Sat 5 Dec 2026 → Sat 13 Mar 2027 is 98 days, 14 weeks.
      want: { status: "waiting", headline: "not started — must go in by Sat 13 Mar, 14 weeks from now; can go in from Sat 27 Feb", coldLine: "needs 14 days cold · 14 to go", startByBefore: "8 weeks before frost", coldToGo: 14 },
    },
    {
      name: "inside two weeks and past the earliest start: due, can go in now",
      input: lane(milkweed, -6), today: "Mon 1 Mar 2027",
      want: { status: "due", headline: "not started — must go in by Sat 13 Mar, in 12 days; can go in now", coldToGo: 14 },
    },
    {
      name: "start-by day itself",
      input: lane(milkweed, -6), today: "Sat 13 Mar 2027",
      want: { status: "due", headline: "not started — must go in by Sat 13 Mar, today; can go in now" },
    },
    {
      name: "a week past the start-by: late, and when it would be ready if started today",
      input: lane(milkweed, -6), today: "Sat 20 Mar 2027",
      // Sat 20 Mar + 14 days = Sat 3 Apr, 7 days after sowing on Sat 27 Mar.
      want: { status: "late", headline: "late: should have started Sat 13 Mar — starting today, ready Sat 3 Apr, 7 days after sowing", coldToGo: 14 },
    },
    {
      name: "warm then cold, bag in on its day: the warm months are behind it, 68 of 90 cold days to go",
      // Sown at frost, Sat 8 May; cold from Sun 7 Feb (8 May − 90 days); warm from Mon 9 Nov 2026 (− 90 more).
      // Mon 9 Nov → Mon 1 Mar is 112 days: 90 warm + 22 cold.
      input: lane(elder, 0, { startedOn: day("Mon 9 Nov 2026"), outOn: null }), today: "Mon 1 Mar 2027",
      want: { status: "in_bag", headline: "in the bag since Mon 9 Nov — ready Sat 8 May", coldLine: "needs 90 days warm, then 90 days cold · 68 to go", coldDone: 22, coldToGo: 68, doneDays: 112, startByBefore: "about 26 weeks before frost" },
    },
    {
      name: "cold-only bag that went in three days late says so",
      input: lane(milkweed, -6, { startedOn: day("Tue 16 Mar 2027"), outOn: null }), today: "Sat 20 Mar 2027",
      want: { status: "in_bag", headline: "in the cold since Tue 16 Mar (3 days after the start-by day) — ready Tue 30 Mar", coldDone: 4, coldToGo: 10 },
    },
    {
      name: "a bag only planned (no start day yet) still counts as not started",
      input: lane(milkweed, -6, { startedOn: null, outOn: null }), today: "Sat 5 Dec 2026",
      want: { status: "waiting", coldToGo: 14, doneDays: 0 },
    },
    {
      name: "out of the cold: done, nothing to go",
      input: lane(milkweed, -6, { startedOn: day("Sat 13 Mar 2027"), outOn: day("Sat 27 Mar 2027") }), today: "Sat 1 May 2027",
      want: { status: "done", headline: "done — out of the cold Sat 27 Mar", coldLine: "needs 14 days cold · cold done", coldToGo: 0, coldDone: 14 },
    },
    {
      name: "no pretreatment: sow straight away",
      input: { id: "x", label: "Baptisia australis", sowOn: day("Sat 8 May 2027"), phases: [] }, today: "Sat 5 Dec 2026",
      want: { status: "no_cold", headline: "no cold needed — sow Sat 8 May", coldLine: "no pretreatment", coldNeeded: 0 },
    },
  ])("$name", ({ input, today, want }) => {
    expect(countDownLane(input, frost, "frost", day(today))).toMatchObject(want);
  });

  it("draws a started bag from the day it went in: three days late ends three days past sowing, with no lead-in", () => {
    const l = countDownLane(lane(milkweed, -6, { startedOn: day("Tue 16 Mar 2027"), outOn: null }), frost, "frost", day("Sat 20 Mar 2027"));
    // Tue 16 Mar → Sat 8 May is 53 days; + 14 days cold ends Tue 30 Mar, 39 days before frost; sowing is 42 days before.
    expect(l.segments.map((s) => [s.startsBefore, s.endsBefore])).toEqual([[53, 39]]);
    expect(l.sowBefore).toBe(42);
    expect(l.leadInBefore).toBeNull();
    expect(countDownLane(lane(milkweed, -6), frost, "frost", day("Sat 20 Mar 2027")).leadInBefore).toBe(70); // Sat 27 Feb
  });

  it("late warm-then-cold: ready three weeks after sowing (Sat 5 Dec + 180 days = Thu 3 Jun, 26 days after Sat 8 May)", () => {
    const l = countDownLane(lane(elder, 0), frost, "frost", day("Sat 5 Dec 2026"));
    expect(l.headline).toBe("late: should have started Mon 9 Nov — starting today, ready Thu 3 Jun, 3 weeks after sowing");
    expect(l.coldLine).toBe("needs 90 days warm, then 90 days cold · 90 to go");
    // What the gauge shows, as one sentence for a screen reader: the phases in order, then sowing.
    expect(l.spoken).toBe("90 days warm from Mon 9 Nov, then 90 days cold from Sun 7 Feb; sow Sat 8 May, at frost.");
  });
});

describe("countDownSeason: one scale of weeks before the frost", () => {
  const season = countDownSeason([lane(milkweed, -6), lane(elder, 0)], frost, day("Sat 5 Dec 2026"))!;

  it.each([
    // Earliest point: elder's warm start, 180 days before frost = 25.7 weeks → 28 weeks in steps of 4.
    { what: "the scale starts at a whole step before the earliest start", got: season.before, want: 28 * 7 },
    { what: "nothing is sown after the frost, so the scale ends there", got: season.after, want: 0 },
    { what: "ticks in words, frost at the end", got: season.ticks.map((t) => t.label), want: ["28 wk", "24 wk", "20 wk", "16 wk", "12 wk", "8 wk", "4 wk", "frost"] },
    // Sat 5 Dec 2026 → Sat 8 May 2027 is 154 days: 22 weeks before frost.
    { what: "today sits 22 weeks before frost", got: season.todayBefore, want: 154 },
    { what: "the frost is at the right-hand edge", got: placeOnScale(season, 0), want: 100 },
    { what: "the start of the scale is the left-hand edge", got: placeOnScale(season, 196), want: 0 },
    { what: "milkweed's sowing sits 42 days before frost", got: season.lanes[0].sowBefore, want: 42 },
  ])("$what", ({ got, want }) => expect(got).toEqual(want));

  it.each([
    { name: "sown after the frost: the scale runs past it", weeks: 3, after: 21 },
    { name: "a short season gets two-week ticks", weeks: -2, after: 0 },
  ])("$name", ({ weeks, after }) => {
    const s = countDownSeason([lane(milkweed, weeks)], frost, day("Sat 5 Dec 2026"))!;
    expect(s.after).toBe(after);
    expect(s.ticks.at(-1)?.label).toBe("frost");
    if (weeks === -2) expect(s.ticks.map((t) => t.label)).toEqual(["6 wk", "4 wk", "2 wk", "frost"]);
  });

  it("a bag started late that ends after the frost stretches the scale past it", () => {
    // Warm 90 + cold 90 from Sat 5 Dec 2026 ends Thu 3 Jun 2027, 26 days after the frost → 4 whole weeks after.
    const s = countDownSeason([lane(elder, 0, { startedOn: day("Sat 5 Dec 2026"), outOn: null })], frost, day("Sat 5 Dec 2026"))!;
    expect(s.lanes[0].segments.at(-1)?.endsBefore).toBe(-26);
    expect(s.after).toBe(28);
    expect(placeOnScale(s, -26)).toBeLessThanOrEqual(100);
  });

  it("without a frost date each species counts back from its own sowing day", () => {
    const s = countDownSeason([lane(milkweed, -6)], null, day("Sat 5 Dec 2026"))!;
    expect(s.anchorKind).toBe("sowing");
    expect(s.todayBefore).toBeNull();
    expect(s.lanes[0]).toMatchObject({ sowBefore: 0, startByBefore: "2 weeks before sowing" });
    expect(s.ticks.at(-1)?.label).toBe("sow");
    expect(countDownSeason([], frost, day("Sat 5 Dec 2026"))).toBeNull();
  });
});

describe("words for days", () => {
  it.each([
    { iso: "2026-01-08", today: "2026-01-01", want: "Thu 8 Jan" },
    { iso: "2027-01-08", today: "2026-12-05", want: "Fri 8 Jan" },
    { iso: "2027-11-08", today: "2026-12-05", want: "Mon 8 Nov 2027" },
    { iso: "2027-03-06", today: undefined, want: "Sat 6 Mar 2027" },
  ])("$iso → $want", ({ iso, today, want }) => expect(formatDayWithWeekday(iso, today)).toBe(want));

  it.each([
    [0, "today"], [1, "tomorrow"], [-1, "yesterday"], [5, "in 5 days"], [13, "in 13 days"], [14, "2 weeks from now"], [27, "3 weeks from now"], [-12, "12 days ago"], [-21, "3 weeks ago"],
  ])("%i days → %s", (n, want) => expect(describeDaysAway(n)).toBe(want));

  it.each([
    [84, "12 weeks before frost"], [90, "about 13 weeks before frost"], [0, "at frost"], [3, "3 days before frost"], [-14, "2 weeks after frost"], [7, "1 week before frost"],
  ])("%i days before → %s", (n, want) => expect(describeWeeksBefore(n)).toBe(want));
});
