import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";

vi.hoisted(() => {
  process.env.UPLOAD_DIR = `${require("node:os").tmpdir()}/rimebook-uploads-${process.pid}`;
});

import type { Knex } from "knex";
import { freshDatabase, storedBoolean } from "../support/db";
import { signedInMember, type TestMember } from "../support/auth";
import { countRows, offline, openPhone, routedFetch, uuid, type Phone } from "../support/sync";
import { createBag, createLot, recordCheck, setDigestOptIn, updateBag } from "@/lib/client/repo";
import { queuePhoto } from "@/lib/client/photos";
import { dismissRejected, outboxCounts } from "@/lib/client/sync";
import { signOut } from "@/lib/client/identity";
import { META } from "@/lib/client/meta";

// Phones (fake IndexedDB) syncing through the real route handlers on a temp SQLite file.

const check = (bagId: string, i: number) => ({
  bag_id: bagId,
  checked_at: new Date(Date.UTC(2026, 10, 1, 8, 0, i)).toISOString(),
  moisture: "damp" as const,
  mould: "clean" as const,
  sprouts: "none" as const,
});

// A 1×1 JPEG's first bytes are enough for the content check; the rest is padding.
const jpeg = () => new Blob([new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 0, 16, 0x4a, 0x46, 0x49, 0x46, 0, 1, 1, 0, 0, 1, 0, 1, 0, 0, 0xff, 0xd9])], { type: "image/jpeg" });

