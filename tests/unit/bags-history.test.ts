import { describe, expect, it } from "vitest";
import type { AuditRow } from "@/lib/client/db";
import { describeBagHistory } from "@/components/bags/bag-history";

const names = {
  stores: new Map([["s1", "Barn fridge"], ["s2", "Potting-shed fridge"]]),
  protocols: new Map([["p1", "Asclepias speciosa"]]),
  members: new Map([["u1", "Tomas Reed"]]),
};
const row = (p: Partial<AuditRow>): AuditRow => ({ id: 1, table_name: "bags", row_id: "b1", field: "box", old_value: null, new_value: null, user_id: "u1", at: "2026-01-10T08:00:00Z", seq: 1, ...p });

describe("describeBagHistory", () => {
  it.each([
    [row({ field: "store_id", old_value: "s1", new_value: "s2" }), { field: "Cold store", from: "Barn fridge", to: "Potting-shed fridge", who: "Tomas Reed" }],
    [row({ field: "store_id", old_value: "gone", new_value: null }), { field: "Cold store", from: "a store no longer on this phone", to: "(empty)" }],
    [row({ field: "medium", old_value: "paper_towel", new_value: "sand" }), { field: "Medium", from: "Paper towel", to: "Sand" }],
    [row({ field: "box", old_value: "Box A", new_value: "Box B", user_id: "u9" }), { field: "Box", from: "Box A", to: "Box B", who: "A member" }],
    [row({ field: "protocol_id", old_value: null, new_value: "p1", user_id: null }), { field: "Protocol", from: "(empty)", to: "Asclepias speciosa", who: "Someone" }],
    [row({ field: "some_new_column", old_value: "1", new_value: "2" }), { field: "some new column", from: "1", to: "2" }],
  ])("%#", (input, want) => {
    expect(describeBagHistory([input], names)[0]).toMatchObject(want);
  });

  it("lists the newest change first, and later-written rows first on the same moment", () => {
    const lines = describeBagHistory(
      [row({ id: 1, at: "2026-01-10T08:00:00Z" }), row({ id: 3, at: "2026-01-12T08:00:00Z" }), row({ id: 2, at: "2026-01-10T08:00:00Z" })],
      names,
    );
    expect(lines.map((l) => l.id)).toEqual([3, 2, 1]);
  });
});
