import { describe, expect, it } from "vitest";
import { chooseSheetSteps } from "@/lib/domain/check-choice";
import { allGoodFindings } from "@/lib/schemas/check";
import { buildRoundFromRows, cadenceFor, chipKindOf, dayOfTimestamp, roundChipTones, summarizeRound, urgentChipKinds, type LastCheckRow } from "@/lib/domain/rows/round-input";
import { starterProtocols } from "@/lib/domain/starter-protocols";
import type { Bag } from "@/lib/schemas/bag";
import type { Lot } from "@/lib/schemas/lot";
import type { Store } from "@/lib/schemas/store";
import type { ProtocolRow } from "@/lib/client/db";

// Phone-store rows → lib/domain's round. Windows come from the starter library's published days:
// showy milkweed 14–28 days cold (Kaye); elder 90 days warm then 90 days cold (Young & Young 1992).
const sync = { farm_id: "f", created_at: "2026-01-01T00:00:00Z", updated_at: "2026-01-01T00:00:00Z", seq: 1, deleted_at: null };
const protocolRow = (key: string, id: string): ProtocolRow => {
  const p = starterProtocols.find((s) => s.key === key)!;
  return { ...sync, id, species: p.species, common_name: p.commonName, phases: p.phases, effective_band: p.effectiveBand, no_cold_reason: null, toxic_seed: p.toxicSeed, medicinal: p.medicinal, is_farm_own: false, starter_key: key, source_trial_id: null, note: null };
};
const protocols = [protocolRow("asclepias-speciosa", "p-showy"), protocolRow("sambucus", "p-elder")];
const lots: Lot[] = [
  { ...sync, id: "l-showy", species: "Asclepias speciosa", common_name: "Showy milkweed", source: null, year: 2025, quantity: 100, protocol_id: "p-showy", treated: false, notes: null },
  { ...sync, id: "l-elder", species: "Sambucus canadensis", common_name: "Elderberry", source: null, year: 2025, quantity: 100, protocol_id: "p-elder", treated: false, notes: null },
];
const stores: Store[] = [
  { ...sync, id: "s-barn", name: "Barn fridge", kind: "fridge", boxes: ["Box A", "Box B"], holds_food: false, notes: null },
  { ...sync, id: "s-shed", name: "Shed fridge", kind: "fridge", boxes: [], holds_food: true, notes: null },
];
const bag = (id: string, over: Partial<Bag>): Bag => ({
  ...sync, id, code: id.toUpperCase(), lot_id: "l-showy", protocol_id: null, store_id: "s-barn", box: "Box A", medium: "paper_towel", seed_count: 40,
  start_date: "2026-01-01", planned_start_date: null, window_start: null, window_end: null, pulled_on: null, sown_on: null, discarded_on: null,
  discard_reason: null, trial_arm_id: null, plan_item_id: null, check_every_days: null, note: null, ...over,
});
const check = (bag_id: string, day: string, over: Partial<LastCheckRow> = {}): LastCheckRow => ({ bag_id, checked_at: `${day}T12:00:00`, moisture: "damp", mould: "clean", sprouts: "none", actions: [], ...over });

const today = "2026-01-20"; // inside showy milkweed's 15–29 Jan window for bags started 1 Jan
const bags = [
  bag("opened", {}), // window open, last checked yesterday → daily check today
  bag("mouldy", { box: "Box B" }),
  bag("weekly", { start_date: "2026-01-12" }), // window opens 26 Jan; weekly from 12 Jan is 19 Jan → due (late)
  bag("fresh", { start_date: "2026-01-18" }), // started two days ago: not due
  bag("shed", { store_id: "s-shed", box: null, start_date: "2025-12-01" }), // window 15–29 Dec: overdue
  bag("elder", { lot_id: "l-elder", start_date: "2025-10-23" }), // 90 days warm end 21 Jan: move to cold on 21 Jan, not today
  bag("pulled", { pulled_on: "2026-01-18" }),
  bag("gone", { deleted_at: "2026-01-02T00:00:00Z" }),
];
const lastChecks = new Map<string, LastCheckRow>([
  ["opened", check("opened", "2026-01-19")],
  ["mouldy", check("mouldy", "2026-01-19", { mould: "spots" })],
  ["shed", check("shed", "2026-01-19")],
  ["elder", check("elder", "2026-01-19")],
]);

