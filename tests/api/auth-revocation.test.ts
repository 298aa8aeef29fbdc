import { afterAll, beforeAll, describe, expect, it } from "vitest";
import knexFactory, { type Knex } from "knex";
import { freshDatabase, type FreshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { buildKnexConfig } from "@/lib/server/db-config";
import { createSession, SESSION_COOKIE } from "@/lib/server/sessions";
import { env } from "@/lib/server/env";
import { GET as pull } from "@/app/api/sync/pull/route";
import { POST as signOut } from "@/app/api/auth/sign-out/route";
import { POST as changePassword } from "@/app/api/me/password/route";
import { PATCH as patchMember, DELETE as deleteMember } from "@/app/api/team/[id]/route";

// The session check runs on every request and keeps nothing about sessions or members in memory (only a verified
// token's signature), so each of these counts from the very next request: sign-out, a revoked session, a role
// change, a removed member, a password change. The last case writes through a second pool of connections to the
// same database, as another app process would, so no in-process invalidation can be what makes it work.

const ctx = { params: Promise.resolve({}) };
const idCtx = (id: string) => ({ params: Promise.resolve({ id }) });

async function pullAs(m: Pick<TestMember, "headers">): Promise<{ status: number; role?: string }> {
  const res = await pull(memberRequest("/api/sync/pull?since=0&limit=5", m), ctx);
  const body = (await res.json()) as { role?: string };
  return { status: res.status, role: body.role };
}

const headersFor = (token: string) => {
  const cookie = `${SESSION_COOKIE}=${token}`;
  return { headers: { cookie, origin: new URL(env.APP_ORIGIN).origin } };
};

describe("revocation counts from the very next request", () => {
  let t: FreshDatabase;
  let db: Knex;
  let owner: TestMember;
  beforeAll(async () => {
    t = await freshDatabase();
    db = t.db;
    owner = await signedInMember(db, { role: "owner" });
  });
  afterAll(async () => t.cleanup());

  it("sign-out", async () => {
    const m = await signedInMember(db, { role: "helper", farmId: owner.farmId });
    expect(await pullAs(m)).toEqual({ status: 200, role: "helper" });
    const res = await signOut(memberRequest("/api/auth/sign-out", m, { method: "POST", json: {} }), ctx);
    expect(res.status).toBe(200);
    expect((await pullAs(m)).status).toBe(401);
  });

  it("a revoked session, the others of the same person untouched", async () => {
    const m = await signedInMember(db, { role: "grower", farmId: owner.farmId });
    const second = await createSession(db, { userId: m.userId, farmId: m.farmId });
    expect((await pullAs(m)).status).toBe(200);
    expect((await pullAs(headersFor(second.token))).status).toBe(200);
    await db("sessions").where({ id: m.sessionId }).update({ revoked_at: new Date().toISOString() });
    expect((await pullAs(m)).status).toBe(401);
    expect((await pullAs(headersFor(second.token))).status).toBe(200);
  });

  it("a role change, both ways", async () => {
    const m = await signedInMember(db, { role: "grower", farmId: owner.farmId });
    expect(await pullAs(m)).toEqual({ status: 200, role: "grower" });
    const down = await patchMember(memberRequest(`/api/team/${m.membershipId}`, owner, { method: "PATCH", json: { role: "visitor" } }), idCtx(m.membershipId));
    expect(down.status).toBe(200);
    expect(await pullAs(m)).toEqual({ status: 200, role: "visitor" });
    const up = await patchMember(memberRequest(`/api/team/${m.membershipId}`, owner, { method: "PATCH", json: { role: "helper" } }), idCtx(m.membershipId));
    expect(up.status).toBe(200);
    expect(await pullAs(m)).toEqual({ status: 200, role: "helper" });
  });

  it("a removed member", async () => {
    const m = await signedInMember(db, { role: "helper", farmId: owner.farmId });
    expect((await pullAs(m)).status).toBe(200);
    const res = await deleteMember(memberRequest(`/api/team/${m.membershipId}`, owner, { method: "DELETE" }), idCtx(m.membershipId));
    expect(res.status).toBe(200);
    expect((await pullAs(m)).status).toBe(401);
  });

  it("a password change: the person's other sessions and this phone's old token end, the new token works", async () => {
    const m = await signedInMember(db, { role: "grower", farmId: owner.farmId });
    const otherPhone = await createSession(db, { userId: m.userId, farmId: m.farmId });
    expect((await pullAs(m)).status).toBe(200);
    expect((await pullAs(headersFor(otherPhone.token))).status).toBe(200);
    const res = await changePassword(memberRequest("/api/me/password", m, { method: "POST", json: { currentPassword: m.password, newPassword: "a new frost on the barn door" } }), ctx);
    expect(res.status).toBe(200);
    expect((await pullAs(m)).status).toBe(401);
    expect((await pullAs(headersFor(otherPhone.token))).status).toBe(401);
    const fresh = res.headers.getSetCookie().map((c) => c.split(";")[0]).find((c) => c.startsWith(`${SESSION_COOKIE}=`))!;
    expect((await pullAs({ headers: { cookie: fresh, origin: new URL(env.APP_ORIGIN).origin } })).status).toBe(200);
  });

  it("changes written by another process (its own connections to the same database)", async () => {
    const other: Knex = knexFactory(buildKnexConfig(t.url));
    try {
      const m = await signedInMember(db, { role: "grower", farmId: owner.farmId });
      const n = await signedInMember(db, { role: "helper", farmId: owner.farmId });
      expect(await pullAs(m)).toEqual({ status: 200, role: "grower" });
      expect(await pullAs(n)).toEqual({ status: 200, role: "helper" });
      await other("memberships").where({ id: m.membershipId }).update({ role: "visitor" });
      expect(await pullAs(m)).toEqual({ status: 200, role: "visitor" });
      await other("sessions").where({ id: m.sessionId }).update({ revoked_at: new Date().toISOString() });
      expect((await pullAs(m)).status).toBe(401);
      await other("memberships").where({ id: n.membershipId }).update({ deleted_at: new Date().toISOString() });
      expect((await pullAs(n)).status).toBe(401);
    } finally {
      await other.destroy();
    }
  });
});
