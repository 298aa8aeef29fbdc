import "server-only";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { z } from "zod";
import { AppError, notFound } from "@/lib/errors";
import { decodeCsvBytes, maxCsvBytes, countRows, type CsvReport, type CsvRowReport } from "@/lib/domain/csv";
import { parseReadingsCsv, type CsvReading, type ReadingsCsvReport } from "@/lib/domain/csv-readings";
import { lotKey, parseLotsCsv, type CsvLot, type LotsCsvReport } from "@/lib/domain/csv-lots";
import { readBodyCapped } from "./http";
import { nowIso } from "./seq";

// CSV imports of cold-store readings and seed lots. All or nothing: one bad row and nothing is
// written; the grower gets a report for every row instead. Rows already on the farm are skipped
// and counted, so importing the same logger file twice adds nothing.

const tooLarge = () =>
  new AppError("too_large", `That file is larger than ${maxCsvBytes / 1024 / 1024} MB. Split it into smaller files (for example one per month) and import each.`, undefined, 413);

const csvTypes = ["text/", "application/csv", "application/vnd.ms-excel", "application/octet-stream"];

export type CsvUpload = { text: string; fileName: string | null; fields: Record<string, string> };

/**
 * The CSV of an import request: the body itself (text/csv) or the "file" field of a form upload.
 * Size-capped (413) and decoded strictly (415 for binary files and text that is not UTF-8).
 */
export async function readCsvUpload(req: Request): Promise<CsvUpload> {
  const type = (req.headers.get("content-type") ?? "text/csv").toLowerCase();
  if (type.startsWith("multipart/form-data")) {
    const body = await readBodyCapped(req, maxCsvBytes + 64 * 1024, tooLarge);
    let form: FormData;
    try {
      form = await new Response(body as BodyInit, { headers: { "content-type": type } }).formData();
    } catch {
      throw new AppError("bad_request", "The upload could not be read. Choose the file again and retry.");
    }
    const file = form.get("file");
    if (!(file instanceof Blob)) throw new AppError("invalid", "No file was attached.", { file: "Choose a CSV file." });
    if (file.size > maxCsvBytes) throw tooLarge();
    const fields: Record<string, string> = {};
    for (const [k, v] of form.entries()) if (typeof v === "string") fields[k] = v;
    const text = decodeCsvBytes(new Uint8Array(await file.arrayBuffer()));
    return { text, fileName: "name" in file && typeof file.name === "string" ? file.name : null, fields };
  }
  if (!csvTypes.some((t) => type.startsWith(t))) {
    throw new AppError("unsupported_type", "Send the CSV file itself (text/csv), or as a form upload with the file in “file”.", undefined, 415);
  }
  const text = decodeCsvBytes(await readBodyCapped(req, maxCsvBytes, tooLarge));
  return { text, fileName: null, fields: {} };
}

const flag = z
  .union([z.boolean(), z.enum(["1", "0", "true", "false", "yes", "no", ""])])
  .optional()
  .transform((v) => v === true || v === "1" || v === "true" || v === "yes");

/** Options of an import, from the query string or the form fields. */
export const ImportOptions = z.object({
  dryRun: flag,
  unit: z.enum(["C", "F"], { error: "Choose °C or °F (C or F)." }).optional(),
  dateOrder: z.enum(["auto", "dmy", "mdy"], { error: "Choose day-first (dmy) or month-first (mdy)." }).optional(),
});
export type ImportOptions = z.infer<typeof ImportOptions>;

/** Query-string options, overridden by form fields of the same name. */
export function readImportOptions(req: Request, upload: CsvUpload): ImportOptions {
  const query = Object.fromEntries(new URL(req.url).searchParams.entries());
  const pick = (k: string) => upload.fields[k] ?? query[k];
  return ImportOptions.parse({ dryRun: pick("dryRun"), unit: pick("unit") || undefined, dateOrder: pick("dateOrder") || undefined });
}

/** Hands out `n` consecutive change counters in one update, so each imported row still has its own seq. */
async function reserveSeqs(trx: Knex.Transaction, farmId: string, n: number): Promise<number> {
  await trx("farms").where({ id: farmId }).increment("seq", n);
  const row = await trx("farms").where({ id: farmId }).first("seq");
  if (!row) throw notFound("The farm");
  return Number(row.seq) - n + 1;
}

const insertChunk = 400;

/** Inserts new farm rows, each with a fresh id, the farm, its stamps and its own seq, in chunks SQLite accepts. */
async function insertStamped(trx: Knex.Transaction, farmId: string, table: "readings" | "lots", values: Record<string, unknown>[], at: string): Promise<number> {
  if (values.length === 0) return 0;
  const first = await reserveSeqs(trx, farmId, values.length);
  const rows = values.map((v, i) => ({ id: randomUUID(), ...v, farm_id: farmId, created_at: at, updated_at: at, seq: first + i, deleted_at: null }));
  for (let i = 0; i < rows.length; i += insertChunk) await trx(table).insert(rows.slice(i, i + insertChunk));
  return rows.length;
}

