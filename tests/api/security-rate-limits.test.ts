import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freshDatabase } from "../support/db";
import { signedInMember, TEST_PASSWORD } from "../support/auth";
import { env } from "@/lib/server/env";
import { CLIENT_HEADER, FRONT_DOOR } from "@/lib/server/front-door.mjs";
import { ACCOUNT_FAILURE_LIMIT, ACCOUNT_HARD_LIMIT, ADDRESS_FAILURE_LIMIT, LOCKED_ACCOUNT_DELAY_MS, SIGN_UP_ADDRESS_LIMIT, recordSignInAttempt } from "@/lib/server/rate-limit";
import { POST as signIn } from "@/app/api/auth/sign-in/route";
import { POST as signUp } from "@/app/api/auth/sign-up/route";

// Issue 11, item 5: the rate limits key on the address the front door read from the socket (never a header
// the caller wrote), there is no shared "unknown" bucket, and a stranger typing wrong passwords for someone's
// e-mail cannot shut the real person out.

const origin = new URL(env.APP_ORIGIN).origin;
const noCtx = {} as never;

/** `socket`: the address the front door saw; `forwarded`: whatever the caller put in X-Forwarded-For. */
function post(p: string, json: unknown, opts: { socket?: string; forwarded?: string } = {}) {
  const headers: Record<string, string> = { "content-type": "application/json", origin };
  if (opts.socket) headers[CLIENT_HEADER] = opts.socket;
  if (opts.forwarded) headers["x-forwarded-for"] = opts.forwarded;
  return new Request(new URL(p, origin), { method: "POST", headers, body: JSON.stringify(json) });
}

let ctx: Awaited<ReturnType<typeof freshDatabase>>;
beforeAll(async () => {
  ctx = await freshDatabase();
  (globalThis as Record<symbol, unknown>)[FRONT_DOOR] = true; // as scripts/serve.mjs does
});
afterAll(async () => {
  delete (globalThis as Record<symbol, unknown>)[FRONT_DOOR];
  await ctx.cleanup();
});

describe("the address comes from the socket, not from X-Forwarded-For", () => {
  it("a new X-Forwarded-For on every wrong password does not walk past the per-address limit", async () => {
    for (let i = 0; i < ADDRESS_FAILURE_LIMIT; i++) {
      const r = await signIn(post("/api/auth/sign-in", { email: `nobody${i}@example.test`, password: "not it at all" }, { socket: "198.51.100.7", forwarded: `10.0.${i}.1` }), noCtx);
      expect(r.status).toBe(401);
    }
    const m = await signedInMember(ctx.db, { role: "helper" });
    const r = await signIn(post("/api/auth/sign-in", { email: m.email, password: TEST_PASSWORD }, { socket: "198.51.100.7", forwarded: "10.9.9.9" }), noCtx);
    expect(r.status).toBe(429);
  });

  it("a new X-Forwarded-For on every sign-up does not walk past the sign-up limit", async () => {
    const statuses: number[] = [];
    for (let i = 0; i <= SIGN_UP_ADDRESS_LIMIT + 1; i++) {
      const r = await signUp(post("/api/auth/sign-up", { email: `starter${i}@example.test`, password: "frost on the barn door", name: `Starter ${i}`, farmName: `Farm ${i}` }, { socket: "198.51.100.8", forwarded: `10.1.${i}.1` }), noCtx);
      statuses.push(r.status);
    }
    expect(statuses.slice(0, SIGN_UP_ADDRESS_LIMIT)).toEqual(Array(SIGN_UP_ADDRESS_LIMIT).fill(201));
    expect(statuses.slice(SIGN_UP_ADDRESS_LIMIT)).toEqual([429, 429]);
  });

  it("requests without X-Forwarded-For share no bucket: one address's failures lock nobody else", async () => {
    for (let i = 0; i < ADDRESS_FAILURE_LIMIT; i++) {
      expect((await signIn(post("/api/auth/sign-in", { email: `ghost${i}@example.test`, password: "not it at all" }, { socket: "203.0.113.40" }), noCtx)).status).toBe(401);
    }
    const owner = await signedInMember(ctx.db, { role: "owner" });
    expect((await signIn(post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD }, { socket: "203.0.113.41" }), noCtx)).status).toBe(200);
  });
});

describe("a stranger cannot lock the real person out", () => {
  it("after the account's guess cap, the guessing addresses are refused and the owner's own address gets in after a slow-down", async () => {
    const owner = await signedInMember(ctx.db, { role: "owner" });
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT; i++) {
      expect((await signIn(post("/api/auth/sign-in", { email: owner.email, password: `guess ${i} of many` }, { socket: "192.0.2.66" }), noCtx)).status).toBe(401);
    }
    // The guesser keeps getting 429, even with the right password (it cannot tell which guess was right).
    const again = await signIn(post("/api/auth/sign-in", { email: owner.email, password: "guess 6 of many" }, { socket: "192.0.2.66" }), noCtx);
    expect(again.status).toBe(429);
    expect((await again.json()).error.message).toMatch(/try again in 15 minutes, or reset your password/);

    const started = Date.now();
    const mine = await signIn(post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD }, { socket: "192.0.2.10" }), noCtx);
    expect(mine.status).toBe(200);
    expect(Date.now() - started).toBeGreaterThanOrEqual(LOCKED_ACCOUNT_DELAY_MS - 50);
  });

  it("a fresh address gets one try at a locked account, then it is refused too", async () => {
    const owner = await signedInMember(ctx.db, { role: "owner" });
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT; i++) await signIn(post("/api/auth/sign-in", { email: owner.email, password: `guess ${i} of many` }, { socket: "192.0.2.70" }), noCtx);
    expect((await signIn(post("/api/auth/sign-in", { email: owner.email, password: "one more guess" }, { socket: "192.0.2.71" }), noCtx)).status).toBe(401);
    expect((await signIn(post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD }, { socket: "192.0.2.71" }), noCtx)).status).toBe(429);
  });

  it(`past ${ACCOUNT_HARD_LIMIT} failures in the window everyone needs the e-mailed reset link`, async () => {
    const owner = await signedInMember(ctx.db, { role: "owner" });
    for (let i = 0; i < ACCOUNT_HARD_LIMIT; i++) await recordSignInAttempt(ctx.db, { email: owner.email, ip: `100.64.0.${i}` }, false);
    const r = await signIn(post("/api/auth/sign-in", { email: owner.email, password: TEST_PASSWORD }, { socket: "192.0.2.99" }), noCtx);
    expect(r.status).toBe(429);
    expect((await r.json()).error.message).toMatch(/Forgot your password/);
  });
});
