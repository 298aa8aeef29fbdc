import "server-only";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { AppError } from "@/lib/errors";
import type { SignUpInput } from "@/lib/schemas/account";
import type { Role } from "@/lib/schemas/vocabulary";
import { hashPassword, verifyPassword } from "./passwords";
import { installStarterProtocols } from "./protocols";
import { assertSignInAllowed, recordSignInAttempt } from "./rate-limit";
import { isUniqueViolation } from "./db-errors";
import { nextSeq } from "./seq";
import { revokeAllSessions } from "./sessions";

// Farms, people and their memberships. Writers take the transaction first.

export type UserRow = { id: string; email: string; name: string; password_hash: string; created_at: string; updated_at: string; deleted_at: string | null };

export const emailTaken = () =>
  new AppError("conflict", "There is already a Rimebook account with this e-mail. Sign in instead, or reset the password.", {
    email: "This e-mail already has an account.",
  }, 409);

export async function findUserByEmail(db: Knex | Knex.Transaction, email: string): Promise<UserRow | undefined> {
  return db("users").where({ email: email.trim().toLowerCase() }).whereNull("deleted_at").first();
}

export async function createUser(trx: Knex.Transaction, input: { email: string; password: string; name: string }, now = new Date()): Promise<string> {
  const email = input.email.trim().toLowerCase();
  if (await trx("users").where({ email }).first("id")) throw emailTaken();
  const id = randomUUID();
  const at = now.toISOString();
  try {
    await trx("users").insert({ id, email, name: input.name.trim(), password_hash: await hashPassword(input.password), created_at: at, updated_at: at });
  } catch (err) {
    // The same e-mail signed up at the same moment: the check above passed for both, the unique index did not.
    if (isUniqueViolation(err)) throw emailTaken();
    throw err;
  }
  return id;
}

/** A membership is a synced row (the team list reaches every phone), so it is stamped with seq. */
export async function addMembership(trx: Knex.Transaction, input: { farmId: string; userId: string; role: Role }, now = new Date()): Promise<string> {
  const at = now.toISOString();
  const existing = await trx("memberships").where({ farm_id: input.farmId, user_id: input.userId }).first();
  const seq = await nextSeq(trx, input.farmId);
  if (existing) {
    // Re-joining after removal: revive the row with the new role.
    await trx("memberships").where({ id: existing.id }).update({ role: input.role, deleted_at: null, updated_at: at, seq });
    return existing.id;
  }
  const id = randomUUID();
  await trx("memberships").insert({ id, farm_id: input.farmId, user_id: input.userId, role: input.role, digest_opt_in: false, created_at: at, updated_at: at, seq, deleted_at: null });
  return id;
}

/** Sign-up: a new farm, its Owner, and the starter protocol library. */
export async function createFarmWithOwner(trx: Knex.Transaction, input: SignUpInput, now = new Date()): Promise<{ userId: string; farmId: string }> {
  const at = now.toISOString();
  const userId = await createUser(trx, input, now);
  const farmId = randomUUID();
  await trx("farms").insert({ id: farmId, name: input.farmName.trim(), seq: 0, created_at: at, updated_at: at });
  await addMembership(trx, { farmId, userId, role: "owner" }, now);
  await installStarterProtocols(trx, farmId, now);
  return { userId, farmId };
}

/** The farms a person belongs to, the one they joined first first. */
export async function farmsOf(db: Knex | Knex.Transaction, userId: string): Promise<{ id: string; name: string; role: Role }[]> {
  return db("memberships as m")
    .join("farms as f", "f.id", "m.farm_id")
    .where({ "m.user_id": userId })
    .whereNull("m.deleted_at")
    .whereNull("f.deleted_at")
    .orderBy("m.created_at", "asc")
    .select("f.id", "f.name", "m.role");
}

// A fixed hash so an unknown e-mail costs the same scrypt work as a known one.
let dummyHash: Promise<string> | null = null;
const timingDummy = () => (dummyHash ??= hashPassword("rimebook-timing-dummy-password"));

