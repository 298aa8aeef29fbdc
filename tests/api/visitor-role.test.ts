import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { freshDatabase, type FreshDatabase } from "../support/db";
import { memberRequest, signedInMember } from "../support/auth";
import { uuid } from "../support/sync";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { env } from "@/lib/server/env";
import { useSmtp } from "@/lib/server/mail";
import { readMailbox, startMailFake, type MailFake } from "@/lib/server/mail-fake";
import { hashPassword } from "@/lib/server/passwords";
import { hashLinkToken } from "@/lib/server/tokens";
import { CLIENT_HEADER, FRONT_DOOR } from "@/lib/server/front-door.mjs";
import { SESSION_COOKIE } from "@/lib/server/sessions";
import { POST as signIn } from "@/app/api/auth/sign-in/route";
import { POST as invite } from "@/app/api/invites/route";
import { GET as describeInvite, POST as acceptInvite } from "@/app/api/invites/accept/route";
import { PATCH as patchMember } from "@/app/api/team/[id]/route";
import { POST as push } from "@/app/api/sync/push/route";
import { GET as pull } from "@/app/api/sync/pull/route";
import { canRun, mutationNames, actionTable, roleAtLeast } from "@/lib/schemas/mutations";
import { Role, roles, vocabularyLabels } from "@/lib/schemas/vocabulary";

// The read-only role was "viewer" until migration 20261205100000_visitor_role; it is "visitor" now
// ("Visitor" on screen). A farm migrated from before keeps its read-only members and open invites, and
// old phones that still send "viewer" are understood. Runs on SQLite, and on PostgreSQL with TEST_DATABASE_URL.

const origin = new URL(env.APP_ORIGIN).origin;
const noCtx = {} as never;
const post = (p: string, json: unknown, cookie?: string) =>
  new Request(new URL(p, origin), {
    method: "POST",
    headers: { "content-type": "application/json", origin, [CLIENT_HEADER]: "192.0.2.77", ...(cookie ? { cookie } : {}) },
    body: JSON.stringify(json),
  });
const cookieFrom = (res: Response) => `${SESSION_COOKIE}=${(res.headers.get("set-cookie") ?? "").match(new RegExp(`${SESSION_COOKIE}=([^;]*)`))![1]}`;

describe("migration 20261205100000_visitor_role on a farm with a 'viewer' member and invite", () => {
  let ctx: FreshDatabase;
  const farmId = randomUUID();
  const ownerId = randomUUID();
  const juniperId = randomUUID();
  const juniperMembership = randomUUID();
  const inviteId = randomUUID();
  const inviteToken = "an-open-invite-token-from-before-the-rename";
  const password = "frost on the cold frame";
  let seqBefore = 0;

  beforeAll(async () => {
    (globalThis as Record<symbol, unknown>)[FRONT_DOOR] = true; // addresses as the front door reads them
    ctx = await freshDatabase();
    // Back to the migration before this one (and before any later one): the rows below are as that version stored them.
    const pending = async (): Promise<string[]> => (await ctx.db.migrate.list())[1].map(String);
    while (!(await pending()).includes("20261205100000_visitor_role")) await ctx.db.migrate.down();
    expect((await pending())[0]).toBe("20261205100000_visitor_role");
    const at = "2026-12-01T08:00:00.000Z";
    const hash = await hashPassword(password);
    await ctx.db("farms").insert({ id: farmId, name: "Before the rename", seq: 2, created_at: at, updated_at: at });
    await ctx.db("users").insert([
      { id: ownerId, email: "owner@before.example.test", name: "Owner", password_hash: hash, created_at: at, updated_at: at },
      { id: juniperId, email: "juniper@before.example.test", name: "Juniper", password_hash: hash, created_at: at, updated_at: at },
    ]);
    await ctx.db("memberships").insert([
      { id: randomUUID(), farm_id: farmId, user_id: ownerId, role: "owner", digest_opt_in: true, created_at: at, updated_at: at, seq: 1 },
      { id: juniperMembership, farm_id: farmId, user_id: juniperId, role: "viewer", digest_opt_in: false, created_at: at, updated_at: at, seq: 2 },
    ]);
    await ctx.db("invites").insert({
      id: inviteId, farm_id: farmId, email: "moss@before.example.test", role: "viewer", token_hash: hashLinkToken(inviteToken),
      invited_by: ownerId, created_at: at, expires_at: "2099-01-01T00:00:00.000Z",
    });
    seqBefore = Number((await ctx.db("farms").where({ id: farmId }).first("seq")).seq);
    await ctx.db.migrate.latest();
  });
  afterAll(async () => ctx.cleanup());

  it("renames the member and the open invite to 'visitor' and leaves the others alone", async () => {
    const rows = await ctx.db("memberships").where({ farm_id: farmId }).orderBy("role").select("user_id", "role");
    expect(rows).toEqual([
      { user_id: ownerId, role: "owner" },
      { user_id: juniperId, role: "visitor" },
    ]);
    expect(await ctx.db("invites").where({ id: inviteId }).first("role")).toEqual({ role: "visitor" });
    expect(await ctx.db("memberships").where({ role: "viewer" }).count({ n: "*" }).first()).toEqual({ n: 0 });
  });

  it("gives the renamed membership a new change counter, so a phone that synced before pulls it again", async () => {
    const farmSeq = Number((await ctx.db("farms").where({ id: farmId }).first("seq")).seq);
    expect(farmSeq).toBe(seqBefore + 1);
    expect(Number((await ctx.db("memberships").where({ id: juniperMembership }).first("seq")).seq)).toBe(farmSeq);
  });

  it("the member still signs in, is a Visitor, reads, and every change is refused (403 / forbidden)", async () => {
    const res = await signIn(post("/api/auth/sign-in", { email: "juniper@before.example.test", password }), noCtx);
    expect(res.status).toBe(200);
    expect(await res.json()).toMatchObject({ role: "visitor", farm: { id: farmId } });
    const cookie = cookieFrom(res);
    const member = { headers: { cookie, origin } };

    const page = await pull(memberRequest("/api/sync/pull?since=0", member), noCtx);
    expect(page.status).toBe(200);
    const body = await page.json();
    expect(body.role).toBe("visitor");
    expect(body.changes.filter((c: { table: string }) => c.table === "memberships").map((c: { row: { role: string } }) => c.row.role).sort()).toEqual(["owner", "visitor"]);

    const refused = await invite(post("/api/invites", { email: "sneak@example.test", role: "visitor" }, cookie), noCtx);
    expect(refused.status).toBe(403);
    expect((await refused.json()).error.code).toBe("forbidden");

    const lot = { id: uuid(), name: "lot.create", args: { id: uuid(), species: "Asclepias tuberosa" }, at: "2026-12-05T08:00:00.000Z" };
    const pushed = await push(memberRequest("/api/sync/push", member, { method: "POST", json: { deviceId: "juniper-phone", mutations: [lot] } }), noCtx);
    const answer = await pushed.json();
    expect(answer.applied).toEqual([]);
    expect(answer.rejected).toEqual([expect.objectContaining({ id: lot.id, error: expect.objectContaining({ code: "forbidden", message: expect.stringMatching(/Visitor/) }) })]);
    expect(await ctx.db("lots").where({ farm_id: farmId }).count({ n: "*" }).first()).toEqual({ n: 0 });
  });

  it("the invitation sent before the rename still works and makes a Visitor", async () => {
    const described = await describeInvite(new Request(new URL(`/api/invites/accept?token=${inviteToken}`, origin)), noCtx);
    expect(await described.json()).toMatchObject({ role: "visitor", email: "moss@before.example.test" });
    const accepted = await acceptInvite(post("/api/invites/accept", { token: inviteToken, name: "Moss", password: "sphagnum and sand" }), noCtx);
    expect(accepted.status).toBe(201);
    expect(await accepted.json()).toMatchObject({ role: "visitor", farm: { id: farmId } });
  });
});

