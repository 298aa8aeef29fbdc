import "server-only";
import { SignJWT, jwtVerify } from "jose";
import { env } from "./env";

// The signed half of a session: a short HS256 token naming the session row. Kept apart from
// the database code so the proxy (which must not load knex) can check a cookie's signature.

export const SESSION_COOKIE = "rimebook_session";
const ISSUER = "rimebook";
const AUDIENCE = "rimebook-session";
const secretKey = () => new TextEncoder().encode(env.SESSION_SECRET);

export async function signSessionToken(sessionId: string, expiresAt: Date): Promise<string> {
  return new SignJWT({ sid: sessionId })
    .setProtectedHeader({ alg: "HS256" })
    .setIssuer(ISSUER)
    .setAudience(AUDIENCE)
    .setIssuedAt()
    .setExpirationTime(Math.floor(expiresAt.getTime() / 1000))
    .sign(secretKey());
}

// Checking a token's signature is pure (the same string always verifies the same way), and a phone sends the same
// token on every request for a day, so a verified token is remembered until it expires. Only the signature is
// remembered: whether the session it names is still live is read from the database on every request.
const VERIFIED_MAX = 5000;
const verified = new Map<string, { sid: string; expiresAtMs: number }>();

/** Verifies signature, issuer, audience and expiry; returns the session id it names, or null. */
export async function verifySessionToken(token: string): Promise<string | null> {
  const known = verified.get(token);
  if (known) {
    verified.delete(token);
    if (known.expiresAtMs <= Date.now()) return null;
    verified.set(token, known); // most recently used last, so the oldest is the first key
    return known.sid;
  }
  try {
    const { payload } = await jwtVerify(token, secretKey(), { issuer: ISSUER, audience: AUDIENCE, algorithms: ["HS256"] });
    if (typeof payload.sid !== "string") return null;
    if (typeof payload.exp === "number") {
      if (verified.size >= VERIFIED_MAX) verified.delete(verified.keys().next().value!);
      verified.set(token, { sid: payload.sid, expiresAtMs: payload.exp * 1000 });
    }
    return payload.sid;
  } catch {
    return null;
  }
}
