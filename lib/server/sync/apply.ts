import "server-only";
import { replaceProtocolSources } from "@/lib/server/protocols";
import type { Knex } from "knex";
import { ZodError } from "zod";
import { AppError, notFound } from "@/lib/errors";
import { canRun, mutationTable, type Mutation, type MutationArgs, type MutationName, type PushRequest } from "@/lib/schemas/mutations";
import { judgeCountEntry, pickDailyTotals } from "@/lib/domain/count-rules";
import { assertStoreCanBeDeleted } from "@/lib/domain/store-rules";
import { effectsOf, rowReferences, sameValue, type Effect, type EffectTable, type RowValues } from "@/lib/schemas/mutation-effects";
import type { ProtocolPhase } from "@/lib/schemas/protocol";
import { vocabularyLabels, type Role } from "@/lib/schemas/vocabulary";
import { assertWellFormedText, fieldsOf } from "@/lib/server/http";
import { isUniqueViolation } from "@/lib/server/db-errors";
import { nextSeq } from "@/lib/server/seq";
import { dialectOf } from "@/lib/server/db-config";
import { applyLaneChunk, laneNames, LANE_CHUNK, type Outcome } from "./fast-lane";
import { auditText, parseRow, serializeRow } from "./rows";

// Applies a phone's pushed mutations. Each runs in its own transaction together with its
// applied_mutations row, so a push cut off half-way and sent again applies everything exactly
// once, and one refused mutation never holds up the ones after it.

export type PushMember = { userId: string; farmId: string; role: Role };
export type RejectedMutation = { id: string; error: { code: string; message: string; fields?: Record<string, string> } };
export type PushResult = { applied: string[]; rejected: RejectedMutation[] };

/** Rejections the phone should simply send again later (nothing wrong with the mutation itself). */
export const retryableCodes = new Set(["server_error"]);

const CHUNK = 100;
type Seen = { farm_id: string; outcome: string };

type Ctx = { trx: Knex.Transaction; member: PushMember; mutationId: string; at: string };

export type ApplyOptions = { now?: () => Date; /** false: the general path only (tests compare the two). */ lane?: boolean };

export async function applyPush(db: Knex, member: PushMember, push: PushRequest, options: ApplyOptions = {}): Promise<PushResult> {
  const now = options.now ?? (() => new Date());
  const result: PushResult = { applied: [], rejected: [] };
  // Which ids were seen before (replays, earlier refusals): one look-up per general chunk, for the ids this push
  // has not met yet (the fast lane reads its own inside its transaction).
  const seen = new Map<string, Seen>();
  const lookUp = async (chunk: Mutation[]) => {
    const ids = [...new Set(chunk.map((m) => m.id))].filter((id) => !seen.has(id));
    if (!ids.length) return;
    const rows: (Seen & { id: string })[] = await db("applied_mutations").whereIn("id", ids).select("id", "farm_id", "outcome");
    for (const r of rows) seen.set(r.id, r);
  };
  const report = (chunk: Mutation[], outcomes: Outcome[]) =>
    chunk.forEach((m, j) => {
      const outcome = outcomes[j];
      if (outcome === "applied") result.applied.push(m.id);
      else result.rejected.push({ id: m.id, error: outcome });
    });
  // Runs of checks and readings take the fast lane on SQLite (lib/server/sync/fast-lane.ts); the rest, and
  // everything on PostgreSQL, the general path below.
  const lane = (options.lane ?? true) && dialectOf(db) === "sqlite";
  const inLane = (m: Mutation) => lane && laneNames.has(m.name);
  const list = push.mutations;
  for (let i = 0; i < list.length; ) {
    const fast = inLane(list[i]);
    let j = i + 1;
    while (j < list.length && j - i < (fast ? LANE_CHUNK : CHUNK) && inLane(list[j]) === fast) j++;
    let chunk = list.slice(i, j);
    let outcomes = fast ? await applyLaneChunk(db, member, push.deviceId, chunk, now) : null;
    if (outcomes) {
      chunk = chunk.slice(0, outcomes.length); // the lane stops at its time budget; the rest is the next chunk
      for (const [k, m] of chunk.entries()) if (outcomes[k] === "applied" || !seen.has(m.id)) seen.set(m.id, { farm_id: member.farmId, outcome: outcomes[k] === "applied" ? "applied" : "rejected" });
    } else {
      chunk = chunk.slice(0, CHUNK);
      await lookUp(chunk);
      outcomes = await applyChunk(db, member, push.deviceId, chunk, now, seen);
    }
    report(chunk, outcomes);
    i += chunk.length;
    // Let pulls and other requests in between chunks of a big push.
    if (fast && i < list.length) await new Promise((resolve) => setImmediate(resolve));
  }
  return result;
}

