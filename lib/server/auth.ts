import "server-only";
import { AppError, forbidden, unauthenticated } from "@/lib/errors";
import { canRun, type ActionName, type MutationName } from "@/lib/schemas/mutations";
import type { Role } from "@/lib/schemas/vocabulary";
import { env } from "./env";
import { getDb } from "./db";
import { NextResponse } from "next/server";
import { SESSION_COOKIE, createSession, renewIfDue, verifySessionToken, type IssuedSession } from "./sessions";
import { withPrepared } from "./prepared";
import { farmsOf } from "./accounts";

// Every handler that touches a farm starts here: who is asking, on which farm, with which role,
// always read from the database, never from what the client sends.

export type Member = {
  userId: string;
  name: string;
  email: string;
  farmId: string;
  farmName: string;
  role: Role;
  sessionId: string;
  /** Set when the session was renewed: pass the response through `withSessionCookie`. */
  renewed?: IssuedSession | null;
};

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** The session cookie's value from a request, or null. */
export function readSessionCookie(req: Request): string | null {
  const header = req.headers.get("cookie");
  if (!header) return null;
  for (const part of header.split(";")) {
    const eq = part.indexOf("=");
    if (eq < 0) continue;
    if (part.slice(0, eq).trim() === SESSION_COOKIE) {
      const value = part.slice(eq + 1).trim();
      try {
        return decodeURIComponent(value) || null;
      } catch {
        return null;
      }
    }
  }
  return null;
}

/**
 * Mutating requests must come from the app's own origin (Origin header, or Referer when a
 * browser leaves Origin out). Safe methods pass.
 */
export function assertSameOrigin(req: Request): void {
  if (SAFE_METHODS.has(req.method.toUpperCase())) return;
  const expected = new URL(env.APP_ORIGIN).origin;
  const origin = req.headers.get("origin");
  let seen: string | null = null;
  if (origin && origin !== "null") seen = origin;
  else {
    const referer = req.headers.get("referer");
    if (referer) {
      try {
        seen = new URL(referer).origin;
      } catch {
        seen = null;
      }
    }
  }
  if (seen !== expected) {
    throw new AppError("forbidden", "This request did not come from Rimebook itself, so it was refused.", undefined, 403);
  }
}

// The session, its member, person and farm in one statement, prepared once per connection: it runs on every
// request. Nothing about a session or membership is kept in memory between requests, so a sign-out, a revoked
// session, a role change or a removed member counts from the very next request, whichever process serves it.
const MEMBER_SQL = `SELECT s.id AS "sessionId", s.expires_at AS "expiresAt", u.id AS "userId", u.name AS "name",
  u.email AS "email", f.id AS "farmId", f.name AS "farmName", m.role AS "role"
FROM sessions s
JOIN memberships m ON m.farm_id = s.farm_id AND m.user_id = s.user_id
JOIN users u ON u.id = s.user_id
JOIN farms f ON f.id = s.farm_id
WHERE s.id = ? AND s.revoked_at IS NULL AND m.deleted_at IS NULL AND u.deleted_at IS NULL AND f.deleted_at IS NULL
LIMIT 1`;
type MemberRow = Omit<Member, "renewed" | "role"> & { role: string; expiresAt: string };

/** The signed-in member or null (pages use this to decide between the app and the sign-in screen). */
export async function findMember(token: string | null, now: Date = new Date()): Promise<Member | null> {
  if (!token) return null;
  const sessionId = await verifySessionToken(token);
  if (!sessionId) return null;
  const db = getDb();
  const [row] = await withPrepared(db, async (query) => query<MemberRow>(MEMBER_SQL, [sessionId]));
  // The row is the authority on expiry (a session can end before its token says).
  if (!row || Date.parse(row.expiresAt) <= now.getTime()) return null;
  const { expiresAt, ...member } = row;
  return { ...member, role: row.role as Role, renewed: await renewIfDue(db, sessionId, expiresAt, now) };
}

/**
 * Authenticates the request (401 when the session is missing, tampered, revoked or expired),
 * refuses cross-origin mutating requests (403), and checks `need` against the role table (403).
 */
export async function requireMember(req: Request, need?: MutationName | ActionName): Promise<Member> {
  assertSameOrigin(req);
  const member = await findMember(readSessionCookie(req));
  if (!member) throw unauthenticated();
  if (need && !canRun(member.role, need)) throw forbidden();
  return member;
}

/** Set-Cookie value for a session token (httpOnly, SameSite=Lax, Secure on https). */
export function sessionCookie(token: string, expiresAt: string): string {
  const parts = [
    `${SESSION_COOKIE}=${encodeURIComponent(token)}`,
    "Path=/",
    "HttpOnly",
    "SameSite=Lax",
    `Expires=${new Date(expiresAt).toUTCString()}`,
    `Max-Age=${Math.max(0, Math.floor((Date.parse(expiresAt) - Date.now()) / 1000))}`,
  ];
  if (env.secureCookies) parts.push("Secure");
  return parts.join("; ");
}

/** Set-Cookie value that removes the session cookie. */
export function clearedSessionCookie(): string {
  const parts = [`${SESSION_COOKIE}=`, "Path=/", "HttpOnly", "SameSite=Lax", "Expires=Thu, 01 Jan 1970 00:00:00 GMT", "Max-Age=0"];
  if (env.secureCookies) parts.push("Secure");
  return parts.join("; ");
}

/** Adds the session cookie to a response. */
export function setSessionCookie<R extends Response>(res: R, session: { token: string; expiresAt: string }): R {
  res.headers.append("Set-Cookie", sessionCookie(session.token, session.expiresAt));
  return res;
}

/** Re-issues the cookie when requireMember renewed the session (rolling 30-day expiry). */
export function withSessionCookie<R extends Response>(res: R, member: Pick<Member, "renewed">): R {
  return member.renewed ? setSessionCookie(res, member.renewed) : res;
}

export function clearSessionCookie<R extends Response>(res: R): R {
  res.headers.append("Set-Cookie", clearedSessionCookie());
  return res;
}

/** The identity the phone keeps so it opens offline: {user, farm, role}. */
export function identityOf(member: Member) {
  return {
    user: { id: member.userId, name: member.name, email: member.email },
    farm: { id: member.farmId, name: member.farmName },
    role: member.role,
  };
}
export type Identity = ReturnType<typeof identityOf>;

/** Starts a session for a person on a farm and answers with their identity and the cookie. */
export async function signedInResponse(req: Request, who: { userId: string; farmId: string }, status = 200): Promise<Response> {
  const issued = await createSession(getDb(), { ...who, userAgent: req.headers.get("user-agent") });
  const member = await findMember(issued.token);
  if (!member) throw unauthenticated();
  const farms = await farmsOf(getDb(), who.userId);
  return setSessionCookie(NextResponse.json({ ...identityOf(member), farms }, { status }), issued);
}
