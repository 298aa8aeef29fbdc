import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { z } from "zod";
import { freshDatabase, testDialect, type FreshDatabase } from "../support/db";
import { memberRequest, signedInMember, TEST_PASSWORD } from "../support/auth";
import { uuid } from "../support/sync";
import { env } from "@/lib/server/env";
import { mutationTable, Mutation, PushRequest } from "@/lib/schemas/mutations";
import { InviteInput, SignUpInput } from "@/lib/schemas/account";
import { POST as push } from "@/app/api/sync/push/route";
import { POST as signUp } from "@/app/api/auth/sign-up/route";
import { POST as signIn } from "@/app/api/auth/sign-in/route";

// Every value a zod schema lets through fits its column. SQLite never enforces a declared length;
// PostgreSQL does (Knex string() is varchar(255) there), so a longer value became a server error the
// phone retries for ever. The behaviour tests run on both databases; the column comparison reads
// PostgreSQL's catalogue.

const origin = new URL(env.APP_ORIGIN).origin;
const ctx = { params: Promise.resolve({}) };

/** Longest string a schema accepts, or null when it sets no limit or is not a string. */
function maxLengthOf(schema: z.ZodType): number | null {
  const def = (schema as unknown as { def: Record<string, unknown> }).def;
  switch (def.type) {
    case "optional":
    case "nullable":
    case "default":
    case "prefault":
      return maxLengthOf(def.innerType as z.ZodType);
    case "pipe":
      return maxLengthOf(def.in as z.ZodType);
    case "enum":
      return Math.max(...Object.values(def.entries as Record<string, string>).map((v) => String(v).length));
    case "string": {
      if (def.format === "uuid") return 36;
      const s = schema as unknown as { maxLength: number | null };
      return s.maxLength ?? null;
    }
    default:
      return null;
  }
}

const snake = (k: string) => k.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);
const shapeOf = (schema: z.ZodType): Record<string, z.ZodType> | null => {
  const def = (schema as unknown as { def: Record<string, unknown> }).def;
  if (def.type === "object") return (schema as unknown as z.ZodObject).shape as Record<string, z.ZodType>;
  if (def.type === "optional" || def.type === "nullable" || def.type === "default") return shapeOf(def.innerType as z.ZodType);
  return null;
};

const tableOfEntity: Record<string, string> = {
  farm: "farms", member: "memberships", protocol: "protocols", lot: "lots", store: "stores", reading: "readings", bag: "bags",
  check: "checks", sowing: "sowings", count: "counts", trial: "trials", plan: "plan_items",
};

/** (table, column, longest accepted value) for every string field of every schema that is stored as a column. */
function schemaLimits(): { table: string; column: string; max: number | null; from: string }[] {
  const out: { table: string; column: string; max: number | null; from: string }[] = [];
  const add = (table: string, schema: z.ZodType, from: string) => {
    for (const [key, field] of Object.entries(shapeOf(schema) ?? {})) {
      const nested = shapeOf(field);
      if (key === "patch" && nested) add(table, field, `${from}.patch`);
      else out.push({ table, column: snake(key), max: maxLengthOf(field), from: `${from}.${key}` });
      const items = (field as unknown as { def: { type: string; element?: z.ZodType } }).def;
      if (key === "arms" && items.type === "array" && items.element) add("trial_arms", items.element, `${from}.arms[]`);
    }
  };
  for (const [name, { args }] of Object.entries(mutationTable)) add(tableOfEntity[name.split(".")[0]], args as z.ZodType, name);
  add("users", SignUpInput.pick({ email: true, name: true }), "SignUpInput");
  out.push({ table: "farms", column: "name", max: maxLengthOf(SignUpInput.shape.farmName), from: "SignUpInput.farmName" });
  add("invites", InviteInput, "InviteInput");
  out.push({ table: "applied_mutations", column: "id", max: maxLengthOf(Mutation.shape.id), from: "Mutation.id" });
  out.push({ table: "audit_log", column: "mutation_id", max: maxLengthOf(Mutation.shape.id), from: "Mutation.id" });
  out.push({ table: "applied_mutations", column: "name", max: maxLengthOf(Mutation.shape.name), from: "Mutation.name" });
  out.push({ table: "applied_mutations", column: "device_id", max: maxLengthOf(PushRequest.shape.deviceId), from: "PushRequest.deviceId" });
  return out;
}

let t: FreshDatabase;
let db: Knex;
beforeAll(async () => {
  t = await freshDatabase();
  db = t.db;
});
afterAll(async () => t.cleanup());

