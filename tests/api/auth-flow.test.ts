import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { memberRequest, signedInMember, TEST_PASSWORD } from "../support/auth";
import { env } from "@/lib/server/env";
import { useSmtp } from "@/lib/server/mail";
import { readMailbox, startMailFake, type MailFake } from "@/lib/server/mail-fake";
import { SESSION_COOKIE } from "@/lib/server/sessions";
import { CLIENT_HEADER, FRONT_DOOR } from "@/lib/server/front-door.mjs";
import { POST as signUp } from "@/app/api/auth/sign-up/route";
import { POST as signIn } from "@/app/api/auth/sign-in/route";
import { POST as signOut } from "@/app/api/auth/sign-out/route";
import { POST as signOutEverywhere } from "@/app/api/auth/sign-out-everywhere/route";
import { POST as resetRequest } from "@/app/api/auth/reset-request/route";
import { POST as resetConfirm } from "@/app/api/auth/reset-confirm/route";
import { GET as me } from "@/app/api/me/route";
import { POST as switchFarm } from "@/app/api/me/farm/route";
import { POST as invite, GET as listInvites } from "@/app/api/invites/route";
import { DELETE as revokeInviteRoute } from "@/app/api/invites/[id]/route";
import { POST as resendInviteRoute } from "@/app/api/invites/[id]/resend/route";
import { GET as describeInviteRoute, POST as acceptInviteRoute } from "@/app/api/invites/accept/route";
import { GET as team } from "@/app/api/team/route";
import { PATCH as patchMember, DELETE as deleteMember } from "@/app/api/team/[id]/route";

const origin = new URL(env.APP_ORIGIN).origin;
const noCtx = {} as never;
const idCtx = (id: string) => ({ params: Promise.resolve({ id }) });

/** A browser-like POST from our own origin with optional cookie and address. */
function post(p: string, json: unknown, opts: { cookie?: string; ip?: string; origin?: string | null } = {}) {
  const headers: Record<string, string> = { "content-type": "application/json", [CLIENT_HEADER]: opts.ip ?? "192.0.2.10" };
  if (opts.origin !== null) headers.origin = opts.origin ?? origin;
  if (opts.cookie) headers.cookie = opts.cookie;
  return new Request(new URL(p, origin), { method: "POST", headers, body: JSON.stringify(json) });
}
const get = (p: string, cookie?: string) => new Request(new URL(p, origin), { headers: cookie ? { cookie } : {} });

/** The cookie a response sets, as the browser would send it back. */
function cookieFrom(res: Response): string {
  const set = res.headers.get("set-cookie") ?? "";
  const m = set.match(new RegExp(`${SESSION_COOKIE}=([^;]*)`));
  if (!m || !m[1]) throw new Error(`no session cookie in ${set}`);
  return `${SESSION_COOKIE}=${m[1]}`;
}

let ctx: Awaited<ReturnType<typeof freshDatabase>>;
let mail: MailFake;
let mailDir: string;

beforeAll(async () => {
  (globalThis as Record<symbol, unknown>)[FRONT_DOOR] = true; // addresses as the front door reads them (scripts/serve.mjs)
  ctx = await freshDatabase();
  mailDir = fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-mailbox-"));
  mail = await startMailFake({ port: 0, dir: mailDir, quiet: true });
  useSmtp(`smtp://127.0.0.1:${mail.port}`);
});
afterAll(async () => {
  await mail.close();
  fs.rmSync(mailDir, { recursive: true, force: true });
  await ctx.cleanup();
});

const mailTo = (to: string) => readMailbox(mailDir).filter((m) => m.to.includes(to));

