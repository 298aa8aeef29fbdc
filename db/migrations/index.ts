import type { Knex } from "knex";
import * as m20261202000000 from "./20261202000000_initial";
import * as m20261204100000 from "./20261204100000_text_columns";
import * as m20261204130000 from "./20261204130000_push_reminders";
import * as m20261205100000 from "./20261205100000_visitor_role";

// Explicit list so migrations run the same under the knex CLI, vitest and the built server.
// Add a migration: create db/migrations/<timestamp>_<what>.ts and append it here. Never edit one that shipped.
const migrations: Record<string, Knex.Migration> = {
  "20261202000000_initial": m20261202000000,
  "20261204100000_text_columns": m20261204100000,
  "20261204130000_push_reminders": m20261204130000,
  "20261205100000_visitor_role": m20261205100000,
};

export const migrationSource: Knex.MigrationSource<string> = {
  getMigrations: async () => Object.keys(migrations).sort(),
  getMigrationName: (name) => name,
  getMigration: async (name) => migrations[name],
};
