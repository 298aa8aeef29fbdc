import { spawn } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { freshDatabase, testDialect, type FreshDatabase } from "../support/db";
import { memberRequest, signedInMember, type TestMember } from "../support/auth";
import { countRows, uuid } from "../support/sync";
import { env } from "@/lib/server/env";
import { POST as push } from "@/app/api/sync/push/route";

// Two app processes behind one database, the same phone's outbox reaching both (a retry through a
// load balancer): each mutation is applied exactly once, both answer "applied" for all of them, and
// the record of who sent it is the first one's. PostgreSQL only: several app processes share one
// PostgreSQL; a SQLite file is served by one process (README, "Running on PostgreSQL").

const ROOT = path.resolve(import.meta.dirname, "../..");
const origin = new URL(env.APP_ORIGIN).origin;

type Answer = { status: number; body: { applied: string[]; rejected: { id: string; error: { code: string } }[] } };

function runWorker(databaseUrl: string, job: object): Promise<Answer[]> {
  const jobFile = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "rimebook-push-")), "job.json");
  fs.writeFileSync(jobFile, JSON.stringify(job));
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ["node_modules/tsx/dist/cli.mjs", "--conditions=react-server", "tests/support/push-worker.ts", jobFile], {
      cwd: ROOT,
      env: { ...process.env, DATABASE_URL: databaseUrl, NODE_ENV: "test" },
      stdio: ["ignore", "pipe", "pipe"],
    });
    let out = "";
    let err = "";
    child.stdout.on("data", (d) => (out += d));
    child.stderr.on("data", (d) => (err += d));
    child.on("error", reject);
    child.on("close", (code) => {
      fs.rmSync(path.dirname(jobFile), { recursive: true, force: true });
      if (code !== 0) return reject(new Error(`push worker exited ${code}: ${err}`));
      try {
        resolve(JSON.parse(out.trim().split("\n").pop()!));
      } catch (e) {
        reject(new Error(`push worker said: ${out}\n${err}\n${String(e)}`));
      }
    });
  });
}

describe.skipIf(testDialect !== "pg")("two app processes pushing the same mutations", () => {
  let t: FreshDatabase;
  let db: Knex;
  beforeAll(async () => {
    t = await freshDatabase();
    db = t.db;
  });
  afterAll(async () => t.cleanup());

  /** Two Helpers of one farm and a bag in the cold for their checks. */
  async function farmWithBag(code: string) {
    const first: TestMember = await signedInMember(db, { role: "helper" });
    const second: TestMember = await signedInMember(db, { role: "helper", farmId: first.farmId });
    const lotId = uuid();
    const bagId = uuid();
    const at = "2026-11-20T08:00:00.000Z";
    const setup = await push(
      memberRequest("/api/sync/push", await signedInMember(db, { role: "grower", farmId: first.farmId }), {
        method: "POST",
        json: {
          deviceId: "setup",
          mutations: [
            { id: uuid(), name: "lot.create", args: { id: lotId, species: "Viola pedata" }, at },
            { id: uuid(), name: "bag.create", args: { id: bagId, code, lot_id: lotId, start_date: "2026-11-01" }, at },
          ],
        },
      }),
      { params: Promise.resolve({}) },
    );
    expect((await setup.json()).rejected).toEqual([]);
    return { first, second, bagId, at };
  }

  it("applies each of 500 checks exactly once; both processes answer applied for all; the first record's person and phone stay", async () => {
    const { first, second, bagId, at } = await farmWithBag("TWO-PROC");
    const checks = Array.from({ length: 500 }, (_, i) => ({
      id: uuid(),
      name: "check.record",
      args: { id: uuid(), bag_id: bagId, checked_at: new Date(Date.UTC(2026, 10, 2) + i * 60_000).toISOString(), moisture: "damp", mould: "clean", sprouts: "none" },
      at,
    }));
    const batches = Array.from({ length: 10 }, (_, b) => checks.slice(b * 50, b * 50 + 50));
    const startAt = Date.now() + 4000; // both workers loaded and connected, then off together
    const [a, b] = await Promise.all([
      runWorker(t.url, { cookie: first.cookie, origin, deviceId: "phone-a", startAt, batches }),
      runWorker(t.url, { cookie: second.cookie, origin, deviceId: "phone-b", startAt, batches }),
    ]);

    for (const answers of [a, b]) {
      expect(answers.map((x) => x.status)).toEqual(Array(10).fill(200));
      expect(answers.flatMap((x) => x.body.rejected)).toEqual([]);
      expect(answers.flatMap((x) => x.body.applied)).toEqual(checks.map((c) => c.id));
    }
    expect(await countRows(db, "checks", { bag_id: bagId })).toBe(500);
    expect(await countRows(db, "applied_mutations", { name: "check.record" })).toBe(500);
    // Whoever stored a check is the one its mutation record names, with that person's phone.
    const byMutation = new Map<string, string>(checks.map((c) => [c.id, c.args.id]));
    const records: { id: string; user_id: string; device_id: string }[] = await db("applied_mutations").whereIn("id", checks.map((c) => c.id)).select("id", "user_id", "device_id");
    const storedBy = new Map((await db("checks").where({ bag_id: bagId }).select("id", "checked_by")).map((r: { id: string; checked_by: string }) => [r.id, r.checked_by]));
    const phoneOf: Record<string, string> = { [first.userId]: "phone-a", [second.userId]: "phone-b" };
    const mismatched = records.filter((r) => storedBy.get(byMutation.get(r.id)!) !== r.user_id || phoneOf[r.user_id] !== r.device_id);
    expect(mismatched).toEqual([]);
  });

  it("the same 500 checks re-queued under new mutation ids through the other process: each check stored once, every mutation applied", async () => {
    const { first, second, bagId, at } = await farmWithBag("TWO-REQ");
    const checks = Array.from({ length: 500 }, (_, i) => ({
      id: uuid(),
      name: "check.record",
      args: { id: uuid(), bag_id: bagId, checked_at: new Date(Date.UTC(2026, 10, 2) + i * 60_000).toISOString(), moisture: "dry", mould: "clean", sprouts: "none" },
      at,
    }));
    const requeued = checks.map((c) => ({ ...c, id: uuid() }));
    const slices = (list: typeof checks) => Array.from({ length: 10 }, (_, b) => list.slice(b * 50, b * 50 + 50));
    const startAt = Date.now() + 4000;
    const [a, b] = await Promise.all([
      runWorker(t.url, { cookie: first.cookie, origin, deviceId: "phone-a", startAt, batches: slices(checks) }),
      runWorker(t.url, { cookie: second.cookie, origin, deviceId: "phone-b", startAt, batches: slices(requeued) }),
    ]);
    expect(a.flatMap((x) => x.body.rejected)).toEqual([]);
    expect(b.flatMap((x) => x.body.rejected)).toEqual([]);
    expect(a.flatMap((x) => x.body.applied)).toEqual(checks.map((c) => c.id));
    expect(b.flatMap((x) => x.body.applied)).toEqual(requeued.map((c) => c.id));
    expect(await countRows(db, "checks", { bag_id: bagId })).toBe(500);
    expect(await countRows(db, "applied_mutations", { farm_id: first.farmId, name: "check.record", outcome: "applied" })).toBe(1000);
  });
});
