import "server-only";
import { createHash, randomBytes } from "node:crypto";

/** A one-time link token (sent by e-mail) and the hash we keep: the token itself is never stored. */
export function newLinkToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, hash: hashLinkToken(token) };
}

export const hashLinkToken = (token: string) => createHash("sha256").update(token).digest("hex");
