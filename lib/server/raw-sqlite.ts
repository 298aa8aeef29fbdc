import "server-only";
import type { Knex } from "knex";
import type BetterSqlite3 from "better-sqlite3";

// Hot paths on SQLite talk to better-sqlite3 directly, with statements prepared once per connection:
// Knex prepares every query anew (STACK.md, fact 15). The connection is borrowed from Knex's pool,
// whose only connection it is (max 1), so nothing else of this process runs on it meanwhile.

export type RawSqlite = BetterSqlite3.Database;
export type Prepare = (sql: string) => BetterSqlite3.Statement;

const statements = new WeakMap<RawSqlite, Map<string, BetterSqlite3.Statement>>();

/** Runs `use` synchronously on the pool's better-sqlite3 connection, with a cache of prepared statements. */
export async function withRawSqlite<T>(db: Knex, use: (conn: RawSqlite, prepare: Prepare) => T): Promise<T> {
  const conn = (await db.client.acquireConnection()) as RawSqlite;
  try {
    let cache = statements.get(conn);
    if (!cache) statements.set(conn, (cache = new Map()));
    const known = cache;
    const prepare: Prepare = (sql) => {
      let stmt = known.get(sql);
      if (!stmt) known.set(sql, (stmt = conn.prepare(sql)));
      return stmt;
    };
    return use(conn, prepare);
  } finally {
    await db.client.releaseConnection(conn);
  }
}

/** A value as Knex would bind it to better-sqlite3 (booleans as 0/1, nothing as NULL). */
export function bindable(value: unknown): unknown {
  if (value === undefined) return null;
  if (typeof value === "boolean") return value ? 1 : 0;
  if (value instanceof Date) return value.valueOf();
  return value;
}
