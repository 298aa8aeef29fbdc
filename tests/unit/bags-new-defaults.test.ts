import { describe, expect, it } from "vitest";
import {
  buildNewBagDraft,
  fillPullWindow,
  generateUniqueBagCode,
  pickDefaultStore,
  pickProtocolForLot,
} from "@/components/bags/new-bag-defaults";
import { parseBagCode } from "@/lib/domain";
import { makeLot, makeProtocolRow, makeStarterRow, makeStore } from "./bags-fixtures";

const showy = makeStarterRow("asclepias-speciosa");
const elder = makeStarterRow("sambucus"); // "Sambucus spp.": 90 days warm then 90 cold (Young & Young 1992)
const strawberry = makeStarterRow("fragaria-vesca"); // 85 days (Univ. of Washington data sheet)
const susan = makeStarterRow("rudbeckia-hirta"); // none required (Native Plant Network)
const ownShowy = makeProtocolRow({ species: "Asclepias speciosa", commonName: "", phases: showy.phases, effectiveBand: null, isFarmOwn: true, noColdReason: "", toxicSeed: null, medicinal: false, note: "" });
const protocols = [showy, elder, strawberry, susan];

describe("pickProtocolForLot", () => {
  const cases: Array<[string, { species: string; protocol_id: string | null }, typeof protocols, string | null]> = [
    ["the lot's own protocol wins", { species: "Asclepias speciosa", protocol_id: strawberry.id }, protocols, strawberry.id],
    ["same species when the lot names none", { species: "Asclepias speciosa", protocol_id: null }, protocols, showy.id],
    ["species match ignores case and spaces", { species: "  asclepias SPECIOSA ", protocol_id: null }, protocols, showy.id],
    ["the farm's own row before the starter row", { species: "Asclepias speciosa", protocol_id: null }, [showy, ownShowy], ownShowy.id],
    ["genus-only lot finds the spp. row", { species: "Sambucus", protocol_id: null }, protocols, elder.id],
    ["a named species finds the genus-wide row", { species: "Sambucus nigra", protocol_id: null }, protocols, elder.id],
    ["another species of a genus does not borrow a species row", { species: "Asclepias tuberosa", protocol_id: null }, protocols, null],
    ["a deleted protocol is skipped", { species: "Asclepias speciosa", protocol_id: null }, [{ ...showy, deleted_at: "2024-01-01T00:00:00Z" }], null],
  ];
  it.each(cases)("%s", (_n, lot, list, want) => {
    expect(pickProtocolForLot(lot, list)?.id ?? null).toBe(want);
  });
});

describe("fillPullWindow", () => {
  it.each([
    // Kaye, Sandlin & Bahm 2018: 2–4 weeks → 14–28 days
    [showy, "2024-01-15", "2024-01-29", "2024-02-12"],
    // Young & Young 1992: 90 warm + 90 cold; 2024-01-15 + 90 = 2024-04-14 (REFERENCES.md), + 90 = 2024-07-13
    [elder, "2024-01-15", "2024-07-13", "2024-07-13"],
    // Univ. of Washington sheet: 85 days; 2023-12-01 + 60 = 2024-01-30 (REFERENCES.md), + 25 = 2024-02-24
    [strawberry, "2023-12-01", "2024-02-24", "2024-02-24"],
    // Native Plant Network: no cold required → no window
    [susan, "2024-01-15", null, null],
  ] as const)("%#: from %s", (protocol, start, opens, closes) => {
    expect(fillPullWindow(protocol, start)).toEqual({ window_start: opens, window_end: closes });
  });
  it("is empty without a start day or protocol", () => {
    expect(fillPullWindow(showy, null)).toEqual({ window_start: null, window_end: null });
    expect(fillPullWindow(null, "2024-01-15")).toEqual({ window_start: null, window_end: null });
  });
});