describe("an old phone or page that still says 'viewer'", () => {
  let ctx: FreshDatabase;
  let mail: MailFake;
  let mailDir: string;
  beforeAll(async () => {
    (globalThis as Record<symbol, unknown>)[FRONT_DOOR] = true;
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

  it("an invite asked for as 'viewer' is stored and answered as 'visitor'", async () => {
    const owner = await signedInMember(ctx.db, { role: "owner" });
    const res = await invite(post("/api/invites", { email: "old-phone@example.test", role: "viewer" }, owner.cookie), noCtx);
    expect(res.status).toBe(201);
    const body = await res.json();
    expect(body).toMatchObject({ mailSent: true, invite: { role: "visitor" } });
    expect(JSON.stringify(body)).not.toMatch(/viewer/);
    expect(await ctx.db("invites").where({ email: "old-phone@example.test" }).first("role")).toEqual({ role: "visitor" });
    const [msg] = readMailbox(mailDir).filter((m) => m.to.includes("old-phone@example.test"));
    expect(msg.html).toContain("Join as Visitor");
    expect(msg.text).toContain("as a Visitor: you can see the farm's records");
  });

  it("a role change to 'viewer' makes a Visitor", async () => {
    const owner = await signedInMember(ctx.db, { role: "owner" });
    const helper = await signedInMember(ctx.db, { role: "helper", farmId: owner.farmId });
    const req = new Request(new URL(`/api/team/${helper.membershipId}`, origin), {
      method: "PATCH", headers: { cookie: owner.cookie, origin, "content-type": "application/json" }, body: JSON.stringify({ role: "viewer" }),
    });
    const res = await patchMember(req, { params: Promise.resolve({ id: helper.membershipId }) });
    expect(res.status).toBe(200);
    expect((await res.json()).member.role).toBe("visitor");
    expect(await ctx.db("memberships").where({ id: helper.membershipId }).first("role")).toEqual({ role: "visitor" });
  });

  it("an unknown role is still refused in words", async () => {
    const owner = await signedInMember(ctx.db, { role: "owner" });
    const res = await invite(post("/api/invites", { email: "x@example.test", role: "reader" }, owner.cookie), noCtx);
    expect(res.status).toBe(400);
    expect((await res.json()).error.fields).toHaveProperty("role");
  });
});

describe("the role table", () => {
  it("has the ladder Owner ⊃ Grower ⊃ Helper ⊃ Visitor, with these words", () => {
    expect(roles).toEqual(["owner", "grower", "helper", "visitor"]);
    expect(roles.map((r) => vocabularyLabels.role[r])).toEqual(["Owner", "Grower", "Helper", "Visitor"]);
    expect(roleAtLeast("helper", "visitor")).toBe(true);
    expect(roleAtLeast("visitor", "helper")).toBe(false);
  });

  it("lets a Visitor change nothing but their own digest setting, and read the exports", () => {
    expect(mutationNames.filter((n) => canRun("visitor", n))).toEqual(["member.preferences"]);
    expect((Object.keys(actionTable) as (keyof typeof actionTable)[]).filter((n) => canRun("visitor", n))).toEqual(["export.read"]);
  });

  it("reads 'viewer' as 'visitor' and nothing else as a role", () => {
    expect(Role.parse("viewer")).toBe("visitor");
    expect(Role.parse("visitor")).toBe("visitor");
    expect(Role.safeParse("Viewer").success).toBe(false);
    expect(Role.safeParse("reader").success).toBe(false);
  });
});
