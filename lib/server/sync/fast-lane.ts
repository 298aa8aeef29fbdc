import "server-only";
import type { Knex } from "knex";
import { notFound } from "@/lib/errors";
import type { Mutation, MutationName } from "@/lib/schemas/mutations";
import { effectsOf, rowReferences, type RowValues } from "@/lib/schemas/mutation-effects";
import { bindable, withRawSqlite, type Prepare } from "@/lib/server/raw-sqlite";
import { admit, labelOf, refusalOf, stampedRow, takenIdError, type PushMember, type RejectedMutation } from "./apply";

// The push's fast lane on SQLite, for the mutations a phone sends by the thousand (checks, readings): one
// plain insert each, no guard. A chunk runs in one BEGIN IMMEDIATE on the raw connection with prepared
// statements; each mutation's refusal (schema, role, a row of another farm, a missing bag or store, a
// replayed or foreign id) is decided from reads inside that transaction before it writes anything, so no
// savepoint is needed and a refused mutation writes only its refusal record, as the general path leaves it.
// The farm's seq is read once and written once per chunk. Answers, rows, seqs and records are the general
// path's (tests/api/sync-lane.test.ts compares them); anything unexpected rolls the chunk back and the
// caller applies it through the general path instead.

export type Outcome = "applied" | RejectedMutation["error"];

/** Mutations the lane applies: a single insert with no guard and no special row rule beyond a reading's twin. */
export const laneNames: ReadonlySet<MutationName> = new Set<MutationName>(["check.record", "reading.record"]);

/** The most mutations a lane chunk takes; it commits sooner when its time budget is spent. */
export const LANE_CHUNK = 1000;
/**
 * How long a chunk may hold the event loop and the write lock: pulls and other requests are served between
 * chunks, each of whose queries may wait for one chunk. Well under the ~25 ms a request may be held up by.
 */
export const LANE_BUDGET_MS = 8;

const RECORD_SQL =
  "INSERT INTO applied_mutations (id, farm_id, user_id, device_id, name, applied_at, outcome, error) VALUES (?, ?, ?, ?, ?, ?, ?, ?) " +
  "ON CONFLICT (id) DO UPDATE SET farm_id = excluded.farm_id, user_id = excluded.user_id, device_id = excluded.device_id, name = excluded.name, " +
  "applied_at = excluded.applied_at, outcome = excluded.outcome, error = excluded.error " +
  "WHERE applied_mutations.outcome = 'rejected' AND applied_mutations.farm_id = ?";

type Seen = { farm_id: string; outcome: string };

/**
 * Applies lane mutations from the start of `chunk` until its time budget is spent: the outcomes of those it
 * took (at least one), or null when it rolled back on an unexpected error (nothing written).
 */
export async function applyLaneChunk(db: Knex, member: PushMember, deviceId: string, chunk: Mutation[], now: () => Date): Promise<Outcome[] | null> {
  try {
    return await withRawSqlite(db, (conn, prepare) => conn.transaction(() => writeChunk(prepare, member, deviceId, chunk, now)).immediate());
  } catch (err) {
    console.error("[rimebook] push: the fast lane rolled a chunk back; applying it mutation by mutation", err);
    return null;
  }
}

