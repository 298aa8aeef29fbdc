import { describe, expect, it } from "vitest";
import { DomainError } from "@/lib/errors";
import { assertStoreCanBeDeleted, bandOfStoreKind, findBagsStillInStore, isBagStillInStore, isOutsideStoreBand, listBagCodes, type BagPlace } from "@/lib/domain/store-rules";

// When a cold store may be deleted: the rule the phone and the server both run. The bag states follow
// PRODUCT.md (planned → chilling → window open → pulled → sown; or discarded); the rule itself is Rimebook's own.

const bag = (code: string, over: Partial<BagPlace> = {}): BagPlace => ({ code, pulled_on: null, sown_on: null, discarded_on: null, deleted_at: null, ...over });

describe("isBagStillInStore", () => {
  it.each([
    ["chilling (no dates)", bag("K7M4QZX"), true],
    ["planned, not started yet", bag("K7M4QZX", {}), true],
    ["pulled", bag("K7M4QZX", { pulled_on: "2026-12-01" }), false],
    ["sown (pull date not typed)", bag("K7M4QZX", { sown_on: "2026-12-02" }), false],
    ["discarded for mould", bag("K7M4QZX", { discarded_on: "2026-11-20" }), false],
    ["deleted", bag("K7M4QZX", { deleted_at: "2026-11-21T10:00:00.000Z" }), false],
    ["fields missing on an old phone row", { code: "K7M4QZX" }, true],
  ])("%s → %s", (_what, b, expected) => {
    expect(isBagStillInStore(b)).toBe(expected);
  });
});

describe("findBagsStillInStore", () => {
  it("keeps only bags still in the cold, in code order", () => {
    const bags = [bag("ZZZ1111"), bag("AAA2222", { pulled_on: "2026-12-01" }), bag("BBB3333"), bag("CCC4444", { discarded_on: "2026-11-02" })];
    expect(findBagsStillInStore(bags).map((b) => b.code)).toEqual(["BBB3333", "ZZZ1111"]);
  });
});

describe("listBagCodes", () => {
  it.each([
    [["K7M4QZX"], "K7M-4QZX"],
    [["K7M4QZX", "A1B2C3D"], "K7M-4QZX, A1B-2C3D"],
    [Array.from({ length: 10 }, (_, i) => `AAAA${i}00`), "AAA-A000, AAA-A100, AAA-A200, AAA-A300, AAA-A400, AAA-A500, AAA-A600, AAA-A700 and 2 more"],
  ])("%j → %s", (codes, words) => {
    expect(listBagCodes(codes.map((c) => bag(c)))).toBe(words);
  });
});

describe("assertStoreCanBeDeleted", () => {
  it.each([
    ["no bags at all", []],
    ["only finished bags", [bag("A1B2C3D", { pulled_on: "2026-12-01" }), bag("K7M4QZX", { sown_on: "2026-12-03" }), bag("Q9R8S7T", { discarded_on: "2026-11-30" })]],
    ["a deleted bag", [bag("A1B2C3D", { deleted_at: "2026-11-01T00:00:00.000Z" })]],
  ])("allows deleting a store with %s", (_what, bags) => {
    expect(() => assertStoreCanBeDeleted("Barn fridge", bags)).not.toThrow();
  });

  it.each([
    ["one bag chilling", [bag("K7M4QZX"), bag("A1B2C3D", { pulled_on: "2026-12-01" })], /Barn fridge still holds 1 bag not yet pulled, sown or discarded: K7M-4QZX\. Move it to another cold store first/],
    ["two bags, one planned", [bag("K7M4QZX"), bag("A1B2C3D")], /still holds 2 bags .*: A1B-2C3D, K7M-4QZX\. Move them/],
  ])("refuses a store with %s, naming the bags", (_what, bags, message) => {
    let thrown: unknown;
    try {
      assertStoreCanBeDeleted("Barn fridge", bags);
    } catch (e) {
      thrown = e;
    }
    expect(thrown).toBeInstanceOf(DomainError);
    expect((thrown as DomainError).message).toMatch(message);
    expect((thrown as DomainError).status).toBe(422);
  });
});

describe("each store against its own band", () => {
  // US FDA food-safety guidance: fridge at or below 4 °C, freezer at −18 °C (0 °F); the product's default cold
  // band is 0–10 °C (REFERENCES: stratification tables). The freezer's −25 to −12 °C allowance is common practice.
  it.each([
    ["fridge", 3, false],
    ["fridge", 12, true],
    ["fridge", -1, true],
    ["freezer", -18.8, false], // a chest freezer where it should be: in band, not red
    ["freezer", -18, false],
    ["freezer", -5, true], // thawing
    ["cold_frame", -9, false], // the weather is the treatment
    ["cold_frame", 14, false],
  ] as const)("%s at %d °C: outside = %s", (kind, c, outside) => {
    expect(isOutsideStoreBand(kind, c)).toBe(outside);
  });

  it("a cold frame has no band; a freezer's is below zero", () => {
    expect(bandOfStoreKind("cold_frame")).toBeNull();
    expect(bandOfStoreKind("freezer")!.maxC).toBeLessThan(0);
    expect(bandOfStoreKind("fridge")).toEqual({ minC: 0, maxC: 10 });
  });
});
