import "fake-indexeddb/auto";
import { describe, expect, it } from "vitest";
import { RimebookDB } from "@/lib/client/db";
import { adoptIdentity } from "@/lib/client/identity";
import { SyncEngine } from "@/lib/client/sync";

// The sync loop's own rules, without a server: backoff with jitter, 401 handling, shared runs.

async function phone() {
  const db = new RimebookDB(`loop-${crypto.randomUUID()}`);
  await adoptIdentity({ user: { id: "u", name: "Wren", email: "w@example.test" }, farm: { id: "f", name: "Bramblewick" }, role: "helper" }, db);
  return db;
}

describe("sync loop", () => {
  it("backs off exponentially with jitter while the network is down, up to a ceiling", async () => {
    const db = await phone();
    let calls = 0;
    const engine = new SyncEngine({
      db,
      baseUrl: "http://test",
      fetch: async () => {
        calls++;
        throw new TypeError("offline");
      },
      baseBackoffMs: 1000,
      maxBackoffMs: 8000,
      random: () => 1, // the top of the jitter range: exactly the ceiling
    });
    const delays: number[] = [];
    for (let i = 0; i < 6; i++) {
      const before = Date.now();
      const state = await engine.syncNow();
      expect(state.phase).toBe("offline");
      delays.push(Math.round((state.retryAt! - before) / 1000));
    }
    expect(delays).toEqual([1, 2, 4, 8, 8, 8]);
    expect(calls).toBe(6);

    const low = new SyncEngine({ db, baseUrl: "http://test", fetch: async () => Promise.reject(new TypeError("x")), baseBackoffMs: 1000, random: () => 0 });
    const t0 = Date.now();
    const s = await low.syncNow();
    expect(s.retryAt! - t0).toBeGreaterThanOrEqual(450); // jitter never goes below half the step
    expect(s.retryAt! - t0).toBeLessThan(600);
  });

  it("stops on 401 with no retry scheduled and says sign-in is needed", async () => {
    const db = await phone();
    await db.outbox.add({ id: crypto.randomUUID(), name: "member.preferences", args: { digest_opt_in: true }, at: new Date().toISOString(), status: "pending", tries: 0 });
    const engine = new SyncEngine({ db, baseUrl: "http://test", fetch: async () => new Response("{}", { status: 401 }) });
    const state = await engine.syncNow();
    expect(state).toMatchObject({ phase: "needs_sign_in", retryAt: null });
    expect(await db.outbox.count()).toBe(1);
  });

  it("runs once for calls made while a sync is running, then once more for what came in meanwhile", async () => {
    const db = await phone();
    let pulls = 0;
    const engine = new SyncEngine({
      db,
      baseUrl: "http://test",
      fetch: async () => {
        pulls++;
        await new Promise((r) => setTimeout(r, 20));
        return Response.json({ cursor: 0, changes: [], more: false, head: 0, farm: { id: "f", name: "Bramblewick" }, role: "helper" });
      },
    });
    const runs = await Promise.all([engine.syncNow(), engine.syncNow(), engine.syncNow()]);
    expect(runs.every((r) => r.phase === "idle")).toBe(true);
    expect(pulls).toBe(2);
  });

  it("with nobody signed in on the phone, asks for sign-in without calling the server", async () => {
    const db = new RimebookDB(`loop-${crypto.randomUUID()}`);
    let calls = 0;
    const engine = new SyncEngine({ db, baseUrl: "http://test", fetch: async () => (calls++, new Response("{}")) });
    expect((await engine.syncNow()).phase).toBe("needs_sign_in");
    expect(calls).toBe(0);
  });
});