describe("sign-up, sign-in, sign-out", () => {
  const email = "wren@bramblewick.example";
  let cookie = "";

  it("signs up a farm with its Owner and the starter protocols; answers 201 with the identity and an httpOnly cookie", async () => {
    const res = await signUp(post("/api/auth/sign-up", { email: " Wren@Bramblewick.example ", password: "catkins in february", name: "Wren Halloway", farmName: "Bramblewick Native Nursery" }), noCtx);
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body).toMatchObject({ user: { email, name: "Wren Halloway" }, farm: { name: "Bramblewick Native Nursery" }, role: "owner" });
    expect(res.headers.get("set-cookie")).toMatch(/HttpOnly/);
    expect(res.headers.get("set-cookie")).toMatch(/SameSite=Lax/);
    cookie = cookieFrom(res);
    const protocols = await ctx.db("protocols").where({ farm_id: body.farm.id });
    expect(protocols.length).toBeGreaterThan(0);
    expect(protocols.every((p) => !p.is_farm_own && p.starter_key)).toBe(true);
    // The password is stored as a scrypt hash, never as given.
    const user = await ctx.db("users").where({ email }).first();
    expect(user.password_hash).toMatch(/^scrypt\$/);
    expect(user.password_hash).not.toContain("catkins");
  });

  it("answers /api/me with {user, farm, role} for the cookie, and 401 without it", async () => {
    const res = await me(get("/api/me", cookie), noCtx);
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ user: { email }, role: "owner", farm: { name: "Bramblewick Native Nursery" } });
    const anon = await me(get("/api/me"), noCtx);
    expect(anon.status).toBe(401);
    expect((await anon.json()).error.code).toBe("unauthenticated");
  });

  it("refuses a second account on the same e-mail (409, field error) and invalid input (400 with fields)", async () => {
    const dup = await signUp(post("/api/auth/sign-up", { email, password: "another long one", name: "X", farmName: "Y" }), noCtx);
    expect(dup.status).toBe(409);
    expect((await dup.json()).error.fields.email).toBeTruthy();
    const bad = await signUp(post("/api/auth/sign-up", { email: "not-an-email", password: "short", name: "", farmName: "" }), noCtx);
    expect(bad.status).toBe(400);
    const { error } = await bad.json();
    expect(Object.keys(error.fields).sort()).toEqual(["email", "farmName", "name", "password"]);
    const junk = await signUp(new Request(new URL("/api/auth/sign-up", origin), { method: "POST", headers: { origin }, body: "{not json" }), noCtx);
    expect(junk.status).toBe(400);
  });

  it("signs in with the right password, 401 with a wrong one", async () => {
    const ok = await signIn(post("/api/auth/sign-in", { email, password: "catkins in february" }, { ip: "198.51.100.1" }), noCtx);
    expect(ok.status).toBe(200);
    expect(await ok.json()).toMatchObject({ role: "owner", user: { email } });
    const wrong = await signIn(post("/api/auth/sign-in", { email, password: "catkins in march" }, { ip: "198.51.100.1" }), noCtx);
    expect(wrong.status).toBe(401);
    expect(wrong.headers.get("set-cookie")).toBeNull();
    const nobody = await signIn(post("/api/auth/sign-in", { email: "nobody@example.test", password: "whatever it is" }, { ip: "198.51.100.1" }), noCtx);
    expect(nobody.status).toBe(401);
    // Same words for an unknown e-mail as for a wrong password.
    expect((await nobody.json()).error.message).toBe((await wrong.json()).error.message);
  });

  it("refuses sign-up and sign-in from another origin (403)", async () => {
    const res = await signIn(post("/api/auth/sign-in", { email, password: "catkins in february" }, { origin: "https://elsewhere.example" }), noCtx);
    expect(res.status).toBe(403);
    const none = await signUp(post("/api/auth/sign-up", { email: "x@example.test", password: "long enough pw", name: "X", farmName: "Y" }, { origin: null }), noCtx);
    expect(none.status).toBe(403);
  });

  it("signs out: the session row is revoked, so the same cookie answers 401 afterwards", async () => {
    const res = await signOut(post("/api/auth/sign-out", {}, { cookie }), noCtx);
    expect(res.status).toBe(200);
    expect(res.headers.get("set-cookie")).toMatch(/Max-Age=0/);
    expect((await me(get("/api/me", cookie), noCtx)).status).toBe(401);
  });

  it("signs out everywhere: every session of the person ends", async () => {
    const a = cookieFrom(await signIn(post("/api/auth/sign-in", { email, password: "catkins in february" }, { ip: "198.51.100.2" }), noCtx));
    const b = cookieFrom(await signIn(post("/api/auth/sign-in", { email, password: "catkins in february" }, { ip: "198.51.100.3" }), noCtx));
    expect((await me(get("/api/me", b), noCtx)).status).toBe(200);
    const res = await signOutEverywhere(post("/api/auth/sign-out-everywhere", {}, { cookie: a }), noCtx);
    expect(res.status).toBe(200);
    expect((await res.json()).ended).toBeGreaterThanOrEqual(2);
    expect((await me(get("/api/me", a), noCtx)).status).toBe(401);
    expect((await me(get("/api/me", b), noCtx)).status).toBe(401);
  });
});

