import { describe, expect, it } from "vitest";
import {
  buildBagRows,
  compareBagRows,
  defaultBagFilters,
  emptyBagFilters,
  filterBagRows,
  matchesWindowFilter,
  sortBagRows,
  toggleChip,
  type BagFilters,
  type BagRow,
  type BagSortKey,
} from "@/lib/domain/rows/bag-rows";
import { makeBag, makeLot, makeStarterRow, makeStore } from "./bags-fixtures";

// Windows come from the starter rows and their published sources:
// Asclepias speciosa 2–4 weeks at 5 °C (Kaye, Sandlin & Bahm 2018) → 14–28 days;
// Lavandula angustifolia ≥ 4 weeks at 4 °C, no upper limit (Dobrowolska & Zawadzińska) → 28 days, open-ended.
// Calendar arithmetic cross-checked by hand against REFERENCES.md's style (2024-01-15 + 14 = 2024-01-29).

const today = "2024-02-05";
const showy = makeStarterRow("asclepias-speciosa");
const lavender = makeStarterRow("lavandula-angustifolia");
const showyLot = makeLot({ species: "Asclepias speciosa", common_name: "Showy milkweed", protocol_id: showy.id });
const lavLot = makeLot({ species: "Lavandula angustifolia", protocol_id: lavender.id });
const barn = makeStore({ name: "Barn fridge", boxes: ["Box A", "Box B"] });
const shed = makeStore({ name: "Potting-shed fridge", holds_food: true });

const bags = [
  // window 2024-01-29 – 2024-02-12: open today
  makeBag({ code: "AAAAAA0", lot_id: showyLot.id, store_id: barn.id, box: "Box B", start_date: "2024-01-15" }),
  // window 2024-02-08 – 2024-02-22: chilling, opens in 3 days
  makeBag({ code: "BBBBBB0", lot_id: showyLot.id, store_id: barn.id, box: "Box A", start_date: "2024-01-25" }),
  // window 2023-12-15 – 2023-12-29: overdue
  makeBag({ code: "CCCCCC0", lot_id: showyLot.id, store_id: shed.id, start_date: "2023-12-01" }),
  // lavender 28 days, no upper limit: opens 2024-01-29, never overdue
  makeBag({ code: "DDDDDD0", lot_id: lavLot.id, store_id: shed.id, start_date: "2024-01-01" }),
  // planned, no start date yet
  makeBag({ code: "EEEEEE0", lot_id: lavLot.id, store_id: barn.id, planned_start_date: "2024-03-01" }),
  makeBag({ code: "FFFFFF0", lot_id: showyLot.id, store_id: barn.id, start_date: "2023-11-01", pulled_on: "2023-11-20" }),
  makeBag({ code: "GGGGGG0", lot_id: showyLot.id, store_id: barn.id, start_date: "2023-11-01", discarded_on: "2023-11-10" }),
  makeBag({ code: "HHHHHH0", lot_id: lavLot.id, store_id: barn.id, start_date: "2023-11-01", deleted_at: "2024-01-02T00:00:00Z" }),
];

const rows = buildBagRows({ bags, lots: [showyLot, lavLot], protocols: [showy, lavender], stores: [barn, shed] }, today);
const byCode = (code: string) => rows.find((r) => r.code === code)!;
const codes = (rs: BagRow[]) => rs.map((r) => r.code);

describe("buildBagRows", () => {
  it.each([
    // code, state, opens, closes (Kaye et al. 2018: 14–28 days; Dobrowolska & Zawadzińska: 28 days, no limit)
    ["AAAAAA0", "window_open", "2024-01-29", "2024-02-12"],
    ["BBBBBB0", "chilling", "2024-02-08", "2024-02-22"],
    ["CCCCCC0", "overdue", "2023-12-15", "2023-12-29"],
    ["DDDDDD0", "window_open", "2024-01-29", null],
    ["FFFFFF0", "pulled", "2023-11-15", "2023-11-29"],
    ["GGGGGG0", "discarded", "2023-11-15", "2023-11-29"],
  ] as const)("%s is %s with window %s – %s", (code, state, opens, closes) => {
    const r = byCode(code);
    expect(r.state).toBe(state);
    expect(r.window?.opensOn).toBe(opens);
    expect(r.window?.closesOn).toBe(closes);
  });

  it("computes a planned bag without a window and leaves deleted bags out", () => {
    expect(byCode("EEEEEE0").state).toBe("planned");
    expect(byCode("EEEEEE0").window).toBeNull();
    expect(rows.find((r) => r.code === "HHHHHH0")).toBeUndefined();
    expect(rows).toHaveLength(7);
  });

  it("falls back to the stored window when the bag has no protocol", () => {
    const lot = makeLot({ species: "Unlisted species" });
    const bag = makeBag({ code: "JJJJJJ0", lot_id: lot.id, start_date: "2024-01-01", window_start: "2024-02-01", window_end: "2024-02-10" });
    const [row] = buildBagRows({ bags: [bag], lots: [lot], protocols: [], stores: [] }, today);
    expect(row.window).toMatchObject({ opensOn: "2024-02-01", closesOn: "2024-02-10" });
    expect(row.state).toBe("window_open");
    expect(row.storeName).toBe("No store");
  });

  it("shows codes split for reading aloud", () => {
    expect(byCode("AAAAAA0").codeShown).toBe("AAA-AAA0");
  });
});

