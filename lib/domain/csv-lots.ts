import { z } from "zod";
import { LotInput } from "@/lib/schemas/lot";
import { countRows, readCsvTable, splitHeaderWords, type CsvReport, type CsvRowReport } from "./csv";

// A seed-lot list (from a spreadsheet or a seed library's sheet) → lots, with a report for every row.
// Pure: the phone's preview and the server's import read the file the same way.

/** The lot fields an import can fill; ids, protocol and farm columns are the server's. */
export const ImportedLot = LotInput.pick({ species: true, common_name: true, source: true, year: true, quantity: true, treated: true, notes: true });
export type ImportedLot = z.infer<typeof ImportedLot>;
type LotField = keyof ImportedLot;

export interface CsvLot {
  row: number;
  lot: ImportedLot;
}

export interface LotsCsvReport extends CsvReport {
  lots: CsvLot[];
  /** Header → the lot field it fills. */
  columns: Partial<Record<LotField, string>>;
  ignoredColumns: string[];
}

const fieldLabels: Record<LotField, string> = {
  species: "Species",
  common_name: "Common name",
  source: "Source",
  year: "Year",
  quantity: "Quantity",
  treated: "Treated",
  notes: "Notes",
};

// Checked in this order, so "Seed source" is a source and "Seed count" a quantity.
const headerRules: [LotField, readonly string[]][] = [
  ["species", ["species", "botanical", "scientific", "latin", "taxon"]],
  ["common_name", ["common"]],
  ["treated", ["treated"]],
  ["year", ["year", "harvest", "harvested"]],
  ["source", ["source", "vendor", "supplier", "origin", "provenance", "collected", "collection", "from"]],
  ["quantity", ["quantity", "qty", "count", "seeds", "amount", "number"]],
  ["notes", ["notes", "note", "comments", "comment", "remarks"]],
];

/** Header cells → which column fills which lot field (first match wins; unknown columns are ignored). */
export function mapLotColumns(header: readonly string[]): Partial<Record<LotField, number>> {
  const map: Partial<Record<LotField, number>> = {};
  header.forEach((h, i) => {
    const words = splitHeaderWords(h);
    const rule = headerRules.find(([field, keys]) => map[field] === undefined && keys.some((k) => words.includes(k)));
    if (rule) map[rule[0]] = i;
  });
  return map;
}

/** What makes two lots the same lot: a re-imported sheet adds no twins. */
export function lotKey(lot: Pick<ImportedLot, "species" | "source" | "year" | "quantity">): string {
  const norm = (s: string | null | undefined) => (s ?? "").trim().replace(/\s+/g, " ").toLowerCase();
  return [norm(lot.species), norm(lot.source), lot.year ?? "", lot.quantity ?? ""].join("|");
}

const yes = new Set(["yes", "y", "true", "1", "x", "treated"]);
const no = new Set(["no", "n", "false", "0", "", "untreated"]);

type Cell<T> = { ok: true; value: T } | { ok: false; error: string };

function readWholeNumber(cell: string, label: string): Cell<number | null> {
  const t = cell.trim();
  if (!t) return { ok: true, value: null };
  // 1200, 1,200, 1 200, 1_200
  if (/^-?\d+$/.test(t) || /^\d{1,3}([,\s_]\d{3})+$/.test(t)) return { ok: true, value: Number(t.replace(/[,\s_]/g, "")) };
  return { ok: false, error: `${label}: “${t.slice(0, 30)}” is not a whole number.` };
}

function readYesNo(cell: string): Cell<boolean> {
  const t = cell.trim().toLowerCase();
  if (yes.has(t)) return { ok: true, value: true };
  if (no.has(t)) return { ok: true, value: false };
  return { ok: false, error: `Treated: write yes or no (not “${cell.trim().slice(0, 20)}”).` };
}

/** Parses a lots CSV into lots plus a report per row. Never throws for bad content. */
export function parseLotsCsv(text: string): LotsCsvReport {
  const report: LotsCsvReport = {
    ok: false,
    problems: [],
    notes: [],
    rows: [],
    counts: { rows: 0, ok: 0, errors: 0, duplicates: 0 },
    lots: [],
    columns: {},
    ignoredColumns: [],
  };
  const table = readCsvTable(text, (cells) => mapLotColumns(cells).species !== undefined);
  if (!table?.header) {
    report.problems.push("We could not find a “Species” column. The first row should name the columns, e.g. Species, Common name, Source, Year, Quantity, Treated, Notes.");
    return report;
  }
  const header = table.header;
  const map = mapLotColumns(header);
  for (const [field, i] of Object.entries(map) as [LotField, number][]) report.columns[field] = header[i];
  const used = new Set(Object.values(map));
  report.ignoredColumns = header.filter((h, i) => !used.has(i) && h !== "");
  if (table.preambleLines > 0) report.notes.push(`Skipped ${table.preambleLines} line${table.preambleLines === 1 ? "" : "s"} above the header.`);
  report.notes.push(`Columns read: ${Object.entries(report.columns).map(([f, h]) => `“${h}” as ${fieldLabels[f as LotField].toLowerCase()}`).join(", ")}.`);
  if (report.ignoredColumns.length) report.notes.push(`Columns left out: ${report.ignoredColumns.map((h) => `“${h}”`).join(", ")}.`);

  const seen = new Map<string, number>();
  for (const { row, cells } of table.lines) {
    report.rows.push(readRow(row, cells));
  }

  function readRow(row: number, cells: string[]): CsvRowReport {
    const cell = (f: LotField) => (map[f] === undefined ? "" : (cells[map[f]!] ?? ""));
    const errors: string[] = [];
    const year = readWholeNumber(cell("year"), "Year");
    const quantity = readWholeNumber(cell("quantity"), "Quantity");
    const treated = readYesNo(cell("treated"));
    for (const c of [year, quantity, treated]) if (!c.ok) errors.push(c.error);
    if (errors.length) return { row, status: "error", message: errors.join(" ") };
    const text = (f: LotField) => cell(f) || null;
    const parsed = ImportedLot.safeParse({
      species: cell("species"),
      common_name: text("common_name"),
      source: text("source"),
      year: year.ok ? year.value : null,
      quantity: quantity.ok ? quantity.value : null,
      treated: treated.ok ? treated.value : false,
      notes: text("notes"),
    });
    if (!parsed.success) {
      const message = parsed.error.issues.map((i) => `${fieldLabels[i.path[0] as LotField] ?? "Row"}: ${i.message}`).join(" ");
      return { row, status: "error", message };
    }
    const key = lotKey(parsed.data);
    const first = seen.get(key);
    if (first !== undefined) return { row, status: "duplicate", message: `Same lot as row ${first}; the first was kept.` };
    seen.set(key, row);
    report.lots.push({ row, lot: parsed.data });
    return { row, status: "ok" };
  }

  report.counts = countRows(report.rows);
  if (report.rows.length === 0) report.problems.push("The file has a header but no lots under it.");
  report.ok = report.problems.length === 0 && report.counts.errors === 0 && report.lots.length > 0;
  return report;
}
