import "server-only";
import type { Knex } from "knex";
import { z } from "zod";
import { notFound } from "@/lib/errors";
import { findZonedDay, isKnownTimeZone, writeCsv } from "@/lib/domain/csv";
import { countDaysBetween, formatBagCode } from "@/lib/domain";
import { migrationSource } from "@/db/migrations";
import { vocabularyLabels, type CheckAction, type Moisture, type Mould, type Sprouts } from "@/lib/schemas/vocabulary";
import { parseRow } from "./sync/rows";
import { readInSnapshot } from "./db-config";
import { loadFarmBagRows } from "./bag-rows";
import { readPhotoFile } from "./storage";

// CSV exports of the farm's records and the Owner's full-farm JSON backup. Only the member's own
// farm is ever read; tombstoned rows stay out of the CSVs (the backup keeps them, marked).

export const exportKinds = ["bags", "checks", "counts", "readings", "sowings"] as const;
export type ExportKind = (typeof exportKinds)[number];

export const ExportQuery = z.object({
  what: z.enum(exportKinds, { error: `Choose what to export: ${exportKinds.join(", ")}.` }),
  format: z.enum(["csv"], { error: "Exports come as CSV (format=csv)." }).default("csv"),
});

type Farm = { id: string; name: string; timezone: string; temperature_unit: string };
type Row = Record<string, string | number | null>;

async function findFarm(db: Knex, farmId: string): Promise<Farm> {
  const farm = await db("farms").where({ id: farmId }).whereNull("deleted_at").first("id", "name", "timezone", "temperature_unit");
  if (!farm) throw notFound("The farm");
  return farm;
}

const round1 = (n: number) => Math.round(n * 10) / 10;

function farmToday(farm: Farm, now: Date): string {
  return findZonedDay(now, isKnownTimeZone(farm.timezone) ? farm.timezone : "UTC");
}

const bagJoin = (db: Knex, farmId: string) =>
  db("bags as b")
    .leftJoin("lots as l", "l.id", "b.lot_id")
    .where("b.farm_id", farmId)
    .whereNull("b.deleted_at");

