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
  return { url: u.toString(), drop: () => onServer(server, (admin) => admin.raw(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`)).then(() => undefined) };
}
