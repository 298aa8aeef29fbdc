import type { Knex } from "knex";

// Free text as `text` on PostgreSQL. Knex's string() is varchar(255) there (SQLite ignores declared
// lengths), so a 300-character discard reason the schema allows, a long in-app browser user agent or
// a 254-character e-mail in a rate-limit key was refused by the database as a server error. Every
// varchar(255) column becomes text; the fixed-format columns keep their lengths (uuid ids 36, mutation
// and device ids 64, bag codes 16, the temperature unit 1), each at least the zod schema's maximum
// (tests/api/column-lengths.test.ts). New free-text columns: use t.text().

export async function up(knex: Knex): Promise<void> {
  if (knex.client.config.client !== "pg") return; // SQLite: text already, whatever the declared type
  const columns: { table_name: string; column_name: string }[] = (
    await knex.raw(
      `select table_name, column_name from information_schema.columns
        where table_schema = current_schema() and data_type = 'character varying' and character_maximum_length = 255
          and table_name not like 'knex_migrations%'
        order by table_name, ordinal_position`,
    )
  ).rows;
  const byTable = new Map<string, string[]>();
  for (const c of columns) byTable.set(c.table_name, [...(byTable.get(c.table_name) ?? []), c.column_name]);
  for (const [table, names] of byTable) {
    await knex.raw(`alter table ?? ${names.map(() => "alter column ?? type text").join(", ")}`, [table, ...names]);
  }
}

export async function down(): Promise<void> {
  // Nothing: narrowing text back to varchar(255) could cut stored words short.
}
