import { describe, expect, it } from "vitest";
import { buildChartPoints, describeBand, describeStoreColdLoss, measureBagCold } from "@/components/stores/store-metrics";
import type { ProtocolForPlan } from "@/lib/domain/schedule";
import type { ProtocolRow } from "@/lib/client/db";

const cold30: ProtocolForPlan = {
  species: "Hypericum perforatum",
  phases: [{ kind: "cold_moist", note: "", sources: [{ citation: "Proc. Fla. State Hort. Soc.", minDays: 30, maxDays: 30, band: null, note: "" }] }],
  effectiveBand: null,
};

// A reading every 6 h from `fromDay` for `days` days at `c` °C, with an optional warm spell (hours since start).
function readings(fromDay: string, days: number, c: number, warm?: { fromH: number; toH: number; c: number }) {
  const start = new Date(`${fromDay}T00:00:00`).getTime();
  const out = [];
  for (let h = 0; h <= days * 24; h += 6) {
    const inWarm = warm && h >= warm.fromH && h < warm.toH;
    out.push({ taken_at: new Date(start + h * 3_600_000).toISOString(), temperature_c: inWarm ? warm.c : c });
  }
  return out;
}

const sync = { farm_id: "f", created_at: "2025-12-01T00:00:00Z", updated_at: "2025-12-01T00:00:00Z", seq: 1, deleted_at: null };
const cold30Row: ProtocolRow = {
  ...sync, id: "p-30", species: cold30.species, common_name: null, phases: cold30.phases as ProtocolRow["phases"], effective_band: null,
  no_cold_reason: null, toxic_seed: null, medicinal: false, is_farm_own: true, starter_key: null, source_trial_id: null, note: null,
};
const pulledBag = { start_date: "2026-01-01", pulled_on: "2026-01-31", sown_on: null, discarded_on: null, window_start: null, window_end: null, store_id: "s" };

describe("measureBagCold: effective cold days and the shifted window, as every other screen shows them", () => {
  it.each([
    { name: "a steady 4 °C fridge (FDA: at or below 4 °C) loses nothing", kind: "fridge" as const, warm: undefined, lost: 0, opens: "2026-01-31" },
    // 48 h at 12 °C is above the default 0–10 °C band: two days lost, the window moves two days later.
    { name: "two days at 12 °C in a fridge move the window by two days", kind: "fridge" as const, warm: { fromH: 240, toH: 288, c: 12 }, lost: 2, opens: "2026-02-02" },
    { name: "three days frozen at −18 °C in a fridge (below the band) move it by three", kind: "fridge" as const, warm: { fromH: 240, toH: 312, c: -18 }, lost: 3, opens: "2026-02-03" },
    // In a freezer, freezing is the treatment: the window stays as planned and no band hours are claimed.
    { name: "the same −18 °C in a freezer moves nothing", kind: "freezer" as const, warm: { fromH: 240, toH: 312, c: -18 }, lost: 0, opens: "2026-01-31" },
  ])("$name", ({ kind, warm, lost, opens }) => {
    const r = measureBagCold(pulledBag, cold30Row, readings("2025-12-31", 40, 4, warm), kind, "2026-02-15");
    expect(r.window?.opensOn).toBe("2026-01-31"); // 2026-01-01 + 30 calendar days
    expect(r.lostDays).toBe(lost);
    expect(r.shifted?.opensOn).toBe(opens);
    if (kind === "fridge") {
      expect(r.exposure?.lostDays).toBe(lost);
      if (warm) expect(r.exposure?.excursions).toHaveLength(1);
    } else {
      expect(r.exposure).toBeNull();
      expect(r.reason).toMatch(/freezer/i);
    }
  });

  it("a bag not started yet has nothing measured and says so", () => {
    const r = measureBagCold({ ...pulledBag, start_date: null, pulled_on: null }, cold30Row, [], "fridge", "2026-02-15");
    expect(r.exposure).toBeNull();
    expect(r.reason).not.toBe("");
  });
});

describe("chart helpers", () => {
  it.each([
    { unit: "C" as const, band: { min: 0, max: 10 }, optimum: { min: 1, max: 5 } },
    // °F = °C × 9/5 + 32
    { unit: "F" as const, band: { min: 32, max: 50 }, optimum: { min: 33.8, max: 41 } },
  ])("the default band 0–10 °C, optimum 1–5 °C in °$unit", ({ unit, band, optimum }) => {
    expect(describeBand(unit)).toEqual({ band, optimum });
  });

  it("sorts, converts and filters the points", () => {
    const rows = [
      { taken_at: "2026-01-02T00:00:00Z", temperature_c: 5 },
      { taken_at: "2026-01-01T00:00:00Z", temperature_c: 0 },
      { taken_at: "2025-12-01T00:00:00Z", temperature_c: 3, deleted_at: null },
    ];
    expect(buildChartPoints(rows, "F", Date.parse("2025-12-15T00:00:00Z")).map((p) => p.value)).toEqual([32, 41]);
    expect(buildChartPoints(rows, "C", null)).toHaveLength(3);
  });
});

describe("the store's cold loss, said once", () => {
  // Product wording; the lost days themselves come from the effective-window rule tested above.
  it.each([
    [[0, 0], null],
    [[3], "Cold lost here moves this bag's pull window 3 days later."],
    [[4, 4, 4], "Cold lost here moves these 3 bags' pull windows 4 days later."],
    [[1, 0], "Cold lost here moves the pull windows of 1 of these 2 bags 1 day later."],
    [[2, 5, 2, 0], "Cold lost here moves the pull windows of 3 of these 4 bags later: 1 by 5 days, 2 by 2 days."],
  ])("%j → %s", (lost, words) => {
    expect(describeStoreColdLoss(lost)).toBe(words);
  });
});
