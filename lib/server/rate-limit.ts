import "server-only";
import type { Knex } from "knex";
import { createHash } from "node:crypto";
import { AppError } from "@/lib/errors";
import { CLIENT_HEADER, FRONT_DOOR } from "./front-door.mjs";

// Sign-in attempts are limited per account and per network address (auth_attempts table).
// Failures count inside a sliding window; for an account a successful sign-in clears the count.
// Sign-ups are limited per address in the same table and window.
//
// A stranger must not be able to shut the real person out by typing wrong passwords for their e-mail:
// once an account has ACCOUNT_FAILURE_LIMIT failures, only the addresses those failures came from are
// refused; an address that has not failed for the account still gets its try, after a slow-down, so a
// guesser gets one more try per fresh address at most. Past ACCOUNT_HARD_LIMIT failures in the window
// everyone needs the e-mailed reset link (which clears the lock).

export const ATTEMPT_WINDOW_MS = 15 * 60 * 1000;
export const ACCOUNT_FAILURE_LIMIT = 5;
export const ACCOUNT_HARD_LIMIT = 50;
export const ADDRESS_FAILURE_LIMIT = 20;
/** How long a sign-in to a locked account from a fresh address waits before the password is checked. */
export const LOCKED_ACCOUNT_DELAY_MS = 2000;

/** `ip` null: the caller's address is unknown (served without the front door), so no per-address rule applies. */
export type AttemptKeys = { email: string; ip: string | null };
const keysOf = (k: AttemptKeys) => ({
  account: `email:${k.email}`,
  address: k.ip === null ? null : `ip:${k.ip}`,
  // Hashed so a long e-mail plus an IPv6 address fits the key column.
  pair: k.ip === null ? null : `pair:${createHash("sha256").update(`${k.email}\n${k.ip}`).digest("hex").slice(0, 40)}`,
});

let warnedUnknown = false;
/**
 * The caller's network address as the front door (lib/server/front-door.mjs) read it from the socket
 * (and TRUST_PROXY), or null when the app is served without it: never a header the caller wrote.
 */
export function clientAddress(req: Request): string | null {
  return addressFromHeaders(req.headers);
}

/** clientAddress for a page (next/headers). */
export function addressFromHeaders(headers: { get(name: string): string | null }): string | null {
  const address = (globalThis as Record<symbol, unknown>)[FRONT_DOOR] ? headers.get(CLIENT_HEADER) : null;
  if (address) return address.slice(0, 64);
  if (!warnedUnknown) {
    warnedUnknown = true;
    console.warn("[rimebook] the caller's address is unknown (served without `npm start`'s front door): per-address limits are off");
  }
  return null;
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

const wait = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/**
 * Throws 429 "try again in N minutes" when the address has failed too often, when the account is locked
 * and this address is one its failures came from, or past the account's hard cap. A fresh address to a
 * locked account waits LOCKED_ACCOUNT_DELAY_MS and goes on. Wrong current passwords on the
 * change-password form count toward the same lock (`what` words it).
 */
export async function assertSignInAllowed(db: Knex, keys: AttemptKeys, now = new Date(), what = "Too many sign-in attempts."): Promise<void> {
  const k = keysOf(keys);
  if (k.address) {
    const until = await lockedUntil(db, k.address, ADDRESS_FAILURE_LIMIT, false, now);
    if (until) throw tooMany(what, [until], now, ", or reset your password");
  }
  const accountUntil = await lockedUntil(db, k.account, ACCOUNT_FAILURE_LIMIT, true, now);
  if (!accountUntil) return;
  const hardUntil = await lockedUntil(db, k.account, ACCOUNT_HARD_LIMIT, true, now);
  if (hardUntil) {
    throw new AppError("rate_limited", `${what} This account is locked for now: use “Forgot your password?” to get a link by e-mail, which opens it again.`, undefined, 429);
  }
  // Unknown address: it cannot be told apart from the guesser's, so the account lock holds for it.
  const failedHere = k.pair === null || (await lockedUntil(db, k.pair, 1, true, now)) !== null;
  if (failedHere) throw tooMany(what, [accountUntil], now, ", or reset your password");
  await wait(LOCKED_ACCOUNT_DELAY_MS);
}

export async function recordSignInAttempt(db: Knex, keys: AttemptKeys, ok: boolean, now = new Date()): Promise<void> {
  const k = keysOf(keys);
  const at = now.toISOString();
  await db("auth_attempts").insert([k.account, k.address, k.pair].filter((key): key is string => key !== null).map((key) => ({ key, at, ok })));
  // Keep the table small: a day of history is plenty for a 15-minute window.
  await db("auth_attempts").where("at", "<", new Date(now.getTime() - 24 * 60 * 60 * 1000).toISOString()).delete();
}

// New farm accounts per network address: every sign-up that gets past the form counts (taken
// e-mails too, so the form cannot be used to test many addresses for an account).
export const SIGN_UP_ADDRESS_LIMIT = 5;
const signUpKey = (ip: string) => `sign-up:${ip}`;

/** Throws 429 when this address has tried to start too many farm accounts in the window. */
export async function assertSignUpAllowed(db: Knex, ip: string | null, now = new Date()): Promise<void> {
  if (ip === null) return;
  const until = await lockedUntil(db, signUpKey(ip), SIGN_UP_ADDRESS_LIMIT, false, now);
  if (until) throw tooMany("Too many new farm accounts were started from this network.", [until], now);
}

/** Counts one sign-up toward the address's limit (stored like a failed attempt: only failures count). */
export async function recordSignUpAttempt(db: Knex, ip: string | null, now = new Date()): Promise<void> {
  if (ip === null) return;
  await db("auth_attempts").insert({ key: signUpKey(ip), at: now.toISOString(), ok: false });
}