describe("phone sync against the real handlers", () => {
  let t: Awaited<ReturnType<typeof freshDatabase>>;
  let db: Knex;
  let grower: TestMember;
  let phoneA: Phone;
  let bagId: string;

  beforeAll(async () => {
    t = await freshDatabase();
    db = t.db;
    grower = await signedInMember(db, { role: "grower" });
    phoneA = await openPhone(grower);
    const lot = await createLot({ species: "Baptisia australis", year: 2025 });
    bagId = (await createBag({ code: "Q4R8T2-5", lot_id: lot.id, start_date: "2026-10-20" })).id;
    const state = await phoneA.engine.syncNow();
    expect(state).toMatchObject({ phase: "idle", error: null });
  });
  afterAll(async () => t.cleanup());

  it("writes the row and its outbox entry together, and refuses bad input without writing anything", async () => {
    phoneA.use();
    const before = await phoneA.db.outbox.count();
    const c = await recordCheck(check(bagId, 1));
    const row = await phoneA.db.checks.get(c.id);
    expect(row).toMatchObject({ bag_id: bagId, moisture: "damp", seq: 0, checked_by: grower.userId, farm_id: grower.farmId });
    expect(await phoneA.db.outbox.count()).toBe(before + 1);
    await expect(recordCheck({ ...check(bagId, 2), moisture: "wet" as never })).rejects.toThrow();
    expect(await phoneA.db.outbox.count()).toBe(before + 1);
    await phoneA.engine.syncNow();
    expect(await phoneA.db.outbox.count()).toBe(0);
    expect((await phoneA.db.checks.get(c.id))?.seq).toBeGreaterThan(0); // the server's copy replaced the local one
  });

  it("a push cut off half-way, then retried, stores everything exactly once", async () => {
    phoneA.use();
    const ids = [];
    for (let i = 0; i < 40; i++) ids.push((await recordCheck(check(bagId, 100 + i))).id);
    const real = routedFetch(grower);
    // The server receives and applies the first half, then the connection drops before the answer.
    phoneA.net.fetch = async (input, init) => {
      if (String(input).endsWith("/api/sync/push")) {
        const body = JSON.parse(String(init?.body));
        await real(input, { ...init, body: JSON.stringify({ ...body, mutations: body.mutations.slice(0, 20) }) });
        throw new TypeError("network connection lost");
      }
      return real(input, init);
    };
    const cut = await phoneA.engine.syncNow();
    expect(cut.phase).toBe("offline");
    expect(await db("checks").whereIn("id", ids).count({ n: "*" }).first()).toEqual({ n: 20 });
    expect((await outboxCounts(phoneA.db)).pending).toBe(40); // the phone does not know what arrived: it keeps all

    phoneA.net.fetch = real;
    const retried = await phoneA.engine.syncNow();
    expect(retried.phase).toBe("idle");
    expect(await db("checks").whereIn("id", ids).count({ n: "*" }).first()).toEqual({ n: 40 });
    expect((await outboxCounts(phoneA.db)).pending).toBe(0);
    expect(await phoneA.db.checks.where("bag_id").equals(bagId).count()).toBe(await countRows(db, "checks", { bag_id: bagId }));
  });

  it("two phones edit the same bag offline: both sync, no check is lost, the overwritten note is in audit_log", async () => {
    const helperB = await signedInMember(db, { role: "grower", farmId: grower.farmId });
    const phoneB = await openPhone(helperB);
    await phoneB.engine.syncNow();
    expect(await phoneB.db.bags.get(bagId)).toBeTruthy();

    phoneA.net.fetch = offline;
    phoneB.net.fetch = offline;
    phoneA.use();
    await updateBag(bagId, { note: "Moved to the back shelf", box: "Box 2" });
    const checkA = await recordCheck({ ...check(bagId, 500), moisture: "dry", actions: ["added_water"] });
    phoneB.use();
    await updateBag(bagId, { note: "Blotted, looks fine" });
    const checkB = await recordCheck({ ...check(bagId, 501), moisture: "soggy", actions: ["blotted"] });
    expect((await phoneA.engine.syncNow()).phase).toBe("offline");

    phoneA.net.fetch = routedFetch(grower);
    phoneB.net.fetch = routedFetch(helperB);
    await phoneA.engine.syncNow();
    await phoneB.engine.syncNow();
    await phoneA.engine.syncNow();

    expect(await db("checks").whereIn("id", [checkA.id, checkB.id]).count({ n: "*" }).first()).toEqual({ n: 2 });
    const bag = await db("bags").where({ id: bagId }).first();
    expect(bag).toMatchObject({ note: "Blotted, looks fine", box: "Box 2" }); // later arrival wins per field
    const trail = await db("audit_log").where({ row_id: bagId, field: "note" }).orderBy("id");
    expect(trail.at(-1)).toMatchObject({ old_value: "Moved to the back shelf", new_value: "Blotted, looks fine", user_id: helperB.userId });
    for (const phone of [phoneA, phoneB]) {
      expect(await phone.db.bags.get(bagId)).toMatchObject({ note: "Blotted, looks fine", box: "Box 2" });
      expect(await phone.db.checks.bulkGet([checkA.id, checkB.id])).toEqual([expect.objectContaining({ moisture: "dry" }), expect.objectContaining({ moisture: "soggy" })]);
      expect(await phone.db.audit_log.where("[table_name+row_id]").equals(["bags", bagId]).count()).toBeGreaterThan(0);
    }
  });

  it("a 401 in the middle of a sync keeps every queued mutation and asks for sign-in", async () => {
    phoneA.use();
    const ids: string[] = [];
    for (let i = 0; i < 1200; i++) ids.push(uuid());
    // 1,200 checks recorded at the fridge with no signal, in one go
    await Promise.all(ids.map((id, i) => recordCheck({ ...check(bagId, 1000 + i), id })));
    const real = routedFetch(grower);
    let pushes = 0;
    phoneA.net.fetch = async (input, init) => {
      if (String(input).endsWith("/api/sync/push") && ++pushes > 1) {
        return new Response(JSON.stringify({ error: { code: "unauthenticated", message: "Please sign in again." } }), { status: 401 });
      }
      return real(input, init);
    };
    const state = await phoneA.engine.syncNow();
    expect(state.phase).toBe("needs_sign_in");
    expect(await db("checks").whereIn("id", ids).count({ n: "*" }).first()).toEqual({ n: 500 }); // first batch of 500 went
    const left = await phoneA.db.outbox.where("status").equals("pending").toArray();
    expect(left.length).toBe(700);
    expect(await phoneA.db.checks.where("id").anyOf(ids).count()).toBe(1200); // all still shown on the phone

    phoneA.net.fetch = real; // signed in again
    let requests = 0;
    phoneA.net.fetch = async (input, init) => {
      if (String(input).endsWith("/api/sync/push")) requests++;
      return real(input, init);
    };
    expect((await phoneA.engine.syncNow()).phase).toBe("idle");
    expect(requests).toBe(2); // 700 left: two requests of up to 500
    expect(await db("checks").whereIn("id", ids).count({ n: "*" }).first()).toEqual({ n: 1200 });
    expect(await phoneA.db.outbox.count()).toBe(0);
    phoneA.net.fetch = real;
  }, 120_000);

  it("a refused mutation (a Visitor's check) stays visible, is undone on the phone, and does not block later ones", async () => {
    // Demoted to Visitor while the phone still thinks Helper: the server decides.
    const visitor = await signedInMember(db, { role: "visitor", farmId: grower.farmId });
    const phone = await openPhone(visitor, { role: "helper" });
    const refused = await recordCheck(check(bagId, 9000));
    await setDigestOptIn(true);
    expect(await phone.db.checks.get(refused.id)).toBeTruthy();
    const state = await phone.engine.syncNow();
    expect(state.phase).toBe("idle");

    const rejected = await phone.db.outbox.where("status").equals("rejected").toArray();
    expect(rejected).toHaveLength(1);
    expect(rejected[0]).toMatchObject({ name: "check.record", error: { code: "forbidden" } });
    expect(rejected[0].error?.message).toMatch(/Visitor/);
    expect(await phone.db.checks.get(refused.id)).toBeUndefined(); // never confirmed: removed from the phone's view
    expect(await db("checks").where({ id: refused.id }).first()).toBeUndefined();
    expect(storedBoolean((await db("memberships").where({ user_id: visitor.userId }).first("digest_opt_in")).digest_opt_in)).toBe(true);
    expect((await phone.db.meta.get(META.identity))?.value).toMatchObject({ role: "visitor" }); // the pull corrected the role
    expect(await outboxCounts(phone.db)).toMatchObject({ pending: 0, rejected: 1 });

    await phone.engine.syncNow(); // still there after another sync: only the person dismisses it
    expect((await outboxCounts(phone.db)).rejected).toBe(1);
    await dismissRejected(rejected[0].id, phone.db);
    expect((await outboxCounts(phone.db)).rejected).toBe(0);
  });

  it("a new phone's first pull loads the whole farm page by page with progress", async () => {
    const phone = await openPhone(grower, { pullPage: 50 });
    const progress: number[] = [];
    phone.engine.subscribe(() => {
      const fp = phone.engine.getState().firstPull;
      if (fp) progress.push(fp.loaded / fp.total);
    });
    await phone.engine.syncNow();
    expect(progress.length).toBeGreaterThan(10);
    expect(progress.at(-1)).toBe(1);
    expect(await phone.db.checks.count()).toBe(await countRows(db, "checks", { farm_id: grower.farmId }));
    expect(await phone.db.bags.get(bagId)).toMatchObject({ note: "Blotted, looks fine" });
  });

  it("photos wait on the phone and upload after their check; the server keeps them under the farm", async () => {
    phoneA.use();
    const c = await recordCheck({ ...check(bagId, 20000), mould: "spots" });
    const photoId = await queuePhoto({ bagId, checkId: c.id, blob: jpeg() });
    expect(await phoneA.db.pending_photos.count()).toBe(1);
    await phoneA.engine.syncNow();
    expect(await phoneA.db.pending_photos.count()).toBe(0);
    const row = await db("photos").where({ id: photoId }).first();
    expect(row).toMatchObject({ farm_id: grower.farmId, check_id: c.id, mime: "image/jpeg", uploaded_by: grower.userId });
    expect(row.path.startsWith(grower.farmId)).toBe(true);
    expect(await phoneA.db.photos.get(photoId)).toMatchObject({ url: `/api/uploads/${photoId}`, check_id: c.id });

    const own = await routedFetch(grower)(`/api/uploads/${photoId}`);
    expect(own.status).toBe(200);
    expect(own.headers.get("content-type")).toBe("image/jpeg");
    const stranger = await signedInMember(db, { role: "owner" });
    expect((await routedFetch(stranger)(`/api/uploads/${photoId}`)).status).toBe(404);
  });

  it("sign-out warns while work is unsent, then empties the phone store", async () => {
    phoneA.use();
    phoneA.net.fetch = offline;
    await recordCheck(check(bagId, 30000));
    const warned = await signOut({ db: phoneA.db, fetch: offline });
    expect(warned).toEqual({ ok: false, waiting: { records: 1, photos: 0, parts: [{ name: "check.record", n: 1 }] } });
    expect(await phoneA.db.outbox.count()).toBe(1);
    const done = await signOut({ db: phoneA.db, fetch: offline, force: true });
    expect(done).toEqual({ ok: true });
    expect(await phoneA.db.bags.count()).toBe(0);
    expect(await phoneA.db.outbox.count()).toBe(0);
    expect(await phoneA.db.meta.get(META.identity)).toBeUndefined();
    expect(await phoneA.db.meta.get(META.deviceId)).toBeTruthy();
  });
});
