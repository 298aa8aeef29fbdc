import { describe, expect, it } from "vitest";
import { buildTodaysRound, type CheckFindings, type PullWindow, type RoundBag } from "@/lib/domain";

const window = (opensOn: string, closesOn: string): PullWindow => ({ opensOn, closesOn, plannedPullOn: opensOn, sourcesDisagree: false });
const clean = (on: string, over: Partial<CheckFindings> = {}): CheckFindings => ({ on, moisture: "damp", mould: "clean", sprouts: "none", ...over });
const bag = (code: string, over: Partial<RoundBag>): RoundBag => ({
  id: code,
  code,
  storeId: "fridge-1",
  storeName: "Barn fridge",
  box: "Box 1",
  startedOn: "2024-01-01",
  window: window("2024-02-01", "2024-02-14"),
  lastCheck: null,
  ...over,
});

const today = "2024-02-01";
const bags: RoundBag[] = [
  bag("WEEKLY1", { lastCheck: clean("2024-01-25"), window: window("2024-03-01", "2024-03-14") }), // due 02-01 weekly
  bag("NOTDUE1", { lastCheck: clean("2024-01-29"), window: window("2024-03-01", "2024-03-14") }), // due 02-05
  bag("OPENS01", { lastCheck: clean("2024-01-29") }), // window opens today
  bag("MOULD01", { lastCheck: clean("2024-01-31", { mould: "spreading" }), box: "Box 2" }),
  bag("ROOTS01", { lastCheck: clean("2024-01-31", { sprouts: "first_roots" }), storeId: "fridge-2", storeName: "House fridge" }),
  bag("LATE001", { lastCheck: clean("2024-01-30"), window: window("2024-01-10", "2024-01-24"), box: "Box 10" }), // overdue
  bag("SOGGY01", { lastCheck: clean("2024-01-31", { moisture: "soggy" }), window: window("2024-03-01", "2024-03-14") }),
  bag("PULLED1", { pulledOn: "2024-01-30" }),
  bag("DISCARD", { discardedOn: "2024-01-30" }),
  bag("PLANNED", { startedOn: null }),
];

describe("today's round", () => {
  const round = buildTodaysRound(bags, today);

  it("lists only bags due today or earlier, mould first, then roots, overdue, windows opening, follow-ups, routine", () => {
    expect(round.items.map((i) => [i.bag.code, i.next.reason])).toEqual([
      ["MOULD01", "discard_now"],
      ["ROOTS01", "pull_now"],
      ["LATE001", "overdue"],
      ["OPENS01", "window_opens"],
      ["SOGGY01", "follow_up"],
      ["WEEKLY1", "weekly"],
    ]);
    expect(round.counts).toMatchObject({ due: 6, urgent: 4 });
  });

  it("groups by cold store, then box, most urgent store first", () => {
    expect(round.stores.map((s) => [s.storeName, s.boxes.map((b) => [b.box, b.items.map((i) => i.bag.code)])])).toEqual([
      ["Barn fridge", [["Box 2", ["MOULD01"]], ["Box 10", ["LATE001"]], ["Box 1", ["OPENS01", "SOGGY01", "WEEKLY1"]]]],
      ["House fridge", [["Box 1", ["ROOTS01"]]]],
    ]);
  });

  it("marks checks missed on earlier days as late", () => {
    const later = buildTodaysRound([bag("MISSED1", { lastCheck: clean("2024-01-10"), window: window("2024-03-01", "2024-03-14") })], today);
    expect(later.items[0]).toMatchObject({ isLate: true, next: { on: "2024-01-17" } });
  });

  it("is fast over 10,000 bags (phone and server share it)", () => {
    const many: RoundBag[] = Array.from({ length: 10_000 }, (_, i) => {
      const start = new Date(Date.UTC(2023, 10, 1 + (i % 90))).toISOString().slice(0, 10);
      const kinds: Partial<CheckFindings>[] = [{}, { moisture: "soggy" }, { mould: "spots" }, { sprouts: "first_roots" }, { moisture: "dry" }];
      return bag(`B${i}`, {
        storeId: `s${i % 7}`,
        storeName: `Fridge ${i % 7}`,
        box: `Box ${i % 23}`,
        startedOn: start,
        window: window(new Date(Date.UTC(2024, 0, 1 + (i % 60))).toISOString().slice(0, 10), "2024-03-15"),
        lastCheck: clean(new Date(Date.UTC(2024, 0, 20 + (i % 12))).toISOString().slice(0, 10), kinds[i % 5]),
      });
    });
    // CPU time, best of three: other work on a busy machine must not make this fail (measured ~50 ms here).
    let best = Infinity;
    let r = buildTodaysRound(many, today);
    for (let k = 0; k < 3; k++) {
      const t0 = process.cpuUsage();
      r = buildTodaysRound(many, today);
      const used = process.cpuUsage(t0);
      best = Math.min(best, (used.user + used.system) / 1000);
    }
    expect(r.items.length).toBeGreaterThan(1000);
    expect(best).toBeLessThan(250);
  });
});
