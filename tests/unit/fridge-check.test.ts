import { describe, expect, it } from "vitest";
import { allGoodDraft, isDraftEntered, markAllGood, previewCheck, toggleAction, type BagForCheck, type CheckDraft } from "@/components/check/check-draft";
import { planCheckSave } from "@/components/check/check-save";
import { computePullWindow } from "@/lib/domain/schedule";
import { formatPullWindow } from "@/components/check/sheet-view";
import { starterProtocols } from "@/lib/domain/starter-protocols";
import { mutationTable } from "@/lib/schemas/mutations";

// Showy milkweed: 2–4 weeks of cold-moist at 5 °C (Kaye, starter library). Started 1 Jan 2026 → the pull window
// is 15–29 Jan 2026 (14 and 28 days later, counted on the calendar).
const showy = starterProtocols.find((p) => p.key === "asclepias-speciosa")!;
const window = computePullWindow(showy, "2026-01-01")!;
const bag: BagForCheck = { id: "3f1c9a2e-8d4b-4c1a-9e2f-5b6a7c8d9e01", storeId: "7a2b3c4d-5e6f-4a1b-8c2d-3e4f5a6b7c8d", startedOn: "2026-01-01", state: "chilling", window, nextMoveOn: null };
let n = 0;
const newId = () => `00000000-0000-4000-8000-${String(++n).padStart(12, "0")}`;
const ctx = (over: Partial<Parameters<typeof planCheckSave>[1]> = {}) => ({
  bag,
  now: new Date("2026-01-08T09:30:00Z"),
  today: "2026-01-08",
  unit: "C" as const,
  newId,
  ...over,
});
const draft = (over: Partial<CheckDraft>): CheckDraft => ({ ...allGoodDraft, ...over });

describe("the window the sheet works from", () => {
  it("is 15–29 Jan for showy milkweed started 1 Jan (Kaye: 14–28 days)", () => {
    expect(window).toMatchObject({ opensOn: "2026-01-15", closesOn: "2026-01-29" });
  });
});

describe("All good in one tap", () => {
  it("saves damp with dry corners, clean, no sprouts, and nothing else", () => {
    const r = planCheckSave(allGoodDraft, ctx());
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.plan.check).toMatchObject({ bag_id: bag.id, checked_at: "2026-01-08T09:30:00.000Z", moisture: "damp", mould: "clean", sprouts: "none", actions: [], note: null, temperature_c: null });
    expect(mutationTable["check.record"].args.safeParse(r.plan.check).success).toBe(true);
    expect(r.plan).toMatchObject({ reading: null, pull: null, discard: null });
  });

  it("keeps a note, temperature or action already entered, and forces the findings to all good", () => {
    const draft = markAllGood({ moisture: "soggy", mould: "spots", sprouts: "many", actions: ["blotted"], note: "new towel", temperatureText: "4" });
    expect(draft).toEqual({ moisture: "damp", mould: "clean", sprouts: "none", actions: ["blotted"], note: "new towel", temperatureText: "4" });
  });

  it("previews calm advice and the next check: the day the window opens (weekly cadence, product rule)", () => {
    const p = previewCheck(allGoodDraft, bag, "2026-01-08");
    expect(p.advice.level).toBe("fine");
    expect(p.next).toMatchObject({ on: "2026-01-15", reason: "window_opens" });
    expect(p.nextText).toBe("Next check 2026-01-15: Pull window opens: start daily checks.");
    expect(p.showMouldCaution).toBe(false);
  });

  it("inside the window the next check is tomorrow (daily once the window is open, common practice)", () => {
    const p = previewCheck(allGoodDraft, { ...bag, state: "window_open" }, "2026-01-20");
    expect(p.next).toMatchObject({ on: "2026-01-21", reason: "window_daily" });
  });
});

describe("findings other than all good", () => {
  it("mould spots: the mould caution shows and the bag is looked at again tomorrow (common practice)", () => {
    const p = previewCheck(draft({ mould: "spots" }), bag, "2026-01-08");
    expect(p.showMouldCaution).toBe(true);
    expect(p.advice.level).toBe("attention");
    expect(p.next).toMatchObject({ on: "2026-01-09", reason: "follow_up" });
  });

  it("spreading mould: discard now, with the caution", () => {
    const p = previewCheck(draft({ mould: "spreading" }), bag, "2026-01-08");
    expect(p).toMatchObject({ showMouldCaution: true, advice: { level: "act_now" }, next: { reason: "discard_now", on: "2026-01-08" } });
    expect(p.nextText).toMatch(/^Act today/);
  });

  it("first roots: pull now and sow (sow once radicles show: Forest Research, via lib/domain); the sheet nudges to tick Pulled", () => {
    const p = previewCheck(draft({ sprouts: "first_roots" }), bag, "2026-01-08");
    expect(p.advice.headline).toMatch(/pull now and sow/);
    expect(p).toMatchObject({ suggestPull: true, next: { reason: "pull_now" } });
    const pulled = previewCheck(draft({ sprouts: "first_roots", actions: ["pulled"] }), bag, "2026-01-08");
    expect(pulled).toMatchObject({ suggestPull: false, next: null, nextText: "No more checks: the bag is pulled." });
  });

  it("ticking Pulled also pulls the bag today; Discarded discards it (and wins over Pulled)", () => {
    const pulled = planCheckSave(draft({ sprouts: "many", actions: ["pulled"] }), ctx());
    expect(pulled.ok && pulled.plan.pull).toEqual({ id: bag.id, pulled_on: "2026-01-08" });
    const binned = planCheckSave(draft({ mould: "spreading", actions: ["pulled", "discarded"] }), ctx());
    expect(binned.ok && binned.plan.pull).toBeNull();
    expect(binned.ok && binned.plan.discard).toEqual({ id: bag.id, discarded_on: "2026-01-08", discard_reason: "Mould spreading (found at a check)." });
  });

  it("a bag not yet started has no next check", () => {
    expect(previewCheck(allGoodDraft, { ...bag, state: "planned", startedOn: null }, "2026-01-08").nextText).toBe("No checks until the bag starts chilling.");
  });

  it("toggles actions on and off", () => {
    expect(toggleAction(["blotted"], "added_water")).toEqual(["blotted", "added_water"]);
    expect(toggleAction(["blotted", "added_water"], "blotted")).toEqual(["added_water"]);
  });
});

