import type { Knex } from "knex";

// The whole data model of ARCHITECTURE.md. Timestamps are ISO-8601 UTC strings and calendar
// dates are "yyyy-MM-dd" strings, so SQLite and PostgreSQL store them alike.

/** Columns every farm-owned, synced row carries. */
function farmOwned(t: Knex.CreateTableBuilder) {
  t.string("id", 36).primary(); // client-generated UUID
  t.string("farm_id", 36).notNullable().references("id").inTable("farms").onDelete("CASCADE");
  t.string("created_at").notNullable();
  t.string("updated_at").notNullable();
  t.bigInteger("seq").notNullable(); // farm-wide change counter at the last write, for pull
  t.string("deleted_at").nullable(); // tombstone
  t.index(["farm_id", "seq"]);
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("farms", (t) => {
    t.string("id", 36).primary();
    t.string("name").notNullable();
    t.string("last_frost_date").nullable(); // average last spring frost, "MM-dd"
    t.string("location_note").nullable();
    t.string("temperature_unit", 1).notNullable().defaultTo("C");
    t.integer("weekly_check_days").notNullable().defaultTo(7);
    t.string("timezone").notNullable().defaultTo("UTC");
    t.bigInteger("seq").notNullable().defaultTo(0); // last change counter handed out
    t.string("created_at").notNullable();
    t.string("updated_at").notNullable();
    t.string("deleted_at").nullable();
  });

  await knex.schema.createTable("users", (t) => {
    t.string("id", 36).primary();
    t.string("email").notNullable().unique(); // stored lower-cased
    t.string("name").notNullable();
    t.string("password_hash").notNullable();
    t.string("created_at").notNullable();
    t.string("updated_at").notNullable();
    t.string("deleted_at").nullable();
  });

  await knex.schema.createTable("memberships", (t) => {
    farmOwned(t);
    t.string("user_id", 36).notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.string("role").notNullable(); // owner | grower | helper | viewer
    t.boolean("digest_opt_in").notNullable().defaultTo(false);
    t.unique(["farm_id", "user_id"]);
    t.index(["user_id"]);
  });

  await knex.schema.createTable("sessions", (t) => {
    t.string("id", 36).primary();
    t.string("user_id", 36).notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.string("farm_id", 36).notNullable().references("id").inTable("farms").onDelete("CASCADE");
    t.string("created_at").notNullable();
    t.string("last_seen_at").notNullable();
    t.string("expires_at").notNullable();
    t.string("revoked_at").nullable();
    t.string("user_agent").nullable();
    t.index(["user_id"]);
  });

  await knex.schema.createTable("invites", (t) => {
    t.string("id", 36).primary();
    t.string("farm_id", 36).notNullable().references("id").inTable("farms").onDelete("CASCADE");
    t.string("email").notNullable();
    t.string("role").notNullable();
    t.string("token_hash").notNullable().unique();
    t.string("invited_by", 36).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.string("created_at").notNullable();
    t.string("expires_at").notNullable();
    t.string("accepted_at").nullable();
    t.string("revoked_at").nullable();
    t.index(["farm_id"]);
  });

  await knex.schema.createTable("password_resets", (t) => {
    t.string("id", 36).primary();
    t.string("user_id", 36).notNullable().references("id").inTable("users").onDelete("CASCADE");
    t.string("token_hash").notNullable().unique();
    t.string("created_at").notNullable();
    t.string("expires_at").notNullable();
    t.string("used_at").nullable();
  });

  await knex.schema.createTable("auth_attempts", (t) => {
    t.increments("id");
    t.string("key").notNullable(); // "email:…" or "ip:…"
    t.string("at").notNullable();
    t.boolean("ok").notNullable();
    t.index(["key", "at"]);
  });

  await knex.schema.createTable("protocols", (t) => {
    farmOwned(t);
    t.string("species").notNullable(); // botanical name
    t.string("common_name").nullable();
    t.text("phases").notNullable(); // JSON: ordered phases, each with its sources (lib/schemas/protocol.ts)
    t.text("effective_band").nullable(); // JSON {minC, maxC}; null = default 0–10 °C
    t.text("no_cold_reason").nullable();
    t.text("toxic_seed").nullable(); // JSON {citation, verified, note}
    t.boolean("medicinal").notNullable().defaultTo(false);
    t.boolean("is_farm_own").notNullable().defaultTo(true); // false = starter library row with published sources
    t.string("starter_key").nullable();
    t.string("source_trial_id", 36).nullable();
    t.text("note").nullable();
    t.index(["farm_id", "species"]);
  });

  await knex.schema.createTable("protocol_sources", (t) => {
    farmOwned(t);
    t.string("protocol_id", 36).notNullable().references("id").inTable("protocols").onDelete("CASCADE");
    // Derived on the server from protocols.phases at each upsert, so sources can be listed and searched.
    t.integer("phase_index").notNullable();
    t.text("citation").notNullable();
    t.integer("min_days").nullable();
    t.integer("max_days").nullable();
    t.float("band_min_c").nullable();
    t.float("band_max_c").nullable();
    t.text("note").nullable();
    t.index(["protocol_id"]);
  });

  await knex.schema.createTable("lots", (t) => {
    farmOwned(t);
    t.string("species").notNullable();
    t.string("common_name").nullable();
    t.string("source").nullable(); // vendor, collection site, seed library
    t.integer("year").nullable();
    t.integer("quantity").nullable(); // seeds on hand
    t.string("protocol_id", 36).nullable().references("id").inTable("protocols").onDelete("SET NULL");
    t.boolean("treated").notNullable().defaultTo(false);
    t.text("notes").nullable();
  });

  await knex.schema.createTable("stores", (t) => {
    farmOwned(t);
    t.string("name").notNullable();
    t.string("kind").notNullable(); // fridge | freezer | cold_frame
    t.text("boxes").notNullable().defaultTo("[]"); // JSON list of box/shelf names
    t.boolean("holds_food").notNullable().defaultTo(false);
    t.text("notes").nullable();
  });

  await knex.schema.createTable("readings", (t) => {
    farmOwned(t);
    t.string("store_id", 36).notNullable().references("id").inTable("stores").onDelete("CASCADE");
    t.string("taken_at").notNullable();
    t.float("temperature_c").notNullable();
    t.string("origin").notNullable().defaultTo("manual"); // manual | check | import
    t.string("check_id", 36).nullable();
    t.unique(["store_id", "taken_at"]); // a logger re-import adds no duplicates
  });

  await knex.schema.createTable("bags", (t) => {
    farmOwned(t);
    t.string("code", 16).notNullable();
    t.string("lot_id", 36).notNullable().references("id").inTable("lots");
    t.string("protocol_id", 36).nullable().references("id").inTable("protocols").onDelete("SET NULL");
    t.string("store_id", 36).nullable().references("id").inTable("stores").onDelete("SET NULL");
    t.string("box").nullable();
    t.string("medium").notNullable().defaultTo("paper_towel");
    t.integer("seed_count").nullable();
    t.string("start_date").nullable(); // null while planned
    t.string("planned_start_date").nullable();
    t.string("window_start").nullable(); // snapshot from lib/domain at the last write
    t.string("window_end").nullable();
    t.string("pulled_on").nullable();
    t.string("sown_on").nullable();
    t.string("discarded_on").nullable();
    t.string("discard_reason").nullable();
    t.string("trial_arm_id", 36).nullable();
    t.string("plan_item_id", 36).nullable();
    t.integer("check_every_days").nullable();
    t.text("note").nullable();
    t.unique(["farm_id", "code"]);
    t.index(["farm_id", "store_id"]);
    t.index(["lot_id"]);
  });

  await knex.schema.createTable("checks", (t) => {
    farmOwned(t);
    t.string("bag_id", 36).notNullable().references("id").inTable("bags").onDelete("CASCADE");
    t.string("checked_at").notNullable();
    t.string("checked_by", 36).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.string("moisture").notNullable();
    t.string("mould").notNullable();
    t.string("sprouts").notNullable();
    t.text("actions").notNullable().defaultTo("[]"); // JSON list of check actions
    t.text("note").nullable();
    t.float("temperature_c").nullable();
    t.index(["bag_id", "checked_at"]);
  });

  await knex.schema.createTable("photos", (t) => {
    farmOwned(t);
    t.string("bag_id", 36).notNullable().references("id").inTable("bags").onDelete("CASCADE");
    t.string("check_id", 36).nullable().references("id").inTable("checks").onDelete("SET NULL");
    t.string("path").notNullable();
    t.string("mime").notNullable();
    t.integer("bytes").notNullable();
    t.string("uploaded_by", 36).nullable().references("id").inTable("users").onDelete("SET NULL");
    t.index(["bag_id"]);
  });

  await knex.schema.createTable("sowings", (t) => {
    farmOwned(t);
    t.string("bag_id", 36).notNullable().references("id").inTable("bags").onDelete("CASCADE");
    t.string("sown_on").notNullable();
    t.string("tray").nullable();
    t.integer("cells").nullable();
    t.integer("seeds_sown").notNullable();
    t.text("note").nullable();
    t.index(["bag_id"]);
  });

  await knex.schema.createTable("counts", (t) => {
    farmOwned(t);
    t.string("sowing_id", 36).notNullable().references("id").inTable("sowings").onDelete("CASCADE");
    t.string("counted_on").notNullable();
    t.integer("germinated_total").notNullable(); // cumulative seedlings up at this count
    t.text("note").nullable();
    t.index(["sowing_id", "counted_on"]);
  });

  await knex.schema.createTable("trials", (t) => {
    farmOwned(t);
    t.string("name").notNullable();
    t.string("lot_id", 36).nullable().references("id").inTable("lots").onDelete("SET NULL");
    t.text("question").nullable();
    t.text("notes").nullable();
  });

  await knex.schema.createTable("trial_arms", (t) => {
    farmOwned(t);
    t.string("trial_id", 36).notNullable().references("id").inTable("trials").onDelete("CASCADE");
    t.string("label").notNullable();
    t.text("treatment").nullable(); // plain words: "freezer 60 days on sand"
    t.integer("position").notNullable().defaultTo(0);
    t.index(["trial_id"]);
  });

  await knex.schema.createTable("plan_items", (t) => {
    farmOwned(t);
    t.integer("season").notNullable(); // sowing year
    t.string("species").notNullable();
    t.string("lot_id", 36).nullable().references("id").inTable("lots").onDelete("SET NULL");
    t.string("protocol_id", 36).nullable().references("id").inTable("protocols").onDelete("SET NULL");
    t.integer("target_plants").notNullable();
    t.text("sowing_rule").notNullable(); // JSON: {anchor: "frost"|"date", weeks, place, date?}
    t.float("expected_germination").nullable();
    t.float("expected_survival").nullable();
    t.string("bag_id", 36).nullable();
    t.text("note").nullable();
  });

  await knex.schema.createTable("applied_mutations", (t) => {
    t.string("id", 64).primary(); // the client's mutation id: a replay is recognised here
    t.string("farm_id", 36).notNullable().references("id").inTable("farms").onDelete("CASCADE");
    t.string("user_id", 36).nullable();
    t.string("device_id", 64).nullable();
    t.string("name").notNullable();
    t.string("applied_at").notNullable();
    t.string("outcome").notNullable(); // applied | rejected
    t.text("error").nullable();
  });

  await knex.schema.createTable("audit_log", (t) => {
    t.increments("id");
    t.string("farm_id", 36).notNullable().references("id").inTable("farms").onDelete("CASCADE");
    t.string("table_name").notNullable();
    t.string("row_id", 36).notNullable();
    t.string("field").notNullable();
    t.text("old_value").nullable();
    t.text("new_value").nullable();
    t.string("mutation_id", 64).nullable();
    t.string("user_id", 36).nullable();
    t.string("at").notNullable();
    t.bigInteger("seq").notNullable();
    t.index(["farm_id", "seq"]);
    t.index(["table_name", "row_id"]);
  });

  await knex.schema.createTable("digest_runs", (t) => {
    t.string("farm_id", 36).notNullable().references("id").inTable("farms").onDelete("CASCADE");
    t.string("day").notNullable();
    t.string("sent_at").notNullable();
    t.integer("recipients").notNullable();
    t.primary(["farm_id", "day"]); // one digest per farm per day
  });
}

export async function down(knex: Knex): Promise<void> {
  const tables = [
    "digest_runs", "audit_log", "applied_mutations", "plan_items", "trial_arms", "trials", "counts",
    "sowings", "photos", "checks", "bags", "readings", "stores", "lots", "protocol_sources", "protocols",
    "auth_attempts", "password_resets", "invites", "sessions", "memberships", "users", "farms",
  ];
  for (const t of tables) await knex.schema.dropTableIfExists(t);
}
