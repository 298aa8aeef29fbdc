import "server-only";
import path from "node:path";
import fs from "node:fs";
import type { Knex } from "knex";
import pg from "pg";
import { migrationSource } from "@/db/migrations";

export type Dialect = "sqlite" | "pg";

export const isPostgresUrl = (databaseUrl: string) => /^postgres(ql)?:\/\//.test(databaseUrl);

// PostgreSQL hands int8 (bigint columns such as seq, and every count(*)) back as strings, since
// they may pass 2^53. Seq counters and counts never come near that, and the app and the phone
// compare them as numbers, as SQLite returns them. Set once per process, before any query.
pg.types.setTypeParser(pg.types.builtins.INT8, (v: string) => Number(v));

/** Knex config for a DATABASE_URL: `file:…` (SQLite, the default) or `postgres://…`. */
export function buildKnexConfig(databaseUrl: string): Knex.Config {
  if (isPostgresUrl(databaseUrl)) {
    // Several app processes may share one server: each keeps a modest pool.
    return { client: "pg", connection: databaseUrl, pool: { min: 0, max: 10 }, migrations: { migrationSource } };
  }
  const filename = databaseUrl === ":memory:" ? ":memory:" : path.resolve(databaseUrl.replace(/^file:/, ""));
  if (filename !== ":memory:") fs.mkdirSync(path.dirname(filename), { recursive: true });
  return {
    client: "better-sqlite3",
    connection: { filename },
    useNullAsDefault: true,
    migrations: { migrationSource },
    pool: {
      min: 1,
      max: 1,
      afterCreate(conn: { pragma: (s: string) => unknown }, done: (err: Error | null, conn: unknown) => void) {
        // WAL lets readers go on while a push writes; foreign keys are off by default in SQLite.
        conn.pragma("journal_mode = WAL");
        conn.pragma("foreign_keys = ON");
        conn.pragma("busy_timeout = 5000");
        conn.pragma("synchronous = NORMAL");
        done(null, conn);
      },
    },
  };
}

/** Which database a knex instance talks to. */
export function dialectOf(db: Knex | Knex.Transaction): Dialect {
  return db.client.config.client === "pg" ? "pg" : "sqlite";
}

/**
 * Runs several reads as of one moment: a REPEATABLE READ, read-only transaction on PostgreSQL (each
 * query of a request may otherwise see a different set of commits); SQLite's one connection already
 * reads inside the transaction's snapshot. For anything that must add up across tables: a pull page, a backup.
 */
export function readInSnapshot<T>(db: Knex, read: (trx: Knex.Transaction) => Promise<T>): Promise<T> {
  return db.transaction(async (trx) => {
    if (dialectOf(trx) === "pg") await trx.raw("set transaction isolation level repeatable read, read only");
    return read(trx);
  });
}
