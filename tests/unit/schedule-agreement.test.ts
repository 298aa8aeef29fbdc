import { describe, expect, it } from "vitest";
import { Temporal } from "@js-temporal/polyfill";
import { buildBagRows, describeRowWindow, matchesWindowFilter, type BagRowSources, type ReadingRow, type WindowClock } from "@/lib/domain/rows/bag-rows";
import { buildRoundFromRows, toRoundBag, type LastCheckRow } from "@/lib/domain/rows/round-input";
import { scheduleBagCheck } from "@/lib/domain/round";
import { starterProtocols } from "@/lib/domain/starter-protocols";
import { describeSheet } from "@/components/check/sheet-view";
import { allGoodDraft, previewCheck } from "@/components/check/check-draft";
import { buildLabels } from "@/components/labels/label-data";
import { formatShortDay } from "@/components/bags/format-day";
import { measureBagCold } from "@/components/stores/store-metrics";
import type { Bag } from "@/lib/schemas/bag";
import type { Lot } from "@/lib/schemas/lot";
import type { Store } from "@/lib/schemas/store";
import type { ProtocolRow } from "@/lib/client/db";

// A bag whose window moved must read the same on every screen: the bags table's row, Today's round, the check
// sheet, the bag page's next check and the printed label. Showy milkweed 14–28 days cold-moist at 5 °C (Kaye,
// Sandlin & Bahm 2018), started 1 Jan 2026: planned window 15–29 Jan. The barn fridge was at 12 °C for two days
// (invented readings), above the product's default 0–10 °C band (REFERENCES.md): the window moves 2 days, to 17–31 Jan.

const sync = { farm_id: "f", created_at: "2026-01-01T00:00:00Z", updated_at: "2026-01-01T00:00:00Z", seq: 1, deleted_at: null };
const starter = starterProtocols.find((s) => s.key === "asclepias-speciosa")!;
const protocol: ProtocolRow = {
  ...sync, id: "p-showy", species: starter.species, common_name: starter.commonName, phases: starter.phases, effective_band: starter.effectiveBand,
  no_cold_reason: null, toxic_seed: starter.toxicSeed, medicinal: starter.medicinal, is_farm_own: false, starter_key: starter.key, source_trial_id: null, note: null,
};
const lot: Lot = { ...sync, id: "l-showy", species: "Asclepias speciosa", common_name: "Showy milkweed", source: "Hollow Lane", year: 2025, quantity: 100, protocol_id: "p-showy", treated: false, notes: null };
const stores: Store[] = [
  { ...sync, id: "s-barn", name: "Barn fridge", kind: "fridge", boxes: ["Box A"], holds_food: false, notes: null },
  { ...sync, id: "s-shed", name: "Shed fridge", kind: "fridge", boxes: [], holds_food: false, notes: null },
];
const bag = (id: string, over: Partial<Bag> = {}): Bag => ({
  ...sync, id, code: id.toUpperCase(), lot_id: "l-showy", protocol_id: null, store_id: "s-barn", box: "Box A", medium: "paper_towel", seed_count: 40,
  start_date: "2026-01-01", planned_start_date: null, window_start: null, window_end: null, pulled_on: null, sown_on: null, discarded_on: null,
  discard_reason: null, trial_arm_id: null, plan_item_id: null, check_every_days: null, note: null, ...over,
});

/** Every 6 h from 25 Dec to 20 Jan; the barn fridge at 12 °C from 5 Jan 00:00 to 7 Jan 00:00, else 4 °C. */
function readingsOf(storeId: string, warm: boolean): ReadingRow[] {
  const out: ReadingRow[] = [];
  for (let t = Date.parse("2025-12-25T00:00:00Z"); t < Date.parse("2026-01-20T00:00:00Z"); t += 6 * 3_600_000) {
    const at = new Date(t).toISOString();
    out.push({ store_id: storeId, taken_at: at, temperature_c: warm && at >= "2026-01-05T00:00:00Z" && at < "2026-01-07T00:00:00Z" ? 12 : 4, deleted_at: null });
  }
  return out;
}

const bags = [bag("warm"), bag("cool", { store_id: "s-shed", box: null }), bag("own", { store_id: "s-shed", box: null, start_date: "2026-01-12", check_every_days: 2 })];
const sources: BagRowSources = { bags, lots: [lot], protocols: [protocol], stores, readings: [...readingsOf("s-barn", true), ...readingsOf("s-shed", false)] };
const lastChecks = new Map<string, LastCheckRow>([
  ["warm", { bag_id: "warm", checked_at: "2026-01-14T12:00:00", moisture: "damp", mould: "clean", sprouts: "none", actions: [] }],
  ["cool", { bag_id: "cool", checked_at: "2026-01-15T12:00:00", moisture: "damp", mould: "clean", sprouts: "none", actions: [] }],
]);
const today = "2026-01-16";
const clockFor = (day: string): WindowClock => ({ asOf: Date.parse(`${day}T09:00:00Z`), startOfDay: (d) => Date.parse(`${d}T00:00:00Z`) });
const plus = (day: string, n: number) => Temporal.PlainDate.from(day).add({ days: n }).toString();

