// Power cut during a big sync: the production server is killed with SIGKILL while a phone's 5,000 checks are
// being pushed, started again on the same database, and the phone retries everything it has no answer for
// (here: all of it, the worst case). Every check must be stored exactly once and the database intact.
// On SQLite by default; `npm test`'s PostgreSQL pass runs it on PostgreSQL too (TEST_DATABASE_URL).
import { randomUUID } from "node:crypto";
import Database from "better-sqlite3";
import knexFactory from "knex";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startApp, type AppServer } from "./support/server";
import { testServerUrl } from "../support/postgres";

let app: AppServer;
let cookie = "";

beforeAll(async () => {
  app = await startApp({ name: "crash", onTestServer: true });
  const res = await fetch(`${app.origin}/api/auth/sign-up`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: app.origin },
    body: JSON.stringify({ email: "owner@crash.example", password: "frost on the barn door", name: "Crash Owner", farmName: "Crash Test Farm" }),
  });
  expect(res.status).toBe(201);
  cookie = res.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
}, 600_000);

afterAll(async () => {
  await app?.stop();
});

type PushResult = { applied: string[]; rejected: { id: string; error: unknown }[] };

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function push(mutations: unknown[]): Promise<PushResult> {
  const res = await fetch(`${app.origin}/api/sync/push`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: app.origin, cookie },
    body: JSON.stringify({ deviceId: "phone-crash", mutations }),
  });
  if (!res.ok) throw new Error(`push answered ${res.status}: ${await res.text()}`);
  return (await res.json()) as PushResult;
}

/** What the phone's sync loop does: on a network failure, wait and send the same batch again. */
async function pushWithRetry(mutations: unknown[], deadline = Date.now() + 120_000): Promise<PushResult> {
  for (let attempt = 0; ; attempt++) {
    try {
      return await push(mutations);
    } catch (err) {
      if (Date.now() > deadline) throw err;
      await sleep(Math.min(100 * 2 ** attempt, 1000));
    }
  }
}

/** One count, read from outside the server as an operator would: SQLite read-only, or a PostgreSQL connection. */
async function count(sql: string, ...args: unknown[]): Promise<number> {
  if (!app.databaseFile) {
    const pg = knexFactory({ client: "pg", connection: app.databaseUrl, pool: { min: 0, max: 1 } });
    try {
      const { rows } = await pg.raw(sql, args as never);
      return Number(rows[0].n);
    } finally {
      await pg.destroy();
    }
  }
  const db = new Database(app.databaseFile, { readonly: true, fileMustExist: true });
  try {
    return (db.prepare(sql).get(...args) as { n: number }).n;
  } finally {
    db.close();
  }
}

const mutation = (name: string, args: Record<string, unknown>) => ({ id: randomUUID(), name, args, at: new Date().toISOString() });

describe(`SIGKILL during a 5,000-check push (${testServerUrl() ? "PostgreSQL" : "SQLite"})`, () => {
  it("stores every check exactly once after a restart and a full retry", async () => {
    const lotId = randomUUID();
    const bagId = randomUUID();
    const setup = await push([
      mutation("lot.create", { id: lotId, species: "Aquilegia canadensis", year: 2025, quantity: 600 }),
      mutation("bag.create", { id: bagId, code: "CR4SH1-A", lot_id: lotId, start_date: "2026-11-01" }),
    ]);
    expect(setup.rejected).toEqual([]);

    const checks = Array.from({ length: 5000 }, (_, i) =>
      mutation("check.record", {
        id: randomUUID(),
        bag_id: bagId,
        checked_at: new Date(Date.UTC(2026, 10, 2) + i * 60_000).toISOString(),
        moisture: "damp",
        mould: "clean",
        sprouts: "none",
        actions: [],
      }),
    );
    const batches = Array.from({ length: 5 }, (_, i) => checks.slice(i * 1000, (i + 1) * 1000));

    // Batch 1 arrives; batches 2–5 are in flight together when the power goes.
    expect((await push(batches[0])).applied).toHaveLength(1000);
    const inFlight = batches.slice(1).map((b) => push(b).then(() => "answered", () => "cut off"));
    const stored = () => count("SELECT COUNT(*) AS n FROM checks WHERE bag_id = ?", bagId);
    const killBy = Date.now() + 60_000;
    while ((await stored()) < 1500 && Date.now() < killBy) await sleep(10);
    await app.kill();
    const atKill = await stored();
    const outcomes = await Promise.all(inFlight);
    expect(atKill, "the kill landed in the middle of the push").toBeGreaterThan(1000);
    expect(atKill).toBeLessThan(5000);
    expect(outcomes).toContain("cut off");

    await app.restart();
    // The phone heard back for batch 1 only; to be safe it sends everything it has again, twice.
    for (let round = 0; round < 2; round++) {
      for (const batch of batches) {
        const result = await pushWithRetry(batch);
        expect(result.rejected).toEqual([]);
        expect(new Set(result.applied)).toEqual(new Set(batch.map((m) => m.id)));
      }
    }

    expect(await stored()).toBe(5000);
    expect(await count("SELECT COUNT(DISTINCT id) AS n FROM checks WHERE bag_id = ?", bagId)).toBe(5000);
    const ids = checks.map((c) => c.id);
    expect(await count(`SELECT COUNT(*) AS n FROM applied_mutations WHERE outcome = 'applied' AND id IN (${ids.map(() => "?").join(",")})`, ...ids)).toBe(5000);
    if (app.databaseFile) {
      const db = new Database(app.databaseFile, { readonly: true });
      expect(db.pragma("integrity_check", { simple: true })).toBe("ok");
      db.close();
    } else {
      // PostgreSQL: every seq handed out is a distinct stamp on the farm's rows (no half-applied write survived).
      expect(await count("SELECT COUNT(*) - COUNT(DISTINCT seq) AS n FROM checks WHERE bag_id = ?", bagId)).toBe(0);
    }
  }, 300_000);
});
