import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import knexFactory, { type Knex } from "knex";
import { useDatabase } from "@/lib/server/db";
import { isPostgresUrl, type Dialect } from "@/lib/server/db-config";

// Every route-handler and sync test gets its own empty database with every migration applied, and the
// process's one knex instance (getDb) points at it. TEST_DATABASE_URL=postgres://user:pw@host/db makes
// each one a fresh database on that PostgreSQL server (dropped afterwards); without it, a SQLite file.

export type FreshDatabase = {
  db: Knex;
  /** The DATABASE_URL of this test database (a second process can open it too). */
  url: string;
  /** The SQLite file ("" on PostgreSQL). */
  file: string;
  dialect: Dialect;
  cleanup: () => Promise<void>;
};

/** The database the tests run on. */
export const testDialect: Dialect = isPostgresUrl(process.env.TEST_DATABASE_URL ?? "") ? "pg" : "sqlite";

export async function freshDatabase(): Promise<FreshDatabase> {
  const server = process.env.TEST_DATABASE_URL;
  if (server && isPostgresUrl(server)) return freshPostgres(server);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-test-"));
  const file = path.join(dir, `${randomUUID()}.sqlite`);
  const url = `file:${file}`;
  const db = await useDatabase(url);
  await db.migrate.latest();
  return {
    db,
    url,
    file,
    dialect: "sqlite",
    cleanup: async () => {
      await db.destroy();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Runs `fn` on the server's maintenance connection (the database TEST_DATABASE_URL names). */
async function onServer<T>(server: string, fn: (admin: Knex) => Promise<T>): Promise<T> {
  const admin = knexFactory({ client: "pg", connection: server, pool: { min: 0, max: 1 } });
  try {
    return await fn(admin);
  } finally {
    await admin.destroy();
  }
}

async function freshPostgres(server: string): Promise<FreshDatabase> {
  const name = `rimebook_t_${randomUUID().replace(/-/g, "").slice(0, 20)}`;
  await onServer(server, (admin) => admin.raw(`CREATE DATABASE ${name}`));
  const u = new URL(server);
  u.pathname = `/${name}`;
  const url = u.toString();
  const db = await useDatabase(url);
  await db.migrate.latest();
  return {
    db,
    url,
    file: "",
    dialect: "pg",
    cleanup: async () => {
      await db.destroy();
      await onServer(server, (admin) => admin.raw(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`));
    },
  };
}

/** A boolean column as stored: SQLite keeps 0/1, PostgreSQL true/false. Anything else is a failure. */
export function storedBoolean(value: unknown): boolean {
  if (value === true || value === 1) return true;
  if (value === false || value === 0) return false;
  throw new Error(`not a stored boolean: ${JSON.stringify(value)}`);
}
