import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { openPhone, uuid } from "../support/sync";
import { POST as push } from "@/app/api/sync/push/route";
import { GET as pull } from "@/app/api/sync/pull/route";
import { createBag, createStore, createTrial, deleteStore, deleteTrial } from "@/lib/client/repo";
import type { MutationName } from "@/lib/schemas/mutations";

// Managing cold stores and trials, and the count rule, through /api/sync/push on a fresh SQLite file:
// a store with bags still in the cold cannot be deleted; a trial is soft-deleted with its arms and
// pulled as tombstones; a running total that falls, or passes the seeds sown, is refused by the server.

const ctx = { params: Promise.resolve({}) };
const at = "2026-11-20T08:00:00.000Z";
const mutation = (name: MutationName, args: unknown) => ({ id: uuid(), name, args, at });
/** The server stamps tombstones with its own clock. */
const stamped = expect.stringMatching(/^\d{4}-\d\d-\d\dT\d\d:\d\d/);
type Rejected = { id: string; error: { code: string; message: string } };

async function pushAs(member: TestMember, mutations: { id: string }[]) {
  const res = await push(memberRequest("/api/sync/push", member, { method: "POST", json: { deviceId: "device-m", mutations } }), ctx);
  return { status: res.status, body: (await res.json()) as { applied: string[]; rejected: Rejected[] } };
}

async function pullAll(member: TestMember, since = 0) {
  const res = await pull(memberRequest(`/api/sync/pull?since=${since}&limit=5000`, member), ctx);
  return (await res.json()) as { cursor: number; changes: { table: string; row: Record<string, unknown> }[] };
}