async function exportRows(db: Knex, farm: Farm, what: ExportKind, now: Date): Promise<Row[]> {
  const f = farm.id;
  const withF = farm.temperature_unit === "F";
  const inF = (c: number | null) => (c === null ? null : round1((c * 9) / 5 + 32));
  switch (what) {
    case "bags": {
      // State and window as the phone shows them: the same lib/domain rows (windows moved by cold lost in the store).
      const today = farmToday(farm, now);
      const timezone = isKnownTimeZone(farm.timezone) ? farm.timezone : "UTC";
      const shown = new Map((await loadFarmBagRows(db, f, today, timezone, now)).map((r) => [r.id, r]));
      const rows = await bagJoin(db, f)
        .leftJoin("stores as s", "s.id", "b.store_id")
        .orderBy("b.code")
        .select("b.*", "l.species", "l.common_name", "l.source as lot_source", "l.year as lot_year", "s.name as store_name");
      return rows.map((b) => {
        const row = shown.get(b.id);
        return {
          code: formatBagCode(b.code),
          species: b.species,
          common_name: b.common_name,
          lot_source: b.lot_source,
          lot_year: b.lot_year,
          state: row ? vocabularyLabels.bagState[row.state] : null,
          cold_store: b.store_name,
          box: b.box,
          medium: vocabularyLabels.medium[b.medium as keyof typeof vocabularyLabels.medium] ?? b.medium,
          seed_count: b.seed_count,
          start_date: b.start_date,
          planned_start_date: b.planned_start_date,
          window_opens: row?.window?.opensOn ?? b.window_start,
          window_closes: row?.window?.closesOn ?? b.window_end,
          planned_window_opens: row?.plannedWindow?.opensOn ?? b.window_start,
          planned_window_closes: row?.plannedWindow?.closesOn ?? b.window_end,
          cold_days_lost: row?.lostColdDays ?? 0,
          pulled_on: b.pulled_on,
          sown_on: b.sown_on,
          discarded_on: b.discarded_on,
          discard_reason: b.discard_reason,
          note: b.note,
          bag_id: b.id,
        };
      });
    }
    case "checks": {
      const rows = await bagJoin(db, f)
        .join("checks as c", "c.bag_id", "b.id")
        .leftJoin("users as u", "u.id", "c.checked_by")
        .where("c.farm_id", f)
        .whereNull("c.deleted_at")
        .orderBy([{ column: "c.checked_at" }, { column: "b.code" }])
        .select("c.*", "b.code", "l.species", "u.name as checker");
      return rows.map((c) => {
        const actions = parseRow("checks", c).actions as CheckAction[] | null;
        return {
          checked_at: c.checked_at,
          bag_code: formatBagCode(c.code),
          species: c.species,
          moisture: vocabularyLabels.moisture[c.moisture as Moisture] ?? c.moisture,
          mould: vocabularyLabels.mould[c.mould as Mould] ?? c.mould,
          sprouts: vocabularyLabels.sprouts[c.sprouts as Sprouts] ?? c.sprouts,
          actions: (actions ?? []).map((a) => vocabularyLabels.checkAction[a] ?? a).join("; "),
          temperature_c: c.temperature_c,
          ...(withF ? { temperature_f: inF(c.temperature_c) } : {}),
          note: c.note,
          checked_by: c.checker,
          check_id: c.id,
          bag_id: c.bag_id,
        };
      });
    }
    case "readings": {
      const rows = await db("readings as r")
        .join("stores as s", "s.id", "r.store_id")
        .where("r.farm_id", f)
        .whereNull("r.deleted_at")
        .orderBy([{ column: "s.name" }, { column: "r.taken_at" }])
        .select("r.*", "s.name as store_name", "s.kind as store_kind");
      return rows.map((r) => ({
        cold_store: r.store_name,
        kind: vocabularyLabels.storeKind[r.store_kind as keyof typeof vocabularyLabels.storeKind] ?? r.store_kind,
        taken_at: r.taken_at,
        temperature_c: r.temperature_c,
        ...(withF ? { temperature_f: inF(r.temperature_c) } : {}),
        origin: r.origin,
        reading_id: r.id,
        store_id: r.store_id,
      }));
    }
    case "sowings": {
      const rows = await bagJoin(db, f)
        .join("sowings as w", "w.bag_id", "b.id")
        .where("w.farm_id", f)
        .whereNull("w.deleted_at")
        .orderBy([{ column: "w.sown_on" }, { column: "b.code" }])
        .select("w.*", "b.code", "l.species");
      return rows.map((w) => ({
        sown_on: w.sown_on,
        bag_code: formatBagCode(w.code),
        species: w.species,
        tray: w.tray,
        cells: w.cells,
        seeds_sown: w.seeds_sown,
        note: w.note,
        sowing_id: w.id,
        bag_id: w.bag_id,
      }));
    }
    case "counts": {
      const rows = await bagJoin(db, f)
        .join("sowings as w", "w.bag_id", "b.id")
        .join("counts as n", "n.sowing_id", "w.id")
        .where("n.farm_id", f)
        .whereNull("w.deleted_at")
        .whereNull("n.deleted_at")
        .orderBy([{ column: "b.code" }, { column: "w.sown_on" }, { column: "n.counted_on" }])
        .select("n.*", "b.code", "l.species", "w.sown_on", "w.seeds_sown");
      return rows.map((n) => ({
        bag_code: formatBagCode(n.code),
        species: n.species,
        sown_on: n.sown_on,
        counted_on: n.counted_on,
        days_after_sowing: countDaysBetween(n.sown_on, n.counted_on),
        germinated_total: n.germinated_total,
        seeds_sown: n.seeds_sown,
        // Germination % = 100·N/Nt (ISTA Rules ch. 5), to one decimal, as of this count.
        germination_percent: n.seeds_sown > 0 ? round1((100 * n.germinated_total) / n.seeds_sown) : null,
        note: n.note,
        count_id: n.id,
        sowing_id: n.sowing_id,
      }));
    }
  }
}

const slug = (s: string) =>
  s
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-|-$/g, "")
    .slice(0, 40) || "farm";

