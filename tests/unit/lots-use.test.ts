import { describe, expect, it } from "vitest";
import { describeLotUse, sortLots, summarizeLotUse } from "@/components/lots/lot-use";
import { makeBag, makeLot } from "./bags-fixtures";

// Invented demo quantities; the rule under test is plain addition of the bags' seed counts.
const lot = makeLot({ species: "Asclepias syriaca", quantity: 420 });
const other = makeLot({ species: "Echinacea purpurea", quantity: null });

describe("summarizeLotUse", () => {
  it.each([
    ["no bags", [], { bags: 0, seedsInBags: 0, bagsWithoutCount: 0, left: 420, overCommitted: false }, "420 seeds, none in bags yet"],
    [
      "three bags, one discarded, one of another lot, one deleted",
      [
        makeBag({ lot_id: lot.id, seed_count: 50 }),
        makeBag({ lot_id: lot.id, seed_count: 60, discarded_on: "2026-01-01" }),
        makeBag({ lot_id: lot.id, seed_count: 10 }),
        makeBag({ lot_id: other.id, seed_count: 500 }),
        makeBag({ lot_id: lot.id, seed_count: 999, deleted_at: "2026-01-02T00:00:00Z" }),
      ],
      { bags: 3, seedsInBags: 120, bagsWithoutCount: 0, left: 300, overCommitted: false },
      "120 of 420 seeds in 3 bags",
    ],
    [
      "a bag without a count",
      [makeBag({ lot_id: lot.id, seed_count: 50 }), makeBag({ lot_id: lot.id, seed_count: null })],
      { bags: 2, seedsInBags: 50, bagsWithoutCount: 1, left: 370, overCommitted: false },
      "50 of 420 seeds in 2 bags (1 without a count)",
    ],
    [
      "more in bags than the lot holds",
      [makeBag({ lot_id: lot.id, seed_count: 400 }), makeBag({ lot_id: lot.id, seed_count: 40 })],
      { bags: 2, seedsInBags: 440, bagsWithoutCount: 0, left: -20, overCommitted: true },
      "440 of 420 seeds in 2 bags",
    ],
  ] as const)("%s", (_n, bags, want, words) => {
    const use = summarizeLotUse(lot, bags);
    expect(use).toEqual(want);
    expect(describeLotUse(lot, use)).toBe(words);
  });

  it("an unknown quantity has nothing left to compare", () => {
    const use = summarizeLotUse(other, [makeBag({ lot_id: other.id, seed_count: 500 })]);
    expect(use).toMatchObject({ left: null, overCommitted: false });
    expect(describeLotUse(other, use)).toBe("500 seeds in 1 bag");
    expect(describeLotUse(other, summarizeLotUse(other, []))).toBe("No bags yet");
  });
});

describe("sortLots", () => {
  it("species, then newest year, then source", () => {
    const a = makeLot({ species: "Asclepias syriaca", year: 2024, source: "B" });
    const b = makeLot({ species: "Asclepias syriaca", year: 2025, source: "Z" });
    const c = makeLot({ species: "asclepias syriaca", year: 2025, source: "A" });
    const d = makeLot({ species: "Allium tricoccum", year: null });
    expect(sortLots([a, b, c, d]).map((l) => l.id)).toEqual([d.id, c.id, b.id, a.id]);
  });
});
