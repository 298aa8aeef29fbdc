import "server-only";
import type { Knex } from "knex";
import { AppError } from "@/lib/errors";

// Sign-in attempts are limited per account and per network address (auth_attempts table).
// Failures count inside a sliding window; for an account a successful sign-in clears the count.
// Sign-ups are limited per address in the same table and window.

export const ATTEMPT_WINDOW_MS = 15 * 60 * 1000;
export const ACCOUNT_FAILURE_LIMIT = 5;
export const ADDRESS_FAILURE_LIMIT = 20;

export type AttemptKeys = { email: string; ip: string };
const keysOf = (k: AttemptKeys) => ({ account: `email:${k.email}`, address: `ip:${k.ip}` });

/** The best guess at the caller's address: the first X-Forwarded-For hop, X-Real-IP, or "unknown". */
export function clientAddress(req: Request): string {
  const forwarded = req.headers.get("x-forwarded-for");
  if (forwarded) {
    const first = forwarded.split(",")[0]?.trim();
    if (first) return first.slice(0, 64);
  }
  return (req.headers.get("x-real-ip") ?? "unknown").slice(0, 64);
}

/** When the key may try again, or null if it is not locked. */
async function lockedUntil(db: Knex, key: string, limit: number, resetOnSuccess: boolean, now: Date): Promise<Date | null> {
  const since = new Date(now.getTime() - ATTEMPT_WINDOW_MS).toISOString();
  let floor = since;
  if (resetOnSuccess) {
    const lastOk = await db("auth_attempts").where({ key, ok: true }).andWhere("at", ">", since).max({ at: "at" }).first();
    if (lastOk?.at && lastOk.at > floor) floor = lastOk.at;
  }
  const failures: { at: string }[] = await db("auth_attempts")
    .where({ key, ok: false })
    .andWhere("at", ">", floor)
    .orderBy("at", "desc")
    .limit(limit)
    .select("at");
  if (failures.length < limit) return null;
  // Locked until the oldest of the last `limit` failures leaves the window.
  return new Date(Date.parse(failures[failures.length - 1].at) + ATTEMPT_WINDOW_MS);
}

/** 429 in words: what happened, and when to try again. */
function tooMany(what: string, until: Date[], now: Date, advice = ""): AppError {
  const latest = Math.max(...until.map((d) => d.getTime()));
  const minutes = Math.max(1, Math.ceil((latest - now.getTime()) / 60_000));
  return new AppError("rate_limited", `${what} For safety, try again in ${minutes} minute${minutes === 1 ? "" : "s"}${advice}.`, undefined, 429);
}

/**
 * Throws 429 "try again in N minutes" when the account or the address has failed too often.
 * Wrong current passwords on the change-password form count toward the same lock (`what` words it).
 */
export async function assertSignInAllowed(db: Knex, keys: AttemptKeys, now = new Date(), what = "Too many sign-in attempts."): Promise<void> {
  const k = keysOf(keys);
  const until = [
    await lockedUntil(db, k.account, ACCOUNT_FAILURE_LIMIT, true, now),
    await lockedUntil(db, k.address, ADDRESS_FAILURE_LIMIT, false, now),
  ].filter((d): d is Date => d !== null);
  if (until.length) throw tooMany(what, until, now, ", or reset your password");
}

export async function recordSignInAttempt(db: Knex, keys: AttemptKeys, ok: boolean, now = new Date()): Promise<void> {
  const k = keysOf(keys);
  const at = now.toISOString();
  await db("auth_attempts").insert([
    { key: k.account, at, ok },
    { key: k.address, at, ok },
  ]);
  // Keep the table small: a day of history is plenty for a 15-minute window.
  await db("auth_attempts").where("at", "<", new Date(now.getTime() - 24 * 60 * 60 * 1000).toISOString()).delete();
}

// New farm accounts per network address: every sign-up that gets past the form counts (taken
// e-mails too, so the form cannot be used to test many addresses for an account).
export const SIGN_UP_ADDRESS_LIMIT = 5;
const signUpKey = (ip: string) => `sign-up:${ip}`;

/** Throws 429 when this address has tried to start too many farm accounts in the window. */
export async function assertSignUpAllowed(db: Knex, ip: string, now = new Date()): Promise<void> {
  const until = await lockedUntil(db, signUpKey(ip), SIGN_UP_ADDRESS_LIMIT, false, now);
  if (until) throw tooMany("Too many new farm accounts were started from this network.", [until], now);
}

/** Counts one sign-up toward the address's limit (stored like a failed attempt: only failures count). */
export async function recordSignUpAttempt(db: Knex, ip: string, now = new Date()): Promise<void> {
  await db("auth_attempts").insert({ key: signUpKey(ip), at: now.toISOString(), ok: false });
}
