import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { freshDatabase, type FreshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { countRows, uuid } from "../support/sync";
import { env } from "@/lib/server/env";
import { POST as push } from "@/app/api/sync/push/route";
import { GET as pull } from "@/app/api/sync/pull/route";
import { POST as signUp } from "@/app/api/auth/sign-up/route";
import { PATCH as patchMember, DELETE as deleteMember } from "@/app/api/team/[id]/route";
import type { MutationName } from "@/lib/schemas/mutations";

// Races between requests on real parallel connections: on PostgreSQL (TEST_DATABASE_URL) each request
// runs on its own pooled connection, as under load; on SQLite the one connection serialises them, and
// the same exact counts must hold. Every assertion counts rows, never just "no error".

const ctx = { params: Promise.resolve({}) };
const idCtx = (id: string) => ({ params: Promise.resolve({ id }) });
const origin = new URL(env.APP_ORIGIN).origin;
const mutation = (name: MutationName, args: unknown) => ({ id: uuid(), name, args, at: "2026-11-20T08:00:00.000Z" });

async function pushAs(member: TestMember, mutations: unknown[], deviceId = "device-1") {
  const res = await push(memberRequest("/api/sync/push", member, { method: "POST", json: { deviceId, mutations } }), ctx);
  return { status: res.status, body: await res.json() };
}

let t: FreshDatabase;
let db: Knex;
beforeAll(async () => {
  t = await freshDatabase();
  db = t.db;
});
afterAll(async () => t.cleanup());

describe("pull under concurrent writers", () => {
  it("reaches the puller with every row exactly once while writers push checks and readings", async () => {
    const owner = await signedInMember(db, { role: "owner" });
    const lotId = uuid();
    const bagId = uuid();
    const storeId = uuid();
    const setup = await pushAs(owner, [
      mutation("lot.create", { id: lotId, species: "Asclepias tuberosa" }),
      mutation("store.create", { id: storeId, name: "Barn fridge", kind: "fridge" }),
      mutation("bag.create", { id: bagId, code: "CNC-0001", lot_id: lotId, start_date: "2026-11-01", store_id: storeId }),
    ]);
    expect(setup.body.rejected).toEqual([]);

    const WRITERS = 3;
    const PUSHES = 30;
    const PER_PUSH = 4; // two checks and two readings: rows land in two tables with interleaved seqs
    let minute = 0;
    const writer = async (w: number) => {
      for (let p = 0; p < PUSHES; p++) {
        const batch = [];
        for (let i = 0; i < PER_PUSH / 2; i++) {
          const m = minute++;
          const takenAt = new Date(Date.UTC(2026, 10, 1) + m * 60_000).toISOString();
          batch.push(mutation("check.record", { id: uuid(), bag_id: bagId, checked_at: takenAt, moisture: "damp", mould: "clean", sprouts: "none" }));
          batch.push(mutation("reading.record", { id: uuid(), store_id: storeId, taken_at: takenAt, temperature_c: 3 + (m % 3) }));
        }
        const r = await pushAs(owner, batch, `writer-${w}`);
        expect(r.body.rejected).toEqual([]);
      }
    };

    const seen = { checks: new Map<string, number>(), readings: new Map<string, number>() };
    let cursor = 0;
    let pulls = 0;
    const pullOnce = async () => {
      const res = await pull(memberRequest(`/api/sync/pull?since=${cursor}&limit=5`, owner), ctx);
      expect(res.status).toBe(200);
      const page = (await res.json()) as { cursor: number; more: boolean; changes: { table: string; row: { id: string } }[] };
      pulls++;
      for (const c of page.changes) {
        const bucket = seen[c.table as keyof typeof seen];
        if (bucket) bucket.set(c.row.id, (bucket.get(c.row.id) ?? 0) + 1);
      }
      cursor = page.cursor;
      return page.more;
    };
    let writing = true;
    const puller = async () => {
      while (writing) await pullOnce();
      while (await pullOnce());
    };
    const pulling = puller();
    await Promise.all(Array.from({ length: WRITERS }, (_, w) => writer(w)));
    writing = false;
    await pulling;

    const total = WRITERS * PUSHES * (PER_PUSH / 2);
    expect(await countRows(db, "checks")).toBe(total);
    expect(await countRows(db, "readings")).toBe(total);
    // Every stored row reached the phone, none twice (a row is sent again only when written again).
    expect(seen.checks.size).toBe(total);
    expect(seen.readings.size).toBe(total);
    expect([...seen.checks.values(), ...seen.readings.values()].every((n) => n === 1)).toBe(true);
    expect(pulls).toBeGreaterThan(10); // the puller really ran alongside the writers
  });
});

describe("the last Owner", () => {
  async function twoOwners() {
    const a = await signedInMember(db, { role: "owner", farmName: "Two Owners" });
    const b = await signedInMember(db, { role: "owner", farmId: a.farmId });
    return { a, b };
  }
  const owners = (farmId: string) => countRows(db, "memberships", { farm_id: farmId, role: "owner", deleted_at: null });

  it("two Owners demoting each other at once: exactly one demotion goes through, one Owner stays (10 rounds)", async () => {
    for (let round = 0; round < 10; round++) {
      const { a, b } = await twoOwners();
      const [ab, ba] = await Promise.all([
        patchMember(memberRequest(`/api/team/${b.membershipId}`, a, { method: "PATCH", json: { role: "grower" } }), idCtx(b.membershipId)),
        patchMember(memberRequest(`/api/team/${a.membershipId}`, b, { method: "PATCH", json: { role: "grower" } }), idCtx(a.membershipId)),
      ]);
      const statuses = [ab.status, ba.status].sort();
      // The loser is refused as the last Owner (409), or, demoted first, no longer allowed to manage the team (403).
      expect(statuses[0]).toBe(200);
      expect([403, 409]).toContain(statuses[1]);
      expect(await owners(a.farmId)).toBe(1);
    }
  });

  it("two Owners removing each other at once: exactly one removal goes through, one Owner stays (10 rounds)", async () => {
    for (let round = 0; round < 10; round++) {
      const { a, b } = await twoOwners();
      const [ab, ba] = await Promise.all([
        deleteMember(memberRequest(`/api/team/${b.membershipId}`, a, { method: "DELETE" }), idCtx(b.membershipId)),
        deleteMember(memberRequest(`/api/team/${a.membershipId}`, b, { method: "DELETE" }), idCtx(a.membershipId)),
      ]);
      const statuses = [ab.status, ba.status].sort();
      expect(statuses[0]).toBe(200);
      // Removed first, the loser's session has ended (401/403), or it counted one Owner left (409).
      expect([401, 403, 409]).toContain(statuses[1]);
      expect(await owners(a.farmId)).toBe(1);
    }
  });
});

describe("duplicate sign-up", () => {
  it("five sign-ups with one e-mail at once: one 201, four 409 in words; one account and one farm", async () => {
    const email = `twin-${uuid().slice(0, 8)}@example.test`;
    const farmsBefore = await countRows(db, "farms");
    const answers = await Promise.all(
      Array.from({ length: 5 }, (_, i) =>
        signUp(
          new Request(new URL("/api/auth/sign-up", origin), {
            method: "POST",
            headers: { "content-type": "application/json", origin, "x-forwarded-for": `198.51.100.${i + 1}` },
            body: JSON.stringify({ email, password: "catkins in february", name: `Twin ${i}`, farmName: `Twin farm ${i}` }),
          }),
          ctx,
        ),
      ),
    );
    const statuses = answers.map((r) => r.status).sort();
    expect(statuses).toEqual([201, 409, 409, 409, 409]);
    for (const r of answers.filter((x) => x.status === 409)) {
      const body = await r.json();
      expect(body.error.code).toBe("conflict");
      expect(body.error.fields).toHaveProperty("email");
    }
    expect(await countRows(db, "users", { email })).toBe(1);
    expect(await countRows(db, "farms")).toBe(farmsBefore + 1);
  });
});