describe("cold stores, trials and counts through the push route", () => {
  let t: Awaited<ReturnType<typeof freshDatabase>>;
  let db: Knex;
  let grower: TestMember;
  let helper: TestMember;
  let lotId: string;

  beforeAll(async () => {
    t = await freshDatabase();
    db = t.db;
    grower = await signedInMember(db, { role: "grower" });
    helper = await signedInMember(db, { role: "helper", farmId: grower.farmId });
    lotId = uuid();
    const r = await pushAs(grower, [mutation("lot.create", { id: lotId, species: "Asclepias tuberosa", year: 2025, quantity: 400 })]);
    expect(r.body.rejected).toEqual([]);
  });
  afterAll(async () => t.cleanup());

  async function storeWithBags(name: string, bags: Record<string, unknown>[]) {
    const storeId = uuid();
    const ids = bags.map(() => uuid());
    const r = await pushAs(grower, [
      mutation("store.create", { id: storeId, name, kind: "fridge" }),
      ...bags.map((b, i) => mutation("bag.create", { id: ids[i], lot_id: lotId, store_id: storeId, start_date: "2026-11-01", ...b })),
    ]);
    expect(r.body.rejected).toEqual([]);
    return { storeId, bagIds: ids };
  }

  it("refuses to delete a store holding bags still in the cold, naming them; the store stays", async () => {
    const { storeId, bagIds } = await storeWithBags("Barn fridge", [{ code: "K7M4QZX" }, { code: "A1B2C3D", pulled_on: "2026-11-15" }, { code: "Q9R8S7T", start_date: null }]);
    const del = mutation("store.delete", { id: storeId });
    const r = await pushAs(grower, [del]);
    expect(r.status).toBe(200);
    expect(r.body.applied).toEqual([]);
    expect(r.body.rejected).toHaveLength(1);
    expect(r.body.rejected[0].error.code).toBe("domain");
    // The chilling bag and the planned one are named; the pulled one is not.
    expect(r.body.rejected[0].error.message).toMatch(/^Barn fridge still holds 2 bags not yet pulled, sown or discarded: K7M-4QZX, Q9R-8S7T\. Move them to another cold store first/);
    expect((await db("stores").where({ id: storeId }).first("deleted_at")).deleted_at).toBeNull();
    expect(await db("applied_mutations").where({ id: del.id }).first("outcome")).toEqual({ outcome: "rejected" });

    // Moved or finished, the bags no longer hold it: the same store can now be deleted.
    const otherStore = uuid();
    const moved = await pushAs(grower, [
      mutation("store.create", { id: otherStore, name: "House fridge", kind: "fridge" }),
      mutation("bag.update", { id: bagIds[0], patch: { store_id: otherStore } }),
      mutation("bag.discard", { id: bagIds[2], discarded_on: "2026-11-20", discard_reason: "never started" }),
      mutation("store.delete", { id: storeId }),
    ]);
    expect(moved.body.rejected).toEqual([]);
    expect((await db("stores").where({ id: storeId }).first("deleted_at")).deleted_at).toEqual(stamped);
  });

  it("deletes a store with only finished bags or none as a tombstone; its readings stay and the tombstone is pulled", async () => {
    const { storeId } = await storeWithBags("Old chest freezer", [
      { code: "B2C3D4E", pulled_on: "2026-11-10", sown_on: "2026-11-11" },
      { code: "C3D4E5F", discarded_on: "2026-11-09" },
    ]);
    const empty = await storeWithBags("Spare fridge", []);
    const readingId = uuid();
    await pushAs(grower, [mutation("reading.record", { id: readingId, store_id: storeId, taken_at: "2026-11-05T06:00:00.000Z", temperature_c: 3.5 })]);
    const { cursor } = await pullAll(grower);
    const r = await pushAs(grower, [mutation("store.delete", { id: storeId }), mutation("store.delete", { id: empty.storeId })]);
    expect(r.body.rejected).toEqual([]);
    expect(await db("stores").whereIn("id", [storeId, empty.storeId]).whereNotNull("deleted_at").count({ n: "*" })).toEqual([{ n: 2 }]);
    expect(await db("readings").where({ id: readingId }).first("deleted_at", "temperature_c")).toEqual({ deleted_at: null, temperature_c: 3.5 });
    const feed = await pullAll(grower, cursor);
    const stores = feed.changes.filter((c) => c.table === "stores").map((c) => [c.row.id, c.row.deleted_at]);
    expect(stores.sort()).toEqual([[storeId, stamped], [empty.storeId, stamped]].sort());
    expect(feed.changes.some((c) => c.table === "readings")).toBe(false);
  });

  it("refuses store and trial deletes from a Helper on the server, whatever the phone sent", async () => {
    const { storeId } = await storeWithBags("Garage fridge", []);
    const trialId = uuid();
    await pushAs(grower, [mutation("trial.create", { id: trialId, name: "Fridge or freezer", lot_id: lotId, arms: [{ id: uuid(), label: "Fridge" }, { id: uuid(), label: "Freezer" }] })]);
    const r = await pushAs(helper, [mutation("store.delete", { id: storeId }), mutation("trial.delete", { id: trialId })]);
    expect(r.body.applied).toEqual([]);
    expect(r.body.rejected.map((x) => x.error.code)).toEqual(["forbidden", "forbidden"]);
    expect(r.body.rejected[0].error.message).toMatch(/Helper cannot do this \(store delete\)/);
    expect((await db("stores").where({ id: storeId }).first("deleted_at")).deleted_at).toBeNull();
    expect((await db("trials").where({ id: trialId }).first("deleted_at")).deleted_at).toBeNull();
  });

  it("trial.delete soft-deletes the trial and its arms with new seqs; bags keep their arm; another phone pulls it gone", async () => {
    const trialId = uuid();
    const arms = [uuid(), uuid()];
    const bagId = uuid();
    const made = await pushAs(grower, [
      mutation("trial.create", { id: trialId, name: "Towel or sand", lot_id: lotId, arms: [{ id: arms[0], label: "Towel" }, { id: arms[1], label: "Sand" }] }),
      mutation("bag.create", { id: bagId, code: "D4E5F6G", lot_id: lotId, trial_arm_id: arms[1], start_date: "2026-11-01" }),
    ]);
    expect(made.body.rejected).toEqual([]);

    // A second phone has the trial before it is deleted.
    const phoneB = await openPhone(grower);
    await phoneB.engine.syncNow();
    expect(await phoneB.db.trials.get(trialId)).toBeDefined();
    expect(await phoneB.db.trial_arms.where("trial_id").equals(trialId).count()).toBe(2);

    const seqBefore = Number((await db("farms").where({ id: grower.farmId }).first("seq")).seq);
    const del = mutation("trial.delete", { id: trialId });
    const r = await pushAs(grower, [del]);
    expect(r.body.applied).toEqual([del.id]);
    const trial = await db("trials").where({ id: trialId }).first();
    expect(trial.deleted_at).toEqual(stamped);
    const armRows = await db("trial_arms").where({ trial_id: trialId });
    expect(armRows.map((a) => a.deleted_at)).toEqual([trial.deleted_at, trial.deleted_at]);
    // trial + two arms, each its own seq after the ones before
    expect([trial.seq, ...armRows.map((a) => a.seq)].map(Number).sort()).toEqual([seqBefore + 1, seqBefore + 2, seqBefore + 3]);
    expect(await db("bags").where({ id: bagId }).first("trial_arm_id", "deleted_at")).toEqual({ trial_arm_id: arms[1], deleted_at: null });
    // Sent again: reported applied, nothing changes.
    const again = await pushAs(grower, [del]);
    expect(again.body.applied).toEqual([del.id]);
    expect(Number((await db("farms").where({ id: grower.farmId }).first("seq")).seq)).toBe(seqBefore + 3);

    await phoneB.engine.syncNow();
    expect(await phoneB.db.trials.get(trialId)).toBeUndefined();
    expect(await phoneB.db.trial_arms.where("trial_id").equals(trialId).count()).toBe(0);
    expect((await phoneB.db.bags.get(bagId))?.trial_arm_id).toBe(arms[1]);
  });

  describe("a germination count's running total", () => {
    let sowingId: string;
    beforeAll(async () => {
      const bagId = uuid();
      sowingId = uuid();
      const r = await pushAs(grower, [
        mutation("bag.create", { id: bagId, code: "E5F6G7H", lot_id: lotId, start_date: "2026-10-01", pulled_on: "2026-11-01" }),
        mutation("sowing.record", { id: sowingId, bag_id: bagId, sown_on: "2026-11-01", seeds_sown: 20 }),
        mutation("count.record", { id: uuid(), sowing_id: sowingId, counted_on: "2026-11-05", germinated_total: 4 }),
        mutation("count.record", { id: uuid(), sowing_id: sowingId, counted_on: "2026-11-08", germinated_total: 9 }),
        mutation("count.record", { id: uuid(), sowing_id: sowingId, counted_on: "2026-11-12", germinated_total: 12 }),
      ]);
      expect(r.body.rejected).toEqual([]);
    });

    // Day numbers are days after sowing (1 Nov).
    it.each([
      // The phone's own words (lib/domain judgeCountEntry), so a refusal reads the same wherever it shows.
      ["falls below the day before", "2026-11-10", 8, /^9 were already up on 8 Nov 2026\. The count is a running total/],
      ["falls below the latest count, sent late from an offline phone", "2026-11-14", 11, /^12 were already up on 12 Nov 2026\./],
      ["is higher than a later day's count", "2026-11-06", 10, /^A later count \(8 Nov 2026\) had only 9/],
      ["passes the seeds sown", "2026-11-15", 21, /^Only 20 seeds were sown, so at most 20 can be up\./],
      ["is on the sowing day", "2026-11-01", 0, /^Counts start the day after sowing \(sown 1 Nov 2026\)\./],
    ])("is refused by the server when it %s", async (_what, countedOn, total, message) => {
      const m = mutation("count.record", { id: uuid(), sowing_id: sowingId, counted_on: countedOn, germinated_total: total });
      const r = await pushAs(helper, [m]);
      expect(r.body.applied).toEqual([]);
      expect(r.body.rejected[0].error).toMatchObject({ code: "domain", message: expect.stringMatching(message) });
      expect(await db("counts").where({ id: (m.args as { id: string }).id }).first()).toBeUndefined();
    });

    it.each([
      ["stays level", "2026-11-13", 12],
      ["fits between two days", "2026-11-10", 10],
      ["recounts a day lower, still above the day before", "2026-11-08", 5],
      ["reaches every seed sown", "2026-11-20", 20],
    ])("is applied when it %s", async (_what, countedOn, total) => {
      const m = mutation("count.record", { id: uuid(), sowing_id: sowingId, counted_on: countedOn, germinated_total: total });
      const r = await pushAs(helper, [m]);
      expect(r.body.rejected).toEqual([]);
      expect(r.body.applied).toEqual([m.id]);
    });
  });

  it("on the phone: a store with a bag in it is refused before anything is written; a trial delete is queued with its arms gone", async () => {
    const phone = await openPhone(grower);
    await phone.engine.syncNow();
    const store = await createStore({ name: "Porch fridge", kind: "fridge" });
    await phone.db.bags.put({ id: uuid(), code: "F6G7H8J", lot_id: lotId, store_id: store.id, farm_id: grower.farmId, seq: 0, deleted_at: null, pulled_on: null, sown_on: null, discarded_on: null } as never);
    const outboxBefore = await phone.db.outbox.count();
    await expect(deleteStore(store.id)).rejects.toMatchObject({ code: "domain", message: expect.stringMatching(/Porch fridge still holds 1 bag .*F6G-7H8J/) });
    expect(await phone.db.outbox.count()).toBe(outboxBefore);
    expect(await phone.db.stores.get(store.id)).toBeDefined();

    const trial = await createTrial({ name: "30 or 60 days", lot_id: lotId, question: null, notes: null, arms: [{ label: "30 days" }, { label: "60 days" }] });
    await deleteTrial(trial.id);
    expect(await phone.db.trials.get(trial.id)).toBeUndefined();
    expect(await phone.db.trial_arms.where("trial_id").equals(trial.id).count()).toBe(0);
    expect((await phone.db.outbox.toArray()).at(-1)).toMatchObject({ name: "trial.delete", args: { id: trial.id }, status: "pending" });
  });

  it("two phones: a store deleted on a phone that has not seen a bag put in it is refused by the server and comes back", async () => {
    const phoneA = await openPhone(grower);
    phoneA.use();
    const store = await createStore({ name: "Cellar fridge", kind: "fridge" });
    await phoneA.engine.syncNow();
    const phoneB = await openPhone(grower);
    await phoneB.engine.syncNow();
    phoneB.use();
    await createBag({ code: "G7H8J9K", lot_id: lotId, store_id: store.id, start_date: "2026-11-18" });
    await phoneB.engine.syncNow();

    // Phone A has not pulled the bag: its own check lets the delete through, the server's does not.
    phoneA.use();
    await deleteStore(store.id);
    expect(await phoneA.db.stores.get(store.id)).toBeUndefined();
    await phoneA.engine.syncNow();
    await phoneA.engine.syncNow();
    const [entry] = await phoneA.db.outbox.where("status").equals("rejected").toArray();
    expect(entry).toMatchObject({ name: "store.delete", error: { code: "domain", message: expect.stringMatching(/^Cellar fridge still holds 1 bag .*G7H-8J9K/) } });
    expect(await phoneA.db.stores.get(store.id)).toMatchObject({ name: "Cellar fridge", deleted_at: null });
    expect((await db("stores").where({ id: store.id }).first("deleted_at")).deleted_at).toBeNull();
  });
});