describe("store temperature at a check", () => {
  it("is stored in °C on the check and as a reading from the check (39 °F = 3.9 °C: (F − 32) × 5/9, NIST SP 811)", () => {
    const r = planCheckSave(draft({ temperatureText: "39 °F" }), ctx());
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.plan.check.temperature_c).toBe(3.9);
    expect(r.plan.reading).toMatchObject({ store_id: bag.storeId, temperature_c: 3.9, origin: "check", check_id: r.plan.check.id, taken_at: r.plan.check.checked_at });
    expect(mutationTable["reading.record"].args.safeParse(r.plan.reading).success).toBe(true);
  });

  it("reads a bare number in the farm's unit", () => {
    const f = planCheckSave(draft({ temperatureText: "41" }), ctx({ unit: "F" }));
    expect(f.ok && f.plan.check.temperature_c).toBe(5); // 41 °F = 5 °C exactly
    const c = planCheckSave(draft({ temperatureText: "−2,5" }), ctx());
    expect(c.ok && c.plan.check.temperature_c).toBe(-2.5);
  });

  it("a bag with no cold store keeps the temperature on the check only", () => {
    const r = planCheckSave(draft({ temperatureText: "4" }), ctx({ bag: { ...bag, storeId: null } }));
    expect(r.ok && r.plan.reading).toBeNull();
    expect(r.ok && r.plan.check.temperature_c).toBe(4);
  });

  it.each([
    ["warm", /not a temperature/],
    ["80", /Hotter than any store/],
    ["-70", /Colder than any store/],
  ])("refuses %j in plain words", (text, message) => {
    const r = planCheckSave(draft({ temperatureText: text }), ctx());
    expect(r).toMatchObject({ ok: false, fields: { temperature: expect.stringMatching(message) } });
  });
});

describe("note", () => {
  it("is trimmed, empty means none, and an overlong one is refused with its limit", () => {
    const r = planCheckSave(draft({ note: "  towel  " }), ctx());
    expect(r.ok && r.plan.check.note).toBe("towel");
    expect(planCheckSave(draft({ note: "   " }), ctx())).toMatchObject({ ok: true, plan: { check: { note: null } } });
    expect(planCheckSave(draft({ note: "x".repeat(2001) }), ctx())).toMatchObject({ ok: false, fields: { note: "Keep it under 2000 characters." } });
  });
});

describe("pull window words", () => {
  it.each([
    [{ opensOn: "2026-01-15", closesOn: "2026-01-29" }, "2026-01-15 – 2026-01-29"],
    [{ opensOn: "2026-02-22", closesOn: "2026-02-22" }, "2026-02-22"],
    [{ opensOn: "2026-01-03", closesOn: null }, "From 2026-01-03, when roots show"],
    [null, "No window (no protocol)"],
  ])("%j reads %j", (w, text) => {
    expect(formatPullWindow(w && { ...w, plannedPullOn: w.opensOn, sourcesDisagree: false }, (d) => d)).toBe(text);
  });
});

describe("pulling and discarding from the sheet: their own step with a date", () => {
  it("a confirmed pull saves the check with its findings, marks it pulled, and pulls on the chosen day", () => {
    const r = planCheckSave(draft({ sprouts: "first_roots", note: "three radicles" }), ctx(), { kind: "pull", on: "2026-01-07" });
    expect(r).toMatchObject({ ok: true, plan: { check: { sprouts: "first_roots", actions: ["pulled"] }, pull: { id: bag.id, pulled_on: "2026-01-07" }, discard: null } });
  });

  it("a confirmed discard keeps the grower's reason, or names spreading mould when none was given", () => {
    const mine = planCheckSave(draft({ mould: "spreading" }), ctx(), { kind: "discard", on: "2026-01-08", reason: "seed rotted" });
    expect(mine).toMatchObject({ ok: true, plan: { check: { actions: ["discarded"] }, discard: { discarded_on: "2026-01-08", discard_reason: "seed rotted" }, pull: null } });
    const none = planCheckSave(draft({ mould: "spreading" }), ctx(), { kind: "discard", on: "2026-01-08", reason: null });
    expect(none).toMatchObject({ ok: true, plan: { discard: { discard_reason: "Mould spreading (found at a check)." } } });
  });

  it("a bad temperature still stops the pull, with its field named", () => {
    expect(planCheckSave(draft({ temperatureText: "warm" }), ctx(), { kind: "pull", on: "2026-01-08" })).toMatchObject({ ok: false, fields: { temperature: expect.any(String) } });
  });

  it("'anything entered' is any finding, action, note, temperature or photo beyond all good", () => {
    expect(isDraftEntered(allGoodDraft)).toBe(false);
    expect(isDraftEntered(allGoodDraft, true)).toBe(true);
    for (const over of [{ moisture: "dry" }, { mould: "spots" }, { sprouts: "many" }, { actions: ["blotted"] }, { note: "x" }, { temperatureText: "4" }] as Partial<CheckDraft>[]) {
      expect(isDraftEntered(draft(over))).toBe(true);
    }
    expect(isDraftEntered(draft({ note: "   " }))).toBe(false);
  });
});
