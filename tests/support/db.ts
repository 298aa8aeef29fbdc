import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { useDatabase } from "@/lib/server/db";
import type { Dialect } from "@/lib/server/db-config";
import { createPostgresDatabase, testServerUrl } from "./postgres";

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
export const testDialect: Dialect = testServerUrl() ? "pg" : "sqlite";

export async function freshDatabase(): Promise<FreshDatabase> {
  const server = testServerUrl();
  if (server) return freshPostgres(server);
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

async function freshPostgres(server: string): Promise<FreshDatabase> {
  const { url, drop } = await createPostgresDatabase(server);
  const db = await useDatabase(url);
  await db.migrate.latest();
  return {
    db,
    url,
    file: "",
    dialect: "pg",
    cleanup: async () => {
      await db.destroy();
      await drop();
    },
  };
}

/** A boolean column as stored: SQLite keeps 0/1, PostgreSQL true/false. Anything else is a failure. */
export function storedBoolean(value: unknown): boolean {
  if (value === true || value === 1) return true;
  if (value === false || value === 0) return false;
  throw new Error(`not a stored boolean: ${JSON.stringify(value)}`);
}
