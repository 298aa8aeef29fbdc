import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { SignJWT } from "jose";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember } from "../support/auth";
import { requireMember, assertSameOrigin, readSessionCookie, sessionCookie } from "@/lib/server/auth";
import { createSession, readSession, revokeAllSessions, revokeSession, SESSION_COOKIE } from "@/lib/server/sessions";
import { env } from "@/lib/server/env";
import { signSessionToken, verifySessionToken } from "@/lib/server/session-token";
import { AppError } from "@/lib/errors";
import { actionTable, mutationNames, mutationTable, type ActionName, type MutationName } from "@/lib/schemas/mutations";
import { roles, type Role } from "@/lib/schemas/vocabulary";

async function statusOf(p: Promise<unknown>): Promise<number> {
  try {
    await p;
    return 200;
  } catch (err) {
    if (err instanceof AppError) return err.status ?? 0;
    throw err;
  }
}

const withCookie = (token: string, method = "GET") =>
  new Request(new URL("/api/me", env.APP_ORIGIN), { method, headers: { cookie: `${SESSION_COOKIE}=${token}`, origin: env.APP_ORIGIN } });

describe("sessions and requireMember", () => {
  let ctx: Awaited<ReturnType<typeof freshDatabase>>;
  beforeAll(async () => {
    ctx = await freshDatabase();
  });
  afterAll(async () => ctx.cleanup());

  it("reads the member, farm and role from the database", async () => {
    const m = await signedInMember(ctx.db, { role: "grower", farmName: "Bramblewick Native Nursery" });
    const member = await requireMember(memberRequest("/api/me", m));
    expect(member).toMatchObject({ userId: m.userId, farmId: m.farmId, farmName: "Bramblewick Native Nursery", role: "grower", sessionId: m.sessionId, email: m.email });
  });

  it("answers 401 with no cookie, a tampered token, a token signed with another key, a revoked or an expired session", async () => {
    const m = await signedInMember(ctx.db, { role: "helper" });
    expect(await statusOf(requireMember(new Request(new URL("/api/me", env.APP_ORIGIN))))).toBe(401);

    // Flip the first character of the signature: it carries six whole bits, whereas the last one's low bits
    // are padding that a lenient base64url decoder drops, so flipping it may leave the signature unchanged.
    const dot = m.token.lastIndexOf(".");
    const first = m.token[dot + 1] === "A" ? "B" : "A";
    expect(await statusOf(requireMember(withCookie(m.token.slice(0, dot + 1) + first + m.token.slice(dot + 2))))).toBe(401);
    // Change the payload to name another session, keeping the old signature.
    const [h, , s] = m.token.split(".");
    const forgedPayload = Buffer.from(JSON.stringify({ sid: "00000000-0000-4000-8000-000000000000" })).toString("base64url");
    expect(await statusOf(requireMember(withCookie(`${h}.${forgedPayload}.${s}`)))).toBe(401);
    // Signed with a different secret.
    const foreign = await new SignJWT({ sid: m.sessionId }).setProtectedHeader({ alg: "HS256" }).setIssuer("rimebook").setAudience("rimebook-session").setExpirationTime("1d").sign(new TextEncoder().encode("x".repeat(40)));
    expect(await statusOf(requireMember(withCookie(foreign)))).toBe(401);
    // Unsigned ("alg: none").
    const none = `${Buffer.from(JSON.stringify({ alg: "none" })).toString("base64url")}.${Buffer.from(JSON.stringify({ sid: m.sessionId, iss: "rimebook", aud: "rimebook-session" })).toString("base64url")}.`;
    expect(await statusOf(requireMember(withCookie(none)))).toBe(401);

    expect(await statusOf(requireMember(withCookie(m.token)))).toBe(200);
    await revokeSession(ctx.db, m.sessionId);
    expect(await statusOf(requireMember(withCookie(m.token)))).toBe(401);

    // Expired: a session created 31 days ago (its token's own expiry has passed too).
    const old = await createSession(ctx.db, { userId: m.userId, farmId: m.farmId }, new Date(Date.now() - 31 * 86_400_000));
    expect(await statusOf(requireMember(withCookie(old.token)))).toBe(401);
    // Row expired although the token has not: the row is the authority.
    const fresh = await createSession(ctx.db, { userId: m.userId, farmId: m.farmId });
    await ctx.db("sessions").where({ id: fresh.sessionId }).update({ expires_at: new Date(Date.now() - 1000).toISOString() });
    expect(await statusOf(requireMember(withCookie(fresh.token)))).toBe(401);
  });

  it("remembers a verified token only until its expiry", async () => {
    const m = await signedInMember(ctx.db, { role: "helper" });
    const soon = await createSession(ctx.db, { userId: m.userId, farmId: m.farmId });
    const token = await signSessionToken(soon.sessionId, new Date(Date.now() + 2_000));
    expect(await verifySessionToken(token)).toBe(soon.sessionId);
    expect(await verifySessionToken(token)).toBe(soon.sessionId); // the remembered answer
    vi.useFakeTimers({ now: Date.now() + 3_000, toFake: ["Date"] });
    try {
      expect(await verifySessionToken(token)).toBeNull();
      expect(await statusOf(requireMember(withCookie(token)))).toBe(401);
    } finally {
      vi.useRealTimers();
    }
  });

  it("renews a session in use after a day (rolling 30 days), not before", async () => {
    const m = await signedInMember(ctx.db, { role: "visitor" });
    const soon = await readSession(m.token, new Date(Date.now() + 60 * 60 * 1000));
    expect(soon?.renewed).toBeNull();
    const later = new Date(Date.now() + 20 * 86_400_000);
    const renewed = await readSession(m.token, later);
    expect(renewed?.renewed).not.toBeNull();
    expect(Date.parse(renewed!.renewed!.expiresAt)).toBeGreaterThan(later.getTime() + 29 * 86_400_000);
    // The renewed row outlives the first token's 30 days; the new token reads it.
    const after = await readSession(renewed!.renewed!.token, new Date(Date.now() + 40 * 86_400_000));
    expect(after?.session.id).toBe(m.sessionId);
  });

  it("signs out everywhere: every session of the person is revoked", async () => {
    const m = await signedInMember(ctx.db, { role: "owner" });
    const second = await createSession(ctx.db, { userId: m.userId, farmId: m.farmId });
    expect(await revokeAllSessions(ctx.db, m.userId)).toBe(2);
    expect(await readSession(m.token)).toBeNull();
    expect(await readSession(second.token)).toBeNull();
  });

  it("401s a member removed from the farm even with a live session", async () => {
    const m = await signedInMember(ctx.db, { role: "helper" });
    await ctx.db("memberships").where({ id: m.membershipId }).update({ deleted_at: new Date().toISOString() });
    expect(await statusOf(requireMember(memberRequest("/api/me", m)))).toBe(401);
  });

  it("refuses a mutating request from another origin, or with no Origin or Referer (403)", async () => {
    const m = await signedInMember(ctx.db, { role: "owner" });
    const post = (headers: Record<string, string>) => new Request(new URL("/api/invites", env.APP_ORIGIN), { method: "POST", headers: { cookie: m.cookie, ...headers } });
    expect(await statusOf(requireMember(post({ origin: "https://evil.example" })))).toBe(403);
    expect(await statusOf(requireMember(post({})))).toBe(403);
    expect(await statusOf(requireMember(post({ origin: "null" })))).toBe(403);
    expect(await statusOf(requireMember(post({ referer: "https://evil.example/page" })))).toBe(403);
    expect(await statusOf(requireMember(post({ referer: `${env.APP_ORIGIN}/team` })))).toBe(200);
    expect(await statusOf(requireMember(post({ origin: env.APP_ORIGIN })))).toBe(200);
    // Reads are not mutating.
    expect(() => assertSameOrigin(new Request(new URL("/api/me", env.APP_ORIGIN)))).not.toThrow();
  });

  it("builds an httpOnly, SameSite=Lax cookie on Path=/ that a request reads back", () => {
    const c = sessionCookie("abc.def.ghi", new Date(Date.now() + 86_400_000).toISOString());
    expect(c).toMatch(/^rimebook_session=abc\.def\.ghi; /);
    expect(c).toContain("HttpOnly");
    expect(c).toContain("SameSite=Lax");
    expect(c).toContain("Path=/");
    expect(c.includes("Secure")).toBe(env.secureCookies);
    expect(readSessionCookie(new Request("http://x/", { headers: { cookie: "a=1; rimebook_session=abc.def.ghi; b=2" } }))).toBe("abc.def.ghi");
  });
});

