import "server-only";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { AppError, notFound } from "@/lib/errors";
import { NewPassword, PersonName, type InviteAcceptInput, type InviteInput } from "@/lib/schemas/account";
import type { Role } from "@/lib/schemas/vocabulary";
import { addMembership, createUser, findUserByEmail } from "./accounts";
import { verifyPassword } from "./passwords";
import { revokeAllSessions } from "./sessions";
import { lockFarm, nextSeq } from "./seq";
import { hashLinkToken, newLinkToken } from "./tokens";

// The team of one farm: members with roles, invites by e-mailed one-time link. Every function
// takes the farm from the signed-in member, so ids of another farm are simply not found (404).

export const INVITE_DAYS = 7;
const DAY_MS = 86_400_000;

export type TeamMember = { membershipId: string; userId: string; name: string; email: string; role: Role; joinedAt: string };
export type PendingInvite = { id: string; email: string; role: Role; createdAt: string; expiresAt: string; expired: boolean; invitedBy: string | null };

export async function listMembers(db: Knex | Knex.Transaction, farmId: string): Promise<TeamMember[]> {
  return db("memberships as m")
    .join("users as u", "u.id", "m.user_id")
    .where({ "m.farm_id": farmId })
    .whereNull("m.deleted_at")
    .orderByRaw("case m.role when 'owner' then 0 when 'grower' then 1 when 'helper' then 2 else 3 end")
    .orderBy("u.name")
    .select("m.id as membershipId", "u.id as userId", "u.name", "u.email", "m.role", "m.created_at as joinedAt");
}

export async function listPendingInvites(db: Knex | Knex.Transaction, farmId: string, now = new Date()): Promise<PendingInvite[]> {
  const rows = await db("invites as i")
    .leftJoin("users as u", "u.id", "i.invited_by")
    .where({ "i.farm_id": farmId })
    .whereNull("i.accepted_at")
    .whereNull("i.revoked_at")
    .orderBy("i.created_at", "desc")
    .select("i.id", "i.email", "i.role", "i.created_at as createdAt", "i.expires_at as expiresAt", "u.name as invitedBy");
  return rows.map((r) => ({ ...r, expired: Date.parse(r.expiresAt) <= now.getTime() }));
}

async function memberOfFarm(trx: Knex.Transaction, farmId: string, membershipId: string) {
  const row = await trx("memberships").where({ id: membershipId, farm_id: farmId }).whereNull("deleted_at").first();
  if (!row) throw notFound("That member");
  return row as { id: string; user_id: string; role: Role };
}

async function ownerCount(trx: Knex.Transaction, farmId: string): Promise<number> {
  const row = await trx("memberships").where({ farm_id: farmId, role: "owner" }).whereNull("deleted_at").count({ n: "*" }).first();
  return Number(row?.n ?? 0);
}

const lastOwner = () =>
  new AppError("conflict", "A farm always needs at least one Owner. Make someone else an Owner first.", undefined, 409);

export async function changeRole(trx: Knex.Transaction, farmId: string, membershipId: string, role: Role, now = new Date()): Promise<TeamMember> {
  // Two Owners demoting each other at once: the second waits here and then counts one Owner.
  await lockFarm(trx, farmId);
  const m = await memberOfFarm(trx, farmId, membershipId);
  if (m.role === "owner" && role !== "owner" && (await ownerCount(trx, farmId)) <= 1) throw lastOwner();
  if (m.role !== role) {
    await trx("memberships").where({ id: m.id }).update({ role, updated_at: now.toISOString(), seq: await nextSeq(trx, farmId) });
  }
  return (await listMembers(trx, farmId)).find((x) => x.membershipId === m.id)!;
}

/** Removes a member (tombstone, so phones drop them on pull) and ends their sessions on this farm. */
export async function removeMember(trx: Knex.Transaction, farmId: string, membershipId: string, now = new Date()): Promise<void> {
  await lockFarm(trx, farmId); // count the Owners only while no one else can change them
  const m = await memberOfFarm(trx, farmId, membershipId);
  if (m.role === "owner" && (await ownerCount(trx, farmId)) <= 1) throw lastOwner();
  const at = now.toISOString();
  await trx("memberships").where({ id: m.id }).update({ deleted_at: at, updated_at: at, seq: await nextSeq(trx, farmId) });
  await revokeAllSessions(trx, m.user_id, { farmId, now });
}

export type CreatedInvite = { invite: PendingInvite; token: string };

