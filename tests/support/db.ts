import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { useDatabase } from "@/lib/server/db";

/** A fresh SQLite file with every migration applied; the process's one knex instance points at it. */
export async function freshDatabase(): Promise<{ db: Knex; file: string; cleanup: () => Promise<void> }> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-test-"));
  const file = path.join(dir, `${randomUUID()}.sqlite`);
  const db = await useDatabase(`file:${file}`);
  await db.migrate.latest();
  return {
    db,
    file,
    cleanup: async () => {
      await db.destroy();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}
