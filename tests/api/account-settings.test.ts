// The signed-in person's own account, through the real route handlers on a temp SQLite file: change
// password (other sessions end, this one stays; wrong current password counted like sign-in), display
// name (seen in /api/me and in every farm's team list), switching farms, and the sign-up limit.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { freshDatabase } from "../support/db";
import { signedInMember, TEST_PASSWORD, type TestMember } from "../support/auth";
import { env } from "@/lib/server/env";
import { addMembership } from "@/lib/server/accounts";
import { createSession, SESSION_COOKIE } from "@/lib/server/sessions";
import { CLIENT_HEADER, FRONT_DOOR } from "@/lib/server/front-door.mjs";
import { ACCOUNT_FAILURE_LIMIT, SIGN_UP_ADDRESS_LIMIT } from "@/lib/server/rate-limit";
import { GET as me, PATCH as patchMe } from "@/app/api/me/route";
import { POST as changePasswordRoute } from "@/app/api/me/password/route";
import { POST as switchFarm } from "@/app/api/me/farm/route";
import { POST as signIn } from "@/app/api/auth/sign-in/route";
import { POST as signUp } from "@/app/api/auth/sign-up/route";
import { GET as pull } from "@/app/api/sync/pull/route";

const origin = new URL(env.APP_ORIGIN).origin;
const noCtx = {} as never;

/** A browser-like request from our own origin (or another), with cookie and address. */
function send(method: string, p: string, json: unknown, opts: { cookie?: string; ip?: string; origin?: string | null } = {}) {
  const headers: Record<string, string> = { "content-type": "application/json", [CLIENT_HEADER]: opts.ip ?? "192.0.2.20" };
  if (opts.origin !== null) headers.origin = opts.origin ?? origin;
  if (opts.cookie) headers.cookie = opts.cookie;
  return new Request(new URL(p, origin), { method, headers, body: JSON.stringify(json) });
}
const post = (p: string, json: unknown, opts?: Parameters<typeof send>[3]) => send("POST", p, json, opts);
const get = (p: string, cookie: string) => new Request(new URL(p, origin), { headers: { cookie } });
const status = async (cookie: string) => (await me(get("/api/me", cookie), noCtx)).status;

/** Another session of the same person (another phone), on `farmId`. */
async function otherSession(m: TestMember, farmId = m.farmId): Promise<string> {
  const s = await createSession(ctx.db, { userId: m.userId, farmId, userAgent: "second phone" });
  return `${SESSION_COOKIE}=${s.token}`;
}

function cookieFrom(res: Response): string {
  const m = (res.headers.get("set-cookie") ?? "").match(new RegExp(`${SESSION_COOKIE}=([^;]*)`));
  if (!m?.[1]) throw new Error("no session cookie");
  return `${SESSION_COOKIE}=${m[1]}`;
}

let ctx: Awaited<ReturnType<typeof freshDatabase>>;
beforeAll(async () => {
  (globalThis as Record<symbol, unknown>)[FRONT_DOOR] = true; // addresses as the front door reads them (scripts/serve.mjs)
  ctx = await freshDatabase();
});
afterAll(async () => ctx.cleanup());

/** A second farm the member also belongs to, as `role`. */
async function joinSecondFarm(m: TestMember, role: "grower" | "helper" | "visitor" = "helper"): Promise<string> {
  const other = await signedInMember(ctx.db, { role: "owner", farmName: "Quill Seed Library" });
  await ctx.db.transaction((trx) => addMembership(trx, { farmId: other.farmId, userId: m.userId, role }));
  return other.farmId;
}

