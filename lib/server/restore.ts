import "server-only";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { AppError } from "@/lib/errors";
import { FarmSettings } from "@/lib/schemas/farm";
import { Role } from "@/lib/schemas/vocabulary";
import { migrationSource } from "@/db/migrations";
import { BACKUP_FORMAT, BACKUP_VERSION, backupTables } from "./exports";
import { serializeRow } from "./sync/rows";
import { removePhotoFile, savePhotoFile, sniffImage } from "./storage";

// Restore: an Owner's backup file into a new, empty farm on any Rimebook server (SQLite or PostgreSQL, the same
// portable Knex). Every row gets a new id and keeps its bag code; references follow the new ids. All rows go in
// one transaction: a refused file, a failure or a killed server leaves the farm as empty as it was.

type Row = Record<string, unknown>;

export interface RestoreReport {
  /** Rows restored per table. */
  restored: Record<string, number>;
  /** Photo rows left out because the backup did not carry their pictures. */
  photosWithoutPicture: number;
  /** Members of the old farm other than the person restoring: invite them again. */
  membersToInvite: { name: string | null; email: string; role: Role }[];
}

const refuse = (code: "invalid" | "conflict", message: string, status: number) => new AppError(code, message, undefined, status);

const notABackup = () =>
  refuse("invalid", "This file is not a Rimebook farm backup. Choose the .json file that the Records screen's backup download saved.", 422);


/** Checks the file is a backup this server can read, before anything is written. */
export async function readBackupFile(input: unknown): Promise<{ farm: Row; members: Row[]; tables: Record<string, Row[]> }> {
  if (!input || typeof input !== "object" || Array.isArray(input)) throw notABackup();
  const b = input as Row;
  if (b.format !== BACKUP_FORMAT || typeof b.version !== "number" || !b.tables || typeof b.tables !== "object") throw notABackup();
  const known = await migrationSource.getMigrations([]);
  if (b.version > BACKUP_VERSION || (typeof b.schema === "string" && !known.includes(b.schema))) {
    throw refuse(
      "invalid",
      `This backup was made by a newer version of Rimebook than this server runs (backup format ${b.version}${typeof b.schema === "string" ? `, database ${b.schema}` : ""}). Update this server, then restore again. Nothing was changed.`,
      422,
    );
  }
  const tables = b.tables as Record<string, unknown>;
  for (const t of backupTables) {
    if (tables[t] !== undefined && !Array.isArray(tables[t])) throw notABackup();
    for (const r of (tables[t] as unknown[] | undefined) ?? []) if (!r || typeof r !== "object") throw notABackup();
  }
  if (!b.farm || typeof b.farm !== "object") throw notABackup();
  return { farm: b.farm as Row, members: Array.isArray(b.members) ? (b.members as Row[]) : [], tables: tables as Record<string, Row[]> };
}

/**
 * Whether the farm holds no record of its own yet (a restore goes only into an empty farm). The starter protocol
 * library a new farm gets at sign-up does not count while nobody has edited it: the backup brings its own library.
 */
async function isFarmEmpty(db: Knex, farmId: string): Promise<boolean> {
  for (const t of backupTables) {
    if (t === "digest_runs" || t === "audit_log" || t === "protocol_sources") continue;
    let q = db(t).where({ farm_id: farmId });
    if (t === "protocols") q = q.where((w) => w.whereNull("starter_key").orWhere("is_farm_own", true).orWhereRaw("updated_at <> created_at"));
    if (await q.first(db.raw("1 as one"))) return false;
  }
  return true;
}

/**
 * Restores `input` (a parsed backup file) into the member's farm, which must be empty. `restorer`: the person doing
 * it; their own user id in the backup (matched by e-mail) becomes theirs here, other people's records keep their
 * rows with "who" left blank, since those people have no account in this farm yet.
 */
