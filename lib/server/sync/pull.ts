import "server-only";
import type { Knex } from "knex";
import { readInSnapshot } from "@/lib/server/db-config";
import { parseRow } from "./rows";

// The pull feed: every row of the member's farm written after a cursor, in seq order, tombstones
// included, one page at a time. The cursor is the farm's change counter (farms.seq).

/** Tables the phone mirrors, plus the audit trail that bag history shows. */
export const pullTables = [
  "protocols", "lots", "stores", "readings", "bags", "checks", "photos", "sowings", "counts",
  "trials", "trial_arms", "plan_items", "memberships", "audit_log",
] as const;
export type PullTable = (typeof pullTables)[number];

export type Change = { table: PullTable; row: Record<string, unknown> };
export type FarmSettingsRow = {
  id: string; name: string; last_frost_date: string | null; location_note: string | null;
  temperature_unit: string; weekly_check_days: number; timezone: string;
};
export type PullPage = {
  cursor: number;
  changes: Change[];
  more: boolean;
  /** The farm's latest change counter: with `cursor` it gives a first pull its progress. */
  head: number;
  farm: FarmSettingsRow;
};

function selectFor(db: Knex.Transaction, table: PullTable, farmId: string) {
  if (table === "memberships") {
    // The team list carries names and e-mails; password hashes and other people's sessions never leave.
    return db("memberships as m")
      .join("users as u", "u.id", "m.user_id")
      .where("m.farm_id", farmId)
      .select("m.*", "u.name as name", "u.email as email");
  }
  if (table === "protocols" || table === "photos") return db(table).where("farm_id", farmId).select(`${table}.*`);
  return db(table).where("farm_id", farmId).select("*");
}

const seqColumn = (table: PullTable) => (table === "memberships" ? "m.seq" : `${table}.seq`);

function present(table: PullTable, raw: Record<string, unknown>): Change {
  const row = parseRow(table, raw);
  if (table === "photos") {
    row.url = `/api/uploads/${String(row.id)}`;
    delete row.path; // where the file sits on the server's disk is nobody's business
  }
  return { table, row };
}

/**
 * One page, read from one consistent snapshot: the farm's head and every table as of the same moment.
 * Read on separate pooled connections, a seq committed between two reads could be passed by the
 * cursor and never reach the phone. Writers commit in seq order (nextSeq holds the farm row's lock),
 * so a snapshot that sees a seq sees every lower one. On SQLite the one connection already serialises.
 */
export async function pullChanges(db: Knex, farmId: string, since: number, limit: number): Promise<PullPage> {
  return readInSnapshot(db, (trx) => readPage(trx, farmId, since, limit));
}

async function eachInTurn<T, R>(items: readonly T[], fn: (item: T) => Promise<R>): Promise<R[]> {
  const out: R[] = [];
  for (const item of items) out.push(await fn(item));
  return out;
}

async function readPage(db: Knex.Transaction, farmId: string, since: number, limit: number): Promise<PullPage> {
  const farm = await db("farms")
    .where({ id: farmId })
    .first("id", "name", "last_frost_date", "location_note", "temperature_unit", "weekly_check_days", "timezone", "seq");
  const head = Number(farm?.seq ?? 0);
  // A cursor ahead of the server (restored database): start again from the beginning.
  const from = since > head ? 0 : since;

  // One row more than a page per table: a table that fills the page exactly is then known to end there, so the
  // answer is not marked truncated and the phone is not sent an empty extra page.
  // One table after another: a transaction is one connection, and pg only queues queries sent to it at once
  // (deprecated in node-postgres 8, an error from 9).
  const perTable = await eachInTurn(pullTables, async (table) => {
    const rows: Record<string, unknown>[] = await selectFor(db, table, farmId).where(seqColumn(table), ">", from).orderBy(seqColumn(table)).limit(limit + 1);
    return rows.map((r) => ({ table, r, seq: Number(r.seq) }));
  });
  const merged = perTable.flat().sort((a, b) => a.seq - b.seq);
  const truncated = merged.length > limit;
  let page = merged.slice(0, limit);
  let cursor = page.length ? page[page.length - 1].seq : from;
  let more = false;

  if (truncated) {
    // Rows written by one change share a seq: never split them across pages.
    const taken = new Set(page.map((p) => `${p.table}:${String(p.r.id)}`));
    const rest = await eachInTurn(pullTables, async (table) => {
      const rows: Record<string, unknown>[] = await selectFor(db, table, farmId).where(seqColumn(table), "=", cursor);
      return rows.map((r) => ({ table, r, seq: cursor }));
    });
    page = page.concat(rest.flat().filter((p) => !taken.has(`${p.table}:${String(p.r.id)}`)));
    // More only if a row after the cursor is known, or a table was cut off at the cursor's seq itself (its rows
    // after that seq were not read). Otherwise the rows that overflowed all shared the cursor's seq.
    more = merged.some((p) => p.seq > cursor) || perTable.some((rows) => rows.length > limit && rows[rows.length - 1].seq === cursor);
  }
  // Everything up to the farm's counter has been seen (some changes write no pulled row).
  if (!more) cursor = Math.max(head, cursor);
  const { seq: _seq, ...settings } = farm ?? { id: farmId, name: "", seq: 0 };
  return { cursor, changes: page.map((p) => present(p.table, p.r)), more, head, farm: settings as FarmSettingsRow };
}