describe("sign-in rate limit", () => {
  it("locks an account after 5 failures in 15 minutes for the address that failed, even for the right password, with 'try again in N minutes'", async () => {
    const m = await signedInMember(ctx.db, { role: "helper" });
    for (let i = 0; i < 5; i++) {
      const r = await signIn(post("/api/auth/sign-in", { email: m.email, password: `wrong guess ${i}` }, { ip: `203.0.113.${i + 1}` }), noCtx);
      expect(r.status).toBe(401);
    }
    const locked = await signIn(post("/api/auth/sign-in", { email: m.email, password: TEST_PASSWORD }, { ip: "203.0.113.3" }), noCtx);
    expect(locked.status).toBe(429);
    expect((await locked.json()).error.message).toMatch(/try again in 15 minutes/);
    // Another account from the same addresses is unaffected.
    const other = await signedInMember(ctx.db, { role: "helper" });
    expect((await signIn(post("/api/auth/sign-in", { email: other.email, password: TEST_PASSWORD }, { ip: "203.0.113.1" }), noCtx)).status).toBe(200);
  });

  it("locks an address after 20 failures across accounts", async () => {
    const ip = "203.0.113.200";
    for (let i = 0; i < 20; i++) {
      const r = await signIn(post("/api/auth/sign-in", { email: `guess${i}@example.test`, password: "not this one" }, { ip }), noCtx);
      expect(r.status).toBe(401);
    }
    const m = await signedInMember(ctx.db, { role: "visitor" });
    const locked = await signIn(post("/api/auth/sign-in", { email: m.email, password: TEST_PASSWORD }, { ip }), noCtx);
    expect(locked.status).toBe(429);
    expect((await locked.json()).error.message).toMatch(/try again in \d+ minutes?/);
    expect((await signIn(post("/api/auth/sign-in", { email: m.email, password: TEST_PASSWORD }, { ip: "203.0.113.201" }), noCtx)).status).toBe(200);
  });
});