// Commits are the slow part on SQLite: a chunk shares one outer transaction, and each mutation
// runs in its own nested transaction (a savepoint) inside it, so a refused one rolls back alone.
function applyChunk(db: Knex, member: PushMember, deviceId: string, chunk: Mutation[], now: () => Date, seen: Map<string, Seen>): Promise<Outcome[]> {
  return db.transaction(async (outer) => {
    const list: Outcome[] = [];
    for (const m of chunk) {
      const outcome = await applyOne(outer, member, deviceId, m, now().toISOString(), seen);
      // The same id twice in one push: the second is a replay of the first.
      seen.set(m.id, { farm_id: member.farmId, outcome: outcome === "applied" ? "applied" : "rejected" });
      list.push(outcome);
    }
    return list;
  });
}

async function applyOne(db: Knex.Transaction, member: PushMember, deviceId: string, m: Mutation, at: string, seenIds: Map<string, Seen>): Promise<"applied" | RejectedMutation["error"]> {
  const seen = seenIds.get(m.id);
  if (seen && seen.farm_id !== member.farmId) return takenIdError();
  if (seen?.outcome === "applied") return "applied"; // a replay: report it, change nothing

  // The mutation's own record. It never overwrites an applied record (the first push's who and where
  // stay), only a refusal of this farm's that a later push now applies. No row back: someone else's.
  const record = async (trx: Knex.Transaction, outcome: "applied" | "rejected", error: unknown = null): Promise<boolean> => {
    const rows = await trx("applied_mutations")
      .insert({
        id: m.id,
        farm_id: member.farmId,
        user_id: member.userId,
        device_id: deviceId,
        name: m.name,
        applied_at: at,
        outcome,
        error: error ? JSON.stringify(error) : null,
      })
      .onConflict("id")
      .merge()
      .where("applied_mutations.outcome", "rejected")
      .andWhere("applied_mutations.farm_id", member.farmId)
      .returning("id");
    return rows.length > 0;
  };
  /** Another push (another process, another connection) recorded this mutation first. */
  const recordedElsewhere = async (): Promise<"applied" | RejectedMutation["error"] | null> => {
    const row: Seen | undefined = await db("applied_mutations").where({ id: m.id }).first("farm_id", "outcome");
    if (row && row.farm_id !== member.farmId) return takenIdError();
    return row?.outcome === "applied" ? "applied" : null;
  };

  let error: RejectedMutation["error"];
  try {
    const args = admit(member, m);
    const apply = () =>
      db.transaction(async (trx): Promise<"applied" | RejectedMutation["error"]> => {
        // Claim the mutation first: the same mutation pushed by another process at the same moment
        // waits here for that push to commit, then finds it applied and changes nothing (a replay).
        if (!(await record(trx, "applied"))) return (await recordedElsewhere()) ?? "applied";
        const ctx: Ctx = { trx, member, mutationId: m.id, at };
        await guards[m.name]?.(ctx, args as never);
        for (const effect of effectsOf(m.name, args as never)) await applyEffect(ctx, effect);
        return "applied";
      });
    try {
      return await apply();
    } catch (err) {
      // A row this mutation writes was written by another request at the same moment (the same row id
      // under another mutation id, a twin reading, a taken bag code): apply it again, now seeing that row.
      if (!isUniqueViolation(err)) throw err;
      const elsewhere = await recordedElsewhere();
      if (elsewhere) return elsewhere;
      return await apply();
    }
  } catch (err) {
    const refused = refusalOf(m.name, err);
    if (!refused) {
      console.error("[rimebook] push: unexpected error applying", m.name, err);
      return { code: "server_error", message: "The server could not save this change just now; it will be sent again." };
    }
    error = refused;
  }
  if (!(await record(db, "rejected", error))) return (await recordedElsewhere()) ?? error;
  return error;
}

/** The answer for a mutation refused by `err`; null for an unexpected error (nothing wrong with the mutation). */
export function refusalOf(name: MutationName, err: unknown): RejectedMutation["error"] | null {
  if (err instanceof ZodError) return { code: "invalid", message: `Some of this ${describe(name)} is not right.`, fields: fieldsOf(err) };
  if (err instanceof AppError) return { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) };
  // Still taken after a fresh look: sending it again would not help, so it is refused, not retried.
  if (isUniqueViolation(err)) return { code: "conflict", message: `This ${describe(name)} clashes with a record saved at the same moment. It was not saved.` };
  return null;
}

/** Checks a mutation's text, schema and the member's role; its parsed args, or throws the refusal. */
export function admit<N extends MutationName>(member: PushMember, m: Mutation & { name: N }): MutationArgs<N> {
  assertWellFormedText(m.args); // half an emoji refuses this mutation alone (the push skips the check)
  const args = mutationTable[m.name].args.parse(m.args) as MutationArgs<N>;
  if (!canRun(member.role, m.name)) {
    throw new AppError("forbidden", `A ${vocabularyLabels.role[member.role]} cannot do this (${describe(m.name)}). Ask the farm's owner.`);
  }
  return args;
}

