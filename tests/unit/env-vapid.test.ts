import { afterEach, describe, expect, it, vi } from "vitest";

// The Web Push keys in lib/server/env.ts: both or neither; without them reminders are off (never a failed start);
// malformed values are a configuration error named in words, as for every other variable.

const saved = { ...process.env };
afterEach(() => {
  process.env = { ...saved };
  vi.resetModules();
});

async function readEnvWith(vars: Record<string, string | undefined>) {
  for (const k of ["VAPID_PUBLIC_KEY", "VAPID_PRIVATE_KEY", "VAPID_SUBJECT", "PUSH_ALLOW_LOOPBACK"]) delete process.env[k];
  Object.assign(process.env, vars);
  vi.resetModules();
  return (await import("@/lib/server/env")).env;
}

// A P-256 pair in the shape `web-push generate-vapid-keys` prints (65-byte public point, 32-byte private key).
const webpush = require("web-push") as typeof import("web-push");
const pair = webpush.generateVAPIDKeys();

describe("VAPID configuration", () => {
  it("without keys (or with empty values) reminders are off and the server still starts", async () => {
    expect((await readEnvWith({})).vapid).toBeNull();
    expect((await readEnvWith({ VAPID_PUBLIC_KEY: "", VAPID_PRIVATE_KEY: " " })).vapid).toBeNull();
  });

  it("with both keys they are used, and the subject falls back to the sender's mailbox on http", async () => {
    const env = await readEnvWith({ VAPID_PUBLIC_KEY: pair.publicKey, VAPID_PRIVATE_KEY: pair.privateKey, MAIL_FROM: "Bramblewick <crew@bramblewick.example>", APP_ORIGIN: "http://localhost:3000" });
    expect(env.vapid).toEqual({ publicKey: pair.publicKey, privateKey: pair.privateKey, subject: "mailto:crew@bramblewick.example" });
    const https = await readEnvWith({ VAPID_PUBLIC_KEY: pair.publicKey, VAPID_PRIVATE_KEY: pair.privateKey, APP_ORIGIN: "https://rimebook.example", SESSION_SECRET: "x".repeat(32) });
    expect(https.vapid?.subject).toBe("https://rimebook.example");
  });

  it("refuses one key without the other, malformed keys and a subject push services cannot use", async () => {
    await expect(readEnvWith({ VAPID_PUBLIC_KEY: pair.publicKey })).rejects.toThrow(/Set both VAPID_PUBLIC_KEY and VAPID_PRIVATE_KEY, or neither/);
    await expect(readEnvWith({ VAPID_PUBLIC_KEY: "not-a-key", VAPID_PRIVATE_KEY: pair.privateKey })).rejects.toThrow(/65-byte P-256 public key/);
    await expect(readEnvWith({ VAPID_PUBLIC_KEY: pair.publicKey, VAPID_PRIVATE_KEY: pair.privateKey, VAPID_SUBJECT: "crew@bramblewick.example" })).rejects.toThrow(/mailto: address or an https: URL/);
  });

  it("never lets loopback push services through on an https deployment", async () => {
    expect((await readEnvWith({ PUSH_ALLOW_LOOPBACK: "on", APP_ORIGIN: "http://127.0.0.1:3000" })).pushAllowLoopback).toBe(true);
    expect((await readEnvWith({ PUSH_ALLOW_LOOPBACK: "on", APP_ORIGIN: "https://rimebook.example", SESSION_SECRET: "x".repeat(32) })).pushAllowLoopback).toBe(false);
  });
});
