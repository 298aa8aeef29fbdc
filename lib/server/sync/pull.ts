import "server-only";
import type { Knex } from "knex";
import { withPrepared, type Query } from "@/lib/server/prepared";
import { parseRowInPlace } from "./rows";

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

type Row = Record<string, unknown>;

// Each table's two reads, as prepared statements (lib/server/prepared.ts): the rows after a seq, and the rows at one.
// The team list carries names and e-mails; password hashes and other people's sessions never leave.
const fromClause = (table: PullTable) =>
  table === "memberships" ? `SELECT m.*, u.name AS name, u.email AS email FROM memberships m JOIN users u ON u.id = m.user_id WHERE m.farm_id = ?` : `SELECT * FROM ${table} WHERE farm_id = ?`;
const seqOf = (table: PullTable) => (table === "memberships" ? "m.seq" : "seq");
const afterSql = Object.fromEntries(pullTables.map((t) => [t, `${fromClause(t)} AND ${seqOf(t)} > ? ORDER BY ${seqOf(t)} LIMIT ?`])) as Record<PullTable, string>;
const atSql = Object.fromEntries(pullTables.map((t) => [t, `${fromClause(t)} AND ${seqOf(t)} = ?`])) as Record<PullTable, string>;
const FARM_SQL = "SELECT id, name, last_frost_date, location_note, temperature_unit, weekly_check_days, timezone, seq FROM farms WHERE id = ? LIMIT 1";

function present(table: PullTable, raw: Record<string, unknown>): Change {
  const row = parseRowInPlace(table, raw); // rows fresh from this page's reads
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
 * so a snapshot that sees a seq sees every lower one: a read transaction on SQLite, REPEATABLE READ on PostgreSQL.
 */
export async function pullChanges(db: Knex, farmId: string, since: number, limit: number): Promise<PullPage> {
  return withPrepared(db, (query) => readPage(query, farmId, since, limit), { snapshot: true });
}

async function readPage(query: Query, farmId: string, since: number, limit: number): Promise<PullPage> {
  const [farm] = await query<FarmSettingsRow & { seq: number }>(FARM_SQL, [farmId]);
  const head = Number(farm?.seq ?? 0);
  // A cursor ahead of the server (restored database): start again from the beginning.
  const from = since > head ? 0 : since;

  // One row more than a page per table: a table that fills the page exactly is then known to end there, so the
  // answer is not marked truncated and the phone is not sent an empty extra page.
  // One table after another: a transaction is one connection, and pg only queues queries sent to it at once
  // (deprecated in node-postgres 8, an error from 9).
  const perTable: { table: PullTable; r: Row; seq: number }[][] = [];
  for (const table of pullTables) {
    const rows = await query(afterSql[table], [farmId, from, limit + 1]);
    perTable.push(rows.map((r) => ({ table, r, seq: Number(r.seq) })));
  }
  const merged = perTable.flat().sort((a, b) => a.seq - b.seq);
  const truncated = merged.length > limit;
  let page = merged.slice(0, limit);
  let cursor = page.length ? page[page.length - 1].seq : from;
  let more = false;

  if (truncated) {
    // Rows written by one change share a seq: never split them across pages. A table whose read reached past the
    // cursor's seq, or ended before the page did, already gave every row it has at that seq (they were read in seq
    // order); only a table cut off at the cursor's seq itself may hold more there, so only that one is read again.
    const overflow = merged.slice(limit);
    const rest: typeof page = [];
    for (const [i, table] of pullTables.entries()) {
      const rows = perTable[i];
      if (rows.length > limit && rows[rows.length - 1].seq === cursor) {
        const taken = new Set(page.filter((p) => p.table === table).map((p) => String(p.r.id)));
        for (const r of await query(atSql[table], [farmId, cursor])) if (!taken.has(String(r.id))) rest.push({ table, r, seq: cursor });
        more = true; // its rows after that seq were not read
      } else {
        for (const p of overflow) if (p.table === table && p.seq === cursor) rest.push(p);
      }
    }
    page = page.concat(rest);
    // More also if a row after the cursor is known. Otherwise the rows that overflowed all shared the cursor's seq.
    more ||= overflow.some((p) => p.seq > cursor);
  }
  // Everything up to the farm's counter has been seen (some changes write no pulled row).
  if (!more) cursor = Math.max(head, cursor);
  const { seq: _seq, ...settings } = farm ?? { id: farmId, name: "", seq: 0 };
  return { cursor, changes: page.map((p) => present(p.table, p.r)), more, head, farm: settings as FarmSettingsRow };
}