describe("today's round from the phone store", () => {
  const round = buildRoundFromRows({ bags, lots, protocols, stores }, lastChecks, today);

  it("lists the due bags, mould first, then the overdue pull, then the daily window check and the missed weekly one", () => {
    expect(round.items.map((i) => [i.bag.code, i.next.reason])).toEqual([
      ["MOULDY", "follow_up"],
      ["SHED", "overdue"],
      ["OPENED", "window_daily"],
      ["WEEKLY", "weekly"],
    ]);
    expect(round.items.find((i) => i.bag.code === "WEEKLY")).toMatchObject({ isLate: true, next: { on: "2026-01-19" } });
  });

  it("groups by cold store and box, with the store's name, a stand-in for a missing box, and the species shown", () => {
    expect(round.stores.map((s) => [s.storeName, s.boxes.map((b) => [b.box, b.items.length])])).toEqual([
      ["Barn fridge", [["Box B", 1], ["Box A", 2]]],
      ["Shed fridge", [["No box", 1]]],
    ]);
    expect(round.items[0].bag.species).toBe("Asclepias speciosa (Showy milkweed)");
  });

  it("brings a warm-then-cold bag back on the day it moves to the fridge (Young & Young: 90 days warm)", () => {
    const tomorrow = buildRoundFromRows({ bags, lots, protocols, stores }, lastChecks, "2026-01-21");
    expect(tomorrow.items.find((i) => i.bag.code === "ELDER")?.next).toMatchObject({ reason: "move_to_next_phase", on: "2026-01-21" });
  });

  it("summarizes counts for the chips, a follow-up after mould apart and urgent; work now, a decision and routine each in its own tone", () => {
    expect(summarizeRound(round)).toEqual([
      { kind: "mould_follow_up", label: "Mould spots", count: 1, urgent: true, tone: "act" },
      { kind: "overdue", label: "Past latest pull", count: 1, urgent: true, tone: "act" },
      { kind: "window_daily", label: "Window open", count: 1, urgent: false, tone: "decide" },
      { kind: "weekly", label: "Routine", count: 1, urgent: false, tone: "routine" },
    ]);
  });

  it("each chip has the tone of the cards it counts (the check sheet's own rule)", () => {
    for (const item of round.items) {
      const card = chooseSheetSteps({ state: item.state, findings: allGoodFindings, entered: false, lastCheck: item.bag.lastCheck ?? null });
      expect({ code: item.bag.code, tone: roundChipTones[chipKindOf(item)] }).toEqual({ code: item.bag.code, tone: card.tone });
    }
  });

  it("a window opening is a decision, not trouble: it does not count as needing action first", () => {
    expect(roundChipTones.window_opens).toBe("decide");
    expect(urgentChipKinds.has("window_opens")).toBe(false);
    expect([...urgentChipKinds].sort()).toEqual(["discard_now", "follow_up", "mould_follow_up", "move_to_next_phase", "overdue", "pull_now"]);
  });

  it("uses the farm's weekly rhythm", () => {
    expect(cadenceFor(3).everyDaysBeforeWindow).toBe(3);
    expect(cadenceFor(null).everyDaysBeforeWindow).toBe(7);
    const r = buildRoundFromRows({ bags, lots, protocols, stores }, lastChecks, today, cadenceFor(2));
    expect(r.items.map((i) => i.bag.code)).toContain("FRESH");
  });

  it("dates a check by the phone's calendar", () => {
    expect(dayOfTimestamp("2026-01-19T23:30:00")).toBe("2026-01-19");
  });
});