export const takenIdError = (): RejectedMutation["error"] => ({ code: "conflict", message: "This change's id is already taken. It was not saved." });

function describe(name: MutationName): string {
  const [entity, verb] = name.split(".");
  return `${entity} ${verb}`.replace("plan ", "plan item ");
}

/** Rules of the trade a mutation must pass before its effects, the same lib/domain rules the phone runs. */
const guards: { [N in MutationName]?: (ctx: Ctx, args: MutationArgs<N>) => Promise<void> } = {
  "store.delete": async (ctx, { id }) => {
    const store = await ownRow(ctx, "stores", id);
    if (!store || store.deleted_at) return; // the tombstone reports a missing store; a second delete changes nothing
    const bags = await ctx.trx("bags").where({ farm_id: ctx.member.farmId, store_id: id }).select("code", "pulled_on", "sown_on", "discarded_on", "deleted_at");
    assertStoreCanBeDeleted(String(store.name), bags);
  },
  "count.record": checkCountRises,
};

/**
 * A running total may not fall below the sowing's nearest earlier count, rise above a later one, nor pass the
 * seeds sown (an offline phone may not have seen another phone's counts): the phone's own rule, judgeCountEntry.
 * A recount of the same day replaces it.
 */
async function checkCountRises(ctx: Ctx, count: MutationArgs<"count.record">): Promise<void> {
  if (await ctx.trx("counts").where({ id: count.id }).first("id")) return; // the same count sent again: the first is kept
  const sowing = await ctx.trx("sowings").where({ id: count.sowing_id, farm_id: ctx.member.farmId }).first("sown_on", "seeds_sown");
  if (!sowing) return; // the insert reports the missing sowing
  const counts = await ctx.trx("counts").where({ sowing_id: count.sowing_id }).whereNull("deleted_at").select("counted_on", "germinated_total", "created_at");
  const verdict = judgeCountEntry({
    sownOn: sowing.sown_on,
    seedsSown: sowing.seeds_sown,
    countedOn: count.counted_on,
    total: count.germinated_total,
    totals: pickDailyTotals(counts),
  });
  if (!verdict.ok) throw new AppError("domain", verdict.message);
}

/** The row must be this farm's: a row of another farm is reported as missing, never as someone else's. */
async function ownRow(ctx: Ctx, table: EffectTable, id: string): Promise<Record<string, unknown> | undefined> {
  const row = await ctx.trx(table).where({ id }).first();
  if (row && row.farm_id !== ctx.member.farmId) throw notFound(labelOf(table));
  return row;
}

/**
 * Every reference must name a row on the farm now, inside this mutation's transaction: never an id merely
 * seen earlier in the push, whose mutation may have been refused and rolled back.
 */
async function assertReferences(ctx: Ctx, table: EffectTable, values: Record<string, unknown>): Promise<void> {
  for (const [column, target] of Object.entries(rowReferences[table] ?? {})) {
    const id = values[column];
    if (id === null || id === undefined) continue;
    const row = await ctx.trx(target).where({ id, farm_id: ctx.member.farmId }).first("id");
    if (!row) throw notFound(labelOf(target));
  }
}

async function applyEffect(ctx: Ctx, e: Effect): Promise<void> {
  switch (e.op) {
    case "insert":
      return insertRow(ctx, e.table, e.row);
    case "upsert": {
      const existing = await ownRow(ctx, e.table, e.row.id);
      if (!existing) return insertRow(ctx, e.table, e.row);
      const { id, ...fields } = e.row;
      return patchRow(ctx, e.table, existing, { ...fields, deleted_at: null }, false);
    }
    case "patch": {
      const existing = await ownRow(ctx, e.table, e.id);
      if (!existing || existing.deleted_at) throw notFound(labelOf(e.table));
      return patchRow(ctx, e.table, existing, e.fields, e.fillOnly ?? false);
    }
    case "tombstone": {
      const existing = await ownRow(ctx, e.table, e.id);
      if (!existing) throw notFound(labelOf(e.table));
      if (existing.deleted_at) return;
      await patchRow(ctx, e.table, existing, { deleted_at: ctx.at }, false);
      // Each dependent row gets its own seq, so other phones pull its tombstone too.
      if (!e.with) return;
      const { table, column } = e.with;
      const dependents = await ctx.trx(table).where({ farm_id: ctx.member.farmId, [column]: e.id }).whereNull("deleted_at");
      for (const row of dependents) await patchRow(ctx, table, row, { deleted_at: ctx.at }, false);
      return;
    }
    case "farm":
      return patchFarm(ctx, e.fields);
    case "own_membership": {
      const existing = await ctx.trx("memberships").where({ farm_id: ctx.member.farmId, user_id: ctx.member.userId }).whereNull("deleted_at").first();
      if (!existing) throw notFound("Your membership");
      return patchRow(ctx, "memberships", existing, e.fields, false);
    }
  }
}