describe("change password while signed in", () => {
  it("sets the new password, ends every other session (all farms) and keeps this one signed in", async () => {
    const m = await signedInMember(ctx.db, { role: "grower" });
    const secondFarm = await joinSecondFarm(m);
    const phone2 = await otherSession(m);
    const onOtherFarm = await otherSession(m, secondFarm);
    expect(await status(phone2)).toBe(200);

    const res = await changePasswordRoute(post("/api/me/password", { currentPassword: TEST_PASSWORD, newPassword: "hazel catkins in march" }, { cookie: m.cookie }), noCtx);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toMatchObject({ ok: true, ended: 2 });
    expect(body.message).toBe("Password changed. You were signed out on 2 other phones or computers. This phone stays signed in.");

    // This phone goes on with the fresh session the answer set; the old session's token ends with the old password.
    const fresh = /rimebook[^=]*=([^;]+)/.exec(res.headers.get("set-cookie") ?? "");
    expect(fresh).not.toBeNull();
    expect(await status(`${m.cookie.split("=")[0]}=${fresh![1]}`)).toBe(200);
    expect(await status(m.cookie)).toBe(401);
    expect(await status(phone2)).toBe(401);
    expect(await status(onOtherFarm)).toBe(401);
    const signInWith = (password: string) => signIn(post("/api/auth/sign-in", { email: m.email, password }, { ip: "192.0.2.21" }), noCtx);
    expect((await signInWith(TEST_PASSWORD)).status).toBe(401);
    expect((await signInWith("hazel catkins in march")).status).toBe(200);
  });

  it("refuses a wrong current password with a field error in words, and changes nothing", async () => {
    const m = await signedInMember(ctx.db, { role: "helper" });
    const phone2 = await otherSession(m);
    const before = (await ctx.db("users").where({ id: m.userId }).first()).password_hash;
    const res = await changePasswordRoute(post("/api/me/password", { currentPassword: "not my password", newPassword: "sphagnum and sand" }, { cookie: m.cookie, ip: "192.0.2.30" }), noCtx);
    expect(res.status).toBe(400);
    const { error } = await res.json();
    expect(error.code).toBe("invalid");
    expect(error.message).toBe("The current password is not right, so the password was not changed.");
    expect(error.fields.currentPassword).toMatch(/^That is not your current password\./);
    expect((await ctx.db("users").where({ id: m.userId }).first()).password_hash).toBe(before);
    expect(await status(phone2)).toBe(200);
    expect(await status(m.cookie)).toBe(200);
  });

  it("answers invalid input with 400 and the field in words", async () => {
    const m = await signedInMember(ctx.db, { role: "visitor" });
    const cases: [unknown, string, RegExp][] = [
      [{ currentPassword: TEST_PASSWORD, newPassword: "short" }, "newPassword", /at least 10 characters/],
      [{ currentPassword: TEST_PASSWORD, newPassword: TEST_PASSWORD }, "newPassword", /same as the current one/],
      [{ currentPassword: "", newPassword: "long enough new one" }, "currentPassword", /Enter your current password/],
      [{ newPassword: "long enough new one" }, "currentPassword", /Enter your current password/],
      [{ currentPassword: TEST_PASSWORD, newPassword: "x".repeat(201) }, "newPassword", /under 200 characters/],
    ];
    for (const [json, field, words] of cases) {
      const res = await changePasswordRoute(post("/api/me/password", json, { cookie: m.cookie }), noCtx);
      expect(res.status, JSON.stringify(json)).toBe(400);
      expect((await res.json()).error.fields[field]).toMatch(words);
    }
    const junk = await changePasswordRoute(new Request(new URL("/api/me/password", origin), { method: "POST", headers: { origin, cookie: m.cookie }, body: "{nope" }), noCtx);
    expect(junk.status).toBe(400);
  });

  it("refuses another origin (403) and a request without a session (401)", async () => {
    const m = await signedInMember(ctx.db, { role: "owner" });
    const json = { currentPassword: TEST_PASSWORD, newPassword: "hazel catkins in march" };
    expect((await changePasswordRoute(post("/api/me/password", json, { cookie: m.cookie, origin: "https://elsewhere.example" }), noCtx)).status).toBe(403);
    expect((await changePasswordRoute(post("/api/me/password", json, { cookie: m.cookie, origin: null }), noCtx)).status).toBe(403);
    expect((await changePasswordRoute(post("/api/me/password", json), noCtx)).status).toBe(401);
    const user = await ctx.db("users").where({ id: m.userId }).first();
    expect(user.updated_at).toBe(user.created_at); // untouched
  });

  it("locks after 5 wrong current passwords like sign-in does: 429 in words, and sign-in is locked too", async () => {
    const m = await signedInMember(ctx.db, { role: "grower" });
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT; i++) {
      const r = await changePasswordRoute(post("/api/me/password", { currentPassword: `guess ${i} here`, newPassword: "sphagnum and sand" }, { cookie: m.cookie, ip: `198.51.100.${i + 10}` }), noCtx);
      expect(r.status).toBe(400);
    }
    const locked = await changePasswordRoute(post("/api/me/password", { currentPassword: TEST_PASSWORD, newPassword: "sphagnum and sand" }, { cookie: m.cookie, ip: "198.51.100.12" }), noCtx);
    expect(locked.status).toBe(429);
    const { error } = await locked.json();
    expect(error).toMatchObject({ code: "rate_limited" });
    expect(error.message).toBe("Too many wrong passwords. For safety, try again in 15 minutes, or reset your password.");
    expect((await signIn(post("/api/auth/sign-in", { email: m.email, password: TEST_PASSWORD }, { ip: "198.51.100.13" }), noCtx)).status).toBe(429);
    // The session itself is not ended by the lock.
    expect(await status(m.cookie)).toBe(200);
  });
});