// ---- Readings ----

export async function findStore(db: Knex | Knex.Transaction, farmId: string, storeId: string): Promise<{ id: string; name: string; kind: string }> {
  if (!z.uuid().safeParse(storeId).success) throw notFound("That cold store");
  const store = await db("stores").where({ id: storeId, farm_id: farmId }).whereNull("deleted_at").first("id", "name", "kind");
  if (!store) throw notFound("That cold store");
  return store;
}

/** Instants (ms) of the store's readings around the file's time span; tombstoned readings count too (the unique key still holds them). */
async function findStoredInstants(db: Knex | Knex.Transaction, storeId: string, readings: readonly CsvReading[]): Promise<Set<number>> {
  if (readings.length === 0) return new Set();
  let min = Infinity;
  let max = -Infinity;
  for (const r of readings) {
    const t = Date.parse(r.takenAt);
    if (t < min) min = t;
    if (t > max) max = t;
  }
  // Stored times may carry any offset; a day either side of the span catches them all by text order.
  const day = 86_400_000;
  const rows: { taken_at: string }[] = await db("readings")
    .where({ store_id: storeId })
    .whereBetween("taken_at", [new Date(min - day).toISOString().slice(0, 10), new Date(max + day).toISOString().slice(0, 10) + "~"])
    .select("taken_at");
  return new Set(rows.map((r) => Date.parse(r.taken_at)));
}

/** Writes the readings (already checked and free of twins) with their farm, stamps and seq. Takes the transaction first. */
export async function insertImportedReadings(trx: Knex.Transaction, farmId: string, storeId: string, readings: readonly CsvReading[], at = nowIso()): Promise<number> {
  const values = readings.map((r) => ({ store_id: storeId, taken_at: r.takenAt, temperature_c: r.temperatureC, origin: "import", check_id: null }));
  return insertStamped(trx, farmId, "readings", values, at);
}

// ---- Lots ----

/** Writes imported lots, linking each to the farm's protocol for its species when there is exactly one. Takes the transaction first. */
export async function insertImportedLots(trx: Knex.Transaction, farmId: string, lots: readonly CsvLot[], at = nowIso()): Promise<number> {
  if (lots.length === 0) return 0;
  const protocols: { id: string; species: string; is_farm_own: number | boolean }[] = await trx("protocols")
    .where({ farm_id: farmId })
    .whereNull("deleted_at")
    .select("id", "species", "is_farm_own");
  const bySpecies = new Map<string, string | null>();
  // The farm's own protocol wins over a starter row; two of the same kind leave the choice to the grower.
  for (const own of [false, true]) {
    const seen = new Map<string, string[]>();
    for (const p of protocols.filter((p) => Boolean(p.is_farm_own) === own)) {
      const k = p.species.trim().toLowerCase();
      seen.set(k, [...(seen.get(k) ?? []), p.id]);
    }
    for (const [k, ids] of seen) bySpecies.set(k, ids.length === 1 ? ids[0] : null);
  }
  const values = lots.map(({ lot }) => ({ ...lot, protocol_id: bySpecies.get(lot.species.trim().toLowerCase()) ?? null }));
  return insertStamped(trx, farmId, "lots", values, at);
}

async function findStoredLotKeys(db: Knex | Knex.Transaction, farmId: string): Promise<Set<string>> {
  const rows = await db("lots").where({ farm_id: farmId }).whereNull("deleted_at").select("species", "source", "year", "quantity");
  return new Set(rows.map((r) => lotKey(r)));
}

// ---- The import itself ----

/** How many row reports an answer carries; the phone runs the same parser for a full preview. */
const maxReportedRows = 1000;

export type ImportAnswer = {
  status: 200 | 201 | 422;
  body: Record<string, unknown>;
};

/** Marks rows already on the farm as duplicates and recounts. */
function markStored(report: CsvReport, storedRows: Set<number>): void {
  if (storedRows.size === 0) return;
  report.rows = report.rows.map((r): CsvRowReport => (storedRows.has(r.row) ? { row: r.row, status: "duplicate", message: "Already recorded; skipped." } : r));
  report.counts = countRows(report.rows);
}

function summarize(report: CsvReport, extra: Record<string, unknown>) {
  const notOk = report.rows.filter((r) => r.status !== "ok");
  return {
    ok: report.ok,
    problems: report.problems,
    notes: report.notes,
    counts: report.counts,
    rows: notOk.slice(0, maxReportedRows),
    rowsLeftOut: Math.max(0, notOk.length - maxReportedRows),
    ...extra,
  };
}

