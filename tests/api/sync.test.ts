import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { freshDatabase, storedBoolean } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { countRows, uuid } from "../support/sync";
import { POST as push } from "@/app/api/sync/push/route";
import { GET as pull } from "@/app/api/sync/pull/route";
import type { MutationName } from "@/lib/schemas/mutations";

// The push/pull contract at the route level, on a fresh SQLite file.

const ctx = { params: Promise.resolve({}) };
const at = "2026-11-20T08:00:00.000Z";
const mutation = (name: MutationName, args: unknown) => ({ id: uuid(), name, args, at });

async function pushAs(member: TestMember, mutations: unknown[], deviceId = "device-1") {
  const res = await push(memberRequest("/api/sync/push", member, { method: "POST", json: { deviceId, mutations } }), ctx);
  return { status: res.status, body: await res.json() };
}

async function pullAs(member: TestMember, since: number, limit: number) {
  const res = await pull(memberRequest(`/api/sync/pull?since=${since}&limit=${limit}`, member), ctx);
  return { status: res.status, body: await res.json() };
}

describe("sync routes", () => {
  let t: Awaited<ReturnType<typeof freshDatabase>>;
  let db: Knex;
  let grower: TestMember;
  let lotId: string;
  let bagId: string;

  beforeAll(async () => {
    t = await freshDatabase();
    db = t.db;
    grower = await signedInMember(db, { role: "grower" });
    lotId = uuid();
    bagId = uuid();
    const r = await pushAs(grower, [
      mutation("lot.create", { id: lotId, species: "Asclepias tuberosa", year: 2025, quantity: 400 }),
      mutation("bag.create", { id: bagId, code: "7K3Q9M-X", lot_id: lotId, start_date: "2026-11-01" }),
    ]);
    expect(r.body.rejected).toEqual([]);
  });
  afterAll(async () => t.cleanup());

  it("a push replayed three times stores each check once and reports it applied each time", async () => {
    const checks = Array.from({ length: 5 }, (_, i) =>
      mutation("check.record", { id: uuid(), bag_id: bagId, checked_at: `2026-11-2${i}T09:00:00.000Z`, moisture: "damp", mould: "clean", sprouts: "none" }),
    );
    const before = await countRows(db, "checks");
    const seqBefore = (await db("farms").where({ id: grower.farmId }).first("seq")).seq;
    const answers = [];
    for (let i = 0; i < 3; i++) answers.push(await pushAs(grower, checks));
    for (const a of answers) {
      expect(a.status).toBe(200);
      expect(a.body.applied).toEqual(checks.map((c) => c.id));
      expect(a.body.rejected).toEqual([]);
    }
    expect(await countRows(db, "checks")).toBe(before + 5);
    // replays changed nothing: no seq handed out after the first push
    expect(Number((await db("farms").where({ id: grower.farmId }).first("seq")).seq)).toBe(Number(seqBefore) + 5);
    const stored = await db("checks").where({ id: checks[0].args && (checks[0].args as { id: string }).id }).first();
    expect(stored).toMatchObject({ farm_id: grower.farmId, checked_by: grower.userId, moisture: "damp", actions: "[]" });
  });

  it("refuses one bad mutation with a reason and still applies the ones after it", async () => {
    const good1 = mutation("check.record", { id: uuid(), bag_id: bagId, checked_at: at, moisture: "dry", mould: "clean", sprouts: "none", actions: ["added_water"] });
    const invalid = mutation("check.record", { id: uuid(), bag_id: bagId, checked_at: at, moisture: "wet", mould: "clean", sprouts: "none" });
    const missingBag = mutation("check.record", { id: uuid(), bag_id: uuid(), checked_at: at, moisture: "dry", mould: "clean", sprouts: "none" });
    const duplicateCode = mutation("bag.create", { id: uuid(), code: "7K3Q9M-X", lot_id: lotId });
    const good2 = mutation("bag.pull", { id: bagId, pulled_on: "2026-12-01" });
    const r = await pushAs(grower, [good1, invalid, missingBag, duplicateCode, good2]);
    expect(r.body.applied).toEqual([good1.id, good2.id]);
    const reasons = Object.fromEntries(r.body.rejected.map((x: { id: string; error: { code: string } }) => [x.id, x.error.code]));
    expect(reasons).toEqual({ [invalid.id]: "invalid", [missingBag.id]: "not_found", [duplicateCode.id]: "conflict" });
    const invalidAnswer = r.body.rejected.find((x: { id: string }) => x.id === invalid.id);
    expect(invalidAnswer.error.fields).toHaveProperty("moisture");
    expect(await db("applied_mutations").where({ id: invalid.id }).first("outcome")).toEqual({ outcome: "rejected" });
  });

  it("checks the role of every mutation on the server: a Visitor is refused, a Helper may record checks but not edit bags", async () => {
    const visitor = await signedInMember(db, { role: "visitor", farmId: grower.farmId });
    const helper = await signedInMember(db, { role: "helper", farmId: grower.farmId });
    const check = mutation("check.record", { id: uuid(), bag_id: bagId, checked_at: at, moisture: "damp", mould: "clean", sprouts: "none" });
    const prefs = mutation("member.preferences", { digest_opt_in: true });
    const v = await pushAs(visitor, [check, prefs]);
    expect(v.body.rejected.map((x: { id: string; error: { code: string } }) => [x.id, x.error.code])).toEqual([[check.id, "forbidden"]]);
    expect(v.body.applied).toEqual([prefs.id]);
    expect(storedBoolean((await db("memberships").where({ user_id: visitor.userId }).first("digest_opt_in")).digest_opt_in)).toBe(true);

    const h = await pushAs(helper, [check, mutation("bag.update", { id: bagId, patch: { note: "helper edit" } })]);
    expect(h.body.applied).toEqual([check.id]); // refused before, allowed for a Helper: a rejected id may be sent again
    expect(h.body.rejected[0].error.code).toBe("forbidden");
    expect(await db("checks").where({ id: (check.args as { id: string }).id }).first("checked_by")).toEqual({ checked_by: helper.userId });
  });

  it("keeps farms apart: another farm's ids are not found and its rows never appear in a pull", async () => {
    const other = await signedInMember(db, { role: "owner" });
    const r = await pushAs(other, [
      mutation("check.record", { id: uuid(), bag_id: bagId, checked_at: at, moisture: "damp", mould: "clean", sprouts: "none" }),
      mutation("bag.create", { id: uuid(), code: "ABCD-1", lot_id: lotId }),
      mutation("bag.update", { id: bagId, patch: { note: "not yours" } }),
      mutation("lot.create", { id: lotId, species: "Taken id" }),
    ]);
    expect(r.body.rejected.map((x: { error: { code: string } }) => x.error.code)).toEqual(["not_found", "not_found", "not_found", "not_found"]);
    const feed = await pullAs(other, 0, 1000);
    expect(feed.body.changes.filter((c: { table: string }) => c.table !== "memberships")).toEqual([]);
    expect((await db("bags").where({ id: bagId }).first("note")).note).toBeNull();
  });

  it("an edit overwrites field by field and keeps the old value in audit_log; untouched fields keep their values", async () => {
    await pushAs(grower, [mutation("bag.update", { id: bagId, patch: { note: "first", box: "Box A", seed_count: 50 } })]);
    const r = await pushAs(grower, [mutation("bag.update", { id: bagId, patch: { note: "second" } })]);
    expect(r.body.rejected).toEqual([]);
    const bag = await db("bags").where({ id: bagId }).first();
    expect(bag).toMatchObject({ note: "second", box: "Box A", seed_count: 50, medium: "paper_towel", start_date: "2026-11-01" });
    const trail = await db("audit_log").where({ row_id: bagId, field: "note" }).orderBy("id");
    expect(trail.map((a) => [a.old_value, a.new_value])).toEqual([[null, "first"], ["first", "second"]]);
  });

  it("pulls in seq order page by page across tombstones, without overlaps or gaps", async () => {
    const owner = await signedInMember(db, { role: "owner" });
    const lots = Array.from({ length: 23 }, (_, i) => mutation("lot.create", { id: uuid(), species: `Species ${i}` }));
    await pushAs(owner, lots);
    const deleted = lots.filter((_, i) => i % 3 === 0).map((l) => (l.args as { id: string }).id);
    const d = await pushAs(owner, deleted.map((id) => mutation("lot.delete", { id })));
    expect(d.body.rejected).toEqual([]);

    let since = 0;
    let pages = 0;
    const seen: { table: string; row: Record<string, unknown> }[] = [];
    for (;;) {
      const { status, body } = await pullAs(owner, since, 5);
      expect(status).toBe(200);
      pages++;
      seen.push(...body.changes);
      expect(body.cursor).toBeGreaterThanOrEqual(since);
      since = body.cursor;
      if (!body.more) break;
      expect(pages).toBeLessThan(50);
    }
    expect(pages).toBeGreaterThan(4);
    const lotRows = seen.filter((c) => c.table === "lots").map((c) => c.row);
    // each lot appears once, in its latest state (a tombstone for deleted ones)
    expect(new Set(lotRows.map((r) => r.id)).size).toBe(lotRows.length);
    expect(lotRows.length).toBe(23);
    expect(lotRows.filter((r) => r.deleted_at).map((r) => r.id).sort()).toEqual([...deleted].sort());
    const seqs = seen.filter((c) => c.table !== "audit_log").map((c) => Number(c.row.seq));
    expect(seqs).toEqual([...seqs].sort((a, b) => a - b));
    expect(since).toBe(Number((await db("farms").where({ id: owner.farmId }).first("seq")).seq));
    expect(seen.some((c) => c.table === "audit_log" && c.row.field === "deleted_at")).toBe(true);
    // booleans and JSON come back as values
    expect(lotRows[0].treated).toBe(false);
    const again = await pullAs(owner, since, 5);
    expect(again.body).toMatchObject({ changes: [], more: false, cursor: since });
  });

  it("parses JSON columns in the pull feed and upserts protocols with their sources", async () => {
    const owner = await signedInMember(db, { role: "owner" });
    const id = uuid();
    const protocol = {
      id, species: "Echinacea purpurea", phases: [{ kind: "cold_moist", sources: [{ citation: "Own records 2025", minDays: 30, maxDays: 60 }] }],
    };
    const r = await pushAs(owner, [
      mutation("protocol.upsert", protocol),
      mutation("store.create", { id: uuid(), name: "Barn fridge", kind: "fridge", boxes: ["A", "B"] }),
      mutation("protocol.upsert", { ...protocol, note: "plan for the earliest date" }),
    ]);
    expect(r.body.rejected).toEqual([]);
    const { body } = await pullAs(owner, 0, 100);
    const p = body.changes.find((c: { table: string; row: { id: string } }) => c.table === "protocols" && c.row.id === id).row;
    expect(p.phases[0].sources[0]).toMatchObject({ minDays: 30, maxDays: 60 });
    expect(p).toMatchObject({ medicinal: false, is_farm_own: true, note: "plan for the earliest date" });
    expect(body.changes.find((c: { table: string }) => c.table === "stores").row.boxes).toEqual(["A", "B"]);
    expect(await countRows(db, "protocol_sources", { protocol_id: id, deleted_at: null })).toBe(1);
  });

  it("keeps readings append-only: a second reading at the same moment in the same store is ignored, not doubled", async () => {
    const storeId = uuid();
    const takenAt = "2026-11-21T06:00:00.000Z";
    const r = await pushAs(grower, [
      mutation("store.create", { id: storeId, name: "Shed freezer", kind: "freezer" }),
      mutation("reading.record", { id: uuid(), store_id: storeId, taken_at: takenAt, temperature_c: -18 }),
      mutation("reading.record", { id: uuid(), store_id: storeId, taken_at: takenAt, temperature_c: -17.5 }),
    ]);
    expect(r.body.rejected).toEqual([]);
    expect(r.body.applied).toHaveLength(3);
    expect(await db("readings").where({ store_id: storeId }).select("temperature_c")).toEqual([{ temperature_c: -18 }]);
  });

  it("answers 401 without a session and 403 for a push from another origin", async () => {
    const noSession = await push(memberRequest("/api/sync/push", null, { method: "POST", json: { deviceId: "d", mutations: [] } }), ctx);
    expect(noSession.status).toBe(401);
    const foreign = await push(
      memberRequest("/api/sync/push", grower, { method: "POST", json: { deviceId: "d", mutations: [] }, headers: { origin: "https://elsewhere.example" } }),
      ctx,
    );
    expect(foreign.status).toBe(403);
    const tooMany = await pushAs(grower, Array.from({ length: 1001 }, () => mutation("lot.delete", { id: uuid() })));
    expect(tooMany.status).toBe(400);
  });
});