describe("column lengths against the schemas", () => {
  it.skipIf(testDialect !== "pg")("PostgreSQL: every schema's longest accepted string fits its column, and free text has no limit", async () => {
    const rows: { table_name: string; column_name: string; max: number }[] = (
      await db.raw(
        `select table_name, column_name, character_maximum_length as max from information_schema.columns
          where table_schema = current_schema() and character_maximum_length is not null and table_name not like 'knex_migrations%'`,
      )
    ).rows;
    const limit = new Map(rows.map((r) => [`${r.table_name}.${r.column_name}`, Number(r.max)]));
    const limits = schemaLimits();
    expect(limits.length).toBeGreaterThan(80); // the walk found the schemas' fields
    const tooShort = limits
      .filter((l) => limit.has(`${l.table}.${l.column}`))
      .filter((l) => l.max === null || l.max > limit.get(`${l.table}.${l.column}`)!)
      .map((l) => `${l.from} (${l.max ?? "no limit"}) > ${l.table}.${l.column} (${limit.get(`${l.table}.${l.column}`)})`);
    expect(tooShort).toEqual([]);
    // What still has a length is a fixed format: ids (and the user ids of checked_by, invited_by…), bag codes, the unit.
    const fixed = rows.filter((r) => !/(^|_)id$|_by$/.test(r.column_name) && !["code", "temperature_unit"].includes(r.column_name));
    expect(fixed.map((r) => `${r.table_name}.${r.column_name}(${r.max})`)).toEqual([]);
  });

  it("a 500-character discard reason (the schema's limit) is applied and kept whole", async () => {
    const grower = await signedInMember(db, { role: "grower" });
    const lotId = uuid();
    const bagId = uuid();
    const reason = "Mould spread through the whole bag after the fridge door was left ajar overnight. ".repeat(7).slice(0, 500);
    expect(reason).toHaveLength(500);
    const at = "2026-11-20T08:00:00.000Z";
    const res = await push(
      memberRequest("/api/sync/push", grower, {
        method: "POST",
        json: {
          deviceId: "d1",
          mutations: [
            { id: uuid(), name: "lot.create", args: { id: lotId, species: "Aquilegia canadensis", source: "s".repeat(200) }, at },
            { id: uuid(), name: "bag.create", args: { id: bagId, code: "LONG-01", lot_id: lotId, start_date: "2026-11-01", box: "b".repeat(60) }, at },
            { id: uuid(), name: "bag.discard", args: { id: bagId, discarded_on: "2026-11-20", discard_reason: reason }, at },
          ],
        },
      }),
      ctx,
    );
    const body = await res.json();
    expect(body.rejected).toEqual([]);
    expect(body.applied).toHaveLength(3);
    expect((await db("bags").where({ id: bagId }).first("discard_reason")).discard_reason).toBe(reason);
  });

  it("signs up and signs in from a phone whose in-app browser sends a 306-character user agent", async () => {
    const userAgent = `Mozilla/5.0 (Linux; Android 14; Pixel 8 Build/UQ1A.240205.004; wv) AppleWebKit/537.36 (KHTML, like Gecko) Version/4.0 Chrome/131.0.6778.135 Mobile Safari/537.36 ${"InAppBrowser/1.0 ".repeat(12)}`.slice(0, 306);
    expect(userAgent).toHaveLength(306);
    const email = `long-agent-${uuid().slice(0, 8)}@example.test`;
    const headers = { "content-type": "application/json", origin, "user-agent": userAgent, "x-forwarded-for": "203.0.113.77" };
    const up = await signUp(new Request(new URL("/api/auth/sign-up", origin), { method: "POST", headers, body: JSON.stringify({ email, password: TEST_PASSWORD, name: "Long Agent", farmName: "Agent farm" }) }), ctx);
    expect(up.status).toBe(201);
    const signedIn = await signIn(new Request(new URL("/api/auth/sign-in", origin), { method: "POST", headers, body: JSON.stringify({ email, password: TEST_PASSWORD }) }), ctx);
    expect(signedIn.status).toBe(200);
    const sessions = await db("sessions as s").join("users as u", "u.id", "s.user_id").where("u.email", email).select("s.user_agent");
    // The session keeps the first 300 characters (lib/server/sessions.ts), enough to tell phones apart.
    expect(sessions.map((s: { user_agent: string }) => s.user_agent)).toEqual([userAgent.slice(0, 300), userAgent.slice(0, 300)]);
  });

  it("signs up with the longest e-mail the schema allows (254 characters), which also keys the sign-up limit", async () => {
    const local = "a".repeat(64);
    const email = `${local}@${"b".repeat(63)}.${"c".repeat(63)}.${"d".repeat(254 - 64 - 1 - 63 - 1 - 63 - 1)}`;
    expect(email).toHaveLength(254);
    const res = await signUp(
      new Request(new URL("/api/auth/sign-up", origin), {
        method: "POST",
        headers: { "content-type": "application/json", origin, "x-forwarded-for": "203.0.113.78" },
        body: JSON.stringify({ email, password: TEST_PASSWORD, name: "n".repeat(120), farmName: "f".repeat(120) }),
      }),
      ctx,
    );
    expect(res.status).toBe(201);
    const signedIn = await signIn(
      new Request(new URL("/api/auth/sign-in", origin), {
        method: "POST",
        headers: { "content-type": "application/json", origin, "x-forwarded-for": "203.0.113.78" },
        body: JSON.stringify({ email, password: "not the password at all" }),
      }),
      ctx,
    );
    expect(signedIn.status).toBe(401); // the failed try is recorded under "email:<254 characters>"
  });
});