describe("display name", () => {
  it("renames the person: /api/me answers the new name, and both farms' team lists pull it", async () => {
    const m = await signedInMember(ctx.db, { role: "helper", name: "Moss F." });
    const secondFarm = await joinSecondFarm(m, "visitor");
    const seqBefore = await ctx.db("memberships").where({ user_id: m.userId }).select("farm_id", "seq");
    const res = await patchMe(send("PATCH", "/api/me", { name: "  Moss Fenwick " }, { cookie: m.cookie }), noCtx);
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body).toMatchObject({ user: { id: m.userId, name: "Moss Fenwick" }, farm: { id: m.farmId }, role: "helper" });
    expect(body.farms).toHaveLength(2);
    expect(await (await me(get("/api/me", m.cookie), noCtx)).json()).toMatchObject({ user: { name: "Moss Fenwick" } });

    for (const before of seqBefore) {
      const after = await ctx.db("memberships").where({ user_id: m.userId, farm_id: before.farm_id }).first();
      expect(after.seq).toBeGreaterThan(before.seq);
    }
    // A phone on the second farm that had pulled everything before sees the new name in its next pull.
    const owner2 = await ctx.db("memberships").where({ farm_id: secondFarm, role: "owner" }).first();
    const ownerCookie = await otherSession({ userId: owner2.user_id } as TestMember, secondFarm);
    const since = Math.min(...seqBefore.map((s) => s.seq));
    const page = await (await pull(get(`/api/sync/pull?since=${since}`, ownerCookie), noCtx)).json();
    const row = page.changes.find((c: { table: string; row: { user_id: string } }) => c.table === "memberships" && c.row.user_id === m.userId);
    expect(row?.row).toMatchObject({ name: "Moss Fenwick" });
  });

  it("refuses an empty or overlong name (400 with the field), another origin (403), and no session (401)", async () => {
    const m = await signedInMember(ctx.db, { role: "visitor", name: "Juniper" });
    const empty = await patchMe(send("PATCH", "/api/me", { name: "   " }, { cookie: m.cookie }), noCtx);
    expect(empty.status).toBe(400);
    expect((await empty.json()).error.fields.name).toBe("Enter your name, as your team knows you.");
    const long = await patchMe(send("PATCH", "/api/me", { name: "x".repeat(121) }, { cookie: m.cookie }), noCtx);
    expect((await long.json()).error.fields.name).toBe("Keep the name under 120 characters.");
    expect((await patchMe(send("PATCH", "/api/me", { name: "Sneaky" }, { cookie: m.cookie, origin: "https://elsewhere.example" }), noCtx)).status).toBe(403);
    expect((await patchMe(send("PATCH", "/api/me", { name: "Sneaky" }), noCtx)).status).toBe(401);
    expect((await ctx.db("users").where({ id: m.userId }).first()).name).toBe("Juniper");
  });
});

