import { describe, expect, it } from "vitest";
import { Temporal } from "@js-temporal/polyfill";
import { buildTodaysRound, scheduleBagCheck, scheduleNextCheck, type CheckFindings, type NextCheckInput, type PullWindow, type RoundBag } from "@/lib/domain";

// The bag's own check rhythm (bags.check_every_days). Checking weekly while chilling and daily once the pull window
// opens is common practice (no published source; REFERENCES.md "Stratification and cold-store facts", PRODUCT.md
// "Check the bags"); the sooner follow-ups after a problem (1–2 days) are common practice too. A bag's own setting
// replaces only the weekly part. Dates cross-checked with Temporal PlainDate (REFERENCES.md, Dates).

const plus = (day: string, n: number) => Temporal.PlainDate.from(day).add({ days: n }).toString();
const window: PullWindow = { opensOn: "2024-01-29", closesOn: "2024-02-12", plannedPullOn: "2024-01-29", sourcesDisagree: false };
const base: NextCheckInput = { state: "chilling", startedOn: "2024-01-01", window };
const check = (on: string, over: Partial<CheckFindings> = {}): CheckFindings => ({ on, moisture: "damp", mould: "clean", sprouts: "none", ...over });
const farmEvery3 = { everyDaysBeforeWindow: 3, followUpDays: { soggy: 1, dry: 2, mouldSpots: 1, mouldRescued: 1 } };

describe("next check with the bag's own rhythm", () => {
  it.each([
    ["no own rhythm: weekly (common practice)", {}, plus("2024-01-01", 7), "weekly", /^Routine check\.$/],
    ["every 3 days from the start", { checkEveryDays: 3 }, plus("2024-01-01", 3), "weekly", /every 3 days/],
    ["every 3 days from the last check", { checkEveryDays: 3, lastCheck: check("2024-01-10") }, plus("2024-01-10", 3), "weekly", /every 3 days/],
    ["every day", { checkEveryDays: 1 }, plus("2024-01-01", 1), "weekly", /this bag: every day/],
    ["the bag's rhythm wins over the farm's", { checkEveryDays: 10, cadence: farmEvery3 }, plus("2024-01-01", 10), "weekly", /every 10 days/],
    ["the farm's rhythm when the bag has none", { checkEveryDays: null, cadence: farmEvery3 }, plus("2024-01-01", 3), "weekly", /^Routine check\.$/],
    ["a long rhythm still stops at the day the window opens", { checkEveryDays: 30, lastCheck: check("2024-01-10") }, "2024-01-29", "window_opens", /start daily/],
    ["inside the window checks stay daily", { checkEveryDays: 10, state: "window_open", lastCheck: check("2024-01-30") }, plus("2024-01-30", 1), "window_daily", /check daily/],
    ["after the window checks stay daily", { checkEveryDays: 10, state: "overdue", lastCheck: check("2024-02-13") }, plus("2024-02-13", 1), "overdue", /latest pull/],
    ["soggy medium: the next-day follow-up beats a 10-day rhythm", { checkEveryDays: 10, lastCheck: check("2024-01-08", { moisture: "soggy" }) }, plus("2024-01-08", 1), "follow_up", /dried/],
    ["mould spots: next day beats a 5-day rhythm", { checkEveryDays: 5, lastCheck: check("2024-01-08", { mould: "spots" }) }, plus("2024-01-08", 1), "follow_up", /mould/],
    ["dry medium: a 1-day rhythm comes before the 2-day follow-up", { checkEveryDays: 1, lastCheck: check("2024-01-08", { moisture: "dry" }) }, plus("2024-01-08", 1), "weekly", /every day/],
    ["past the latest pull since a check before the window: overdue, not 'window opens'", { checkEveryDays: 10, state: "overdue", lastCheck: check("2024-01-25") }, "2024-01-29", "overdue", /latest pull/],
    ["past the latest pull after a check inside the window: overdue, not 'check daily'", { state: "overdue", lastCheck: check("2024-02-10") }, "2024-02-11", "overdue", /latest pull/],
    ["roots still mean pull now", { checkEveryDays: 10, lastCheck: check("2024-01-08", { sprouts: "first_roots" }) }, "2024-01-08", "pull_now", /pull now/],
  ] as const)("%s", (_name, over, on, reason, note) => {
    const next = scheduleNextCheck({ ...base, ...over } as NextCheckInput)!;
    expect(next).toMatchObject({ on, reason });
    expect(next.note).toMatch(note);
  });

  it.each([0, -1, 2.5])("refuses %s days between checks in words", (days) => {
    expect(() => scheduleNextCheck({ ...base, checkEveryDays: days })).toThrow("Days between checks must be a whole number of at least 1.");
  });

  it("the round and the single-bag rule give the same next check (Today and the bag page agree)", () => {
    const bag = (id: string, over: Partial<RoundBag>): RoundBag => ({ id, code: id, storeId: "s", storeName: "Barn fridge", box: "Box A", startedOn: "2024-01-01", window, ...over });
    const bags = [bag("OWN3", { checkEveryDays: 3 }), bag("FARM", {}), bag("OWN2LATE", { checkEveryDays: 2 })];
    const today = "2024-01-04";
    const round = buildTodaysRound(bags, today);
    expect(round.items.map((i) => [i.bag.code, i.next.on, i.isLate])).toEqual([
      ["OWN2LATE", "2024-01-03", true],
      ["OWN3", "2024-01-04", false],
    ]);
    for (const b of bags) {
      const single = scheduleBagCheck(b, today);
      const item = round.items.find((i) => i.bag.id === b.id);
      if (item) expect(single).toEqual({ state: item.state, next: item.next });
      else expect(single.next!.on > today).toBe(true);
    }
  });
});
