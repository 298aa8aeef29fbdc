import "server-only";
import knexFactory, { type Knex } from "knex";
import { env } from "./env";
import { buildKnexConfig } from "./db-config";

// One knex instance per process (kept on globalThis so dev reloads do not open more).
const g = globalThis as unknown as { __rimebookDb?: Knex };

export function getDb(): Knex {
  if (!g.__rimebookDb) g.__rimebookDb = knexFactory(buildKnexConfig(env.DATABASE_URL));
  return g.__rimebookDb;
}

/** Tests point the process at a fresh file; closes any previous instance. */
export async function useDatabase(databaseUrl: string): Promise<Knex> {
  if (g.__rimebookDb) await g.__rimebookDb.destroy();
  g.__rimebookDb = knexFactory(buildKnexConfig(databaseUrl));
  return g.__rimebookDb;
}
