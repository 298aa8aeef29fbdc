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

/** Verifies signature, issuer, audience and expiry; returns the session id it names, or null. */
export async function verifySessionToken(token: string): Promise<string | null> {
  try {
    const { payload } = await jwtVerify(token, secretKey(), { issuer: ISSUER, audience: AUDIENCE, algorithms: ["HS256"] });
    return typeof payload.sid === "string" ? payload.sid : null;
  } catch {
    return null;
  }
}
