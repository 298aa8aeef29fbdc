import { describe, expect, it } from "vitest";
import { lotKey, mapLotColumns, parseLotsCsv } from "@/lib/domain/csv-lots";

// Invented demo lots (Bramblewick Native Nursery); no published values are checked here.

describe("mapLotColumns", () => {
  it.each([
    [["Species", "Common name", "Source", "Year", "Quantity", "Treated", "Notes"], { species: 0, common_name: 1, source: 2, year: 3, quantity: 4, treated: 5, notes: 6 }],
    [["Botanical name", "Seed source", "Harvest year", "Seed count", "Treated?", "Comments"], { species: 0, source: 1, year: 2, quantity: 3, treated: 4, notes: 5 }],
    [["scientific_name", "vendor", "qty", "Bin"], { species: 0, source: 1, quantity: 2 }],
    [["Name", "Colour"], {}],
  ])("%j", (header, map) => expect(mapLotColumns(header)).toEqual(map));
});

describe("parseLotsCsv", () => {
  it.each([
    [
      "every column",
      "Species,Common name,Source,Year,Quantity,Treated,Notes\nAsclepias syriaca,Common milkweed,Bramblewick hedgerow,2025,1200,no,Hand-cleaned\n",
      [{ species: "Asclepias syriaca", common_name: "Common milkweed", source: "Bramblewick hedgerow", year: 2025, quantity: 1200, treated: false, notes: "Hand-cleaned" }],
    ],
    [
      "species only; the rest empty",
      "species\nEchinacea purpurea\n",
      [{ species: "Echinacea purpurea", common_name: null, source: null, year: null, quantity: null, treated: false, notes: null }],
    ],
    [
      "thousands separators, yes/no words, a preamble line and semicolons",
      "Seed list 2026\nSpecies;Quantity;Treated\nBaptisia australis;1 500;yes\nFragaria vesca;\"2,000\";N\n",
      [
        { species: "Baptisia australis", common_name: null, source: null, year: null, quantity: 1500, treated: true, notes: null },
        { species: "Fragaria vesca", common_name: null, source: null, year: null, quantity: 2000, treated: false, notes: null },
      ],
    ],
  ])("imports %s", (_name, text, lots) => {
    const r = parseLotsCsv(text);
    expect(r.problems).toEqual([]);
    expect(r.ok).toBe(true);
    expect(r.lots.map((l) => l.lot)).toEqual(lots);
  });

  it("reports every row: bad rows in grower words, twins counted, unknown columns listed", () => {
    const text = [
      "Species,Source,Year,Quantity,Treated,Bin", // 1
      "Asclepias syriaca,Hedgerow,2025,300,no,A1", // 2 ok
      ",Hedgerow,2025,10,no,A2", // 3 no species
      "Echinacea purpurea,Vendor,20x5,12,maybe,A3", // 4 two problems
      "Allium tricoccum,Woods,1850,5,no,A4", // 5 year too early
      "Sambucus nigra,Lane,2024,-5,no,A5", // 6 negative count
      "asclepias  syriaca,hedgerow,2025,300,,B", // 7 same lot as row 2
    ].join("\n");
    const r = parseLotsCsv(text);
    expect(r.ok).toBe(false);
    expect(r.rows.map((row) => [row.row, row.status])).toEqual([
      [2, "ok"], [3, "error"], [4, "error"], [5, "error"], [6, "error"], [7, "duplicate"],
    ]);
    const message = (n: number) => r.rows.find((row) => row.row === n)?.message ?? "";
    expect(message(3)).toBe("Species: Name the species.");
    expect(message(4)).toBe("Year: “20x5” is not a whole number. Treated: write yes or no (not “maybe”).");
    expect(message(5)).toMatch(/^Year: Give the year/);
    expect(message(6)).toBe("Quantity: Seed count cannot be negative.");
    expect(message(7)).toMatch(/Same lot as row 2/);
    expect(r.ignoredColumns).toEqual(["Bin"]);
    expect(r.counts).toEqual({ rows: 6, ok: 1, errors: 4, duplicates: 1 });
  });

  it.each([
    ["no species column", "Name,Count\nx,1\n", /could not find a “Species” column/],
    ["header only", "Species,Year\n", /no lots under it/],
  ])("file-level problem: %s", (_name, text, words) => {
    const r = parseLotsCsv(text);
    expect(r.ok).toBe(false);
    expect(r.problems.join(" ")).toMatch(words);
  });

  it("lotKey ignores case and spacing but not year or count", () => {
    const a = { species: "Asclepias syriaca", source: "Hedgerow", year: 2025, quantity: 300 };
    expect(lotKey({ ...a, species: " asclepias   SYRIACA " })).toBe(lotKey(a));
    expect(lotKey({ ...a, year: 2024 })).not.toBe(lotKey(a));
    expect(lotKey({ ...a, quantity: 301 })).not.toBe(lotKey(a));
  });
});
