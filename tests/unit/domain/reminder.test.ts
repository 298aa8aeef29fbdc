import { describe, expect, it } from "vitest";
import { buildTodaysRound, type CheckFindings, type PullWindow, type RoundBag } from "@/lib/domain";
import { readZonedClock } from "@/lib/domain/csv";
import { composeReminder, composeTestReminder, describeReminderDays, isReminderDue, REMINDER_LATE_HOURS } from "@/lib/domain/reminder";

// The phone reminder is Today's round (lib/domain/round.ts) in a few words. Order of urgency (mould, roots,
// past the latest pull) is the product's own rule, shared with Today; nothing here is a published value.

const window = (opensOn: string, closesOn: string): PullWindow => ({ opensOn, closesOn, plannedPullOn: opensOn, sourcesDisagree: false });
const check = (on: string, over: Partial<CheckFindings> = {}): CheckFindings => ({ on, moisture: "damp", mould: "clean", sprouts: "none", ...over });
const bag = (code: string, over: Partial<RoundBag>): RoundBag => ({
  id: code,
  code,
  storeId: "barn",
  storeName: "Barn fridge",
  box: "Box 1",
  startedOn: "2024-01-01",
  window: window("2024-03-01", "2024-03-14"),
  lastCheck: null,
  ...over,
});
const today = "2024-02-01";
const cellar = { storeId: "cellar", storeName: "Cellar fridge" };

describe("the reminder's words", () => {
  it("counts due bags by store and names the most urgent codes: mould, roots, past the latest pull", () => {
    const round = buildTodaysRound(
      [
        bag("WEEK0001", { lastCheck: check("2024-01-25") }),
        bag("MMMM1111", { lastCheck: check("2024-01-31", { mould: "spreading" }), ...cellar }),
        bag("MMMM2222", { lastCheck: check("2024-01-31", { mould: "spots" }), ...cellar }),
        bag("RRRR3333", { lastCheck: check("2024-01-31", { sprouts: "first_roots" }) }),
        bag("PAST4444", { lastCheck: check("2024-01-30"), window: window("2024-01-10", "2024-01-24") }),
        bag("NNNN5555", { lastCheck: check("2024-01-30") }),
      ],
      today,
    );
    expect(composeReminder(round)).toEqual({
      title: "5 bags to check today",
      body: "Cellar fridge 2 · Barn fridge 3\nMould spreading: MMMM-1111\nMould spots: MMMM-2222\nRoots showing: RRRR-3333\nPast latest pull: PAST-4444",
      url: "/today",
      tag: "rimebook-round",
    });
  });

  it("says nothing when nothing is due (then nothing is sent)", () => {
    expect(composeReminder(buildTodaysRound([bag("NNNN5555", { lastCheck: check("2024-01-30") })], today))).toBeNull();
    expect(composeTestReminder(buildTodaysRound([], today)).body).toMatch(/^Nothing is due today/);
  });

  it("names the farm only when asked (a person on two farms), and keeps long lists short", () => {
    const many = Array.from({ length: 7 }, (_, i) => bag(`RRRR000${i}`, { lastCheck: check("2024-01-31", { sprouts: "many" }), storeId: `s${i}`, storeName: `Fridge ${i}` }));
    const m = composeReminder(buildTodaysRound(many, today), { farmName: "Bramblewick Native Nursery" })!;
    expect(m.title).toBe("7 bags to check today · Bramblewick Native Nursery");
    expect(m.body).toBe("Fridge 0 1 · Fridge 1 1 · Fridge 2 1 · Fridge 3 1 +3 more\nRoots showing: RRRR-0000, RRRR-0001, RRRR-0002, RRRR-0003 +3 more");
  });
});

describe("when the reminder is due", () => {
  const time = { hour: 7, days: [1, 2, 3, 4, 5] };
  it("at the chosen hour on the chosen days, up to the late hours, never before", () => {
    const friday = { day: "2026-12-04", weekday: 5 };
    expect(isReminderDue(time, { ...friday, hour: 6 })).toBe(false);
    expect(isReminderDue(time, { ...friday, hour: 7 })).toBe(true);
    expect(isReminderDue(time, { ...friday, hour: 7 + REMINDER_LATE_HOURS })).toBe(true);
    expect(isReminderDue(time, { ...friday, hour: 8 + REMINDER_LATE_HOURS })).toBe(false);
    expect(isReminderDue(time, { day: "2026-12-05", weekday: 6, hour: 7 })).toBe(false);
  });

  it("reads the farm's own clock, across a daylight-saving change (IANA time zone database via Intl)", () => {
    // 2026-03-08 is the US spring-forward day: 13:30 UTC is 08:30 CDT (UTC−5); a day earlier it was 07:30 CST (UTC−6).
    expect(readZonedClock(new Date("2026-03-08T13:30:00Z"), "America/Chicago")).toEqual({ day: "2026-03-08", hour: 8, weekday: 7 });
    expect(readZonedClock(new Date("2026-03-07T13:30:00Z"), "America/Chicago")).toEqual({ day: "2026-03-07", hour: 7, weekday: 6 });
    // Past midnight UTC it is still the evening before in Chicago.
    expect(readZonedClock(new Date("2026-12-05T02:00:00Z"), "America/Chicago")).toEqual({ day: "2026-12-04", hour: 20, weekday: 5 });
  });

  it("describes days in words", () => {
    expect(describeReminderDays([1, 2, 3, 4, 5, 6, 7])).toBe("every day");
    expect(describeReminderDays([5, 4, 3, 2, 1])).toBe("Mon–Fri");
    expect(describeReminderDays([6, 7])).toBe("weekends");
    expect(describeReminderDays([1, 3, 5])).toBe("Mon, Wed, Fri");
  });
});