describe("filterBagRows", () => {
  const cases: Array<[string, Partial<BagFilters>, string[]]> = [
    ["no filter", {}, ["AAAAAA0", "BBBBBB0", "CCCCCC0", "DDDDDD0", "EEEEEE0", "FFFFFF0", "GGGGGG0"]],
    // Everything still needing a person: pulled-not-sown (FFFFFF0) stays in view; discarded (GGGGGG0) does not.
    ["states needing a person (the default)", { states: defaultBagFilters.states }, ["AAAAAA0", "BBBBBB0", "CCCCCC0", "DDDDDD0", "EEEEEE0", "FFFFFF0"]],
    ["window open", { states: ["window_open"] }, ["AAAAAA0", "DDDDDD0"]],
    ["store: shed", { storeIds: [shed.id] }, ["CCCCCC0", "DDDDDD0"]],
    ["species: lavender", { species: ["Lavandula angustifolia"] }, ["DDDDDD0", "EEEEEE0"]],
    ["two chips in one group are OR", { states: ["overdue", "planned"] }, ["CCCCCC0", "EEEEEE0"]],
    ["chips in different groups are AND", { states: ["window_open"], storeIds: [barn.id] }, ["AAAAAA0"]],
    ["window opens within 7 days", { window: "opens_this_week" }, ["BBBBBB0"]],
    ["window open now", { window: "open_now" }, ["AAAAAA0", "DDDDDD0"]],
    ["window closes within 7 days (02-12 is today + 7)", { window: "closes_this_week" }, ["AAAAAA0"]],
    ["past latest pull", { window: "past_latest" }, ["CCCCCC0"]],
    ["no window", { window: "no_window" }, ["EEEEEE0"]],
    ["text: code typed with a hyphen, any case", { text: "aaa-aaa" }, ["AAAAAA0"]],
    ["text: common name", { text: "showy" }, ["AAAAAA0", "BBBBBB0", "CCCCCC0", "FFFFFF0", "GGGGGG0"]],
    ["text: box", { text: "box a" }, ["BBBBBB0"]],
  ];
  it.each(cases)("%s", (_name, f, expected) => {
    expect(codes(filterBagRows(rows, { ...emptyBagFilters, ...f }, today))).toEqual(expected);
  });

  it("closes within 7 days counts the last day inclusive", () => {
    expect(matchesWindowFilter(byCode("AAAAAA0"), "closes_this_week", "2024-02-05")).toBe(true); // closes 02-12 = today + 7
    expect(matchesWindowFilter(byCode("AAAAAA0"), "closes_this_week", "2024-02-04")).toBe(false);
  });
});

describe("sortBagRows", () => {
  const cases: Array<[BagSortKey, boolean, string[]]> = [
    ["code", false, ["AAAAAA0", "BBBBBB0", "CCCCCC0", "DDDDDD0", "EEEEEE0", "FFFFFF0", "GGGGGG0"]],
    ["code", true, ["GGGGGG0", "FFFFFF0", "EEEEEE0", "DDDDDD0", "CCCCCC0", "BBBBBB0", "AAAAAA0"]],
    // by opening day; the planned bag has no window and goes last
    ["window", false, ["FFFFFF0", "GGGGGG0", "CCCCCC0", "AAAAAA0", "DDDDDD0", "BBBBBB0", "EEEEEE0"]],
    // overdue first, then open windows (earliest first), chilling, planned, pulled, discarded
    ["state", false, ["CCCCCC0", "AAAAAA0", "DDDDDD0", "BBBBBB0", "EEEEEE0", "FFFFFF0", "GGGGGG0"]],
    ["species", false, ["AAAAAA0", "BBBBBB0", "CCCCCC0", "FFFFFF0", "GGGGGG0", "DDDDDD0", "EEEEEE0"]],
    // Barn fridge: "" box < Box A < Box B; then the shed
    ["store", false, ["EEEEEE0", "FFFFFF0", "GGGGGG0", "BBBBBB0", "AAAAAA0", "CCCCCC0", "DDDDDD0"]],
    ["started", false, ["FFFFFF0", "GGGGGG0", "CCCCCC0", "DDDDDD0", "AAAAAA0", "BBBBBB0", "EEEEEE0"]],
  ];
  it.each(cases)("by %s (descending: %s)", (key, desc, expected) => {
    expect(codes(sortBagRows(rows, key, desc))).toEqual(expected);
  });

  it("is a consistent comparison (antisymmetric)", () => {
    for (const key of ["window", "state", "species", "store", "code", "started"] as const) {
      for (const a of rows) for (const b of rows) expect(Math.sign(compareBagRows(key, a, b))).toBe(-Math.sign(compareBagRows(key, b, a)) || 0);
    }
  });
});

describe("toggleChip", () => {
  it.each([
    [["a"], "b", ["a", "b"]],
    [["a", "b"], "a", ["b"]],
    [[], "a", ["a"]],
  ])("%j toggling %s gives %j", (from, v, to) => {
    expect(toggleChip(from, v)).toEqual(to);
  });
});
