import "server-only";
import { createHash } from "node:crypto";
import type { Knex } from "knex";
import type { Database, Statement } from "better-sqlite3";
import type { PoolClient } from "pg";
import { dialectOf } from "./db-config";

// Knex builds and prepares every query afresh. The reads on every request (the session check, a pull page) run
// here instead, as statements prepared once per connection: better-sqlite3 statements kept per connection, named
// statements on PostgreSQL (pg parses a name once per connection). SQL is written with `?` placeholders.
// The connection comes from knex's own pool, so no knex query or transaction uses it meanwhile.

type Row = Record<string, unknown>;
/** Runs one prepared statement on the held connection. */
export type Query = <T = Row>(sql: string, params: readonly unknown[]) => T[] | Promise<T[]>;

// better-sqlite3 builds row objects through V8's API, one property at a time; reading rows as arrays and naming
// their values here costs about half as much (the pull reads hundreds of rows per page).
type SqliteStatement = { stmt: Statement; columns: string[] | null };
const sqliteStatements = new WeakMap<Database, Map<string, SqliteStatement>>();

function sqliteStatement(conn: Database, sql: string): SqliteStatement {
  let cache = sqliteStatements.get(conn);
  if (!cache) sqliteStatements.set(conn, (cache = new Map()));
  let prepared = cache.get(sql);
  if (!prepared) {
    const stmt = conn.prepare(sql);
    const columns = stmt.reader ? stmt.columns().map((c) => c.name) : null;
    if (columns) stmt.raw(true);
    cache.set(sql, (prepared = { stmt, columns }));
  }
  return prepared;
}

function sqliteAll(conn: Database, sql: string, params: readonly unknown[], stale = false): Row[] {
  if (stale) sqliteStatements.get(conn)?.delete(sql);
  const { stmt, columns } = sqliteStatement(conn, sql);
  if (!columns) {
    stmt.run(...params);
    return [];
  }
  const values = stmt.all(...params) as unknown[][];
  // SQLite re-prepares a statement after a schema change; a `SELECT *` may then be wider (migrations add columns).
  if (values.length && values[0].length !== columns.length) return sqliteAll(conn, sql, params, true);
  const rows: Row[] = new Array(values.length);
  for (let r = 0; r < values.length; r++) {
    const row: Row = {};
    // A name given twice keeps its first place and its last value, as better-sqlite3's own objects do.
    for (let c = 0; c < columns.length; c++) row[columns[c]] = values[r][c];
    rows[r] = row;
  }
  return rows;
}

const pgNames = new Map<string, { name: string; text: string }>();

function pgStatement(sql: string): { name: string; text: string } {
  let named = pgNames.get(sql);
  if (!named) {
    let n = 0;
    const text = sql.replace(/\?/g, () => `$${++n}`);
    named = { name: `rb_${createHash("sha1").update(sql).digest("hex").slice(0, 16)}`, text };
    pgNames.set(sql, named);
  }
  return named;
}

/**
 * Holds one pooled connection for `read` and gives it prepared statements. With `snapshot`, every statement reads
 * as of one moment: a deferred read transaction on SQLite, REPEATABLE READ READ ONLY on PostgreSQL.
 */
export async function withPrepared<T>(db: Knex, read: (query: Query) => Promise<T>, opts: { snapshot?: boolean } = {}): Promise<T> {
  if (dialectOf(db) === "pg") return withPg(db, read, opts.snapshot ?? false);
  const conn = (await db.client.acquireConnection()) as Database;
  const query: Query = <R>(sql: string, params: readonly unknown[]) => sqliteAll(conn, sql, params) as R[];
  try {
    if (!opts.snapshot) return await read(query);
    sqliteAll(conn, "BEGIN", []);
    try {
      const out = await read(query);
      sqliteAll(conn, "COMMIT", []);
      return out;
    } finally {
      if (conn.inTransaction) sqliteAll(conn, "ROLLBACK", []);
    }
  } finally {
    await db.client.releaseConnection(conn);
  }
}

async function withPg<T>(db: Knex, read: (query: Query) => Promise<T>, snapshot: boolean): Promise<T> {
  const conn = (await db.client.acquireConnection()) as PoolClient & { __knex__disposed?: unknown };
  const query: Query = async <R>(sql: string, params: readonly unknown[]) => (await conn.query({ ...pgStatement(sql), values: params as unknown[] })).rows as R[];
  try {
    if (!snapshot) return await read(query);
    await conn.query("BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY");
    try {
      const out = await read(query);
      await conn.query("COMMIT");
      return out;
    } catch (err) {
      // A connection that cannot even roll back is not given back to the pool for reuse.
      await conn.query("ROLLBACK").catch((e: unknown) => (conn.__knex__disposed = e ?? "rollback failed"));
      throw err;
    }
  } finally {
    await db.client.releaseConnection(conn);
  }
}
