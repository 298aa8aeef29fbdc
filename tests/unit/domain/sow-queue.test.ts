import { describe, expect, it } from "vitest";
import { Temporal } from "@js-temporal/polyfill";
import { buildSowQueue, defaultSowRule, describeTimeOut, judgeSowing, type PulledBag } from "@/lib/domain";
import { buildSowQueueFromRows, describeRoundCount, roundHeadline, summarizeSowQueue } from "@/lib/domain/rows/round-input";

// The sowing rule is common practice, not a published figure: sow within a few days of the pull (3 here), and a bag
// whose roots show the same day or the next (1), because young radicles break and dry out easily. Forest Research's
// species pages (REFERENCES.md) say to sow once about 10 % of the seed is chitted, which is what "roots showing" marks.

const bag = (code: string, pulledOn: string, sprouts: PulledBag["sprouts"] = "none"): PulledBag => ({ id: code, code, pulledOn, sprouts });
const today = "2024-03-10";

describe("sowing rule (common practice)", () => {
  it("gives 3 days for a plain pull and 1 day with roots showing", () => {
    expect(defaultSowRule).toEqual({ plainDays: 3, sproutedDays: 1 });
  });

  // [pulled on, sprouts, days out, sow by, late]
  const cases: Array<[string, PulledBag["sprouts"], number, string, boolean]> = [
    ["2024-03-10", "none", 0, "2024-03-13", false],
    ["2024-03-07", "none", 3, "2024-03-10", false], // the last day inside the rule
    ["2024-03-06", "none", 4, "2024-03-09", true],
    ["2024-03-10", "first_roots", 0, "2024-03-11", false],
    ["2024-03-09", "many", 1, "2024-03-10", false],
    ["2024-03-08", "first_roots", 2, "2024-03-09", true],
    // Across the month end and a leap day: calendar days, cross-checked with Temporal.PlainDate below.
    ["2024-02-28", "none", 11, "2024-03-02", true],
  ];
  it.each(cases)("pulled %s with sprouts %s: %i days out, sow by %s, late %s", (pulledOn, sprouts, daysOut, sowBy, late) => {
    const j = judgeSowing(bag("X", pulledOn, sprouts), today);
    expect(j.daysOut).toBe(daysOut);
    expect(j.daysOut).toBe(Temporal.PlainDate.from(pulledOn).until(Temporal.PlainDate.from(today)).days);
    expect(j.sowBy).toBe(sowBy);
    expect(j.sowBy).toBe(Temporal.PlainDate.from(pulledOn).add({ days: sprouts === "none" ? 3 : 1 }).toString());
    expect(j.isLate).toBe(late);
  });

  it("says how long a bag has been out of the cold in plain words", () => {
    expect(describeTimeOut(0)).toBe("Pulled today");
    expect(describeTimeOut(1)).toBe("Pulled yesterday");
    expect(describeTimeOut(6)).toBe("6 days out of the cold");
    expect(judgeSowing(bag("X", "2024-03-10", "first_roots"), today).note).toBe("Pulled today, roots showing: sow by tomorrow; the young roots break easily.");
    expect(judgeSowing(bag("X", "2024-03-06"), today).note).toBe("4 days out of the cold: late to sow (sow by 2024-03-09). Sow now, or note why it waits.");
  });

  it("a farm's own tighter rule flags sooner", () => {
    expect(judgeSowing(bag("X", "2024-03-08"), today, { plainDays: 1, sproutedDays: 0 }).isLate).toBe(true);
  });
});