export const wrongCredentials = () =>
  new AppError("unauthenticated", "That e-mail and password do not match an account. Check both and try again.", undefined, 401);

/**
 * Checks e-mail and password (rate-limited per account and per address) and picks the farm to
 * open: `farmId` if the person belongs to it, else the first farm they joined.
 */
export async function authenticate(
  db: Knex,
  input: { email: string; password: string; farmId?: string; ip: string | null },
  now = new Date(),
): Promise<{ userId: string; farmId: string }> {
  const keys = { email: input.email.trim().toLowerCase(), ip: input.ip };
  await assertSignInAllowed(db, keys, now);
  const user = await findUserByEmail(db, keys.email);
  const ok = user ? await verifyPassword(input.password, user.password_hash) : (await verifyPassword(input.password, await timingDummy()), false);
  await recordSignInAttempt(db, keys, ok, now);
  if (!user || !ok) throw wrongCredentials();
  const farms = await farmsOf(db, user.id);
  const farm = (input.farmId && farms.find((f) => f.id === input.farmId)) || farms[0];
  if (!farm) throw new AppError("forbidden", "This account is not a member of any farm any more. Ask a farm Owner for a new invite.", undefined, 403);
  return { userId: user.id, farmId: farm.id };
}

export async function setPassword(trx: Knex.Transaction, userId: string, password: string, now = new Date()): Promise<void> {
  await trx("users").where({ id: userId }).update({ password_hash: await hashPassword(password), updated_at: now.toISOString() });
}

export const wrongCurrentPassword = () =>
  new AppError("invalid", "The current password is not right, so the password was not changed.", {
    currentPassword: "That is not your current password. Check it, or sign out and use “Forgot your password?”.",
  }, 400);

/**
 * Proves the signed-in person knows their password before it changes. Wrong tries count toward the
 * same per-account and per-address lock as sign-in, so a borrowed phone gives no extra guesses.
 */
export async function confirmCurrentPassword(db: Knex, input: { userId: string; email: string; password: string; ip: string | null }, now = new Date()): Promise<void> {
  const keys = { email: input.email.trim().toLowerCase(), ip: input.ip };
  await assertSignInAllowed(db, keys, now, "Too many wrong passwords.");
  const user: UserRow | undefined = await db("users").where({ id: input.userId }).whereNull("deleted_at").first();
  const ok = !!user && (await verifyPassword(input.password, user.password_hash));
  await recordSignInAttempt(db, keys, ok, now);
  if (!ok) throw wrongCurrentPassword();
}

/**
 * Sets a new password and ends every other session of the person (every phone, every farm); the
 * session that asked stays signed in. Open reset links stop working too. Returns how many ended.
 */
export async function changePassword(trx: Knex.Transaction, input: { userId: string; keepSessionId: string; password: string }, now = new Date()): Promise<number> {
  await setPassword(trx, input.userId, input.password, now);
  await trx("password_resets").where({ user_id: input.userId }).whereNull("used_at").update({ used_at: now.toISOString() });
  return revokeAllSessions(trx, input.userId, { exceptSessionId: input.keepSessionId, now });
}

/**
 * Renames the person. Their membership rows are stamped with a new seq on every farm, so each
 * team list (synced to the phones) picks up the new name on the next pull.
 */
export async function updateDisplayName(trx: Knex.Transaction, userId: string, name: string, now = new Date()): Promise<string> {
  const at = now.toISOString();
  const clean = name.trim();
  await trx("users").where({ id: userId }).update({ name: clean, updated_at: at });
  // Farm by farm in one fixed order, so two renames sharing farms never wait on each other's locks.
  const memberships: { id: string; farm_id: string }[] = await trx("memberships").where({ user_id: userId }).whereNull("deleted_at").orderBy("farm_id").select("id", "farm_id");
  for (const m of memberships) {
    await trx("memberships").where({ id: m.id }).update({ seq: await nextSeq(trx, m.farm_id), updated_at: at });
  }
  return clean;
}
