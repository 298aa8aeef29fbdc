import type { Knex } from "knex";

// Reminders on the phone by Web Push. Server-only tables (never pulled to phones, never in the backup):
// the push subscriptions each member made on each phone, and one row per person, farm and day that a
// reminder was decided (its primary key is what stops a second job run from sending it again).

// Free text and timestamps as text: PostgreSQL would hold string() to 255 characters (see the text-columns migration).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("push_subscriptions", (t) => {
    t.string("id", 36).primary();
    t.string("farm_id", 36).notNullable().references("id").inTable("farms").onDelete("CASCADE");
    t.string("user_id", 36).notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.string("device_id", 64).notNullable(); // the phone's own id (lib/client/meta.ts), kept across sign-outs
    t.string("session_id", 36).nullable(); // the session that saved it, so signing out there removes it
    t.text("endpoint").notNullable(); // the push service's address for this phone (RFC 8030)
    t.text("p256dh").notNullable(); // the phone's public key and auth secret (RFC 8291)
    t.text("auth").notNullable();
    t.integer("hour").notNullable(); // 0–23 on the farm's clock
    t.text("days").notNullable(); // ISO weekdays, "1234567" = every day
    t.text("created_at").notNullable();
    t.text("updated_at").notNullable();
    t.text("last_sent_at").nullable();
    t.unique(["farm_id", "user_id", "device_id"]); // one per member and phone
    t.index(["user_id"]);
  });

  await knex.schema.createTable("reminder_runs", (t) => {
    t.string("farm_id", 36).notNullable().references("id").inTable("farms").onDelete("CASCADE");
    t.string("user_id", 36).notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.text("day").notNullable(); // the farm's calendar day
    t.text("status").notNullable(); // sending | sent | nothing_due
    t.integer("devices").notNullable().defaultTo(0);
    t.integer("bags").notNullable().defaultTo(0);
    t.text("decided_at").notNullable();
    t.primary(["farm_id", "user_id", "day"]); // one reminder per person per farm per day
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("reminder_runs");
  await knex.schema.dropTableIfExists("push_subscriptions");
}