describe("the To sow group", () => {
  it("lists late bags first, then sprouted before plain pulls, then the longest out of the cold", () => {
    const queue = buildSowQueue(
      [bag("PLAIN01", "2024-03-09"), bag("ROOTS01", "2024-03-10", "first_roots"), bag("PLAIN02", "2024-03-08"), bag("LATE001", "2024-03-01"), bag("MANY001", "2024-03-10", "many")],
      today,
    );
    expect(queue.map((i) => i.bag.code)).toEqual(["LATE001", "MANY001", "ROOTS01", "PLAIN02", "PLAIN01"]);
  });

  const row = (id: string, over: Record<string, unknown>) =>
    ({ id, code: id, lot_id: "lot", store_id: "fridge", box: "Box 1", deleted_at: null, pulled_on: null, sown_on: null, discarded_on: null, ...over }) as never;
  const sources = {
    lots: [{ id: "lot", species: "Asclepias syriaca", common_name: "Common milkweed" }] as never[],
    stores: [{ id: "fridge", name: "Barn fridge" }] as never[],
    bags: [
      row("PULLED1", { pulled_on: "2024-03-09" }),
      row("ROOTED1", { pulled_on: "2024-03-10" }),
      row("SOWN001", { pulled_on: "2024-03-01", sown_on: "2024-03-02" }),
      row("GONE001", { pulled_on: "2024-03-01", discarded_on: "2024-03-02" }),
      row("DELETED", { pulled_on: "2024-03-01", deleted_at: "2024-03-02T00:00:00Z" }),
      row("CHILLNG", { start_date: "2024-02-01" }),
    ],
  };

  it("takes only pulled, unsown, live bags from the phone store's rows, with their last check's roots", () => {
    const queue = buildSowQueueFromRows(sources, new Map([["ROOTED1", { sprouts: "first_roots" as const }]]), today);
    expect(queue.map((i) => [i.bag.code, i.sprouted, i.bag.species])).toEqual([
      ["ROOTED1", true, "Asclepias syriaca (Common milkweed)"],
      ["PULLED1", false, "Asclepias syriaca (Common milkweed)"],
    ]);
  });

  it("counts in the round's summary sentence and chip", () => {
    const queue = buildSowQueueFromRows(sources, new Map(), today);
    expect(describeRoundCount(0, 0, [])).toBe("No bags due for a check.");
    expect(describeRoundCount(0, 0, queue)).toBe("No bags due for a check; 2 pulled bags to sow.");
    expect(describeRoundCount(3, 1, queue)).toBe("3 bags to check, 1 needing action first; 2 pulled bags to sow.");
    const late = buildSowQueue([bag("LATE001", "2024-03-01")], today);
    expect(describeRoundCount(1, 0, late)).toBe("1 bag to check; 1 pulled bag to sow (1 late).");
    expect(summarizeSowQueue(late)).toEqual([{ kind: "to_sow", label: "To sow (1 late)", count: 1, urgent: true, tone: "trouble" }]);
    expect(summarizeSowQueue(queue)).toEqual([{ kind: "to_sow", label: "To sow", count: 2, urgent: false, tone: "routine" }]);
  });
});

describe("the bag's badge", () => {
  it("says roots are showing once a check found them, instead of the cold state", async () => {
    const { findBadgeKind } = await import("@/lib/domain/sow-queue");
    expect(findBadgeKind("chilling", "first_roots")).toBe("roots_showing");
    expect(findBadgeKind("window_open", "many")).toBe("roots_showing");
    expect(findBadgeKind("chilling", "none")).toBe("chilling");
    expect(findBadgeKind("chilling", null)).toBe("chilling");
    // Once pulled, the state speaks: it is out of the cold.
    expect(findBadgeKind("pulled", "first_roots")).toBe("pulled");
  });
});

describe("dates in the words", () => {
  it("the phone writes the sow-by day its own way; the digest keeps yyyy-mm-dd", () => {
    const short = (d: string) => `day ${d.slice(8)}`;
    expect(judgeSowing(bag("X", "2024-03-06"), today, defaultSowRule, short).note).toBe("4 days out of the cold: late to sow (sow by day 09). Sow now, or note why it waits.");
    expect(judgeSowing(bag("X", "2024-03-10"), today, defaultSowRule, short).note).toBe("Pulled today: sow by day 13.");
  });
});

describe("Today's heading (roundHeadline)", () => {
  // Product wording (PRODUCT.md vocabulary); no outside source: the heading only counts.
  const barn = { name: "Barn fridge", kind: "fridge" as const };
  const shed = { name: "Shed fridge", kind: "fridge" as const };
  const chest = { name: "Chest freezer", kind: "freezer" as const };
  it.each([
    [4, [barn, shed], 0, "4 bags due in 2 fridges"],
    [1, [barn], 0, "1 bag due in Barn fridge"],
    [3, [barn, chest], 0, "3 bags due in 2 cold stores"],
    [2, [chest, { name: "Garage freezer", kind: "freezer" as const }], 1, "2 bags due in 2 freezers, 1 to sow"],
    [0, [], 2, "2 pulled bags to sow"],
    [0, [], 1, "1 pulled bag to sow"],
    [0, [], 0, "Nothing due today"],
  ])("%i due in %j, %i to sow → %s", (due, stores, toSow, words) => {
    expect(roundHeadline(due, stores, toSow)).toBe(words);
  });
});
