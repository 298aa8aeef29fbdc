import "server-only";
import type { Knex } from "knex";
import { migrationSource } from "@/db/migrations";

export type Health = { ok: boolean; database: "up" | "down"; migrations: { current: boolean; pending: string[] } };

/** Database reachable and every migration applied. */
export async function checkHealth(db: Knex): Promise<Health> {
  try {
    await db.raw("select 1");
  } catch {
    return { ok: false, database: "down", migrations: { current: false, pending: [] } };
  }
  const known = await migrationSource.getMigrations([]);
  let applied: string[] = [];
  if (await db.schema.hasTable("knex_migrations")) {
    applied = (await db("knex_migrations").select("name")).map((r: { name: string }) => r.name);
  }
  const pending = known.filter((m) => !applied.includes(m));
  return { ok: pending.length === 0, database: "up", migrations: { current: pending.length === 0, pending } };
}
