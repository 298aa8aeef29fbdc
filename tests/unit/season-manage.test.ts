import { describe, expect, it } from "vitest";
import { describeStoreDelete, explainStoreRefusal } from "@/components/stores/store-delete";
import { describeTrialDelete, pickChangedFields } from "@/components/trials/trial-manage";
import { TrialDetails } from "@/lib/schemas/trial";
import { mutationTable } from "@/lib/schemas/mutations";

// The words and wiring of the store and trial management screens (pure, no DOM). The rules are Rimebook's own.

describe("explainStoreRefusal", () => {
  it.each([
    ["no bags", [], null],
    ["only a pulled bag", [{ code: "K7M4QZX", pulled_on: "2026-12-01" }], null],
    ["a bag chilling", [{ code: "K7M4QZX" }], /^Barn fridge still holds 1 bag not yet pulled, sown or discarded: K7M-4QZX\./],
  ])("%s → %s", (_what, bags, expected) => {
    const said = explainStoreRefusal({ name: "Barn fridge" }, bags);
    if (expected === null) expect(said).toBeNull();
    else expect(said).toMatch(expected);
  });
});

describe("describeStoreDelete", () => {
  it.each([
    [0, "Finished bags that were in it keep their history."],
    [1, "Its 1 temperature reading is kept for the record (they stay in the readings export), and finished bags keep their history."],
    [412, "Its 412 temperature readings are kept for the record (they stay in the readings export), and finished bags keep their history."],
  ])("%i readings → %s", (n, line) => {
    expect(describeStoreDelete(n)[1]).toBe(line);
  });
});

describe("describeTrialDelete", () => {
  it.each([
    [{ armLabels: ["Fridge", "Freezer"], bagsInArms: 0, hasOwnProtocol: false }, ["No bag is in its arms yet.", "The comparison and its arms (Fridge, Freezer) go with it, on every phone once this one syncs."]],
    [{ armLabels: ["A", "B"], bagsInArms: 1, hasOwnProtocol: false }, ["Its 1 bag is not deleted: it keeps its checks, sowings and counts and just stops being compared."]],
    [{ armLabels: ["A", "B", "C"], bagsInArms: 6, hasOwnProtocol: true }, ["Its 6 bags are not deleted: they keep their checks, sowings and counts and just stop being compared.", "The comparison and its arms (A, B, C) go with it, on every phone once this one syncs.", "The farm's own protocol made from this trial stays as it is, with its source written in it."]],
  ])("%j", (input, lines) => {
    expect(describeTrialDelete(input).slice(0, lines.length)).toEqual(lines);
  });
});

describe("pickChangedFields (trial edit)", () => {
  const values = TrialDetails.parse({ name: "Fridge or freezer", lot_id: null, question: "Which is faster?", notes: "" });
  it.each([
    [{}, {}],
    [{ name: true }, { name: "Fridge or freezer" }],
    [{ notes: true }, { notes: null }], // a cleared field is sent as empty, not as ""
    [{ question: true, lot_id: true }, { question: "Which is faster?", lot_id: null }],
  ])("dirty %j → patch %j", (dirty, patch) => {
    expect(pickChangedFields(values, dirty)).toEqual(patch);
  });

  it("gives a patch the trial.update mutation accepts", () => {
    const args = mutationTable["trial.update"].args.parse({ id: crypto.randomUUID(), patch: pickChangedFields(values, { notes: true, name: true }) });
    expect(args.patch).toEqual({ name: "Fridge or freezer", notes: null });
  });

  it("the edit schema refuses an empty name in words", () => {
    const r = TrialDetails.safeParse({ name: "  " });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].message).toBe("Give the trial a name.");
  });
});
