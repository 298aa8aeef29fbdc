import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import fc from "fast-check";
import knexFactory, { type Knex } from "knex";
import { buildKnexConfig } from "@/lib/server/db-config";
import { applyPush, type PushMember } from "@/lib/server/sync/apply";
import type { MutationName, PushRequest } from "@/lib/schemas/mutations";
import { checkActions, storeKinds } from "@/lib/schemas/words";
import { testDialect } from "../support/db";

// The push's fast lane on SQLite (lib/server/sync/fast-lane.ts) against the general path: the same random
// pushes, applied to two copies of one farm database, must give the same answers, rows, seqs,
// applied_mutations records and audit_log, refusals, replays, duplicates and another farm's rows included.

const id = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, "0")}`;
const FARM = id(1), OTHER_FARM = id(2), OWNER = id(3), VISITOR = id(4), OTHER_OWNER = id(5);
const LOT = id(10), BAG = id(11), BAG2 = id(12), STORE = id(13), OTHER_LOT = id(20), OTHER_BAG = id(21), OTHER_STORE = id(22), OTHER_CHECK = id(23), OTHER_MUTATION = id(24);
const MISSING = id(99);
const owner: PushMember = { userId: OWNER, farmId: FARM, role: "owner" };
const visitor: PushMember = { userId: VISITOR, farmId: FARM, role: "visitor" };
const otherOwner: PushMember = { userId: OTHER_OWNER, farmId: OTHER_FARM, role: "owner" };

/** A clock that moves one millisecond per call, the same on both sides. */
const clock = () => {
  let t = Date.UTC(2026, 10, 20, 8);
  return () => new Date(t++);
};
const m = (mutationId: string, name: MutationName, args: unknown) => ({ id: mutationId, name, args, at: "2026-11-20T08:00:00.000Z" });

const open = (file: string) => knexFactory(buildKnexConfig(`file:${file}`));
let dir = "";
let base = "";

async function seed(db: Knex) {
  const at = "2026-11-01T00:00:00.000Z";
  await db("farms").insert([FARM, OTHER_FARM].map((f, i) => ({ id: f, name: `Farm ${i}`, seq: 0, created_at: at, updated_at: at })));
  await db("users").insert([OWNER, VISITOR, OTHER_OWNER].map((u, i) => ({ id: u, email: `u${i}@bramblewick.example`, name: `Grower ${i}`, password_hash: "x", created_at: at, updated_at: at })));
  const now = clock();
  const kind = storeKinds[0];
  await applyPush(db, owner, { deviceId: "seed", mutations: [
    m(id(30), "lot.create", { id: LOT, species: "Asclepias tuberosa", year: 2025, quantity: 400 }),
    m(id(31), "bag.create", { id: BAG, code: "7K3Q9M-X", lot_id: LOT, start_date: "2026-11-01" }),
    m(id(32), "bag.create", { id: BAG2, code: "4H8R2T-B", lot_id: LOT, start_date: "2026-11-02" }),
    m(id(33), "store.create", { id: STORE, name: "Barn fridge", kind }),
  ] } as PushRequest, { now, lane: false });
  await applyPush(db, otherOwner, { deviceId: "seed", mutations: [
    m(id(40), "lot.create", { id: OTHER_LOT, species: "Echinacea pallida", year: 2025, quantity: 90 }),
    m(id(41), "bag.create", { id: OTHER_BAG, code: "PULL01-A", lot_id: OTHER_LOT, start_date: "2026-11-01" }),
    m(id(42), "store.create", { id: OTHER_STORE, name: "Cellar", kind }),
    m(OTHER_MUTATION, "check.record", { id: OTHER_CHECK, bag_id: OTHER_BAG, checked_at: "2026-11-03T08:00:00.000Z", moisture: "damp", mould: "clean", sprouts: "none", actions: [] }),
  ] } as PushRequest, { now, lane: false });
}

// Small pools, so ids, rows, twins and codes collide often.
const mutationId = fc.oneof({ weight: 6, arbitrary: fc.integer({ min: 100, max: 160 }).map(id) }, { weight: 1, arbitrary: fc.constant(OTHER_MUTATION) });
const rowId = fc.oneof({ weight: 6, arbitrary: fc.integer({ min: 200, max: 230 }).map(id) }, { weight: 1, arbitrary: fc.constant(OTHER_CHECK) });
const bagRef = fc.constantFrom(BAG, BAG, BAG2, BAG, OTHER_BAG, MISSING);
const storeRef = fc.constantFrom(STORE, STORE, STORE, OTHER_STORE, MISSING);
const moment = fc.integer({ min: 0, max: 20 }).map((i) => new Date(Date.UTC(2026, 10, 5) + i * 3_600_000).toISOString());
const check = fc.record({
  id: rowId,
  bag_id: bagRef,
  checked_at: moment,
  moisture: fc.constantFrom("dry", "damp", "soggy", "damp", "wet"), // "wet" is refused
  mould: fc.constantFrom("clean", "spots"),
  sprouts: fc.constantFrom("none", "first_roots"),
  actions: fc.subarray([...checkActions], { maxLength: 2 }),
  note: fc.option(fc.constantFrom("dry corners", "\ud800 half an emoji"), { nil: undefined }),
});
const reading = fc.record({
  id: rowId,
  store_id: storeRef,
  taken_at: moment,
  temperature_c: fc.oneof({ weight: 9, arbitrary: fc.integer({ min: -5, max: 8 }) }, { weight: 1, arbitrary: fc.constant(99) }),
  origin: fc.constantFrom("manual", "check"),
  check_id: fc.option(rowId, { nil: null }),
});
const anyMutation = fc.oneof(
  { weight: 8, arbitrary: fc.tuple(mutationId, check).map(([i, a]) => m(i, "check.record", a)) },
  { weight: 4, arbitrary: fc.tuple(mutationId, reading).map(([i, a]) => m(i, "reading.record", a)) },
  { weight: 1, arbitrary: fc.tuple(mutationId, fc.integer({ min: 300, max: 305 }), fc.constantFrom("7K3Q9M-X", "9Z9Z9Z-Q", "5M5M5M-R")).map(([i, b, code]) => m(i, "bag.create", { id: id(b), code, lot_id: LOT, start_date: "2026-11-04" })) },
  { weight: 1, arbitrary: fc.tuple(mutationId, fc.constantFrom("left of the door", "top shelf")).map(([i, note]) => m(i, "bag.update", { id: BAG, patch: { note } })) },
);
const pushes = fc.array(
  fc.record({ who: fc.constantFrom(owner, owner, owner, visitor, otherOwner), mutations: fc.array(anyMutation, { minLength: 1, maxLength: 40 }) }),
  { minLength: 1, maxLength: 4 },
);

async function everything(db: Knex) {
  const tables = (await db.raw("SELECT name FROM sqlite_master WHERE type='table' AND name NOT LIKE 'sqlite_%' AND name NOT LIKE 'knex_%' ORDER BY name")) as { name: string }[];
  const out: Record<string, unknown[]> = {};
  for (const { name } of tables) out[name] = await db.raw(`SELECT * FROM "${name}" ORDER BY rowid`);
  return out;
}

describe.skipIf(testDialect !== "sqlite")("push fast lane", () => {
  beforeAll(async () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-lane-"));
    base = path.join(dir, "base.sqlite");
    const db = open(base);
    await db.migrate.latest();
    await seed(db);
    await db.destroy(); // closing checkpoints the WAL into the file, so a copy is whole
  });
  afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

  it("gives the general path's answers, rows, seqs, records and audit for random pushes", async () => {
    let run = 0;
    let refusals = 0;
    let total = 0;
    await fc.assert(
      fc.asyncProperty(pushes, async (list) => {
        run++;
        const files = ["lane", "general"].map((side) => path.join(dir, `${side}-${run}.sqlite`));
        for (const f of files) fs.copyFileSync(base, f);
        const [lane, general] = files.map(open);
        try {
          const laneNow = clock();
          const generalNow = clock();
          for (const { who, mutations } of list) {
            const push = { deviceId: "phone-1", mutations } as PushRequest;
            const a = await applyPush(lane, who, push, { now: laneNow });
            const b = await applyPush(general, who, push, { now: generalNow, lane: false });
            expect(a).toEqual(b);
            refusals += a.rejected.length;
            total += mutations.length;
          }
          expect(await everything(lane)).toEqual(await everything(general));
        } finally {
          await lane.destroy();
          await general.destroy();
          for (const f of files) fs.rmSync(f, { force: true });
        }
      }),
      { numRuns: 60 },
    );
    // The generators must really produce refusals (well over 1 %), not only clean checks.
    expect(refusals / total).toBeGreaterThan(0.01);
  }, 120_000);

  it("gives the same for a full push of 1,000, which the lane splits into chunks at its time budget", async () => {
    const files = ["lane-full", "general-full"].map((side) => path.join(dir, `${side}.sqlite`));
    for (const f of files) fs.copyFileSync(base, f);
    const [lane, general] = files.map(open);
    try {
      // Wider pools than above, so most of the push is applied and the lane has real work to split.
      const wide = fc.tuple(fc.integer({ min: 1000, max: 1700 }).map(id), check, fc.integer({ min: 2000, max: 2900 }).map(id))
        .map(([mid, a, rid]) => m(mid, "check.record", { ...a, id: rid }));
      const mutations = fc.sample(fc.oneof({ weight: 9, arbitrary: wide }, { weight: 1, arbitrary: anyMutation }), { numRuns: 1000, seed: 17 });
      const push = { deviceId: "phone-1", mutations } as PushRequest;
      const a = await applyPush(lane, owner, push, { now: clock() });
      const b = await applyPush(general, owner, push, { now: clock(), lane: false });
      expect(a).toEqual(b);
      expect(a.applied.length).toBeGreaterThan(500);
      expect(a.rejected.length).toBeGreaterThan(10);
      expect(await everything(lane)).toEqual(await everything(general));
    } finally {
      await lane.destroy();
      await general.destroy();
    }
  }, 60_000);

  it("rolls a chunk back on an unexpected error and applies it mutation by mutation through the general path", async () => {
    const files = ["lane-broken", "general-plain"].map((side) => path.join(dir, `${side}.sqlite`));
    for (const f of files) fs.copyFileSync(base, f);
    const [lane, general] = files.map(open);
    try {
      // A database fault the general path never meets: the farm's seq may only move one step at a time, so the
      // lane's one write of the chunk's seq fails after the chunk's rows are written.
      await lane.raw("CREATE TRIGGER one_step BEFORE UPDATE OF seq ON farms WHEN NEW.seq > OLD.seq + 1 BEGIN SELECT RAISE(ABORT, 'seq jumped'); END");
      const check = (n: number, bag = BAG) => ({ id: id(200 + n), bag_id: bag, checked_at: new Date(Date.UTC(2026, 10, 5, n)).toISOString(), moisture: "damp", mould: "clean", sprouts: "none", actions: [] });
      const push = { deviceId: "phone-1", mutations: [
        m(id(100), "check.record", check(1)), m(id(101), "check.record", check(2, MISSING)), m(id(102), "check.record", check(3)),
        m(id(100), "check.record", check(1)), m(OTHER_MUTATION, "check.record", check(4)),
      ] } as PushRequest;
      // A still clock: the rolled-back chunk read the time once already, the retry reads it again.
      const now = () => new Date(Date.UTC(2026, 10, 20, 8));
      const a = await applyPush(lane, owner, push, { now });
      const b = await applyPush(general, owner, push, { now, lane: false });
      expect(a.applied).toEqual([id(100), id(102), id(100)]);
      expect(a).toEqual(b);
      await lane.raw("DROP TRIGGER one_step");
      expect(await everything(lane)).toEqual(await everything(general));
    } finally {
      await lane.destroy();
      await general.destroy();
    }
  });
});