/** A new invite; an earlier pending invite to the same address on this farm is withdrawn. */
export async function createInvite(trx: Knex.Transaction, farmId: string, invitedBy: string, input: InviteInput, now = new Date()): Promise<CreatedInvite> {
  const existingUser = await findUserByEmail(trx, input.email);
  if (existingUser) {
    const already = await trx("memberships").where({ farm_id: farmId, user_id: existingUser.id }).whereNull("deleted_at").first("id");
    if (already) {
      throw new AppError("conflict", `${input.email} is already a member of this farm. Change their role in the list instead.`, { email: "Already a member of this farm." }, 409);
    }
  }
  const at = now.toISOString();
  await trx("invites").where({ farm_id: farmId, email: input.email }).whereNull("accepted_at").whereNull("revoked_at").update({ revoked_at: at });
  const { token, hash } = newLinkToken();
  const id = randomUUID();
  const expiresAt = new Date(now.getTime() + INVITE_DAYS * DAY_MS).toISOString();
  await trx("invites").insert({ id, farm_id: farmId, email: input.email, role: input.role, token_hash: hash, invited_by: invitedBy, created_at: at, expires_at: expiresAt });
  const invite = (await listPendingInvites(trx, farmId, now)).find((i) => i.id === id)!;
  return { invite, token };
}

/** A fresh link and expiry for a pending invite (the old link stops working). */
export async function resendInvite(trx: Knex.Transaction, farmId: string, inviteId: string, now = new Date()): Promise<CreatedInvite> {
  const row = await trx("invites").where({ id: inviteId, farm_id: farmId }).whereNull("accepted_at").whereNull("revoked_at").first();
  if (!row) throw notFound("That invite");
  const { token, hash } = newLinkToken();
  const expiresAt = new Date(now.getTime() + INVITE_DAYS * DAY_MS).toISOString();
  await trx("invites").where({ id: inviteId }).update({ token_hash: hash, expires_at: expiresAt });
  const invite = (await listPendingInvites(trx, farmId, now)).find((i) => i.id === inviteId)!;
  return { invite, token };
}

export async function revokeInvite(trx: Knex.Transaction, farmId: string, inviteId: string, now = new Date()): Promise<void> {
  const n = await trx("invites").where({ id: inviteId, farm_id: farmId }).whereNull("accepted_at").whereNull("revoked_at").update({ revoked_at: now.toISOString() });
  if (!n) throw notFound("That invite");
}

const inviteGone = () => new AppError("not_found", "This invite link has already been used or was withdrawn. Ask the farm's Owner for a new one.", undefined, 404);
const inviteExpired = () => new AppError("not_found", "This invite link has expired. Ask the farm's Owner to send it again.", undefined, 410);

type InviteRow = { id: string; farm_id: string; email: string; role: Role; expires_at: string; accepted_at: string | null; revoked_at: string | null };

async function usableInvite(db: Knex | Knex.Transaction, token: string, now: Date): Promise<InviteRow> {
  const row: InviteRow | undefined = await db("invites").where({ token_hash: hashLinkToken(token) }).first();
  if (!row || row.accepted_at || row.revoked_at) throw inviteGone();
  if (Date.parse(row.expires_at) <= now.getTime()) throw inviteExpired();
  return row;
}

/** What the acceptance page shows before the person commits. */
export async function describeInvite(db: Knex, token: string, now = new Date()) {
  const row = await usableInvite(db, token, now);
  const farm = await db("farms").where({ id: row.farm_id }).first("name");
  const existingAccount = Boolean(await findUserByEmail(db, row.email));
  return { email: row.email, role: row.role, farmName: farm?.name as string, existingAccount, expiresAt: row.expires_at };
}

/**
 * Accepts an invite once: creates the account (name + new password) or, when the e-mail already
 * has one, checks that account's password and adds this farm to it. Returns who joined which farm.
 */
export async function acceptInvite(trx: Knex.Transaction, input: InviteAcceptInput, now = new Date()): Promise<{ userId: string; farmId: string; created: boolean }> {
  const invite = await usableInvite(trx, input.token, now);
  const user = await findUserByEmail(trx, invite.email);
  let userId: string;
  let created = false;
  if (user) {
    if (!(await verifyPassword(input.password, user.password_hash))) {
      throw new AppError("unauthenticated", `That is not the password of the Rimebook account for ${invite.email}.`, { password: "Enter the password you already use for Rimebook." }, 401);
    }
    userId = user.id;
  } else {
    const fields: Record<string, string> = {};
    const name = PersonName.safeParse(input.name ?? "");
    const password = NewPassword.safeParse(input.password);
    if (!name.success) fields.name = name.error.issues[0].message;
    if (!password.success) fields.password = password.error.issues[0].message;
    if (Object.keys(fields).length) throw new AppError("invalid", "Some of what was sent is not right. Check the marked fields.", fields, 400);
    userId = await createUser(trx, { email: invite.email, name: name.data!, password: input.password }, now);
    created = true;
  }
  // Single use, even under a race: only one request can flip accepted_at.
  const flipped = await trx("invites").where({ id: invite.id }).whereNull("accepted_at").whereNull("revoked_at").update({ accepted_at: now.toISOString() });
  if (!flipped) throw inviteGone();
  await addMembership(trx, { farmId: invite.farm_id, userId, role: invite.role }, now);
  return { userId, farmId: invite.farm_id, created };
}
