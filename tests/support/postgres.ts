import { randomUUID } from "node:crypto";
import knexFactory, { type Knex } from "knex";

// Test databases on the PostgreSQL server TEST_DATABASE_URL names (`npm test` sets it for its
// PostgreSQL pass): each test file gets its own, created empty and dropped afterwards.

export const isPostgresUrl = (url: string) => /^postgres(ql)?:\/\//.test(url);

/** The PostgreSQL server the tests run on, or null for SQLite. */
export const testServerUrl = (): string | null => {
  const url = process.env.TEST_DATABASE_URL ?? "";
  return isPostgresUrl(url) ? url : null;
};

/** Runs `fn` on the server's maintenance connection (the database TEST_DATABASE_URL names). */
async function onServer<T>(server: string, fn: (admin: Knex) => Promise<T>): Promise<T> {
  const admin = knexFactory({ client: "pg", connection: server, pool: { min: 0, max: 1 } });
  try {
    return await fn(admin);
  } finally {
    await admin.destroy();
  }
}

/** A new, empty database on the server; `drop` removes it even while something is still connected. */
export async function createPostgresDatabase(server: string): Promise<{ url: string; drop: () => Promise<void> }> {
  const name = `rimebook_t_${randomUUID().replace(/-/g, "").slice(0, 20)}`;
  await onServer(server, (admin) => admin.raw(`CREATE DATABASE ${name}`));
  const u = new URL(server);
  u.pathname = `/${name}`;
  return { url: u.toString(), drop: () => dropDatabase(server, name) };
}

/** FORCE ends our own leftover connections, but a non-superuser may not end an autovacuum worker
 *  (42501); plain DROP DATABASE stops autovacuum by itself, so that case falls back to it. */
async function dropDatabase(server: string, name: string): Promise<void> {
  for (let attempt = 0; ; attempt++) {
    try {
      const sql = attempt === 0 ? `DROP DATABASE IF EXISTS ${name} WITH (FORCE)` : `DROP DATABASE IF EXISTS ${name}`;
      await onServer(server, (admin) => admin.raw(sql));
      return;
    } catch (err) {
      const code = (err as { code?: string }).code;
      // 42501: not allowed to end a worker; 55006: still in use (a worker between tasks).
      if (attempt >= 10 || (code !== "42501" && code !== "55006")) throw err;
      await new Promise((r) => setTimeout(r, 300));
    }
  }
}