describe("switching farms", () => {
  it("opens another farm of the person with that farm's role; the old session ends", async () => {
    const m = await signedInMember(ctx.db, { role: "owner", farmName: "Bramblewick Native Nursery" });
    const secondFarm = await joinSecondFarm(m, "grower");
    const res = await switchFarm(post("/api/me/farm", { farmId: secondFarm }, { cookie: m.cookie }), noCtx);
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ farm: { id: secondFarm, name: "Quill Seed Library" }, role: "grower" });
    const fresh = cookieFrom(res);
    expect(await (await me(get("/api/me", fresh), noCtx)).json()).toMatchObject({ farm: { id: secondFarm }, role: "grower" });
    expect(await status(m.cookie)).toBe(401);
  });

  it("cannot open a farm the person does not belong to, or no longer belongs to (404, session kept)", async () => {
    const m = await signedInMember(ctx.db, { role: "grower" });
    const stranger = await signedInMember(ctx.db, { role: "owner", farmName: "Someone Else's Farm" });
    const notMine = await switchFarm(post("/api/me/farm", { farmId: stranger.farmId }, { cookie: m.cookie }), noCtx);
    expect(notMine.status).toBe(404);
    expect((await notMine.json()).error.message).toBe("That farm was not found.");
    expect(await status(m.cookie)).toBe(200);

    const removedFrom = await joinSecondFarm(m, "helper");
    await ctx.db("memberships").where({ farm_id: removedFrom, user_id: m.userId }).update({ deleted_at: new Date().toISOString() });
    expect((await switchFarm(post("/api/me/farm", { farmId: removedFrom }, { cookie: m.cookie }), noCtx)).status).toBe(404);
    expect((await switchFarm(post("/api/me/farm", { farmId: randomUUID() }, { cookie: m.cookie }), noCtx)).status).toBe(404);
    const bad = await switchFarm(post("/api/me/farm", { farmId: "not-a-farm" }, { cookie: m.cookie }), noCtx);
    expect(bad.status).toBe(400);
    expect((await bad.json()).error.fields.farmId).toBe("Pick a farm.");
    expect((await switchFarm(post("/api/me/farm", { farmId: stranger.farmId }, { cookie: m.cookie, origin: "https://elsewhere.example" }), noCtx)).status).toBe(403);
    expect(await status(m.cookie)).toBe(200);
  });
});

describe("sign-up limit per network address", () => {
  const signUpFrom = (ip: string, n: number) =>
    signUp(post("/api/auth/sign-up", { email: `grower${n}-${ip}@example.test`, password: "frost on the barn door", name: `Grower ${n}`, farmName: `Farm ${n}` }, { ip }), noCtx);

  it(`allows ${SIGN_UP_ADDRESS_LIMIT} new farms from one address in 15 minutes, then answers 429 in words`, async () => {
    const ip = "203.0.113.70";
    // Input the form itself refuses does not count toward the limit.
    const invalid = await signUp(post("/api/auth/sign-up", { email: "nope", password: "short", name: "", farmName: "" }, { ip }), noCtx);
    expect(invalid.status).toBe(400);
    for (let i = 0; i < SIGN_UP_ADDRESS_LIMIT; i++) expect((await signUpFrom(ip, i)).status).toBe(201);
    const limited = await signUpFrom(ip, 99);
    expect(limited.status).toBe(429);
    expect(limited.headers.get("set-cookie")).toBeNull();
    expect((await limited.json()).error).toEqual({
      code: "rate_limited",
      message: "Too many new farm accounts were started from this network. For safety, try again in 15 minutes.",
    });
    expect(await ctx.db("users").where({ email: `grower99-${ip}@example.test` }).first()).toBeUndefined();
    // Another address is not affected.
    expect((await signUpFrom("203.0.113.71", 0)).status).toBe(201);
  });

  it("counts a sign-up with an e-mail that already has an account (so the form cannot probe many e-mails)", async () => {
    const ip = "203.0.113.80";
    const existing = await signedInMember(ctx.db, { role: "owner" });
    for (let i = 0; i < SIGN_UP_ADDRESS_LIMIT; i++) {
      const r = await signUp(post("/api/auth/sign-up", { email: existing.email, password: "frost on the barn door", name: "X", farmName: "Y" }, { ip }), noCtx);
      expect(r.status).toBe(409);
    }
    expect((await signUpFrom(ip, 1)).status).toBe(429);
  });
});