describe("a bag whose window moved reads the same everywhere", () => {
  const rows = buildBagRows(sources, today, clockFor(today));
  const warm = rows.find((r) => r.id === "warm")!;
  const cool = rows.find((r) => r.id === "cool")!;

  it("bags table row: chilling, window 17–31 Jan (2 days later), the planned one kept beside it", () => {
    expect(warm).toMatchObject({ state: "chilling", lostColdDays: 2, windowBasis: "shifted", window: { opensOn: plus("2026-01-15", 2), closesOn: plus("2026-01-29", 2) } });
    expect(warm.plannedWindow).toMatchObject({ opensOn: "2026-01-15", closesOn: "2026-01-29" });
    expect(warm.windowNote).toMatch(/About 2 days of cold lost/);
    expect(describeRowWindow(warm, formatShortDay)).toBe("Opens 17 Jan, 2 days later: cold lost");
    expect(describeRowWindow(cool, formatShortDay)).toBe("Open until 29 Jan");
    expect(matchesWindowFilter(warm, "open_now", today)).toBe(false);
    expect(matchesWindowFilter(warm, "opens_this_week", today)).toBe(true);
    // The same bag in a fridge that held its band: the planned window, open since 15 Jan.
    expect(cool).toMatchObject({ state: "window_open", lostColdDays: 0, windowBasis: "kept_cold", window: { opensOn: "2026-01-15" } });
  });

  it("store page: the same moved window and the same two days lost, beside the fridge's hours", () => {
    const cold = measureBagCold(bags[0], protocol, readingsOf("s-barn", true), "fridge", today);
    expect(cold.shifted).toEqual(warm.window);
    expect(cold.window).toEqual(warm.plannedWindow);
    expect(cold.lostDays).toBe(warm.lostColdDays);
    expect(cold.exposure?.lostDays).toBe(2);
  });

  it("Today's round: the moved bag is not due before its window opens, and opens on 17 Jan", () => {
    const round = buildRoundFromRows(sources, lastChecks, today, undefined, clockFor(today));
    expect(round.items.map((i) => [i.bag.code, i.state, i.next.reason])).toEqual([
      ["COOL", "window_open", "window_daily"],
      ["OWN", "chilling", "weekly"],
    ]);
    const next = buildRoundFromRows(sources, lastChecks, "2026-01-17", undefined, clockFor("2026-01-17"));
    expect(next.items.find((i) => i.bag.code === "WARM")).toMatchObject({ state: "window_open", next: { on: "2026-01-17", reason: "window_opens" } });
  });

  it("the bag's own rhythm (every 2 days) reaches the round from its row", () => {
    const own = buildRoundFromRows(sources, lastChecks, today, undefined, clockFor(today)).items.find((i) => i.bag.code === "OWN")!;
    expect(own.next).toMatchObject({ on: plus("2026-01-12", 2), note: "Routine check (this bag: every 2 days)." });
    expect(own.isLate).toBe(true);
  });

  it("check sheet: the same state and window, and after 'all good' on 12 Jan the next check is 17 Jan, not 15 Jan", () => {
    const sheet = { bag: bags[0], lot, protocol, store: stores[0], lastCheck: null, readings: readingsOf("s-barn", true) };
    expect(describeSheet(sheet, today, clockFor(today))!.row).toEqual(warm);
    const view = describeSheet(sheet, "2026-01-12", clockFor("2026-01-12"))!;
    expect(view.row.state).toBe("chilling");
    expect(view.forCheck.window).toEqual(warm.window);
    expect(previewCheck(allGoodDraft, view.forCheck, "2026-01-12").next).toMatchObject({ on: "2026-01-17", reason: "window_opens" });
  });

  it("bag page: its next check is the round's", () => {
    const single = scheduleBagCheck(toRoundBag(warm, bags[0], lastChecks.get("warm")!), today);
    expect(single).toEqual({ state: "chilling", next: { on: "2026-01-17", reason: "window_opens", note: "Pull window opens: start daily checks." } });
  });

  it("label: prints the moved window", () => {
    const [label] = buildLabels([warm], { lots: [lot], protocols: [protocol], bags }, "https://rimebook.example");
    expect(label.windowText).toBe("Pull 17 Jan – 31 Jan");
  });

  it("without the readings every screen falls back to the planned window (and says it assumed the store held its band)", () => {
    const planned = buildBagRows({ ...sources, readings: [] }, today, clockFor(today)).find((r) => r.id === "warm")!;
    expect(planned).toMatchObject({ state: "window_open", windowBasis: "no_readings", window: { opensOn: "2026-01-15" } });
    expect(planned.windowNote).toMatch(/assuming the store held 0\.0 °C to 10\.0 °C/);
  });
});
