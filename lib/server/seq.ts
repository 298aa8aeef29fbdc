import "server-only";
import type { Knex } from "knex";

/** Hands out the farm's next change counter; every synced write stamps its row with it. */
export async function nextSeq(trx: Knex.Transaction | Knex, farmId: string): Promise<number> {
  await trx("farms").where({ id: farmId }).increment("seq", 1);
  const row = await trx("farms").where({ id: farmId }).first("seq");
  if (!row) throw new Error(`farm ${farmId} missing`);
  return Number(row.seq);
}

export const nowIso = () => new Date().toISOString();