describe("invites over real SMTP to the local fake", () => {
  let owner: Awaited<ReturnType<typeof signedInMember>>;
  beforeAll(async () => {
    owner = await signedInMember(ctx.db, { role: "owner", farmName: "Bramblewick Native Nursery", name: "Wren Halloway" });
  });

  it("lets only an Owner invite (403 for a Grower)", async () => {
    const grower = await signedInMember(ctx.db, { role: "grower", farmId: owner.farmId });
    const res = await invite(post("/api/invites", { email: "x@example.test", role: "helper" }, { cookie: grower.cookie }), noCtx);
    expect(res.status).toBe(403);
  });

  it("e-mails a one-time link that creates a Helper account once, and never again", async () => {
    const res = await invite(post("/api/invites", { email: "Moss.Fenwick@example.test", role: "helper" }, { cookie: owner.cookie }), noCtx);
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body).toMatchObject({ mailSent: true, invite: { email: "moss.fenwick@example.test", role: "helper" } });

    const [msg] = mailTo("moss.fenwick@example.test");
    expect(msg.subject).toBe("Wren Halloway invited you to Bramblewick Native Nursery on Rimebook");
    expect(msg.html).toContain("Join as Helper");
    expect(msg.text).toMatch(/record checks, pulls, sowings and counts/);
    const link = msg.links.find((l) => l.includes("/invite/"));
    expect(link).toBeTruthy();
    expect(link!.startsWith(`${origin}/invite/`)).toBe(true);
    const token = link!.split("/invite/")[1];

    const described = await describeInviteRoute(get(`/api/invites/accept?token=${token}`), noCtx);
    expect(await described.json()).toMatchObject({ email: "moss.fenwick@example.test", role: "helper", farmName: "Bramblewick Native Nursery", existingAccount: false });

    const tooShort = await acceptInviteRoute(post("/api/invites/accept", { token, name: "Moss Fenwick", password: "short" }), noCtx);
    expect(tooShort.status).toBe(400);
    expect((await tooShort.json()).error.fields.password).toMatch(/at least 10/);

    const accepted = await acceptInviteRoute(post("/api/invites/accept", { token, name: "Moss Fenwick", password: "sphagnum and sand" }), noCtx);
    expect(accepted.status).toBe(201);
    expect(await accepted.json()).toMatchObject({ role: "helper", user: { name: "Moss Fenwick" }, farm: { id: owner.farmId } });
    const helperCookie = cookieFrom(accepted);
    expect(await (await me(get("/api/me", helperCookie), noCtx)).json()).toMatchObject({ role: "helper" });

    const again = await acceptInviteRoute(post("/api/invites/accept", { token, name: "Someone Else", password: "another password" }), noCtx);
    expect(again.status).toBe(404);
    expect((await again.json()).error.message).toMatch(/already been used/);

    // The Helper is limited to what a Helper may do.
    expect((await invite(post("/api/invites", { email: "y@example.test", role: "visitor" }, { cookie: helperCookie }), noCtx)).status).toBe(403);
  });

  it("adds the farm to an existing account when its password is given, keeping the account's name", async () => {
    const elsewhere = await signedInMember(ctx.db, { role: "owner", name: "Ash Quill", farmName: "Quill Seed Library" });
    await invite(post("/api/invites", { email: elsewhere.email, role: "grower" }, { cookie: owner.cookie }), noCtx);
    const token = mailTo(elsewhere.email)[0].links[0].split("/invite/")[1];
    const wrong = await acceptInviteRoute(post("/api/invites/accept", { token, password: "not my password" }), noCtx);
    expect(wrong.status).toBe(401);
    expect((await wrong.json()).error.fields.password).toBeTruthy();
    const ok = await acceptInviteRoute(post("/api/invites/accept", { token, password: TEST_PASSWORD }), noCtx);
    expect(ok.status).toBe(200);
    const body = await ok.json();
    expect(body).toMatchObject({ role: "grower", user: { name: "Ash Quill" }, farm: { name: "Bramblewick Native Nursery" } });
    expect(body.farms.map((f: { name: string }) => f.name).sort()).toEqual(["Bramblewick Native Nursery", "Quill Seed Library"]);

    // Switching back to the first farm opens it with that farm's role.
    const switched = await switchFarm(post("/api/me/farm", { farmId: elsewhere.farmId }, { cookie: cookieFrom(ok) }), noCtx);
    expect(await switched.json()).toMatchObject({ role: "owner", farm: { name: "Quill Seed Library" } });
    // ...but not a farm they do not belong to.
    const stranger = await signedInMember(ctx.db, { role: "owner" });
    expect((await switchFarm(post("/api/me/farm", { farmId: stranger.farmId }, { cookie: cookieFrom(switched) }), noCtx)).status).toBe(404);
  });

  it("rate-limits password guesses through an invite link for an existing account", async () => {
    const target = await signedInMember(ctx.db, { role: "owner", farmName: "Target Farm" });
    await invite(post("/api/invites", { email: target.email, role: "visitor" }, { cookie: owner.cookie }), noCtx);
    const token = mailTo(target.email)[0].links[0].split("/invite/")[1];
    for (let i = 0; i < 5; i++) {
      const r = await acceptInviteRoute(post("/api/invites/accept", { token, password: `guess number ${i}` }, { ip: `192.0.2.${50 + i}` }), noCtx);
      expect(r.status).toBe(401);
    }
    const locked = await acceptInviteRoute(post("/api/invites/accept", { token, password: TEST_PASSWORD }, { ip: "192.0.2.52" }), noCtx);
    expect(locked.status).toBe(429);
    // Sign-in to that account from a guessing address is locked as well: the guesses counted against the account.
    expect((await signIn(post("/api/auth/sign-in", { email: target.email, password: TEST_PASSWORD }, { ip: "192.0.2.54" }), noCtx)).status).toBe(429);
  });

  it("refuses to invite someone already on the team (409)", async () => {
    const res = await invite(post("/api/invites", { email: owner.email, role: "visitor" }, { cookie: owner.cookie }), noCtx);
    expect(res.status).toBe(409);
  });

  it("resend gives a fresh link (the old one stops working); revoke withdraws it", async () => {
    const created = await (await invite(post("/api/invites", { email: "fern@example.test", role: "visitor" }, { cookie: owner.cookie }), noCtx)).json();
    const first = mailTo("fern@example.test")[0].links[0].split("/invite/")[1];
    const resent = await resendInviteRoute(post(`/api/invites/${created.invite.id}/resend`, {}, { cookie: owner.cookie }), idCtx(created.invite.id));
    expect(resent.status).toBe(200);
    const fern = mailTo("fern@example.test");
    expect(fern.length).toBe(2);
    const second = fern.map((m) => m.links[0].split("/invite/")[1]).find((t) => t !== first)!;
    expect((await describeInviteRoute(get(`/api/invites/accept?token=${first}`), noCtx)).status).toBe(404);
    expect((await describeInviteRoute(get(`/api/invites/accept?token=${second}`), noCtx)).status).toBe(200);

    const pending = await (await listInvites(get("/api/invites", owner.cookie), noCtx)).json();
    expect(pending.invites.map((i: { email: string }) => i.email)).toContain("fern@example.test");

    const del = new Request(new URL(`/api/invites/${created.invite.id}`, origin), { method: "DELETE", headers: { cookie: owner.cookie, origin } });
    expect((await revokeInviteRoute(del, idCtx(created.invite.id))).status).toBe(200);
    const gone = await acceptInviteRoute(post("/api/invites/accept", { token: second, name: "Fern", password: "long enough password" }), noCtx);
    expect(gone.status).toBe(404);
  });

  it("an expired invite link answers 410 with words to ask for a new one", async () => {
    await invite(post("/api/invites", { email: "late@example.test", role: "helper" }, { cookie: owner.cookie }), noCtx);
    await ctx.db("invites").where({ email: "late@example.test" }).update({ expires_at: new Date(Date.now() - 1000).toISOString() });
    const token = mailTo("late@example.test")[0].links[0].split("/invite/")[1];
    const res = await acceptInviteRoute(post("/api/invites/accept", { token, name: "Late", password: "long enough password" }), noCtx);
    expect(res.status).toBe(410);
    expect((await res.json()).error.message).toMatch(/expired/);
  });
});