describe("the role matrix: every role × every mutation and action, through requireMember", () => {
  let ctx: Awaited<ReturnType<typeof freshDatabase>>;
  const members = {} as Record<Role, Awaited<ReturnType<typeof signedInMember>>>;
  beforeAll(async () => {
    ctx = await freshDatabase();
    const owner = await signedInMember(ctx.db, { role: "owner" });
    members.owner = owner;
    for (const r of ["grower", "helper", "visitor"] as const) members[r] = await signedInMember(ctx.db, { role: r, farmId: owner.farmId });
  });
  afterAll(async () => ctx.cleanup());

  // Expected from PRODUCT.md: Owner everything; Grower plans, lots, protocols, bags, checks;
  // Helper checks, pulls, counts (and readings, sowings, photos); Visitor reads only.
  const helperMay = new Set(["member.preferences", "reading.record", "bag.pull", "bag.discard", "check.record", "sowing.record", "count.record", "photo.upload", "export.read"]);
  const ownerOnly = new Set(["farm.update", "team.manage", "farm.backup", "farm.restore"]);
  const visitorMay = new Set(["member.preferences", "export.read"]);
  function expected(role: Role, name: string): boolean {
    if (role === "owner") return true;
    if (role === "grower") return !ownerOnly.has(name);
    if (role === "helper") return helperMay.has(name);
    return visitorMay.has(name);
  }

  const names = [...mutationNames, ...(Object.keys(actionTable) as ActionName[])];
  it("covers every name in the table", () => {
    expect(names.length).toBe(Object.keys(mutationTable).length + Object.keys(actionTable).length);
  });

  for (const role of roles) {
    it(`${role}`, async () => {
      const outcome: Record<string, number> = {};
      const want: Record<string, number> = {};
      for (const name of names) {
        outcome[name] = await statusOf(requireMember(memberRequest("/api/sync/push", members[role], { method: "POST" }), name as MutationName | ActionName));
        want[name] = expected(role, name) ? 200 : 403;
      }
      expect(outcome).toEqual(want);
    });
  }
});
