import { describe, expect, it } from "vitest";
import { chooseSheetSteps, type SheetChoiceInput } from "@/lib/domain/check-choice";
import type { BagState } from "@/lib/schemas/vocabulary";

// The first action on a check sheet, by the bag's state and what was found. The rules are the product's
// (issue: the check sheet follows the bag); the growing advice behind them is common practice: pull as soon as
// the first roots show, discard a bag where mould spreads, and check daily once the pull window is open.

const allGood = { moisture: "damp", mould: "clean", sprouts: "none" } as const;
const input = (state: BagState, over: Partial<SheetChoiceInput> = {}): SheetChoiceInput => ({ state, findings: allGood, entered: false, lastCheck: null, ...over });

describe("the first, largest action on the check sheet", () => {
  it.each<[string, SheetChoiceInput, string[], string[], string]>([
    ["chilling, nothing entered: All good in one tap", input("chilling"), ["all_good"], [], "routine"],
    ["window open, nothing entered: keep chilling or pull, side by side", input("window_open"), ["keep_chilling", "pull"], [], "decide"],
    ["past the latest pull: pull first", input("overdue"), ["pull"], ["save"], "act"],
    ["first roots found: pull first", input("chilling", { findings: { ...allGood, sprouts: "first_roots" }, entered: true }), ["pull"], ["save"], "act"],
    ["many sprouts in the window: pull first", input("window_open", { findings: { ...allGood, sprouts: "many" }, entered: true }), ["pull"], ["save"], "act"],
    ["spreading mould: discard first", input("chilling", { findings: { ...allGood, mould: "spreading" }, entered: true }), ["discard"], ["save"], "trouble"],
    ["spreading mould beats roots", input("window_open", { findings: { moisture: "soggy", mould: "spreading", sprouts: "first_roots" }, entered: true }), ["discard"], ["save"], "trouble"],
    ["spreading mould on an overdue bag: discard, not pull", input("overdue", { findings: { ...allGood, mould: "spreading" }, entered: true }), ["discard"], ["save"], "trouble"],
    ["soggy found: Save check replaces All good", input("chilling", { findings: { ...allGood, moisture: "soggy" }, entered: true }), ["save"], [], "act"],
    ["dry found in the window: Save check, pull still offered", input("window_open", { findings: { ...allGood, moisture: "dry" }, entered: true }), ["save"], ["pull"], "act"],
    ["only a note entered: Save check", input("chilling", { entered: true }), ["save"], [], "routine"],
    ["last check saw spreading mould: discard first", input("chilling", { lastCheck: { moisture: "damp", mould: "spreading", sprouts: "none" } }), ["discard"], ["save"], "trouble"],
    ["last check saw roots: pull first", input("window_open", { lastCheck: { moisture: "damp", mould: "clean", sprouts: "first_roots" } }), ["pull"], ["save"], "act"],
    ["last check soggy, nothing entered: All good stays, the card reads as work to do", input("chilling", { lastCheck: { moisture: "soggy", mould: "clean", sprouts: "none" } }), ["all_good"], [], "act"],
    ["planned: nothing due", input("planned"), [], ["save"], "closed"],
    ["pulled: nothing due", input("pulled"), [], ["save"], "closed"],
    ["sown, something entered: Save check", input("sown", { entered: true }), ["save"], [], "closed"],
  ])("%s", (_name, given, first, then, tone) => {
    const choice = chooseSheetSteps(given);
    expect(choice.first).toEqual(first);
    expect(choice.then).toEqual(then);
    expect(choice.tone).toBe(tone);
    expect(choice.why.length).toBeGreaterThan(10);
  });

  it("never offers All good first when anything was entered, or on a bag in trouble", () => {
    const states: BagState[] = ["planned", "chilling", "window_open", "overdue", "pulled", "sown", "discarded"];
    const moistures = ["dry", "damp", "soggy"] as const;
    const moulds = ["clean", "spots", "spreading"] as const;
    const sprouts = ["none", "first_roots", "many"] as const;
    for (const state of states)
      for (const moisture of moistures)
        for (const mould of moulds)
          for (const sprout of sprouts)
            for (const entered of [false, true]) {
              const findings = entered ? { moisture, mould, sprouts: sprout } : allGood;
              const lastCheck = entered ? null : { moisture, mould, sprouts: sprout };
              const c = chooseSheetSteps({ state, findings, entered, lastCheck });
              const allGoodFirst = c.first.includes("all_good") || c.first.includes("keep_chilling");
              const trouble = (entered ? mould : lastCheck?.mould) === "spreading" || (entered ? sprout : lastCheck?.sprouts) !== "none" || state === "overdue";
              if (entered || trouble) expect(allGoodFirst, `${state} ${moisture} ${mould} ${sprout} entered=${entered}`).toBe(false);
            }
  });
});
