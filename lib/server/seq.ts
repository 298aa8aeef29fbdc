import "server-only";
import type { Knex } from "knex";
import { dialectOf } from "./db-config";

/**
 * Hands out the farm's next change counter; every synced write stamps its row with it. The UPDATE
 * takes the farm row's lock and the transaction keeps it until it commits, so writers of one farm
 * commit in seq order: a pull that sees a seq has also seen every lower one (lib/server/sync/pull.ts).
 * Hence a transaction only: outside one the lock would end at once.
 */
export async function nextSeq(trx: Knex.Transaction, farmId: string): Promise<number> {
  const [row] = await trx("farms").where({ id: farmId }).increment("seq", 1).returning("seq");
  if (!row) throw new Error(`farm ${farmId} missing`);
  return Number(row.seq);
}

/**
 * Takes the farm row's lock for the rest of the transaction without handing out a seq: for checks
 * that count rows before changing them (the last Owner). SQLite has one writer at a time already.
 */
export async function lockFarm(trx: Knex.Transaction, farmId: string): Promise<void> {
  if (dialectOf(trx) === "pg") await trx("farms").where({ id: farmId }).forUpdate().first("id");
}

export const nowIso = () => new Date().toISOString();
