import "server-only";
import path from "node:path";
import fs from "node:fs";
import type { Knex } from "knex";
import { migrationSource } from "@/db/migrations";

/** Knex config for a DATABASE_URL: `file:…` (SQLite, the default) or `postgres://…`. */
export function buildKnexConfig(databaseUrl: string): Knex.Config {
  if (databaseUrl.startsWith("postgres://") || databaseUrl.startsWith("postgresql://")) {
    return { client: "pg", connection: databaseUrl, migrations: { migrationSource } };
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
