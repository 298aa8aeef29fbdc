import "server-only";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import type { Protocol } from "@/lib/schemas/protocol";
import { copyStarterProtocols } from "@/lib/domain/starter-protocols";
import { nextSeq } from "./seq";

// Protocol rows store phases / effective band / toxic-seed flag as JSON text; protocol_sources
// is derived from the phases at every write so sources can be listed and searched.

export type ProtocolWrite = Protocol & {
  id: string;
  starter_key?: string | null;
  source_trial_id?: string | null;
};

/**
 * Inserts or replaces one protocol and its derived source rows (old source rows are tombstoned,
 * so a phone pulling by cursor drops them too). Returns the seq stamped on the protocol.
 */
export async function writeProtocol(trx: Knex.Transaction, farmId: string, p: ProtocolWrite, now = new Date()): Promise<number> {
  const at = now.toISOString();
  const seq = await nextSeq(trx, farmId);
  const columns = {
    species: p.species,
    common_name: p.commonName || null,
    phases: JSON.stringify(p.phases),
    effective_band: p.effectiveBand ? JSON.stringify(p.effectiveBand) : null,
    no_cold_reason: p.noColdReason || null,
    toxic_seed: p.toxicSeed ? JSON.stringify(p.toxicSeed) : null,
    medicinal: p.medicinal,
    is_farm_own: p.isFarmOwn,
    starter_key: p.starter_key ?? null,
    source_trial_id: p.source_trial_id ?? null,
    note: p.note || null,
    updated_at: at,
    seq,
    deleted_at: null,
  };
  const existing = await trx("protocols").where({ id: p.id }).first("farm_id");
  if (existing && existing.farm_id !== farmId) throw new Error("protocol id belongs to another farm");
  if (existing) await trx("protocols").where({ id: p.id }).update(columns);
  else await trx("protocols").insert({ id: p.id, farm_id: farmId, created_at: at, ...columns });

  await trx("protocol_sources").where({ protocol_id: p.id }).whereNull("deleted_at").update({ deleted_at: at, updated_at: at, seq });
  const sources = p.phases.flatMap((phase, phaseIndex) =>
    phase.sources.map((s) => ({
      id: randomUUID(),
      farm_id: farmId,
      created_at: at,
      updated_at: at,
      seq,
      deleted_at: null,
      protocol_id: p.id,
      phase_index: phaseIndex,
      citation: s.citation,
      min_days: s.minDays,
      max_days: s.maxDays,
      band_min_c: s.band?.minC ?? null,
      band_max_c: s.band?.maxC ?? null,
      note: s.note || null,
    })),
  );
  if (sources.length) await trx("protocol_sources").insert(sources);
  return seq;
}

/** Copies the starter library (published sources only) into a new farm; rows are not the farm's own. */
export async function installStarterProtocols(trx: Knex.Transaction, farmId: string, now = new Date()): Promise<number> {
  const starters = copyStarterProtocols();
  for (const s of starters) {
    const { key, citations: _citations, ...protocol } = s;
    await writeProtocol(trx, farmId, { ...protocol, isFarmOwn: false, id: randomUUID(), starter_key: key }, now);
  }
  return starters.length;
}
