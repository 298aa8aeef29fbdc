import "server-only";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { getDb } from "./db";
import { SESSION_COOKIE, signSessionToken, verifySessionToken } from "./session-token";

export { SESSION_COOKIE, verifySessionToken };

// A session is a server-side row (revocable) named by a short jose-signed token kept in an
// httpOnly cookie. The token's own expiry matches the row's; the row is the authority.

export const SESSION_DAYS = 30;
/** Rolling renewal: once a day of use, the session is pushed out to a fresh 30 days. */
const RENEW_AFTER_MS = 24 * 60 * 60 * 1000;
const DAY_MS = 24 * 60 * 60 * 1000;

export type SessionRow = {
  id: string;
  user_id: string;
  farm_id: string;
  created_at: string;
  last_seen_at: string;
  expires_at: string;
  revoked_at: string | null;
  user_agent: string | null;
};

export type IssuedSession = { token: string; sessionId: string; expiresAt: string };

/** The session as read from a valid token; `renewed` is set when the cookie should be re-issued. */
export type ActiveSession = { session: SessionRow; renewed: IssuedSession | null };

export async function createSession(
  db: Knex | Knex.Transaction,
  input: { userId: string; farmId: string; userAgent?: string | null },
  now: Date = new Date(),
): Promise<IssuedSession> {
  const sessionId = randomUUID();
  const expires = new Date(now.getTime() + SESSION_DAYS * DAY_MS);
  await db("sessions").insert({
    id: sessionId,
    user_id: input.userId,
    farm_id: input.farmId,
    created_at: now.toISOString(),
    last_seen_at: now.toISOString(),
    expires_at: expires.toISOString(),
    revoked_at: null,
    user_agent: input.userAgent ? input.userAgent.slice(0, 300) : null,
  });
  return { token: await signSessionToken(sessionId, expires), sessionId, expiresAt: expires.toISOString() };
}

/**
 * A valid, unrevoked, unexpired session for this token, or null. Renews it (new expiry, new
 * token) when it was last renewed more than a day ago.
 */
export async function readSession(token: string | null | undefined, now: Date = new Date(), db: Knex = getDb()): Promise<ActiveSession | null> {
  if (!token) return null;
  const sessionId = await verifySessionToken(token);
  if (!sessionId) return null;
  const session: SessionRow | undefined = await db("sessions").where({ id: sessionId }).first();
  if (!session || session.revoked_at) return null;
  if (Date.parse(session.expires_at) <= now.getTime()) return null;

  const renewed = await renewIfDue(db, sessionId, session.expires_at, now);
  return renewed ? { session: { ...session, last_seen_at: now.toISOString(), expires_at: renewed.expiresAt }, renewed } : { session, renewed: null };
}

/** Pushes a live session out to a fresh 30 days (new token) once a day of use has passed since it was last renewed. */
export async function renewIfDue(db: Knex, sessionId: string, expiresAt: string, now: Date = new Date()): Promise<IssuedSession | null> {
  const renewedAt = Date.parse(expiresAt) - SESSION_DAYS * DAY_MS;
  if (now.getTime() - renewedAt < RENEW_AFTER_MS) return null;
  const expires = new Date(now.getTime() + SESSION_DAYS * DAY_MS);
  const patch = { last_seen_at: now.toISOString(), expires_at: expires.toISOString() };
  await db("sessions").where({ id: sessionId }).whereNull("revoked_at").update(patch);
  return { token: await signSessionToken(sessionId, expires), sessionId, expiresAt: patch.expires_at };
}

export async function revokeSession(db: Knex | Knex.Transaction, sessionId: string, now: Date = new Date()): Promise<void> {
  await db("sessions").where({ id: sessionId }).whereNull("revoked_at").update({ revoked_at: now.toISOString() });
}

/**
 * "Sign out everywhere"; with farmId, only that farm's sessions (a member removed from one farm);
 * with exceptSessionId, every session but that one (a password change keeps the phone that made it).
 */
export async function revokeAllSessions(
  db: Knex | Knex.Transaction,
  userId: string,
  opts: { farmId?: string; exceptSessionId?: string; now?: Date } = {},
): Promise<number> {
  const q = db("sessions").where({ user_id: userId }).whereNull("revoked_at");
  if (opts.farmId) q.andWhere({ farm_id: opts.farmId });
  if (opts.exceptSessionId) q.andWhereNot({ id: opts.exceptSessionId });
  return q.update({ revoked_at: (opts.now ?? new Date()).toISOString() });
}
