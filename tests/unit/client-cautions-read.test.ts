import "fake-indexeddb/auto";
import { describe, expect, it } from "vitest";
import { RimebookDB } from "@/lib/client/db";
import { loadReadCautions, markCautionsRead } from "@/lib/client/cautions-read";
import { pickBagCautions } from "@/components/check/bag-cautions";

describe("cautions a person has read, remembered on the phone", () => {
  it("are kept per person, per farm and per bag", async () => {
    const db = new RimebookDB(`cautions-${crypto.randomUUID()}`);
    const tomas = { userId: "u-tomas", farmId: "f-1" };
    await markCautionsRead(db, tomas, "bag-a", ["toxic", "foodFridge"]);
    await markCautionsRead(db, tomas, "bag-a", ["toxic"]); // reading twice changes nothing
    expect([...(await loadReadCautions(db, tomas, "bag-a"))].sort()).toEqual(["foodFridge", "toxic"]);
    expect((await loadReadCautions(db, tomas, "bag-b")).size).toBe(0);
    expect((await loadReadCautions(db, { userId: "u-ada", farmId: "f-1" }, "bag-a")).size).toBe(0);
    expect((await loadReadCautions(db, { userId: "u-tomas", farmId: "f-2" }, "bag-a")).size).toBe(0);
    // A bag id that starts like another is not mistaken for it.
    await markCautionsRead(db, tomas, "bag-a2", ["treated"]);
    expect([...(await loadReadCautions(db, tomas, "bag-a"))].sort()).toEqual(["foodFridge", "toxic"]);
  });
});

describe("which cautions a bag carries", () => {
  // Common practice (seed suppliers' and extension services' handling advice): treated and toxic seed are kept
  // away from food; the separate "this fridge and food" caution is for a store that also holds food.
  it("the fridge-and-food caution only for a store that holds food", () => {
    const keys = (f: Parameters<typeof pickBagCautions>[0]) => pickBagCautions(f).map((c) => c.key);
    expect(keys({ species: "Carex grayi", treated: true, storeHoldsFood: false })).toEqual(["treated"]);
    expect(keys({ species: "Carex grayi", treated: true, storeHoldsFood: true })).toEqual(["treated", "foodFridge"]);
    expect(keys({ species: "Carex grayi", storeHoldsFood: false })).not.toContain("foodFridge");
  });
});