describe("team: roles, the last Owner, and other farms' ids", () => {
  it("changes roles, never demotes or removes the last Owner, and removes a member (ending their sessions)", async () => {
    const owner = await signedInMember(ctx.db, { role: "owner" });
    const helper = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId });
    const patch = (id: string, role: string, cookie = owner.cookie) =>
      patchMember(new Request(new URL(`/api/team/${id}`, origin), { method: "PATCH", headers: { cookie, origin, "content-type": "application/json" }, body: JSON.stringify({ role }) }), idCtx(id));
    const remove = (id: string, cookie = owner.cookie) => deleteMember(new Request(new URL(`/api/team/${id}`, origin), { method: "DELETE", headers: { cookie, origin } }), idCtx(id));

    const demoteSelf = await patch(owner.membershipId, "grower");
    expect(demoteSelf.status).toBe(409);
    expect((await demoteSelf.json()).error.message).toMatch(/at least one Owner/);
    expect((await remove(owner.membershipId)).status).toBe(409);

    // A Helper cannot change roles, not even their own.
    expect((await patch(helper.membershipId, "owner", helper.cookie)).status).toBe(403);

    const promoted = await patch(helper.membershipId, "grower");
    expect(promoted.status).toBe(200);
    expect((await promoted.json()).member.role).toBe("grower");
    expect(await (await me(get("/api/me", helper.cookie), noCtx)).json()).toMatchObject({ role: "grower" });

    const list = await (await team(get("/api/team", owner.cookie), noCtx)).json();
    expect(list.members.map((m: { role: string }) => m.role)).toEqual(["owner", "grower"]);

    // With two Owners, one may step down.
    await patch(helper.membershipId, "owner");
    expect((await patch(owner.membershipId, "visitor")).status).toBe(200);

    const newOwner = helper;
    expect((await remove(owner.membershipId, newOwner.cookie)).status).toBe(200);
    expect((await me(get("/api/me", owner.cookie), noCtx)).status).toBe(401);
    const after = await (await team(get("/api/team", newOwner.cookie), noCtx)).json();
    expect(after.members).toHaveLength(1);
  });

  it("answers 404 for a member or invite of another farm, and shows no invites to non-Owners", async () => {
    const a = await signedInMember(ctx.db, { role: "owner" });
    const b = await signedInMember(ctx.db, { role: "owner" });
    const bHelper = await signedInMember(ctx.db, { role: "helper", farmId: b.farmId });
    const bInvite = await (await invite(post("/api/invites", { email: "b-only@example.test", role: "helper" }, { cookie: b.cookie }), noCtx)).json();

    const patchOther = await patchMember(
      new Request(new URL(`/api/team/${bHelper.membershipId}`, origin), { method: "PATCH", headers: { cookie: a.cookie, origin }, body: JSON.stringify({ role: "visitor" }) }),
      idCtx(bHelper.membershipId),
    );
    expect(patchOther.status).toBe(404);
    const delOther = await deleteMember(new Request(new URL(`/api/team/${bHelper.membershipId}`, origin), { method: "DELETE", headers: { cookie: a.cookie, origin } }), idCtx(bHelper.membershipId));
    expect(delOther.status).toBe(404);
    expect((await resendInviteRoute(post(`/api/invites/${bInvite.invite.id}/resend`, {}, { cookie: a.cookie }), idCtx(bInvite.invite.id))).status).toBe(404);
    const delInvite = await revokeInviteRoute(new Request(new URL(`/api/invites/${bInvite.invite.id}`, origin), { method: "DELETE", headers: { cookie: a.cookie, origin } }), idCtx(bInvite.invite.id));
    expect(delInvite.status).toBe(404);
    // The other farm's helper is untouched.
    expect((await ctx.db("memberships").where({ id: bHelper.membershipId }).first()).role).toBe("helper");

    const seenByA = await (await team(get("/api/team", a.cookie), noCtx)).json();
    expect(seenByA.members.map((m: { userId: string }) => m.userId)).toEqual([a.userId]);
    const seenByHelper = await (await team(get("/api/team", bHelper.cookie), noCtx)).json();
    expect(seenByHelper.invites).toEqual([]);
    expect(seenByHelper.you.canManage).toBe(false);
  });

  it("refuses a cross-origin team change (403) even with a valid Owner cookie", async () => {
    const owner = await signedInMember(ctx.db, { role: "owner" });
    const res = await invite(post("/api/invites", { email: "z@example.test", role: "helper" }, { cookie: owner.cookie, origin: "https://evil.example" }), noCtx);
    expect(res.status).toBe(403);
    expect(await ctx.db("invites").where({ email: "z@example.test" }).first()).toBeUndefined();
  });
});