function refusal(report: CsvReport, what: string, details: Record<string, unknown>): ImportAnswer {
  const errors = report.rows.filter((r) => r.status === "error");
  const message = report.problems.length
    ? `${report.problems[0]} Nothing was imported.`
    : `${errors.length} row${errors.length === 1 ? " has a problem" : "s have problems"}, so no ${what} were imported. Fix ${errors.length === 1 ? "it" : "them"} and import the file again.`;
  const fields = Object.fromEntries(errors.slice(0, 50).map((r) => [`row ${r.row}`, r.message ?? "This row has a problem."]));
  return { status: 422, body: { error: { code: "domain", message, ...(errors.length ? { fields } : {}) }, report: summarize(report, details) } };
}

function describeDone(imported: number, duplicates: number, what: string): string {
  if (imported === 0) return `Nothing new: all ${duplicates} ${what} were already recorded.`;
  return `Imported ${imported} ${what}${duplicates ? `; ${duplicates} already recorded or repeated were skipped` : ""}.`;
}

export async function importReadingsCsv(
  db: Knex,
  input: { farmId: string; storeId: string; text: string; options: ImportOptions; timeZone: string; now?: Date },
): Promise<ImportAnswer> {
  const now = input.now ?? new Date();
  const store = await findStore(db, input.farmId, input.storeId);
  const report: ReadingsCsvReport = parseReadingsCsv(input.text, {
    unit: input.options.unit,
    dateOrder: input.options.dateOrder,
    timeZone: input.timeZone,
    notAfter: new Date(now.getTime() + 86_400_000).toISOString(),
  });
  const details = () => ({
    store: { id: store.id, name: store.name },
    unit: report.unit,
    unitSource: report.unitSource,
    dateOrder: report.dateOrder,
    columns: report.columns,
  });
  if (!report.ok) return refusal(report, "readings", details());

  // Check stored twins and write in one transaction, so two imports at once cannot both add a reading.
  return db.transaction(async (trx) => {
    const stored = await findStoredInstants(trx, store.id, report.readings);
    const fresh = report.readings.filter((r) => !stored.has(Date.parse(r.takenAt)));
    markStored(report, new Set(report.readings.filter((r) => stored.has(Date.parse(r.takenAt))).map((r) => r.row)));
    const preview = fresh.slice(0, 20).map(({ row, takenAt, temperatureC }) => ({ row, takenAt, temperatureC }));
    if (input.options.dryRun) {
      return { status: 200, body: { dryRun: true, toImport: fresh.length, message: `Ready to import ${fresh.length} readings.`, ...summarize(report, { ...details(), preview }) } };
    }
    const imported = await insertImportedReadings(trx, input.farmId, store.id, fresh, now.toISOString());
    const span = fresh.length ? { from: fresh.reduce((a, r) => (r.takenAt < a ? r.takenAt : a), fresh[0].takenAt), to: fresh.reduce((a, r) => (r.takenAt > a ? r.takenAt : a), fresh[0].takenAt) } : null;
    return {
      status: imported > 0 ? 201 : 200,
      body: { dryRun: false, imported, span, message: describeDone(imported, report.counts.duplicates, "readings"), ...summarize(report, details()) },
    };
  });
}

export async function importLotsCsv(db: Knex, input: { farmId: string; text: string; options: ImportOptions; now?: Date }): Promise<ImportAnswer> {
  const now = input.now ?? new Date();
  const report: LotsCsvReport = parseLotsCsv(input.text);
  const details = () => ({ columns: report.columns, ignoredColumns: report.ignoredColumns });
  if (!report.ok) return refusal(report, "lots", details());
  return db.transaction(async (trx) => {
    const stored = await findStoredLotKeys(trx, input.farmId);
    const fresh = report.lots.filter((l) => !stored.has(lotKey(l.lot)));
    markStored(report, new Set(report.lots.filter((l) => stored.has(lotKey(l.lot))).map((l) => l.row)));
    const preview = fresh.slice(0, 20);
    if (input.options.dryRun) {
      return { status: 200, body: { dryRun: true, toImport: fresh.length, message: `Ready to import ${fresh.length} lots.`, ...summarize(report, { ...details(), preview }) } };
    }
    const imported = await insertImportedLots(trx, input.farmId, fresh, now.toISOString());
    return {
      status: imported > 0 ? 201 : 200,
      body: { dryRun: false, imported, message: describeDone(imported, report.counts.duplicates, "lots"), ...summarize(report, details()) },
    };
  });
}

/** The farm's time zone: times in a logger file without an offset are the farm's local time. */
export async function findFarmTimeZone(db: Knex, farmId: string): Promise<string> {
  const farm = await db("farms").where({ id: farmId }).first("timezone");
  return farm?.timezone || "UTC";
}
