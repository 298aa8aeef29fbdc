import type { Knex } from "knex";

// The read-only role is called "visitor" (shown "Visitor"), no longer "viewer". Members and open
// invitations keep their place: their rows are renamed. The role columns are plain strings on both
// databases (20261202000000_initial made them with t.string, no enum and no CHECK constraint, and
// 20261204100000_text_columns widened them to text on PostgreSQL), so no table is rebuilt; the allowed
// values live in lib/schemas/vocabulary.ts, which still reads a stray "viewer" as "visitor".
//
// Each renamed membership takes a new farm change counter, so phones pull the row again. Knex runs
// the migration in one transaction (the farm rows stay locked until it commits).

export async function up(knex: Knex): Promise<void> {
  await renameRole(knex, "viewer", "visitor");
}

export async function down(knex: Knex): Promise<void> {
  await renameRole(knex, "visitor", "viewer"); // for a rollback to code that only knows "viewer"
}

async function renameRole(knex: Knex, from: string, to: string): Promise<void> {
  const at = new Date().toISOString();
  const farms: { farm_id: string }[] = await knex("memberships").distinct("farm_id").where({ role: from });
  for (const { farm_id } of farms) {
    await knex("farms").where({ id: farm_id }).increment("seq", 1);
    const farm = await knex("farms").where({ id: farm_id }).first("seq");
    await knex("memberships").where({ farm_id, role: from }).update({ role: to, seq: Number(farm.seq), updated_at: at });
  }
  await knex("invites").where({ role: from }).update({ role: to });
}
