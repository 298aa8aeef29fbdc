import "server-only";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import type { ProtocolPhase } from "@/lib/schemas/protocol";
import type { MutationArgs } from "@/lib/schemas/mutations";
import { protocolRow } from "@/lib/schemas/mutation-effects";
import { copyStarterProtocols } from "@/lib/domain/starter-protocols";
import { nextSeq } from "./seq";
import { serializeRow } from "./sync/rows";

// Protocol rows store phases / effective band / toxic-seed flag as JSON text; protocol_sources
// is derived from the phases at every write so sources can be listed and searched.

/** A protocol as protocol.upsert carries it (camelCase schema plus id and starter key). */
export type ProtocolWrite = MutationArgs<"protocol.upsert">;

/** Inserts or replaces one protocol and its derived source rows. Returns the seq stamped on it. */
export async function writeProtocol(trx: Knex.Transaction, farmId: string, p: ProtocolWrite, now = new Date()): Promise<number> {
  const at = now.toISOString();
  const seq = await nextSeq(trx, farmId);
  const { id: _id, ...stored } = serializeRow("protocols", protocolRow(p));
  const columns = { ...stored, updated_at: at, seq, deleted_at: null };
  const existing = await trx("protocols").where({ id: p.id }).first("farm_id");
  if (existing && existing.farm_id !== farmId) throw new Error("protocol id belongs to another farm");
  if (existing) await trx("protocols").where({ id: p.id }).update(columns);
  else await trx("protocols").insert({ id: p.id, farm_id: farmId, created_at: at, ...columns });

  await replaceProtocolSources(trx, { farmId, protocolId: p.id, phases: p.phases, seq, at });
  return seq;
}

/**
 * protocol_sources is derived from a protocol's phases (one row per source, so sources can be
 * listed and searched). The old rows are tombstoned with the same seq, so a pulling phone drops them.
 */
export async function replaceProtocolSources(
  trx: Knex.Transaction,
  p: { farmId: string; protocolId: string; phases: readonly ProtocolPhase[]; seq: number; at: string },
): Promise<void> {
  await trx("protocol_sources").where({ protocol_id: p.protocolId }).whereNull("deleted_at").update({ deleted_at: p.at, updated_at: p.at, seq: p.seq });
  const rows = p.phases.flatMap((phase, phaseIndex) =>
    phase.sources.map((s) => ({
      id: randomUUID(),
      farm_id: p.farmId,
      created_at: p.at,
      updated_at: p.at,
      seq: p.seq,
      deleted_at: null,
      protocol_id: p.protocolId,
      phase_index: phaseIndex,
      citation: s.citation,
      min_days: s.minDays,
      max_days: s.maxDays,
      band_min_c: s.band?.minC ?? null,
      band_max_c: s.band?.maxC ?? null,
      note: s.note || null,
    })),
  );
  if (rows.length) await trx("protocol_sources").insert(rows);
}

/** Copies the starter library (published sources only) into a new farm; rows are not the farm's own. */
export async function installStarterProtocols(trx: Knex.Transaction, farmId: string, now = new Date()): Promise<number> {
  const starters = copyStarterProtocols();
  for (const s of starters) {
    const { key, citations: _citations, ...protocol } = s;
    await writeProtocol(trx, farmId, { ...protocol, isFarmOwn: false, id: randomUUID(), starter_key: key, source_trial_id: null }, now);
  }
  return starters.length;
}
