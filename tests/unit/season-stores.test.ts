import { describe, expect, it } from "vitest";
import { buildChartPoints, describeBand, measureBagCold } from "@/components/stores/store-metrics";
import type { ProtocolForPlan } from "@/lib/domain/schedule";

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

describe("measureBagCold: effective cold days and the shifted window", () => {
  it.each([
    { name: "a steady 4 °C fridge (FDA: at or below 4 °C) loses nothing", warm: undefined, lost: 0, opens: "2026-01-31" },
    // 48 h at 12 °C is above the default 0–10 °C band: two days lost, the window moves two days later.
    { name: "two days at 12 °C move the window by two days", warm: { fromH: 240, toH: 288, c: 12 }, lost: 2, opens: "2026-02-02" },
    { name: "three days frozen at −18 °C (a freezer is another treatment) move it by three", warm: { fromH: 240, toH: 312, c: -18 }, lost: 3, opens: "2026-02-03" },
  ])("$name", ({ warm, lost, opens }) => {
    const r = measureBagCold({ start_date: "2026-01-01", pulled_on: "2026-01-31", discarded_on: null }, cold30, readings("2025-12-31", 40, 4, warm), "2026-02-15T00:00:00Z");
    expect(r.problem).toBeNull();
    expect(r.window?.opensOn).toBe("2026-01-31"); // 2026-01-01 + 30 calendar days
    expect(r.exposure?.lostDays).toBe(lost);
    expect(r.shifted?.opensOn).toBe(opens);
    if (warm) expect(r.exposure?.excursions).toHaveLength(1);
  });

  it.each([
    { name: "not started", bag: { start_date: null, pulled_on: null, discarded_on: null }, problem: "Not started" },
  ])("$name", ({ bag, problem }) => {
    expect(measureBagCold(bag, cold30, [], "2026-02-15T00:00:00Z").problem).toContain(problem);
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