async function insertRow(ctx: Ctx, table: EffectTable, row: RowValues): Promise<void> {
  const { trx, member, at } = ctx;
  // Same row id sent again under another mutation id (e.g. a re-queued check): keep the first.
  if (await ownRow(ctx, table, row.id)) return;
  await assertReferences(ctx, table, row);
  if (table === "readings") {
    const twin = await trx("readings").where({ store_id: row.store_id, taken_at: row.taken_at }).first("id");
    if (twin) return; // a reading at the same moment in the same store is already recorded
  }
  if (table === "bags") {
    const twin = await trx("bags").where({ farm_id: member.farmId, code: row.code }).first("id");
    if (twin) {
      throw new AppError("conflict", `Another bag already has the code ${String(row.code)}. Give this bag a new label.`, { code: "This code is taken." });
    }
  }
  const seq = await nextSeq(trx, member.farmId);
  await trx(table).insert(stampedRow(table, row, member, at, seq));
  if (table === "protocols") await replaceProtocolSources(ctx.trx, { farmId: ctx.member.farmId, protocolId: row.id, phases: row.phases as ProtocolPhase[], seq: seq, at: ctx.at });
}

/** A new row as stored: the server's own columns stamped, JSON columns as text. */
export function stampedRow(table: EffectTable, row: RowValues, member: PushMember, at: string, seq: number): Record<string, unknown> {
  const stamped: Record<string, unknown> = { ...row, farm_id: member.farmId, created_at: at, updated_at: at, seq, deleted_at: null };
  if (table === "checks") stamped.checked_by = member.userId;
  return serializeRow(table, stamped);
}

/** Later arrival wins field by field; each value it replaces is kept in audit_log. */
async function patchRow(ctx: Ctx, table: EffectTable, stored: Record<string, unknown>, fields: Record<string, unknown>, fillOnly: boolean): Promise<void> {
  const { trx, member, at } = ctx;
  const current = parseRow(table, stored);
  const changed = Object.entries(fields).filter(([k, v]) => k !== "id" && !sameValue(current[k], v) && (!fillOnly || current[k] === null || current[k] === undefined));
  if (changed.length === 0) return;
  await assertReferences(ctx, table, Object.fromEntries(changed));
  const seq = await nextSeq(trx, member.farmId);
  const values = Object.fromEntries(changed);
  await trx(table).where({ id: stored.id }).update(serializeRow(table, { ...values, updated_at: at, seq }));
  await trx("audit_log").insert(
    changed.map(([field, value]) => ({
      farm_id: member.farmId,
      table_name: table,
      row_id: String(stored.id),
      field,
      old_value: auditText(current[field]),
      new_value: auditText(value),
      mutation_id: ctx.mutationId,
      user_id: member.userId,
      at,
      seq,
    })),
  );
  if (table === "protocols" && "phases" in values) await replaceProtocolSources(ctx.trx, { farmId: ctx.member.farmId, protocolId: String(stored.id), phases: values.phases as ProtocolPhase[], seq: seq, at: ctx.at });
}

async function patchFarm(ctx: Ctx, fields: Record<string, unknown>): Promise<void> {
  const { trx, member, at } = ctx;
  const farm = await trx("farms").where({ id: member.farmId }).first();
  if (!farm) throw notFound("The farm");
  const changed = Object.entries(fields).filter(([k, v]) => !sameValue(farm[k], v));
  if (changed.length === 0) return;
  const seq = await nextSeq(trx, member.farmId);
  await trx("farms").where({ id: member.farmId }).update({ ...Object.fromEntries(changed), updated_at: at });
  await trx("audit_log").insert(
    changed.map(([field, value]) => ({
      farm_id: member.farmId, table_name: "farms", row_id: member.farmId, field,
      old_value: auditText(farm[field]), new_value: auditText(value), mutation_id: ctx.mutationId, user_id: member.userId, at, seq,
    })),
  );
}

const tableLabels: Record<EffectTable, string> = {
  protocols: "That protocol", lots: "That seed lot", stores: "That cold store", readings: "That reading", bags: "That bag",
  checks: "That check", photos: "That photo", sowings: "That sowing", counts: "That count", trials: "That trial",
  trial_arms: "That trial arm", plan_items: "That plan item", memberships: "That member",
};
export const labelOf = (table: EffectTable) => tableLabels[table];