export async function restoreBackup(db: Knex, target: { farmId: string; userId: string; email: string }, input: unknown): Promise<RestoreReport> {
  const backup = await readBackupFile(input);
  if (!(await isFarmEmpty(db, target.farmId))) {
    throw refuse("conflict", "This farm already has records. Restore only into a new, empty farm: start a new farm account, then restore there. Nothing was changed.", 409);
  }

  // New ids for every row, so a backup can be restored beside its original (even on the same server).
  const ids = new Map<string, string>();
  for (const t of backupTables) for (const r of backup.tables[t] ?? []) if (typeof r.id === "string") ids.set(r.id, randomUUID());
  const oldUserIds = new Set<string>();
  let restorerOldId: string | null = null;
  for (const m of backup.members) {
    if (typeof m.user_id !== "string") continue;
    oldUserIds.add(m.user_id);
    if (typeof m.email === "string" && m.email.toLowerCase() === target.email.toLowerCase()) restorerOldId = m.user_id;
  }
  const mapValue = (v: unknown): unknown => {
    if (typeof v !== "string") return v;
    if (ids.has(v)) return ids.get(v);
    if (oldUserIds.has(v)) return v === restorerOldId ? target.userId : null;
    return v;
  };

  const report: RestoreReport = {
    restored: {},
    photosWithoutPicture: 0,
    membersToInvite: backup.members
      .filter((m) => m.user_id !== restorerOldId && !m.deleted_at && typeof m.email === "string")
      .map((m) => ({ name: (m.name as string | null) ?? null, email: String(m.email), role: Role.catch("helper").parse(m.role) })), // a backup from before 2026-12-05 says "viewer"
  };

  // Pictures first (files are not transactional): removed again if the rows cannot be written.
  const written: string[] = [];
  const photoPaths = new Map<string, { path: string; mime: string; bytes: number }>();
  try {
    for (const p of backup.tables.photos ?? []) {
      if (typeof p.data !== "string") continue;
      const bytes = Buffer.from(p.data, "base64");
      const mime = sniffImage(bytes);
      if (!mime) throw refuse("invalid", "A photo in this backup is not a JPEG, PNG or WebP picture: the file may be damaged. Nothing was changed.", 422);
      const newId = ids.get(String(p.id))!;
      const rel = await savePhotoFile(target.farmId, newId, mime, bytes);
      written.push(rel);
      photoPaths.set(newId, { path: rel, mime, bytes: bytes.length });
    }

    await db.transaction(async (trx) => {
      const farm = await trx("farms").where({ id: target.farmId }).first("seq");
      const base = Number(farm?.seq ?? 0);
      let top = base + Number(backup.farm.seq ?? 0);
      // The untouched starter library of the new farm gives way to the backup's own protocols.
      await trx("protocol_sources").where({ farm_id: target.farmId }).delete();
      await trx("protocols").where({ farm_id: target.farmId }).delete();
      for (const t of backupTables) {
        const columns = new Set(Object.keys(await trx(t).columnInfo()));
        const out: Row[] = [];
        for (const r of backup.tables[t] ?? []) {
          const row: Row = {};
          for (const [k, v] of Object.entries(r)) if (columns.has(k)) row[k] = mapValue(v);
          row.farm_id = target.farmId;
          if (t === "audit_log") delete row.id; // a counter of this database
          if (typeof row.seq === "number" || typeof row.seq === "string") {
            row.seq = base + Number(row.seq);
            top = Math.max(top, Number(row.seq));
          }
          if (t === "photos") {
            const file = photoPaths.get(String(row.id)) ?? (row.deleted_at ? { path: "", mime: String(row.mime ?? ""), bytes: 0 } : null);
            if (!file) {
              report.photosWithoutPicture++;
              continue;
            }
            Object.assign(row, file);
          }
          out.push(serializeRow(t, row));
        }
        // Chunks keep each statement under SQLite's and PostgreSQL's limits on bound values.
        try {
          for (let i = 0; i < out.length; i += 100) await trx(t).insert(out.slice(i, i + 100));
        } catch (err) {
          // A damaged or hand-edited file: say where, keep the database's words short, change nothing.
          const why = String((err as Error)?.message ?? "").split("\n")[0].slice(-160);
          throw refuse("invalid", `The backup's ${t.replace(/_/g, " ")} could not be restored (${why}). The file may be damaged or edited. Nothing was changed.`, 422);
        }
        report.restored[t] = out.length;
      }
      // Farm settings come along when they are valid settings (the farm's id, counter and dates stay its own).
      const settings = FarmSettings.safeParse(backup.farm);
      await trx("farms").where({ id: target.farmId }).update({ ...(settings.success ? settings.data : {}), seq: top, updated_at: new Date().toISOString() });
    });
  } catch (err) {
    for (const rel of written) await removePhotoFile(rel).catch(() => undefined);
    throw err;
  }
  return report;
}
