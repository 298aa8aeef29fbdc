import type { Table } from "dexie";
import { effectsOf, type Effect } from "@/lib/schemas/mutation-effects";
import type { MutationArgs, MutationName } from "@/lib/schemas/mutations";
import { farmTables, type OutboxEntry, type RimebookDB } from "./db";
import { META, type PhoneIdentity } from "./meta";

// Writes on the phone: the optimistic rows a mutation makes (the same effects the server applies),
// pulled server rows, and the re-application of still-unsent mutations on top of them.

/** Who wrote a local row and when; local rows carry seq 0 until the server's copy replaces them. */
export type LocalStamp = { farmId: string; userId: string; at: string };

type AnyRow = Record<string, unknown> & { id: string };

/** Tables a local write may touch: farm rows, audit trail, outbox and meta. */
export function writeTables(db: RimebookDB): Table[] {
  return [...farmTables.map((t) => db.table(t)), db.audit_log, db.outbox, db.meta];
}

export function effectsOfEntry(entry: Pick<OutboxEntry, "name" | "args">): Effect[] {
  return effectsOf(entry.name as MutationName, entry.args as MutationArgs<MutationName>);
}

function stampRow(table: string, row: AnyRow, s: LocalStamp): AnyRow {
  const stamped: AnyRow = { ...row, farm_id: s.farmId, created_at: s.at, updated_at: s.at, seq: 0, deleted_at: null };
  if (table === "checks") stamped.checked_by = s.userId;
  return stamped;
}

/** Must run inside a Dexie transaction that covers `writeTables(db)`. */
export async function applyEffectsLocally(db: RimebookDB, effects: Effect[], s: LocalStamp): Promise<void> {
  for (const e of effects) {
    switch (e.op) {
      case "insert": {
        const t = db.table(e.table);
        if (!(await t.get(e.row.id))) await t.put(stampRow(e.table, e.row, s));
        break;
      }
      case "upsert": {
        const t = db.table(e.table);
        const existing = await t.get(e.row.id);
        if (existing) await t.update(e.row.id, { ...e.row, updated_at: s.at });
        else await t.put(stampRow(e.table, e.row, s));
        break;
      }
      case "patch": {
        const t = db.table(e.table);
        const existing = (await t.get(e.id)) as AnyRow | undefined;
        if (!existing) break;
        const fields = e.fillOnly ? Object.fromEntries(Object.entries(e.fields).filter(([k]) => existing[k] === null || existing[k] === undefined)) : e.fields;
        if (Object.keys(fields).length) await t.update(e.id, { ...fields, updated_at: s.at });
        break;
      }
      case "tombstone":
        await db.table(e.table).delete(e.id);
        if (e.with) await db.table(e.with.table).where(e.with.column).equals(e.id).delete();
        break;
      case "farm": {
        const identity = (await db.meta.get(META.identity))?.value as PhoneIdentity | undefined;
        if (identity) await db.meta.put({ key: META.identity, value: { ...identity, farm: { ...identity.farm, ...e.fields } } });
        break;
      }
      case "own_membership":
        await db.memberships.where("user_id").equals(s.userId).modify(e.fields);
        break;
    }
  }
}

/** The rows an effect touches, as "table:id" keys (the farm row as "farms"). */
export function touchedKeys(e: Effect): string[] {
  switch (e.op) {
    case "insert":
    case "upsert":
      return [`${e.table}:${e.row.id}`];
    case "patch":
    case "tombstone":
      return [`${e.table}:${e.id}`];
    case "farm":
      return ["farms"];
    case "own_membership":
      return ["memberships:*"];
  }
}

export type PulledChange = { table: string; row: Record<string, unknown> };

/**
 * Applies one pulled page (call inside a transaction over `writeTables`): server rows replace
 * local ones, tombstones remove them, then every unsent mutation touching those rows is applied
 * again so the phone keeps showing what its person recorded.
 */
export async function applyPulledPage(db: RimebookDB, changes: PulledChange[], s: LocalStamp): Promise<void> {
  const touched = new Set<string>();
  const removed = new Set<string>();
  const known = new Set<string>(farmTables);
  const puts = new Map<string, Record<string, unknown>[]>();
  const deletes = new Map<string, string[]>();
  const audit: Record<string, unknown>[] = [];
  for (const { table, row } of changes) {
    if (table === "audit_log") {
      audit.push(row);
      continue;
    }
    if (!known.has(table)) continue;
    const id = String(row.id);
    touched.add(`${table}:${id}`);
    if (table === "memberships") touched.add("memberships:*");
    if (row.deleted_at) removed.add(`${table}:${id}`);
    const bucket = row.deleted_at ? deletes : puts;
    const list = (bucket.get(table) ?? []) as unknown[];
    list.push(row.deleted_at ? id : row);
    bucket.set(table, list as never);
  }
  // Bulk writes per table: a first pull of thousands of rows stays quick on a phone.
  for (const [table, rows] of puts) await db.table(table).bulkPut(rows);
  for (const [table, ids] of deletes) await db.table(table).bulkDelete(ids);
  if (audit.length) await db.audit_log.bulkPut(audit as never[]);
  touched.add("farms");
  await reapplyPending(db, s, touched, removed);
}

/** Unsent mutations, oldest first, applied again over rows the server just replaced. */
export async function reapplyPending(db: RimebookDB, s: LocalStamp, touched: Set<string> | null, removed: Set<string> = new Set()): Promise<void> {
  const pending = await db.outbox.where("status").equals("pending").sortBy("n");
  for (const entry of pending) {
    // A row the server has deleted is not brought back by its own (already sent) creation.
    const effects = effectsOfEntry(entry).filter((e) => !((e.op === "insert" || e.op === "upsert") && removed.has(touchedKeys(e)[0])));
    if (touched && !effects.some((e) => touchedKeys(e).some((k) => touched.has(k)))) continue;
    await applyEffectsLocally(db, effects, { ...s, at: entry.at });
  }
}

/**
 * After the server refused a mutation: rows it created that the server never confirmed (seq 0) are
 * removed; returns true when it edited rows, whose server state a full pull must restore.
 */
export async function undoRejected(db: RimebookDB, entry: OutboxEntry): Promise<boolean> {
  let needsRepair = false;
  for (const e of effectsOfEntry(entry)) {
    if (e.op === "insert" || e.op === "upsert") {
      const t = db.table(e.table);
      const row = (await t.get(e.row.id)) as AnyRow | undefined;
      if (row && row.seq === 0) await t.delete(e.row.id);
      else if (row) needsRepair = true;
    } else {
      needsRepair = true;
    }
  }
  return needsRepair;
}
