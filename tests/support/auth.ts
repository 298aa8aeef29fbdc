import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { env } from "@/lib/server/env";
import { hashPassword } from "@/lib/server/passwords";
import { addMembership } from "@/lib/server/accounts";
import { installStarterProtocols } from "@/lib/server/protocols";
import { createSession, SESSION_COOKIE } from "@/lib/server/sessions";
import type { Role } from "@/lib/schemas/vocabulary";

// Lets any route test call a handler as a member of any role:
//   const m = await signedInMember(db, { role: "helper" });
//   await POST(memberRequest("/api/sync/push", m, { method: "POST", body }), ctx)

export const TEST_PASSWORD = "frost on the barn door";
let testHash: Promise<string> | null = null;

export type TestMember = {
  userId: string;
  farmId: string;
  membershipId: string;
  sessionId: string;
  token: string;
  email: string;
  password: string;
  role: Role;
  /** The Cookie header value. */
  cookie: string;
  /** Cookie plus the app's own Origin, as the browser sends on a mutating request. */
  headers: Record<string, string>;
};

export async function signedInMember(
  db: Knex,
  opts: { role?: Role; farmId?: string; farmName?: string; email?: string; name?: string; starters?: boolean } = {},
): Promise<TestMember> {
  const role = opts.role ?? "owner";
  const now = new Date();
  const at = now.toISOString();
  const email = (opts.email ?? `${role}-${randomUUID().slice(0, 8)}@example.test`).toLowerCase();
  const userId = randomUUID();
  const password_hash = await (testHash ??= hashPassword(TEST_PASSWORD));
  let farmId = opts.farmId;
  const membershipId = await db.transaction(async (trx) => {
    if (!farmId) {
      farmId = randomUUID();
      await trx("farms").insert({ id: farmId, name: opts.farmName ?? "Test Farm", seq: 0, created_at: at, updated_at: at });
      if (opts.starters) await installStarterProtocols(trx, farmId, now);
    }
    await trx("users").insert({ id: userId, email, name: opts.name ?? `Test ${role}`, password_hash, created_at: at, updated_at: at });
    return addMembership(trx, { farmId, userId, role }, now);
  });
  const session = await createSession(db, { userId, farmId: farmId!, userAgent: "vitest" });
  const cookie = `${SESSION_COOKIE}=${session.token}`;
  return {
    userId,
    farmId: farmId!,
    membershipId,
    sessionId: session.sessionId,
    token: session.token,
    email,
    password: TEST_PASSWORD,
    role,
    cookie,
    headers: { cookie, origin: new URL(env.APP_ORIGIN).origin },
  };
}

/** A Request to `path` on the app's origin, carrying the member's cookie and Origin. */
export function memberRequest(path: string, member: Pick<TestMember, "headers"> | null, init: RequestInit & { json?: unknown } = {}): Request {
  const { json, headers, ...rest } = init;
  const h = new Headers(headers);
  if (member) {
    for (const [k, v] of Object.entries(member.headers)) if (!h.has(k)) h.set(k, v);
  } else if (!h.has("origin")) {
    h.set("origin", new URL(env.APP_ORIGIN).origin);
  }
  if (json !== undefined) h.set("content-type", "application/json");
  return new Request(new URL(path, env.APP_ORIGIN), { ...rest, headers: h, body: json !== undefined ? JSON.stringify(json) : rest.body });
}