function writeChunk(prepare: Prepare, member: PushMember, deviceId: string, chunk: Mutation[], now: () => Date): Outcome[] {
  const { farmId, userId } = member;
  // Read inside the write lock: another process may have applied some of these ids a moment ago.
  const seen = new Map<string, Seen>();
  const seenRows = prepare("SELECT id, farm_id, outcome FROM applied_mutations WHERE id IN (SELECT value FROM json_each(?))").all(JSON.stringify(chunk.map((m) => m.id))) as (Seen & { id: string })[];
  for (const r of seenRows) seen.set(r.id, r);
  const farm = prepare("SELECT seq FROM farms WHERE id = ?").get(farmId) as { seq: number } | undefined;
  if (!farm) throw new Error(`farm ${farmId} missing`);
  const seqBefore = Number(farm.seq);
  let seq = seqBefore;
  const farmOf = rowFarms(prepare);
  const record = prepare(RECORD_SQL);
  const outcomes: Outcome[] = [];
  const started = performance.now();
  for (const m of chunk) {
    if (outcomes.length && performance.now() - started > LANE_BUDGET_MS) break;
    const at = now().toISOString();
    const before = seen.get(m.id);
    if (before && before.farm_id !== farmId) {
      outcomes.push(takenIdError());
      continue;
    }
    if (before?.outcome === "applied") {
      outcomes.push("applied"); // a replay: report it, change nothing
      continue;
    }
    let row: { table: "checks" | "readings"; values: RowValues } | null = null;
    let refused: RejectedMutation["error"] | null = null;
    try {
      row = newRow(prepare, farmOf, farmId, m, admit(member, m));
    } catch (err) {
      refused = refusalOf(m.name, err);
      if (!refused) throw err;
    }
    record.run(m.id, farmId, userId, deviceId, m.name, at, refused ? "rejected" : "applied", refused ? JSON.stringify(refused) : null, farmId);
    if (row) {
      const stored = stampedRow(row.table, row.values, member, at, ++seq);
      const columns = Object.keys(stored);
      prepare(`INSERT INTO ${row.table} (${columns.map((c) => `"${c}"`).join(", ")}) VALUES (${columns.map(() => "?").join(", ")})`).run(columns.map((c) => bindable(stored[c])));
      farmOf.set(row.table, row.values.id, farmId);
    }
    seen.set(m.id, { farm_id: farmId, outcome: refused ? "rejected" : "applied" });
    outcomes.push(refused ?? "applied");
  }
  if (seq !== seqBefore) prepare("UPDATE farms SET seq = ? WHERE id = ?").run(seq, farmId);
  return outcomes;
}

/**
 * The row a lane mutation adds, or null when there is nothing to add (the same row id sent again under another
 * mutation id, a reading already taken at that moment in that store); throws the refusal. The general path's
 * insertRow rules, in its order.
 */
function newRow(prepare: Prepare, farmOf: RowFarms, farmId: string, m: Mutation, args: unknown): { table: "checks" | "readings"; values: RowValues } | null {
  const [effect] = effectsOf(m.name, args as never);
  if (effect?.op !== "insert" || (effect.table !== "checks" && effect.table !== "readings")) throw new Error(`${m.name} is not a lane mutation`);
  const { table, row } = effect;
  const existing = farmOf.get(table, row.id);
  if (existing !== null) {
    if (existing !== farmId) throw notFound(labelOf(table)); // another farm's row is reported as missing
    return null;
  }
  for (const [column, target] of Object.entries(rowReferences[table] ?? {})) {
    const id = row[column];
    if (id === null || id === undefined) continue;
    if (farmOf.get(target, String(id)) !== farmId) throw notFound(labelOf(target));
  }
  if (table === "readings" && prepare("SELECT 1 FROM readings WHERE store_id = ? AND taken_at = ?").get(bindable(row.store_id), bindable(row.taken_at))) return null;
  return { table, values: row };
}

type RowFarms = { get: (table: string, id: string) => string | null; set: (table: string, id: string, farmId: string) => void };

/**
 * Which farm each row a chunk names belongs to (null: no such row), read once per chunk and kept up to date with
 * the chunk's own inserts. Only checks and readings change inside the lane, so the bags and stores it refers
 * to are read once per chunk.
 */
function rowFarms(prepare: Prepare): RowFarms {
  const known = new Map<string, string | null>();
  const key = (table: string, id: string) => `${table}\u0000${id}`;
  return {
    get(table, id) {
      const k = key(table, id);
      let farm = known.get(k);
      if (farm === undefined) {
        farm = (prepare(`SELECT farm_id FROM ${table} WHERE id = ?`).get(id) as { farm_id: string } | undefined)?.farm_id ?? null;
        known.set(k, farm);
      }
      return farm;
    },
    set: (table, id, farmId) => void known.set(key(table, id), farmId),
  };
}
