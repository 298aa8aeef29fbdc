import "server-only";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { AppError } from "@/lib/errors";
import { findUserByEmail, setPassword } from "./accounts";
import { revokeAllSessions } from "./sessions";
import { hashLinkToken, newLinkToken } from "./tokens";

// Password reset by an e-mailed one-time link: it expires, works once, and ends every session.

export const RESET_MINUTES = 60;
/** At most this many reset e-mails per account per quarter hour (the rest are dropped quietly). */
const RESETS_PER_WINDOW = 3;
const WINDOW_MS = 15 * 60 * 1000;

/**
 * A reset link for the account with this e-mail, or null when there is none (or too many were
 * sent lately). The caller answers the same either way, so the form never reveals who has an account.
 */
export async function requestPasswordReset(trx: Knex.Transaction, email: string, now = new Date()): Promise<{ token: string; userId: string; name: string; email: string } | null> {
  const user = await findUserByEmail(trx, email);
  if (!user) return null;
  const recent = await trx("password_resets")
    .where({ user_id: user.id })
    .andWhere("created_at", ">", new Date(now.getTime() - WINDOW_MS).toISOString())
    .count({ n: "*" })
    .first();
  if (Number(recent?.n ?? 0) >= RESETS_PER_WINDOW) return null;
  const { token, hash } = newLinkToken();
  await trx("password_resets").insert({
    id: randomUUID(),
    user_id: user.id,
    token_hash: hash,
    created_at: now.toISOString(),
    expires_at: new Date(now.getTime() + RESET_MINUTES * 60_000).toISOString(),
  });
  return { token, userId: user.id, name: user.name, email: user.email };
}

const resetGone = () => new AppError("not_found", "This link has already been used. Ask for a new one if you still need to change the password.", undefined, 404);
const resetExpired = () => new AppError("not_found", "This link has expired. Ask for a new one; it arrives in a minute or two.", undefined, 410);

/** Sets the new password once; every open link for the account and every session end with it. */
export async function confirmPasswordReset(trx: Knex.Transaction, input: { token: string; password: string }, now = new Date()): Promise<{ userId: string; email: string }> {
  const row = await trx("password_resets").where({ token_hash: hashLinkToken(input.token) }).first();
  if (!row || row.used_at) throw resetGone();
  if (Date.parse(row.expires_at) <= now.getTime()) throw resetExpired();
  const at = now.toISOString();
  const flipped = await trx("password_resets").where({ id: row.id }).whereNull("used_at").update({ used_at: at });
  if (!flipped) throw resetGone();
  await trx("password_resets").where({ user_id: row.user_id }).whereNull("used_at").update({ used_at: at });
  await setPassword(trx, row.user_id, input.password, now);
  await revokeAllSessions(trx, row.user_id, { now });
  const user = await trx("users").where({ id: row.user_id }).first("email");
  return { userId: row.user_id, email: user.email };
}