/** Content-Disposition for a download: a plain ASCII name plus the RFC 5987 form. */
export function attachment(fileName: string): string {
  return `attachment; filename="${fileName.replace(/[^\x20-\x7e]|"/g, "_")}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}

export type CsvExport = { fileName: string; csv: string; rows: number };

/** One kind of record as CSV with a header row, for the member's farm only. */
export async function exportCsv(db: Knex, farmId: string, what: ExportKind, now = new Date()): Promise<CsvExport> {
  const farm = await findFarm(db, farmId);
  const rows = await exportRows(db, farm, what, now);
  const columns = rows.length ? Object.keys(rows[0]) : emptyColumns[what](farm.temperature_unit === "F");
  // A byte-order mark so spreadsheet programs read ° and accents as UTF-8; formulae are neutralised by writeCsv.
  const csv = "\uFEFF" + writeCsv(columns, rows.map((r) => columns.map((c) => r[c] ?? "")));
  return { fileName: `rimebook-${slug(farm.name)}-${what}-${farmToday(farm, now)}.csv`, csv, rows: rows.length };
}

// Header rows for an empty export, so a blank sheet still names its columns.
const emptyColumns: Record<ExportKind, (withF: boolean) => string[]> = {
  bags: () => ["code", "species", "common_name", "lot_source", "lot_year", "state", "cold_store", "box", "medium", "seed_count", "start_date", "planned_start_date", "window_opens", "window_closes", "planned_window_opens", "planned_window_closes", "cold_days_lost", "pulled_on", "sown_on", "discarded_on", "discard_reason", "note", "bag_id"],
  checks: (f) => ["checked_at", "bag_code", "species", "moisture", "mould", "sprouts", "actions", "temperature_c", ...(f ? ["temperature_f"] : []), "note", "checked_by", "check_id", "bag_id"],
  readings: (f) => ["cold_store", "kind", "taken_at", "temperature_c", ...(f ? ["temperature_f"] : []), "origin", "reading_id", "store_id"],
  sowings: () => ["sown_on", "bag_code", "species", "tray", "cells", "seeds_sown", "note", "sowing_id", "bag_id"],
  counts: () => ["bag_code", "species", "sown_on", "counted_on", "days_after_sowing", "germinated_total", "seeds_sown", "germination_percent", "note", "count_id", "sowing_id"],
};

// ---- Full-farm backup ----

/** Every farm table, in an order a restore can insert them. */
export const backupTables = [
  "protocols", "protocol_sources", "lots", "stores", "readings", "trials", "trial_arms", "plan_items", "bags", "checks",
  "photos", "sowings", "counts", "audit_log", "digest_runs",
] as const;

export const BACKUP_FORMAT = "rimebook-farm-backup";
/** Raised when the file's shape changes; a server refuses backups with a higher number (lib/server/restore.ts). */
export const BACKUP_VERSION = 1;

/**
 * The Owner's download: the farm row, its members (names, e-mails, roles; never password hashes)
 * and every row of every farm table, tombstones included. Sessions, invite and reset tokens stay out.
 * `withPhotos`: each photo row also carries its picture (base64), so a restore brings the pictures back.
 */
export async function buildBackup(db: Knex, farmId: string, now = new Date(), { withPhotos = false } = {}) {
  // Every table from one snapshot (a consistent file while phones keep pushing); pictures are read from disk after,
  // so the database is not held while files are read.
  const { farm, members, invites, tables, photoPaths } = await readInSnapshot(db, async (trx) => {
    const farm = await trx("farms").where({ id: farmId }).first();
    if (!farm) throw notFound("The farm");
    const members = await trx("memberships as m")
      .join("users as u", "u.id", "m.user_id")
      .where("m.farm_id", farmId)
      .orderBy("m.created_at")
      .select("m.id", "m.user_id", "u.name", "u.email", "m.role", "m.digest_opt_in", "m.created_at", "m.updated_at", "m.seq", "m.deleted_at");
    const invites = await trx("invites")
      .where({ farm_id: farmId })
      .select("id", "email", "role", "invited_by", "created_at", "expires_at", "accepted_at", "revoked_at");
    const tables: Record<string, Record<string, unknown>[]> = {};
    const photoPaths = new Map<Record<string, unknown>, string>();
    for (const t of backupTables) {
      const order = t === "audit_log" ? "id" : t === "digest_runs" ? "day" : "seq";
      const rows: Record<string, unknown>[] = await trx(t).where({ farm_id: farmId }).orderBy(order);
      tables[t] = [];
      for (const r of rows) {
        const row = parseRow(t, r);
        if (t === "photos") {
          row.url = `/api/uploads/${String(row.id)}`;
          if (withPhotos && !row.deleted_at) photoPaths.set(row, String(r.path));
          delete row.path; // where the file sits on the server's disk
        }
        tables[t].push(row);
      }
    }
    return { farm, members, invites, tables, photoPaths };
  });
  for (const [row, filePath] of photoPaths) {
    // A picture missing on disk is left out of the file; the restore then reports it, the rest still comes back.
    const bytes = await readPhotoFile(filePath).catch(() => null);
    if (bytes) row.data = bytes.toString("base64");
  }
  const counts = Object.fromEntries(Object.entries(tables).map(([k, v]) => [k, v.length]));
  return {
    fileName: `rimebook-backup-${withPhotos ? "with-photos-" : ""}${slug(farm.name)}-${findZonedDay(now, isKnownTimeZone(farm.timezone) ? farm.timezone : "UTC")}.json`,
    backup: {
      format: BACKUP_FORMAT,
      version: BACKUP_VERSION,
      /** The database's latest migration when it was made: a server that does not know it is older. */
      schema: (await migrationSource.getMigrations([])).sort().at(-1),
      withPhotos,
      exportedAt: now.toISOString(),
      farm: { ...farm, seq: Number(farm.seq) },
      members: members.map((m) => parseRow("memberships", m)),
      invites,
      tables,
      counts,
    },
  };
}
