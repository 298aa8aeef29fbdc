import "fake-indexeddb/auto";
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { env } from "@/lib/server/env";
import { RimebookDB, setLocalDb } from "@/lib/client/db";
import { adoptIdentity } from "@/lib/client/identity";
import { SyncEngine, type SyncOptions } from "@/lib/client/sync";
import type { Role } from "@/lib/schemas/vocabulary";
import * as push from "@/app/api/sync/push/route";
import * as pull from "@/app/api/sync/pull/route";
import * as uploads from "@/app/api/uploads/route";
import * as upload from "@/app/api/uploads/[id]/route";
import * as me from "@/app/api/me/route";
import type { TestMember } from "./auth";

// A phone in a test: its own fake IndexedDB database and a sync loop whose fetch goes straight to
// the real route handlers (no server, no mock), carrying the member's cookie as a browser would.

export const origin = new URL(env.APP_ORIGIN).origin;

type Fetch = typeof fetch;

/** fetch → the route handlers, with the member's cookie and the app's Origin. */
export function routedFetch(member: Pick<TestMember, "cookie">): Fetch {
  return async (input, init) => {
    const url = new URL(typeof input === "string" ? input : input instanceof URL ? input.href : input.url, origin);
    const headers = new Headers(init?.headers);
    headers.set("cookie", member.cookie);
    headers.set("origin", origin);
    const req = new Request(url, { ...init, headers });
    const path = url.pathname;
    const ctx = { params: Promise.resolve({}) };
    if (path === "/api/sync/push") return push.POST(req, ctx);
    if (path === "/api/sync/pull") return pull.GET(req, ctx);
    if (path === "/api/uploads") return uploads.POST(req, ctx);
    if (path === "/api/me") return me.GET(req, ctx);
    const photo = /^\/api\/uploads\/([^/]+)$/.exec(path);
    if (photo) return upload.GET(req, { params: Promise.resolve({ id: photo[1] }) });
    return new Response(JSON.stringify({ error: { code: "not_found", message: "no such route in the test router" } }), { status: 404 });
  };
}

export type Phone = {
  db: RimebookDB;
  engine: SyncEngine;
  /** The network between this phone and the server; tests swap it to cut it off or sign out. */
  net: { fetch: Fetch };
  /** Makes this phone the one repository functions write to. */
  use: () => void;
};

/** A signed-in phone for `member`, identity stored as after sign-in, nothing pulled yet. */
export async function openPhone(member: TestMember & { name?: string }, opts: SyncOptions & { role?: Role } = {}): Promise<Phone> {
  const db = new RimebookDB(`phone-${randomUUID()}`);
  const net = { fetch: routedFetch(member) };
  const engine = new SyncEngine({ db, fetch: (...a) => net.fetch(...a), baseUrl: origin, ...opts });
  await adoptIdentity(
    { user: { id: member.userId, name: "Test", email: member.email }, farm: { id: member.farmId, name: "Test Farm" }, role: opts.role ?? member.role },
    db,
  );
  const use = () => setLocalDb(db);
  use();
  return { db, engine, net, use };
}

/** A network that drops every request. */
export const offline: Fetch = async () => {
  throw new TypeError("fetch failed");
};

export async function countRows(db: Knex, table: string, where: Record<string, unknown> = {}): Promise<number> {
  const row = await db(table).where(where).count({ n: "*" }).first();
  return Number(row?.n ?? 0);
}

export const uuid = () => randomUUID();
