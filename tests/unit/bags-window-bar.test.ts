import { describe, expect, it } from "vitest";
import { computeWindowBarGeometry, type WindowBarInput } from "@/components/bags/window-bar-geometry";

// Our own drawing rule (no published source): the bar runs from the start day to the latest of the window's close,
// today, or 14 days past an open-ended window's opening. Positions are % of that span, rounded to 0.1.

describe("computeWindowBarGeometry", () => {
  const cases: Array<[string, WindowBarInput, { total: number; chillTo: number; win: [number, number, boolean]; today: [number, string]; day: number }]> = [
    [
      "14–28 day window, today inside (Kaye et al. 2018 speciosa row)",
      { startedOn: "2024-01-15", opensOn: "2024-01-29", closesOn: "2024-02-12", today: "2024-02-05" },
      { total: 28, chillTo: 50, win: [50, 100, false], today: [75, "in_window"], day: 21 },
    ],
    [
      "still chilling, day 7 of 28",
      { startedOn: "2024-01-15", opensOn: "2024-01-29", closesOn: "2024-02-12", today: "2024-01-22" },
      { total: 28, chillTo: 50, win: [50, 100, false], today: [25, "chilling"], day: 7 },
    ],
    [
      "overdue: the bar stretches to today",
      { startedOn: "2024-01-15", opensOn: "2024-01-29", closesOn: "2024-02-12", today: "2024-02-22" },
      { total: 38, chillTo: 36.8, win: [36.8, 73.7, false], today: [100, "past_window"], day: 38 },
    ],
    [
      "open-ended window gets a 14-day tail (lavender row: 28 days, no upper limit)",
      { startedOn: "2024-01-01", opensOn: "2024-01-29", closesOn: null, today: "2024-01-10" },
      { total: 42, chillTo: 66.7, win: [66.7, 100, true], today: [21.4, "chilling"], day: 9 },
    ],
    [
      "planned: today before the start is pinned to the left edge",
      { startedOn: "2024-03-01", opensOn: "2024-03-15", closesOn: "2024-03-29", today: "2024-02-20" },
      { total: 28, chillTo: 50, win: [50, 100, false], today: [0, "before_start"], day: -10 },
    ],
    [
      "window that opens and closes on the start day keeps one day of width",
      { startedOn: "2024-01-15", opensOn: "2024-01-15", closesOn: "2024-01-15", today: "2024-01-15" },
      { total: 1, chillTo: 0, win: [0, 0, false], today: [0, "in_window"], day: 0 },
    ],
    [
      "across the leap day (2024-02-29 counts)",
      { startedOn: "2024-02-01", opensOn: "2024-03-01", closesOn: "2024-03-02", today: "2024-02-29" },
      { total: 30, chillTo: 96.7, win: [96.7, 100, false], today: [93.3, "chilling"], day: 28 },
    ],
  ];
  it.each(cases)("%s", (_name, input, want) => {
    const g = computeWindowBarGeometry(input);
    expect(g.totalDays).toBe(want.total);
    expect(g.chill).toEqual({ fromPct: 0, toPct: want.chillTo });
    expect([g.window.fromPct, g.window.toPct, g.window.openEnded]).toEqual(want.win);
    expect([g.today.pct, g.today.phase]).toEqual(want.today);
    expect(g.today.dayNumber).toBe(want.day);
  });

  it("draws a shifted window after lost cold days and widens the bar to hold it", () => {
    const g = computeWindowBarGeometry({
      startedOn: "2024-01-15",
      opensOn: "2024-01-29",
      closesOn: "2024-02-12",
      today: "2024-02-01",
      shifted: { opensOn: "2024-02-01", closesOn: "2024-02-15" }, // three days warm
    });
    expect(g.totalDays).toBe(31);
    expect(g.endsOn).toBe("2024-02-15");
    expect(g.shifted).toEqual({ fromPct: 54.8, toPct: 100, openEnded: false });
    expect(g.window).toEqual({ fromPct: 45.2, toPct: 90.3, openEnded: false });
  });
});