describe("password reset by e-mailed link", () => {
  it("mails a link that works once, ends old sessions, and expires", async () => {
    const m = await signedInMember(ctx.db, { role: "grower", name: "Rowan Tansy" });
    const res = await resetRequest(post("/api/auth/reset-request", { email: m.email }), noCtx);
    expect(res.status).toBe(202);
    const unknown = await resetRequest(post("/api/auth/reset-request", { email: "nobody-here@example.test" }), noCtx);
    expect(unknown.status).toBe(202);
    expect((await unknown.json()).message.replace("nobody-here@example.test", "X")).toBe((await res.json()).message.replace(m.email, "X"));
    expect(mailTo("nobody-here@example.test")).toHaveLength(0);

    const [msg] = mailTo(m.email);
    expect(msg.subject).toBe("Choose a new Rimebook password");
    expect(msg.text).toContain("Hello Rowan Tansy");
    const token = msg.links.find((l) => l.includes("/reset/"))!.split("/reset/")[1];

    const done = await resetConfirm(post("/api/auth/reset-confirm", { token, password: "a brand new phrase" }), noCtx);
    expect(done.status).toBe(200);
    expect(await done.json()).toMatchObject({ user: { email: m.email }, role: "grower" });
    // The old session ended; the new password signs in; the old one does not.
    expect((await me(get("/api/me", m.cookie), noCtx)).status).toBe(401);
    expect((await signIn(post("/api/auth/sign-in", { email: m.email, password: "a brand new phrase" }), noCtx)).status).toBe(200);
    expect((await signIn(post("/api/auth/sign-in", { email: m.email, password: TEST_PASSWORD }), noCtx)).status).toBe(401);

    const twice = await resetConfirm(post("/api/auth/reset-confirm", { token, password: "yet another phrase" }), noCtx);
    expect(twice.status).toBe(404);

    await resetRequest(post("/api/auth/reset-request", { email: m.email }), noCtx);
    const second = mailTo(m.email).map((x) => x.links[0].split("/reset/")[1]).find((t) => t !== token)!;
    await ctx.db("password_resets").whereNull("used_at").update({ expires_at: new Date(Date.now() - 1000).toISOString() });
    const late = await resetConfirm(post("/api/auth/reset-confirm", { token: second, password: "yet another phrase" }), noCtx);
    expect(late.status).toBe(410);
  });
});

describe("handlers read role and farm from the database only", () => {
  it("ignores a farm id or role the client sends", async () => {
    const visitor = await signedInMember(ctx.db, { role: "visitor" });
    const other = await signedInMember(ctx.db, { role: "owner" });
    const res = await invite(
      memberRequest("/api/invites", visitor, { method: "POST", json: { email: "sneak@example.test", role: "owner", farmId: other.farmId, farm_id: other.farmId, asRole: "owner" } }),
      noCtx,
    );
    expect(res.status).toBe(403);
    expect(await ctx.db("invites").where({ email: "sneak@example.test" }).first()).toBeUndefined();
  });
});