describe("pickDefaultStore", () => {
  const kitchen = makeStore({ name: "Kitchen fridge", holds_food: true, boxes: ["Door"] });
  const freezer = makeStore({ name: "Chest freezer", kind: "freezer" });
  const barn = makeStore({ name: "Barn fridge", boxes: ["Box A", "Box B"] });
  it.each([
    ["a fridge without food first", [kitchen, freezer, barn], barn],
    ["a food fridge before a freezer", [freezer, kitchen], kitchen],
    ["any store when there is no fridge", [freezer], freezer],
    ["none when the farm has no store", [], null],
  ] as const)("%s", (_n, stores, want) => {
    expect(pickDefaultStore(stores)?.id ?? null).toBe(want?.id ?? null);
  });
});

describe("buildNewBagDraft", () => {
  const barn = makeStore({ name: "Barn fridge", boxes: ["Box A", "Box B"] });
  const shed = makeStore({ name: "Potting-shed fridge", holds_food: true, boxes: ["Crisper"] });
  const lot = makeLot({ species: "Asclepias speciosa" });
  it("starts today with the window from the lot's protocol, the cautious store and its first box", () => {
    expect(buildNewBagDraft({ lot, protocols, stores: [shed, barn], today: "2024-01-15", when: "now" })).toEqual({
      lot_id: lot.id,
      protocol_id: showy.id,
      start_date: "2024-01-15",
      planned_start_date: null,
      window_start: "2024-01-29",
      window_end: "2024-02-12",
      store_id: barn.id,
      box: "Box A",
      medium: "paper_towel",
    });
  });
  it("a planned bag has no start date; its window counts from the planned day", () => {
    const d = buildNewBagDraft({ lot, protocols, stores: [barn], today: "2024-01-15", when: "planned", plannedStartOn: "2024-03-01", storeId: barn.id, medium: "sand" });
    expect(d).toMatchObject({ start_date: null, planned_start_date: "2024-03-01", window_start: "2024-03-15", window_end: "2024-03-29", medium: "sand" });
  });
  it("keeps a chosen store", () => {
    expect(buildNewBagDraft({ lot, protocols, stores: [barn, shed], today: "2024-01-15", when: "now", storeId: shed.id })).toMatchObject({ store_id: shed.id, box: "Crisper" });
  });
  it("no lot yet: nothing filled but the start and store", () => {
    expect(buildNewBagDraft({ lot: null, protocols, stores: [], today: "2024-01-15", when: "now" })).toMatchObject({ lot_id: null, protocol_id: null, window_start: null, store_id: null, box: null });
  });
});

describe("generateUniqueBagCode", () => {
  const bytes = (...seq: number[][]) => {
    let i = 0;
    return () => Uint8Array.from(seq[Math.min(i++, seq.length - 1)]);
  };
  it("makes a code whose check character passes (Crockford base 32, Damm check)", () => {
    const code = generateUniqueBagCode([], bytes([1, 2, 3, 4, 5, 6, 7, 8]));
    expect(code.slice(0, 7)).toBe("1234567");
    expect(parseBagCode(code)).toEqual({ ok: true, code });
  });
  it("skips a code already on the phone, however it was typed", () => {
    const first = generateUniqueBagCode([], bytes([1, 2, 3, 4, 5, 6, 0, 0]));
    const taken = `${first.slice(0, 3).toLowerCase()}-${first.slice(3)}`;
    const next = generateUniqueBagCode([taken], bytes([1, 2, 3, 4, 5, 6, 0, 0], [9, 9, 9, 9, 9, 9, 9, 0]));
    expect(next.slice(0, 7)).toBe("9999999");
  });
  it("gives up with a message instead of looping forever", () => {
    const only = generateUniqueBagCode([], bytes([0, 0, 0, 0, 0, 0, 0, 0]));
    expect(() => generateUniqueBagCode([only], bytes([0, 0, 0, 0, 0, 0, 0, 0]), 3)).toThrow(/unused bag code/);
  });
});
